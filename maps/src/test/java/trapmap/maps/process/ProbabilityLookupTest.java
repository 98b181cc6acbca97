package trapmap.maps.process;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.Random;
import org.junit.jupiter.api.Test;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.uncertainty.ConditionUncertainty;
import trapmap.physics.uncertainty.ExceedanceModel;

/** The bucket table gives the model's probability for every float lifetime, at the thresholds themselves too. */
class ProbabilityLookupTest {
    private static void sameAsTheModel(ExceedanceModel m) {
        ProbabilityLookup lookup = new ProbabilityLookup(m.thresholdLifetimesUs());
        Random r = new Random(4);
        for (int i = 0; i < 200_000; i++) {
            float tau = (float) Math.pow(10, -4 + 9 * r.nextDouble());
            assertThat(Double.valueOf(lookup.probability(tau))).as("tau %s", tau)
                    .isEqualTo(Double.valueOf(m.probability(tau)));
            assertThat(Float.valueOf(lookup.probabilityAsFloat(tau))).isEqualTo(Float.valueOf((float) m.probability(tau)));
        }
        for (double t : m.thresholdLifetimesUs()) {
            float f = (float) t;
            for (float g : new float[] {Math.nextDown(f), f, Math.nextUp(f)}) {
                assertThat(Double.valueOf(lookup.probability(g))).as("tau %s", g)
                        .isEqualTo(Double.valueOf(m.probability(g)));
                assertThat(Float.valueOf(lookup.probabilityAsFloat(g))).isEqualTo(Float.valueOf((float) m.probability(g)));
            }
        }
        for (float g : new float[] {Float.NaN, -1, 0, 1e-4f, 1e-3f, Float.MAX_VALUE, Float.POSITIVE_INFINITY,
                Float.MIN_VALUE}) {
            assertThat(Double.valueOf(lookup.probability(g))).as("tau %s", g)
                    .isEqualTo(Double.valueOf(m.probability(g)));
            assertThat(Float.valueOf(lookup.probabilityAsFloat(g))).isEqualTo(Float.valueOf((float) m.probability(g)));
        }
    }

    @Test
    void equalsTheModelsBinarySearch() {
        Conditions c = MapConversion.physicsConditions(new trapmap.maps.model.MeasurementConditions(
                trapmap.physics.material.Doping.pType(1e16), 180.0, 300.0, 1e14, null, 10.0, null, null,
                java.util.Map.of()), ConversionSettings.DEFAULTS);
        sameAsTheModel(ExceedanceModel.prepare(c, DefectLibrary.byId("fe-i"), PhysicsSettings.DEFAULTS,
                ConditionUncertainty.DEFAULTS, 1e11, 10_000, 1));
        // few samples, wide spread: buckets of one bit pattern each do not occur, wide buckets do
        sameAsTheModel(ExceedanceModel.prepare(c, DefectLibrary.byId("fe-i"), PhysicsSettings.DEFAULTS,
                new ConditionUncertainty(0.5, 0.5, 2, 1, 10, 1), 1e11, 16, 2));
        // no uncertainty at all: every threshold lifetime is the same
        sameAsTheModel(ExceedanceModel.prepare(c, DefectLibrary.byId("cr-i"), PhysicsSettings.DEFAULTS,
                ConditionUncertainty.NONE, 1e11, 64, 3));
    }
}
