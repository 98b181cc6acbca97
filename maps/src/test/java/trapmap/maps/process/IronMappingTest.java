package trapmap.maps.process;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.util.Map;
import org.junit.jupiter.api.Test;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.IronMapping.IronStatus;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.recombination.SrhRecombination;
import trapmap.shared.error.InvalidValueException;

/**
 * Iron maps of synthetic FeB/Fe_i pairs: a pair drawn with the computed prefactor of check value R-FE-5 gives back
 * the planted iron, and pairs drawn with the SRH rates of the library's fe-b and fe-i levels give the statuses and
 * counts of their pixels; bad pairs are refused.
 */
class IronMappingTest {
    private static final int N = 8;
    private static final Doping DOPING = Doping.pType(1e16);
    private static final double BASE_US = 300; // lifetime without iron, µs

    private static MeasurementConditions conditions(double dn) {
        return new MeasurementConditions(DOPING, null, null, dn, null, null, null, null, Map.of());
    }

    /** Pixel i holds iron 1e10·(i+1) cm⁻³; pixel 0 has no data in the Fe_i state. */
    private static WaferMap[] pair(double dn) {
        Conditions c = MapConversion.physicsConditions(conditions(dn), ConversionSettings.DEFAULTS);
        double chiFeB = SrhRecombination.of(DefectLibrary.byId("fe-b"), DOPING, c.silicon()).ratePerTrapCm3PerS(dn);
        double chiFei = SrhRecombination.of(DefectLibrary.byId("fe-i"), DOPING, c.silicon()).ratePerTrapCm3PerS(dn);
        float[] feb = new float[N * N];
        float[] fei = new float[N * N];
        for (int i = 0; i < feb.length; i++) {
            double fe = 1e10 * (i + 1);
            feb[i] = (float) (1e6 / (1e6 / BASE_US + fe * chiFeB));
            fei[i] = (float) (1e6 / (1e6 / BASE_US + fe * chiFei));
        }
        fei[0] = Float.NaN;
        PixelGrid g = PixelGrid.centred(N, N, 1);
        return new WaferMap[] {
            new WaferMap(FloatRaster.wrap(N, N, feb), g, Quantity.EFFECTIVE_LIFETIME, "W", conditions(dn),
                    Provenance.of("test")),
            new WaferMap(FloatRaster.wrap(N, N, fei), g, Quantity.EFFECTIVE_LIFETIME, "W", conditions(dn),
                    Provenance.of("test"))};
    }

    /**
     * Pixel i holds iron 1e10·(i+1) cm⁻³ at Δn 1e10 cm⁻³, drawn with the prefactor of the library's fe-i/fe-b at
     * N_A 1e16, v_th 1.1e7 cm/s, 300 K: C = 1.0296e7 s cm⁻³ (Macdonald, Geerligs &amp; Azzizi, JAP 95, 1021 (2004),
     * computed; docs/check-values.md R-FE-5), so that 1/τ_Fei = 1/τ_FeB + [Fe_i]/C; pixel 0 has no data in the Fe_i
     * state. Independent of the SRH rates of the code under test.
     */
    private static WaferMap[] publishedPair() {
        double c = 1.0296e7; // s cm^-3, R-FE-5
        float[] feb = new float[N * N];
        float[] fei = new float[N * N];
        for (int i = 0; i < feb.length; i++) {
            feb[i] = (float) BASE_US;
            fei[i] = (float) (1e6 / (1e6 / BASE_US + 1e10 * (i + 1) / c));
        }
        fei[0] = Float.NaN;
        PixelGrid g = PixelGrid.centred(N, N, 1);
        return new WaferMap[] {
            new WaferMap(FloatRaster.wrap(N, N, feb), g, Quantity.EFFECTIVE_LIFETIME, "W", conditions(1e10),
                    Provenance.of("test")),
            new WaferMap(FloatRaster.wrap(N, N, fei), g, Quantity.EFFECTIVE_LIFETIME, "W", conditions(1e10),
                    Provenance.of("test"))};
    }

    @Test
    void recoversThePlantedIronPerPixel() {
        WaferMap[] p = publishedPair();
        IronMapping.Result r = IronMapping.map(p[0], p[1], null, null);
        for (int i = 1; i < N * N; i++) {
            // R-FE-5 holds C to 0.1 %; float lifetimes add about 1e-6 relative on the difference of two rates
            assertThat((double) r.iron().raster().samples()[i]).isCloseTo(1e10 * (i + 1),
                    within(1e-3 * 1e10 * (i + 1)));
            assertThat(r.status().raster().samples()[i]).isEqualTo((float) IronStatus.OK.code());
        }
        assertThat(r.iron().raster().samples()[0]).isNaN();
        assertThat(r.status().raster().samples()[0]).isEqualTo((float) IronStatus.NO_DATA.code());
        assertThat(r.count(IronStatus.OK)).isEqualTo(N * N - 1);
        assertThat(r.count(IronStatus.NO_DATA)).isEqualTo(1);
        // type-7 median of 2e10..64e10 cm^-3 (63 values): the 32nd, 33e10
        assertThat(r.medianPerCm3()).isCloseTo(33e10, within(0.01e10));
        assertThat(r.p95PerCm3()).isCloseTo(1e10 * (2 + 0.95 * 62), within(0.05e10));
        assertThat(r.iron().quantity()).isEqualTo(Quantity.IRON_DENSITY);
        assertThat(r.status().quantity()).isEqualTo(Quantity.STATUS);
        // the library's fe-i/fe-b at N_A 1e16, v_th 1.1e7 cm/s: crossover 1.1848e14 cm^-3 (Macdonald, Geerligs &
        // Azzizi, JAP 95, 1021 (2004), computed; docs/check-values.md R-FE-5), 0.5 %
        assertThat(r.crossoverPerCm3()).isCloseTo(1.1848e14, within(0.005 * 1.1848e14));
        assertThat(r.nearCrossover()).isFalse();
    }

    @Test
    void marksCrossoverAndNearCrossoverPixels() {
        double crossover = IronMapping.map(pair(1e13)[0], pair(1e13)[1], null, null).crossoverPerCm3();
        WaferMap[] at = pair(crossover);
        IronMapping.Result r = IronMapping.map(at[0], at[1], null, null);
        assertThat(r.count(IronStatus.CROSSOVER)).isEqualTo(N * N - 1);
        assertThat(r.statistics().count()).isZero();
        assertThat(r.medianPerCm3()).isNaN();
        WaferMap[] near = pair(crossover / 1.5);
        IronMapping.Result n = IronMapping.map(near[0], near[1], null, null);
        assertThat(n.count(IronStatus.NEAR_CROSSOVER)).isEqualTo(N * N - 1);
        assertThat(n.nearCrossover()).isTrue();
        assertThat(n.iron().raster().samples()[5]).isCloseTo(6e10f, within(0.05e10f));
    }

    @Test
    void swappedStatesAreInconsistentNotNoIron() {
        // below the crossover dissociation lowers the lifetime; with the maps swapped it rises
        WaferMap[] p = pair(1e13);
        IronMapping.Result r = IronMapping.map(p[1], p[0], null, null);
        int inconsistent = r.count(IronStatus.INCONSISTENT);
        // every planted density (2e10 cm^-3 and more) changes the lifetime by far more than the 5 % resolution
        assertThat(inconsistent).isEqualTo(N * N - 1);
        assertThat(r.count(IronStatus.NO_DATA)).isEqualTo(1);
        float[] codes = r.status().raster().samples();
        for (int i = 0; i < codes.length; i++) {
            if (codes[i] == IronStatus.INCONSISTENT.code()) {
                assertThat(r.iron().raster().samples()[i]).isNaN();
            }
        }
        assertThat(r.statistics().count()).isZero();
        assertThat(r.inconsistentNote()).startsWith(inconsistent + " pixel(s) inconsistent").contains("below")
                .contains("lower");
        assertThat(IronMapping.codes()).endsWith("6 inconsistent");
        assertThat(IronMapping.map(p[0], p[1], null, null).inconsistentNote()).isEmpty();
    }

    @Test
    void noLifetimeDropIsBelowTheDetectionLimit() {
        WaferMap[] p = publishedPair();
        IronMapping.Result r = IronMapping.map(p[0], p[0], null, null);
        assertThat(r.count(IronStatus.BELOW_LIMIT)).isEqualTo(N * N);
        // the detection limit, an upper bound: the iron of a 5 % lifetime change (common practice, R-LIM-7),
        // C·0.05/τ = 1.0296e7 s cm^-3 (R-FE-5) · 0.05 / 300e-6 s = 1.7160e9 cm^-3 (computed, R-FE-6)
        assertThat((double) r.iron().raster().samples()[3]).isCloseTo(1.7160e9, within(1e-3 * 1.7160e9));
    }

    @Test
    void refusesPairsTheMethodCannotUse() {
        WaferMap[] p = pair(1e13);
        WaferMap otherInjection = p[1].withConditions(conditions(1e14));
        assertThatThrownBy(() -> IronMapping.map(p[0], otherInjection, null, null))
                .isInstanceOf(InvalidValueException.class).hasMessageContaining("same injection");
        WaferMap nType = p[0].withConditions(conditions(1e13).withDoping(Doping.nType(1e16)));
        assertThatThrownBy(() -> IronMapping.map(nType, p[1], null, null))
                .isInstanceOf(InvalidValueException.class).hasMessageContaining("p-type");
        WaferMap density = p[1].derive(p[1].raster(), Quantity.TRAP_DENSITY, trapmap.maps.model.ProcessingStep.of("test"));
        assertThatThrownBy(() -> IronMapping.map(p[0], density, null, null))
                .isInstanceOf(InvalidValueException.class).hasMessageContaining("effective-lifetime");
    }

    @Test
    void unregisteredPairReportsItsIdentityPlacement() {
        WaferMap[] p = pair(1e13);
        IronMapping.Result r = IronMapping.ofPair(p[0], p[1], null, null, null);
        assertThat(r.registration().kept().key()).isEqualTo("unregistered");
        assertThat(r.count(IronStatus.OK)).isEqualTo(N * N - 1);
    }
}
