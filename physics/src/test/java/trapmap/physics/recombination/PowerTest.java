package trapmap.physics.recombination;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.SplittableRandom;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/** {@link IntrinsicLifetime.Power} against {@code Math.pow} over the whole range of doubles. */
class PowerTest {

    @ParameterizedTest
    @ValueSource(doubles = {0.92, 0.54, 0.5, 0.01, 0.99})
    void agreesWithMathPowToAFewUlp(double a) {
        IntrinsicLifetime.Power power = new IntrinsicLifetime.Power(a);
        SplittableRandom rnd = new SplittableRandom(3);
        double worst = 0;
        for (int k = 0; k < 200_000; k++) {
            // Log-uniform over the normal doubles, plus values on and next to the table nodes.
            double x = k % 4 == 0 ? Math.scalb(1 + (rnd.nextInt(512) / 512.0), rnd.nextInt(2046) - 1022)
                    : Math.pow(2, -1022 + 2045 * rnd.nextDouble());
            if (k % 8 == 1) {
                x = Math.nextUp(x);
            }
            double expected = Math.pow(x, a);
            worst = Math.max(worst, Math.abs(power.of(x) - expected) / expected);
        }
        assertThat(worst).isLessThan(1e-15);
    }

    @ParameterizedTest
    @ValueSource(doubles = {0.0, -0.0, -2.0, Double.MIN_VALUE, 1e-310, Double.POSITIVE_INFINITY,
        Double.NEGATIVE_INFINITY, Double.NaN, Double.MAX_VALUE, Double.MIN_NORMAL, 1.0})
    void specialArgumentsMatchMathPow(double x) {
        IntrinsicLifetime.Power power = new IntrinsicLifetime.Power(0.92);
        double expected = Math.pow(x, 0.92);
        if (Double.isNaN(expected) || expected == 0 || Double.isInfinite(expected)) {
            assertThat(Double.doubleToLongBits(power.of(x))).isEqualTo(Double.doubleToLongBits(expected));
        } else {
            assertThat(Math.abs(power.of(x) - expected) / expected).isLessThan(1e-15);
        }
    }

    @ParameterizedTest
    @ValueSource(doubles = {0, 1, 1.25, -0.5, Double.NaN})
    void rejectsExponentsOutsideTheUnitInterval(double a) {
        assertThatThrownBy(() -> new IntrinsicLifetime.Power(a)).isInstanceOf(IllegalArgumentException.class);
    }
}
