package trapmap.maps.trend;

import java.time.Instant;
import java.util.List;
import java.util.Objects;

/**
 * One judged wafer as a point of a trend.
 *
 * @param time        when the wafer was measured (UTC); {@code null} when unknown: such a point counts for the yield
 *                    and the Pareto but is left out of the charts (a time is never invented)
 * @param group       the subgroup it belongs to (a lot, a day, a week or an attribute's value); never null
 * @param value       the figure plotted, in the figure's own unit; NaN when the wafer has none (left out of the charts)
 * @param pass        whether the wafer passed its rules
 * @param failedRules the names of the rules it failed (empty when it passed)
 */
public record TrendPoint(Instant time, String group, double value, boolean pass, List<String> failedRules) {
    public TrendPoint {
        Objects.requireNonNull(group, "group");
        failedRules = failedRules == null ? List.of() : List.copyOf(failedRules);
    }

    /** Whether the point can be charted: it has a time and a finite value. */
    public boolean charted() {
        return time != null && Double.isFinite(value);
    }
}
