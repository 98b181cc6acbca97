package trapmap.maps.stats;

import java.util.ArrayList;
import java.util.List;
import trapmap.shared.check.Checks;

/**
 * What {@link MapStatistics} should compute beyond the fixed moments: which percentiles and which thresholds for
 * area fractions.
 *
 * @param percents   percentiles to estimate, each in [0, 100] (the median is always computed)
 * @param thresholds values whose area fractions above and below are wanted, in the unit of the map
 */
public record StatisticsRequest(List<Double> percents, List<Double> thresholds) {

    /** P5, P10, P25, P75, P90, P95 and no thresholds. */
    public static final StatisticsRequest DEFAULT = new StatisticsRequest(List.of(5.0, 10.0, 25.0, 75.0, 90.0, 95.0),
            List.of());

    public StatisticsRequest {
        percents = List.copyOf(percents);
        thresholds = List.copyOf(thresholds);
        for (double p : percents) {
            Checks.inRange(p, 0, 100, "percentile", "%");
        }
        for (double t : thresholds) {
            Checks.finite(t, "threshold", "");
        }
    }

    /** The given percentiles and thresholds. */
    public static StatisticsRequest of(double[] percents, double... thresholds) {
        List<Double> p = new ArrayList<>();
        for (double v : percents) {
            p.add(v);
        }
        List<Double> t = new ArrayList<>();
        for (double v : thresholds) {
            t.add(v);
        }
        return new StatisticsRequest(p, t);
    }

    /** The default percentiles with these thresholds. */
    public static StatisticsRequest withThresholds(double... thresholds) {
        return of(new double[] {5, 10, 25, 75, 90, 95}, thresholds);
    }
}
