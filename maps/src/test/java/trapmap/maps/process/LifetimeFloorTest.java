package trapmap.maps.process;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

/** Lifetimes below the 1 ns floor are INVALID pixels, and a map that looks like seconds read as µs says so. */
class LifetimeFloorTest {
    private static WaferMap map(float... tau) {
        return new WaferMap(FloatRaster.wrap(tau.length, 1, tau), PixelGrid.centred(tau.length, 1, 1),
                Quantity.EFFECTIVE_LIFETIME, "w", MeasurementConditions.UNKNOWN.withDoping(Doping.pType(1e16))
                        .withInjection(1e14), Provenance.of("test"));
    }

    @Test
    void aMapInSecondsIsInvalidAndTheNoteNamesTheUnit() {
        WaferMap m = map(12.5e-6f, 40e-6f, 3e-4f, 25f);
        MapConversion.Result r = MapConversion.convert(m, DefectLibrary.byId("fe-i"), ConversionSettings.DEFAULTS, 1);
        float[] status = r.get(Quantity.STATUS).raster().samples();
        assertThat(status).containsExactly(PixelStatus.INVALID.code(), PixelStatus.INVALID.code(),
                PixelStatus.INVALID.code(), PixelStatus.OK.code());
        assertThat(r.get(Quantity.TRAP_DENSITY).raster().samples()[0]).isNaN();
        assertThat(MapConversion.lifetimeFloorNote(m)).startsWith("3 pixel(s) with a lifetime below 1 ns")
                .contains("seconds").contains("\"unit\": \"s\"");
        assertThat(r.lifetimeFloorNote()).isEqualTo(MapConversion.lifetimeFloorNote(m));
        assertThat(r.statusMask(PixelStatus.INVALID).count()).isEqualTo(3);
        assertThat(r.okTrapDensity().raster().samples()).containsExactly(Float.NaN, Float.NaN, Float.NaN,
                r.get(Quantity.TRAP_DENSITY).raster().samples()[3]);
    }

    @Test
    void tinyValuesThatAreNotSecondsGetNoUnitHintAndOrdinaryMapsNoNote() {
        assertThat(MapConversion.lifetimeFloorNote(map(1e-12f, 1e-13f, 20f))).startsWith("2 pixel(s)")
                .doesNotContain("seconds");
        assertThat(MapConversion.lifetimeFloorNote(map(0.001f, 20f, Float.NaN))).isEmpty();
    }

    @Test
    void theConversionCountsTheNoteInItsOwnPass() {
        for (WaferMap m : new WaferMap[] {map(1e-12f, 1e-13f, 20f), map(0.001f, 20f, Float.NaN),
            map(5e-4f, 2e-4f, 1e-9f, -1f, 0f, 300f)}) {
            MapConversion.Result r = MapConversion.convert(m, DefectLibrary.byId("fe-i"), ConversionSettings.DEFAULTS,
                    java.util.Set.of(Quantity.TRAP_DENSITY), 2);
            assertThat(r.lifetimeFloorNote()).isEqualTo(MapConversion.lifetimeFloorNote(m));
        }
    }
}
