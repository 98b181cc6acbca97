package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.PixelResult;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

/**
 * Pixels below the detection limit carry the limit as an upper bound, not a measured density: the batch leaves them
 * out of trap-density flags, regions and percentiles and reports their share as below_limit_area_fraction, unless
 * the rules' flag opts in with {@code "below_limit": "at_bound"}.
 */
class BelowLimitJudgementTest {
    private static final int N = 101;
    private static final double PITCH_MM = 1.0;
    private static final TrapDensityConverter FE = new TrapDensityConverter(
            Conditions.of(Doping.pType(1e16), Injection.fixed(1e15)), DefectLibrary.byId("fe-i"));
    private static final double TAU_LIMIT_US = FE.convert(100).intrinsicLifetimeUs();

    /**
     * A 100 mm round wafer (p 1e16, Δn 1e15): the left part (x < −17 mm) at 0.9·τ_lim (about 2e9 cm⁻³ of fe-i), the
     * middle at 0.99·τ_lim and the right part (x > 17 mm) at the limit lifetime τ_lim: the two better parts are
     * below the detection limit (about 8.8e8 cm⁻³).
     */
    private static WaferMap wafer() {
        PixelGrid g = PixelGrid.centred(N, N, PITCH_MM);
        float[] s = new float[N * N];
        for (int y = 0; y < N; y++) {
            for (int x = 0; x < N; x++) {
                double xm = g.xMm(x);
                double f = xm < -17 ? 0.9 : xm > 17 ? 1.0 : 0.99;
                s[y * N + x] = Math.hypot(xm, g.yMm(y)) > 50 ? Float.NaN : (float) (f * TAU_LIMIT_US);
            }
        }
        MeasurementConditions c = MeasurementConditions.UNKNOWN.withDoping(Doping.pType(1e16)).withInjection(1e15);
        return new WaferMap(FloatRaster.wrap(N, N, s), g, Quantity.EFFECTIVE_LIFETIME, "bands", c,
                Provenance.of("test"));
    }

    private static Rules rules(String belowLimit) throws RulesException {
        return Rules.parse("{\"defect\": \"fe-i\", \"edge_exclusion_mm\": 0,"
                + " \"flag\": {\"quantity\": \"trap-density\", \"threshold\": 5e8, \"min_area_mm2\": 1"
                + (belowLimit == null ? "" : ", \"below_limit\": \"" + belowLimit + "\"") + "},"
                + " \"limits\": {\"trap_density_p95_cm3\": {\"max\": 1e12}, \"below_limit_area_fraction\": {\"max\": 0.9}}}",
                "rules.json");
    }

    @Test
    void belowLimitPixelsAreNeverFlaggedAndAreCountedOnTheirOwn() throws Exception {
        PixelResult worse = FE.convert((float) (0.9 * TAU_LIMIT_US));
        assertThat(worse.status()).isEqualTo(PixelStatus.OK);
        assertThat(FE.convert((float) (0.99 * TAU_LIMIT_US)).status()).isEqualTo(PixelStatus.BELOW_LIMIT);
        for (String mode : new String[] {null, "exclude"}) {
            WaferInspection.Evaluation e = new WaferInspection(rules(mode)).judge("bands.tif", wafer(), null);
            // one flagged region: the worse left part; the better parts are not flagged
            assertThat(e.regions().regions()).hasSize(1);
            assertThat(e.regions().regions().get(0).region().centroidXMm()).isLessThan(-17);
            double below = e.result().figures().get("below_limit_area_fraction");
            int left = 0;
            int all = 0;
            PixelGrid g = wafer().grid();
            for (int y = 0; y < N; y++) {
                for (int x = 0; x < N; x++) {
                    if (e.evaluated()[y * N + x]) {
                        all++;
                        left += g.xMm(x) < -17 ? 1 : 0;
                    }
                }
            }
            assertThat(below).isCloseTo(1 - (double) left / all, within(1e-12));
            // the percentile is of the measured (OK) densities only
            assertThat(e.result().figures().get("trap_density_p95_cm3"))
                    .isCloseTo((float) worse.trapDensityPerCm3(), within(1e-6 * worse.trapDensityPerCm3()));
            assertThat(e.result().status()).isEqualTo(WaferResult.Status.PASS);
        }
    }

    @Test
    void aRuleMayCountThemAtTheirBound() throws Exception {
        WaferInspection.Evaluation e = new WaferInspection(rules("at_bound")).judge("bands.tif", wafer(), null);
        double limit = FE.convert(TAU_LIMIT_US).trapDensityPerCm3();
        assertThat(limit).isGreaterThan(5e8);
        // at their bound (8.8e8 > 5e8) the whole wafer is one flagged region
        assertThat(e.regions().regions()).hasSize(1);
        assertThat(e.regions().totalAreaMm2()).isGreaterThan(0.99 * Math.PI * 50 * 50 * 0.98);
        assertThat(e.result().figures().get("below_limit_area_fraction")).isGreaterThan(0.5);
        assertThat(e.result().figures().get("trap_density_p95_cm3")).isGreaterThan(1e9);
    }

    @Test
    void theKeyIsValidated() {
        assertThatThrownBy(() -> rules("ignore")).isInstanceOf(RulesException.class)
                .hasMessageContaining("flag.below_limit").hasMessageContaining("exclude or at_bound");
    }
}
