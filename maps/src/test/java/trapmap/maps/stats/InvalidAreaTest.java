package trapmap.maps.stats;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import org.junit.jupiter.api.Test;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

class InvalidAreaTest {
    /** Lifetimes, µs: two non-finite, three non-positive, two under the 1 ns floor, four usable. */
    private static final float[] TAU = {Float.NaN, Float.POSITIVE_INFINITY, Float.NEGATIVE_INFINITY, 0f, -0f, -2f,
        5e-4f, 9.9e-4f, 1e-3f, 0.5f, 50f, 2000f};

    private static WaferMap map() {
        return new WaferMap(FloatRaster.wrap(TAU.length, 1, TAU.clone()), PixelGrid.centred(TAU.length, 1, 0.5),
                Quantity.EFFECTIVE_LIFETIME, "w", MeasurementConditions.UNKNOWN.withDoping(Doping.pType(1e16))
                        .withInjection(1e15), Provenance.of("test"));
    }

    @Test
    void eachPixelHasTheFirstCauseThatApplies() {
        assertThat(InvalidArea.cause(Float.NaN, -1, true)).isEqualTo(InvalidArea.Cause.NON_FINITE);
        assertThat(InvalidArea.cause(Float.NEGATIVE_INFINITY, -1, true)).isEqualTo(InvalidArea.Cause.NON_FINITE);
        assertThat(InvalidArea.cause(0f, -1, true)).isEqualTo(InvalidArea.Cause.NON_POSITIVE);
        assertThat(InvalidArea.cause(-3f, 2, true)).isEqualTo(InvalidArea.Cause.NON_POSITIVE);
        assertThat(InvalidArea.cause(5e-4f, -1, true)).isEqualTo(InvalidArea.Cause.INVALID_CONVERSION);
        // the floor is a lifetime rule: a PL count of 5e-4 is usable
        assertThat(InvalidArea.cause(5e-4f, -1, false)).isEqualTo(InvalidArea.Cause.USABLE);
        assertThat(InvalidArea.cause(1e-3f, -1, true)).isEqualTo(InvalidArea.Cause.USABLE);
        // statuses decide when given: below the detection limit (1) is usable, invalid (2) and no data (3) are not
        assertThat(InvalidArea.cause(80f, 1, true)).isEqualTo(InvalidArea.Cause.USABLE);
        assertThat(InvalidArea.cause(80f, 2, false)).isEqualTo(InvalidArea.Cause.INVALID_CONVERSION);
        assertThat(InvalidArea.cause(80f, 3, false)).isEqualTo(InvalidArea.Cause.INVALID_CONVERSION);
    }

    @Test
    void theConversionsStatusesAndItsFloorGiveTheSameCounts() {
        WaferMap m = map();
        MapConversion.Result c = MapConversion.convert(m, DefectLibrary.byId("fe-i"), ConversionSettings.DEFAULTS, 1);
        Mask all = Mask.all(TAU.length, 1);
        InvalidArea byStatus = InvalidArea.of(m.raster(), all, c.statusCodes(), true, m.grid());
        InvalidArea byFloor = InvalidArea.of(m.raster(), all, null, true, m.grid());
        assertThat(byStatus).isEqualTo(byFloor);
        assertThat(byFloor.nonFiniteCount()).isEqualTo(3);
        assertThat(byFloor.nonPositiveCount()).isEqualTo(3);
        assertThat(byFloor.invalidConversionCount()).isEqualTo(2);
        assertThat(byFloor.fraction()).isEqualTo(8.0 / 12);
        assertThat(byFloor.areaMm2()).isEqualTo(8 * 0.25);
    }

    @Test
    void onlyTheEvaluatedAreaCounts() {
        WaferMap m = map();
        Mask right = Mask.of(TAU.length, 1, i -> i >= 6);
        InvalidArea a = InvalidArea.of(m.raster(), right, null, true, m.grid());
        assertThat(a.evaluatedCount()).isEqualTo(6);
        assertThat(a.invalidCount()).isEqualTo(2);
        assertThat(a.describe()).isEqualTo("0.333 of the evaluated area (2 of 6 px: non-finite 0, non-positive 0,"
                + " invalid conversion 2)");
        assertThat(a.aboveDefaultLimit()).isTrue();
        assertThat(a.defaultLimitWarning()).isEqualTo("invalid_area_fraction 0.333 > 0.05 (default limit)");
        InvalidArea none = InvalidArea.of(m.raster(), Mask.of(TAU.length, 1, i -> false), null, true, m.grid());
        assertThat(none.fraction()).isNaN();
        assertThat(none.defaultLimitWarning()).isEmpty();
    }

    @Test
    void theDefaultLimitIsAFractionOfAtMostOneTwentieth() {
        InvalidArea at = new InvalidArea(100, 0, 5, 0, 1);
        assertThat(at.aboveDefaultLimit()).isFalse();
        assertThat(new InvalidArea(100, 6, 0, 0, 1).aboveDefaultLimit()).isTrue();
        assertThat(InvalidArea.exceeds(0.33995, 0.05)).isEqualTo("invalid_area_fraction 0.34 > 0.05 (default limit)");
        assertThatThrownBy(() -> new InvalidArea(3, 2, 2, 0, 1)).isInstanceOf(IllegalArgumentException.class);
    }
}
