package trapmap.maps.trend;

import java.util.ArrayList;
import java.util.List;
import java.util.Set;

/**
 * Applies the {@link RunRule}s to a series of standardised values z = (x − centre)/σ (NaN: a point not on the chart,
 * which breaks no window but is skipped). A rule fires at the point that completes its pattern, and only when that
 * point itself is part of the pattern (for "2 of 3 beyond 2σ" the last point is one of the two), so a signal marks a
 * point that shows it. A point exactly on the centre line is on neither side. Rules are from the Western Electric
 * <i>Statistical Quality Control Handbook</i> (1956) and Nelson, J. Qual. Technol. 16, 237 (1984).
 */
public final class RunRules {
    private RunRules() {
    }

    /** The signals of {@code rules} over {@code z}, ordered by point and then by rule. */
    public static List<Signal> evaluate(double[] z, Set<RunRule> rules) {
        int[] at = new int[z.length];
        int m = 0;
        for (int i = 0; i < z.length; i++) {
            if (!Double.isNaN(z[i])) {
                at[m++] = i;
            }
        }
        double[] v = new double[m];
        for (int k = 0; k < m; k++) {
            v[k] = z[at[k]];
        }
        List<Signal> out = new ArrayList<>();
        for (int k = 0; k < m; k++) {
            for (RunRule rule : RunRule.values()) {
                if (!rules.contains(rule)) {
                    continue;
                }
                Signal s = test(rule, v, k, at);
                if (s != null) {
                    out.add(s);
                }
            }
        }
        return out;
    }

    private static Signal test(RunRule rule, double[] v, int k, int[] at) {
        switch (rule) {
            case BEYOND_3_SIGMA:
                if (Math.abs(v[k]) > 3.0) {
                    return new Signal(rule, at[k], at[k], v[k] > 0);
                }
                return null;
            case TWO_OF_THREE_BEYOND_2_SIGMA:
                return countBeyond(rule, v, k, at, 3, 2, 2.0);
            case FOUR_OF_FIVE_BEYOND_1_SIGMA:
                return countBeyond(rule, v, k, at, 5, 4, 1.0);
            case EIGHT_ON_ONE_SIDE:
                if (k < 7) {
                    return null;
                }
                boolean above = true;
                boolean below = true;
                for (int j = k - 7; j <= k; j++) {
                    above &= v[j] > 0;
                    below &= v[j] < 0;
                }
                return above || below ? new Signal(rule, at[k], at[k - 7], above) : null;
            case SIX_TRENDING:
                if (k < 5) {
                    return null;
                }
                boolean rising = true;
                boolean falling = true;
                for (int j = k - 4; j <= k; j++) {
                    rising &= v[j] > v[j - 1];
                    falling &= v[j] < v[j - 1];
                }
                return rising || falling ? new Signal(rule, at[k], at[k - 5], rising) : null;
            default:
                throw new IllegalStateException(rule.name());
        }
    }

    /**
     * {@code needed} of the {@code window} points ending at k beyond {@code limit} on the side of point k (at the
     * start of a series the window holds the points there are).
     */
    private static Signal countBeyond(RunRule rule, double[] v, int k, int[] at, int window, int needed,
            double limit) {
        if (Math.abs(v[k]) <= limit) {
            return null;
        }
        boolean up = v[k] > 0;
        int first = Math.max(0, k - window + 1);
        int count = 0;
        for (int j = first; j <= k; j++) {
            if (up ? v[j] > limit : v[j] < -limit) {
                count++;
            }
        }
        return count >= needed ? new Signal(rule, at[k], at[first], up) : null;
    }
}
