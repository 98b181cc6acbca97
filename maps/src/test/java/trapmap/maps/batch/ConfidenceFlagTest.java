package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.Map;
import org.junit.jupiter.api.Test;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.ExceedanceMaps;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.uncertainty.ConditionUncertainty;

/**
 * A trap-density flag with a confidence flags exactly the pixels whose probability of exceeding the threshold
 * ({@link ExceedanceMaps}, independently prepared here) is at least the confidence; the exceedance figure is their
 * share; the rules refuse confidences where they make no sense.
 */
class ConfidenceFlagTest {
    private static final int N = 61;
    private static final MeasurementConditions CONDITIONS = new MeasurementConditions(Doping.pType(1e16), 180.0,
            300.0, 1e14, null, 10.0, null, null, Map.of());

    /** A 60 mm round wafer whose lifetime rises from 50 µs (left) to 400 µs (right), Fe_i's uncertain band. */
    private static WaferMap wafer() {
        PixelGrid g = PixelGrid.centred(N, N, 1.0);
        float[] s = new float[N * N];
        for (int y = 0; y < N; y++) {
            for (int x = 0; x < N; x++) {
                double f = (double) x / (N - 1);
                s[y * N + x] = Math.hypot(g.xMm(x), g.yMm(y)) > 30 ? Float.NaN : (float) (50 * Math.pow(8, f));
            }
        }
        return new WaferMap(FloatRaster.wrap(N, N, s), g, Quantity.EFFECTIVE_LIFETIME, "ramp", CONDITIONS,
                Provenance.of("test"));
    }

    private static Rules rules(String flagExtra, String limits) throws RulesException {
        return Rules.parse("{\"defect\": \"fe-i\", \"edge_exclusion_mm\": 0, \"physics\": {\"uncertainty\":"
                + " {\"samples\": 4000, \"seed\": 3, \"srv_relative\": 0.3}},"
                + " \"flag\": {\"quantity\": \"trap-density\", \"threshold\": 1e11" + flagExtra + "}"
                + (limits == null ? "" : ", \"limits\": " + limits) + "}", "rules.json");
    }

    @Test
    void flagsThePixelsWhoseProbabilityReachesTheConfidence() throws Exception {
        Rules r = rules(", \"confidence\": 0.9", "{\"exceedance_area_fraction_c90\": {\"max\": 0.2},"
                + " \"exceedance_area_fraction_c50\": {\"max\": 1}}");
        assertThat(r.flag().confidence()).isEqualTo(0.9);
        assertThat(r.flag().uncertainty().samples()).isEqualTo(4000);
        WaferInspection.Evaluation e = new WaferInspection(r).judge("ramp.tif", wafer(), null);
        ExceedanceMaps reference = ExceedanceMaps.prepare(CONDITIONS, DefectLibrary.byId("fe-i"),
                ConversionSettings.DEFAULTS, new ConditionUncertainty(0.05, 0.02, 0.3, 0.1, 1, 0.03), 1e11, 4000, 3);
        float[] tau = wafer().raster().samples();
        int evaluated = 0;
        int expected = 0;
        int atHalf = 0;
        for (int i = 0; i < tau.length; i++) {
            boolean in = e.evaluated()[i];
            double p = reference.probabilityAt(tau[i]);
            boolean flag = in && p >= 0.9;
            assertThat(e.regions().pixels().get(i)).as("pixel %d, tau %s us, P %s", i, tau[i], p).isEqualTo(flag);
            evaluated += in ? 1 : 0;
            expected += flag ? 1 : 0;
            atHalf += in && p >= 0.5 ? 1 : 0;
        }
        assertThat(expected).as("some flagged, some not").isGreaterThan(20).isLessThan(evaluated - 20);
        assertThat(atHalf).isGreaterThan(expected);
        Map<String, Double> f = e.result().figures();
        assertThat(f.get("exceedance_area_fraction_c90")).isEqualTo((double) expected / evaluated);
        assertThat(f.get("exceedance_area_fraction_c50")).isEqualTo((double) atHalf / evaluated);
        assertThat(f.get("flagged_area_fraction")).isCloseTo((double) expected / evaluated,
                org.assertj.core.data.Offset.offset(1e-12));
        assertThat(e.result().failed()).containsExactly("exceedance_area_fraction_c90");
        assertThat(r.flag().describe()).isEqualTo("P(trap density above 1E11 cm^-3) at least 0.9");
    }

    @Test
    void withoutAConfidenceTheFlagIsTheNominalDensitysAsBefore() throws Exception {
        Rules r = rules("", null);
        assertThat(r.flag().confident()).isFalse();
        assertThat(r.flag().uncertainty().samples()).isEqualTo(4000);
        assertThat(r.flag()).isEqualTo(new Rules.Flag(Rules.FlagQuantity.TRAP_DENSITY, 1e11, 0,
                Rules.BelowLimit.EXCLUDE, 0, r.flag().uncertainty()));
    }

    @Test
    void refusesConfidencesThatMakeNoSense() {
        assertThatThrownBy(() -> rules(", \"confidence\": 1.5", null)).isInstanceOf(RulesException.class)
                .hasMessageContaining("field 'flag.confidence'").hasMessageContaining("probability");
        assertThatThrownBy(() -> rules(", \"confidence\": \"high\"", null))
                .hasMessageContaining("field 'flag.confidence': must be a number");
        assertThatThrownBy(() -> Rules.parse("{\"flag\": {\"quantity\": \"lifetime\", \"threshold\": 50,"
                + " \"confidence\": 0.9}}", "r.json")).hasMessageContaining("field 'flag.confidence': needs a"
                + " trap-density flag");
        assertThatThrownBy(() -> Rules.parse("{\"flag\": {\"quantity\": \"lifetime\", \"threshold\": 50},"
                + " \"defect\": \"fe-i\", \"limits\": {\"exceedance_area_fraction_c95\": {\"max\": 0.1}}}", "r.json"))
                .hasMessageContaining("field 'flag.quantity'").hasMessageContaining("needs a trap-density flag");
        assertThatThrownBy(() -> rules("", "{\"exceedance_area_fraction_c0\": {\"max\": 0.1}}"))
                .hasMessageContaining("confidence of exceedance_area_fraction_c0 must be in (0, 100]");
        assertThatThrownBy(() -> Rules.parse("{\"physics\": {\"uncertainty\": {\"samples\": 3}}, \"flag\":"
                + " {\"quantity\": \"lifetime\", \"threshold\": 50}}", "r.json"))
                .hasMessageContaining("r.json: field 'physics.uncertainty.samples'");
    }
}
