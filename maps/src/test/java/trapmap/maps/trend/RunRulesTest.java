package trapmap.maps.trend;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.EnumSet;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * The run rules on hand-made standardised series (z in σ units), each case worked out by hand from the rule's wording
 * in the Western Electric <i>Statistical Quality Control Handbook</i> (1956) and Nelson (J. Qual. Technol. 16, 237
 * (1984)).
 */
class RunRulesTest {
    private static List<Signal> only(RunRule rule, double... z) {
        return RunRules.evaluate(z, EnumSet.of(rule));
    }

    @Test
    void onePointBeyondThreeSigma() {
        List<Signal> s = only(RunRule.BEYOND_3_SIGMA, 0.5, 3.01, -2.99, -3.2, 3.0);
        assertThat(s).extracting(Signal::index).containsExactly(1, 3);
        assertThat(s).extracting(Signal::upward).containsExactly(true, false);
    }

    @Test
    void twoOfThreeBeyondTwoSigmaOnOneSide() {
        // 2.1 and 2.5 two apart: the second completes the pattern at index 2.
        assertThat(only(RunRule.TWO_OF_THREE_BEYOND_2_SIGMA, 2.1, 0.0, 2.5)).extracting(Signal::index)
                .containsExactly(2);
        // opposite sides: no signal
        assertThat(only(RunRule.TWO_OF_THREE_BEYOND_2_SIGMA, 2.1, 0.0, -2.5)).isEmpty();
        // three apart: outside the window
        assertThat(only(RunRule.TWO_OF_THREE_BEYOND_2_SIGMA, 2.1, 0.0, 0.0, 2.5)).isEmpty();
        // the completing point must itself be beyond: 2.1, 2.2 fire at 1; the following 0.3 does not
        List<Signal> s = only(RunRule.TWO_OF_THREE_BEYOND_2_SIGMA, 2.1, 2.2, 0.3);
        assertThat(s).extracting(Signal::index).containsExactly(1);
        assertThat(s.get(0).firstIndex()).isEqualTo(0);
        // exactly 2σ is not beyond
        assertThat(only(RunRule.TWO_OF_THREE_BEYOND_2_SIGMA, 2.0, 2.0, 2.0)).isEmpty();
    }

    @Test
    void fourOfFiveBeyondOneSigma() {
        assertThat(only(RunRule.FOUR_OF_FIVE_BEYOND_1_SIGMA, -1.5, -1.2, 0.0, -1.1, -1.9))
                .extracting(Signal::index, Signal::upward).containsExactly(org.assertj.core.groups.Tuple.tuple(4,
                        false));
        // only three of five
        assertThat(only(RunRule.FOUR_OF_FIVE_BEYOND_1_SIGMA, 1.5, 1.2, 0.0, -1.1, 1.9)).isEmpty();
    }

    @Test
    void eightInARowOnOneSide() {
        double[] seven = {0.1, 0.2, 0.3, 0.1, 0.5, 0.2, 0.4, -0.1};
        assertThat(only(RunRule.EIGHT_ON_ONE_SIDE, seven)).isEmpty();
        double[] nine = {-0.2, 0.1, 0.2, 0.3, 0.1, 0.5, 0.2, 0.4, 0.1, 0.6};
        List<Signal> s = only(RunRule.EIGHT_ON_ONE_SIDE, nine);
        assertThat(s).extracting(Signal::index).containsExactly(8, 9);
        assertThat(s.get(0).firstIndex()).isEqualTo(1);
        // a point on the centre line breaks the run
        assertThat(only(RunRule.EIGHT_ON_ONE_SIDE, 0.1, 0.2, 0.3, 0.0, 0.5, 0.2, 0.4, 0.1)).isEmpty();
    }

    @Test
    void sixInARowRisingOrFalling() {
        assertThat(only(RunRule.SIX_TRENDING, -1.0, -0.5, 0.0, 0.2, 0.3, 0.9)).extracting(Signal::index,
                Signal::upward).containsExactly(org.assertj.core.groups.Tuple.tuple(5, true));
        // five rising points are not enough; a tie breaks the run
        assertThat(only(RunRule.SIX_TRENDING, -1.0, -0.5, 0.0, 0.2, 0.3)).isEmpty();
        assertThat(only(RunRule.SIX_TRENDING, -1.0, -0.5, 0.0, 0.0, 0.3, 0.9)).isEmpty();
        assertThat(only(RunRule.SIX_TRENDING, 1.0, 0.5, 0.0, -0.2, -0.3, -0.9)).extracting(Signal::upward)
                .containsExactly(false);
    }

    @Test
    void pointsOffTheChartAreSkippedAndReportedByTheirOwnIndex() {
        List<Signal> s = only(RunRule.TWO_OF_THREE_BEYOND_2_SIGMA, 2.5, Double.NaN, 0.0, 2.5);
        assertThat(s).extracting(Signal::index, Signal::firstIndex)
                .containsExactly(org.assertj.core.groups.Tuple.tuple(3, 0));
    }
}
