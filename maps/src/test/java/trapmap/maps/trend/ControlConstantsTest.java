package trapmap.maps.trend;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;
import trapmap.shared.error.InvalidValueException;

/**
 * The computed constants against closed forms and the published tables (check values R-SPC-1 to R-SPC-3). Table
 * values: ASTM E2587, "Standard Practice for Use of Control Charts in Statistical Process Control", table of factors,
 * identical to Montgomery, <i>Introduction to Statistical Quality Control</i>, Appendix Table VI (three decimals;
 * quoted from memory).
 */
class ControlConstantsTest {
    // n = 2 … 10
    private static final double[] D2 = {1.128, 1.693, 2.059, 2.326, 2.534, 2.704, 2.847, 2.970, 3.078};
    private static final double[] D3_SMALL = {0.853, 0.888, 0.880, 0.864, 0.848, 0.833, 0.820, 0.808, 0.797};
    private static final double[] BIG_D3 = {0, 0, 0, 0, 0, 0.076, 0.136, 0.184, 0.223};
    private static final double[] BIG_D4 = {3.267, 2.574, 2.282, 2.114, 2.004, 1.924, 1.864, 1.816, 1.777};
    private static final double[] A2 = {1.880, 1.023, 0.729, 0.577, 0.483, 0.419, 0.373, 0.337, 0.308};

    @Test
    void pairsAndTriplesMatchTheirClosedForms() {
        // Range of two standard normals: |X1 − X2| with X1 − X2 ~ N(0, 2): E = 2/√π, E[R²] = 2 (computed from
        // the half-normal distribution). Range of three: E = 3/√π (Tippett 1925).
        assertThat(ControlConstants.of(2).d2()).isCloseTo(2 / Math.sqrt(Math.PI), within(1e-6));
        assertThat(ControlConstants.of(2).d3()).isCloseTo(Math.sqrt(2 - 4 / Math.PI), within(1e-5));
        assertThat(ControlConstants.of(3).d2()).isCloseTo(3 / Math.sqrt(Math.PI), within(1e-6));
    }

    @Test
    void agreeWithTheTableOfFactors() {
        for (int n = 2; n <= 10; n++) {
            ControlConstants c = ControlConstants.of(n);
            int i = n - 2;
            assertThat(c.d2()).as("d2(%d)", n).isCloseTo(D2[i], within(6e-4));
            assertThat(c.d3()).as("d3(%d)", n).isCloseTo(D3_SMALL[i], within(6e-4));
            assertThat(c.bigD3()).as("D3(%d)", n).isCloseTo(BIG_D3[i], within(1.2e-3));
            assertThat(c.bigD4()).as("D4(%d)", n).isCloseTo(BIG_D4[i], within(1.2e-3));
            assertThat(c.a2()).as("A2(%d)", n).isCloseTo(A2[i], within(6e-4));
        }
        // n = 25, the last row of the table (from memory): d2 3.931, d3 0.708.
        assertThat(ControlConstants.of(25).d2()).isCloseTo(3.931, within(6e-4));
        assertThat(ControlConstants.of(25).d3()).isCloseTo(0.708, within(6e-4));
    }

    @Test
    void theMeanRangeGrowsWithTheSubgroup() {
        double previous = 0;
        for (int n = 2; n <= ControlConstants.MAX_N; n += 7) {
            double d2 = ControlConstants.of(n).d2();
            assertThat(d2).isGreaterThan(previous);
            previous = d2;
        }
    }

    @Test
    void sizesOutsideTheRangeAreRefused() {
        assertThatThrownBy(() -> ControlConstants.of(1)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("subgroup size");
        assertThatThrownBy(() -> ControlConstants.of(ControlConstants.MAX_N + 1))
                .isInstanceOf(InvalidValueException.class);
    }
}
