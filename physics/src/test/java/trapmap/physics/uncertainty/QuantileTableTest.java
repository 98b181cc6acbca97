package trapmap.physics.uncertainty;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import org.junit.jupiter.api.Test;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.conversion.Surface;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

/**
 * The tabulated quantile gives exactly the values of the one-pass path of {@link ExceedanceModel}, inside its range,
 * on the cell edges and outside it, from a small share of the samples.
 */
class QuantileTableTest {
    private static final Conditions WAFER = Conditions.of(Doping.pType(1e16), new Injection.Fixed(1e14))
            .withSurface(Surface.sproul(180, 10));

    private static void assertSameAsOnePass(ExceedanceModel m, double q, double minUs, double maxUs) {
        QuantileTable table = m.quantileTable(q, minUs, maxUs);
        int n = 0;
        for (double tau = minUs / 2; tau < maxUs * 2; tau *= 1.0037) {
            float t = (float) tau;
            assertThat(table.quantile(t)).as("q %s, tau %s us", q, t).isEqualTo(m.quantile(t, q));
            n++;
        }
        for (float t : new float[] {(float) minUs, (float) maxUs, Float.NaN, 0.0001f}) {
            assertThat(Double.compare(table.quantile(t), m.quantile(t, q))).as("q %s, tau %s us", q, t).isZero();
        }
        assertThat(n).isGreaterThan(1000);
        assertThat(table.meanCandidates()).as("candidates per cell, q %s", q).isLessThan(m.samples() / 10.0);
    }

    @Test
    void equalsTheOnePassQuantileForFeWithDefaultUncertainties() {
        ExceedanceModel m = ExceedanceModel.prepare(WAFER, DefectLibrary.byId("fe-i"), PhysicsSettings.DEFAULTS,
                ConditionUncertainty.DEFAULTS, 1e11, 10_000, 5);
        for (double q : new double[] {0.05, 0.5, 0.95}) {
            assertSameAsOnePass(m, q, 5, 3000);
        }
    }

    @Test
    void equalsTheOnePassQuantileForAWideSpreadAndFewSamples() {
        ExceedanceModel m = ExceedanceModel.prepare(WAFER.withSurface(Surface.sproul(180, 1000)),
                DefectLibrary.byId("cr-b"), PhysicsSettings.DEFAULTS,
                ConditionUncertainty.DEFAULTS.withLifetimeRelative(0.3), 1e12, 257, 9);
        for (double q : new double[] {0.01, 0.3, 0.99}) {
            QuantileTable table = m.quantileTable(q, 0.5, 400);
            float[] row = new float[600];
            for (int i = 0; i < row.length; i++) {
                row[i] = (float) (0.3 * Math.pow(1.013, i));
            }
            float[] fast = new float[row.length];
            float[] onePass = new float[row.length];
            table.quantiles(row, fast);
            m.quantiles(row, q, onePass);
            assertThat(fast).containsExactly(onePass);
        }
    }

    @Test
    void aBadRangeIsRefused() {
        ExceedanceModel m = ExceedanceModel.prepare(WAFER, DefectLibrary.byId("fe-i"), PhysicsSettings.DEFAULTS,
                ConditionUncertainty.DEFAULTS, 1e11, 100, 5);
        assertThatThrownBy(() -> m.quantileTable(0.5, 100, 10)).hasMessageContaining("maximum lifetime");
        assertThatThrownBy(() -> m.quantileTable(0.5, 0, 10)).hasMessageContaining("minimum lifetime");
        assertThatThrownBy(() -> m.quantileTable(1.5, 1, 10)).hasMessageContaining("(0, 1)");
    }
}
