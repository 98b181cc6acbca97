package trapmap.maps.compare;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.concurrent.atomic.AtomicInteger;
import org.junit.jupiter.api.Test;

/** The downhill simplex (Commons Math's SimplexOptimizer) as the registration uses it. */
class SimplexSearchTest {

    /** A tilted, elongated bowl with its minimum −0.9 at (1.3, −2.1, 0.4). */
    private static double bowl(double[] u) {
        double a = u[0] - 1.3;
        double b = u[1] + 2.1;
        double c = u[2] - 0.4;
        return -0.9 + a * a + 3 * b * b + 0.5 * c * c + 0.4 * a * b;
    }

    @Test
    void findsTheMinimumOfABowlWithinTheTolerance() {
        SimplexSearch.Minimum m = SimplexSearch.minimise(SimplexSearchTest::bowl, new double[] {0, 0, 0},
                new double[] {1, 1, 1}, 1e-4, 2000);
        assertThat(m.point()[0]).isCloseTo(1.3, within(1e-3));
        assertThat(m.point()[1]).isCloseTo(-2.1, within(1e-3));
        assertThat(m.point()[2]).isCloseTo(0.4, within(1e-3));
        assertThat(m.value()).isCloseTo(-0.9, within(1e-6));
        assertThat(m.evaluations()).isLessThan(2000);
    }

    @Test
    void aLooserToleranceStopsSooner() {
        SimplexSearch.Minimum loose = SimplexSearch.minimise(SimplexSearchTest::bowl, new double[] {0, 0, 0},
                new double[] {1, 1, 1}, 0.05, 2000);
        SimplexSearch.Minimum tight = SimplexSearch.minimise(SimplexSearchTest::bowl, new double[] {0, 0, 0},
                new double[] {1, 1, 1}, 1e-4, 2000);
        assertThat(loose.evaluations()).isLessThan(tight.evaluations());
        assertThat(loose.point()[0]).isCloseTo(1.3, within(0.2));
        assertThat(loose.point()[1]).isCloseTo(-2.1, within(0.2));
    }

    @Test
    void notANumberCountsAsWorseThanAnything() {
        // the half-plane x > 1 is forbidden (NaN); the minimum on the allowed side lies on its edge
        SimplexSearch.Minimum m = SimplexSearch.minimise(u -> u[0] > 1 ? Double.NaN
                : (u[0] - 2) * (u[0] - 2) + u[1] * u[1], new double[] {0, 0.5}, new double[] {0.5, 0.5}, 1e-6, 2000);
        assertThat(m.point()[0]).isLessThanOrEqualTo(1).isCloseTo(1, within(1e-3));
        assertThat(m.point()[1]).isCloseTo(0, within(1e-3));
        assertThat(m.value()).isFinite();
    }

    @Test
    void whenTheEvaluationsRunOutTheBestPointEvaluatedIsReturned() {
        AtomicInteger calls = new AtomicInteger();
        double[] bestSeen = {Double.POSITIVE_INFINITY};
        SimplexSearch.Minimum m = SimplexSearch.minimise(u -> {
            calls.incrementAndGet();
            double v = bowl(u);
            bestSeen[0] = Math.min(bestSeen[0], v);
            return v;
        }, new double[] {0, 0, 0}, new double[] {1, 1, 1}, 1e-12, 30);
        assertThat(calls.get()).isLessThanOrEqualTo(30);
        assertThat(m.evaluations()).isEqualTo(30);
        assertThat(m.value()).isEqualTo(bestSeen[0]);
        assertThat(bowl(m.point())).isEqualTo(m.value());
    }

    @Test
    void aTwoParameterSearchKeepsToTwoParameters() {
        SimplexSearch.Minimum m = SimplexSearch.minimise(u -> (u[0] - 0.25) * (u[0] - 0.25)
                + (u[1] + 0.75) * (u[1] + 0.75), new double[] {1, 1}, new double[] {0.6, 0.6}, 0.02, 400);
        assertThat(m.point()).hasSize(2);
        assertThat(m.point()[0]).isCloseTo(0.25, within(0.04));
        assertThat(m.point()[1]).isCloseTo(-0.75, within(0.04));
    }
}
