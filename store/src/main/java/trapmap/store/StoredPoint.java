package trapmap.store;

import java.time.Instant;
import java.util.List;

/**
 * One wafer's value of a figure, as {@link ResultsStore#points} gives it for a trend.
 *
 * @param time        the wafer's measured time when its sidecar gave {@code measured_at}, otherwise the time its
 *                    result was stored ({@code measured} tells which)
 * @param measured    whether {@code time} is the measured time
 * @param group       the wafer's group (see {@link ResultsStore#points}); {@value ResultsStore#NO_GROUP} when the
 *                    wafer has no value for the grouping
 * @param value       the figure's value in its unit (as in results.csv); NaN when the wafer has none (an error, or a
 *                    figure it cannot compute)
 * @param pass        whether the wafer passed
 * @param verdict     pass, fail or error
 * @param failedRules the figures outside their limits, in the profile's order
 * @param waferId     wafer id
 * @param lot         lot, or null
 * @param file        the map file as given to the run
 * @param profile     the rules profile that judged it
 * @param runId       the store run that wrote the wafer's result last ({@link ResultsStore#startRun}), or null
 */
public record StoredPoint(Instant time, boolean measured, String group, double value, boolean pass, String verdict,
                          List<String> failedRules, String waferId, String lot, String file, String profile,
                          String runId) {
    public StoredPoint {
        failedRules = List.copyOf(failedRules);
    }

    /** A point without its run. */
    public StoredPoint(Instant time, boolean measured, String group, double value, boolean pass, String verdict,
                       List<String> failedRules, String waferId, String lot, String file, String profile) {
        this(time, measured, group, value, pass, verdict, failedRules, waferId, lot, file, profile, null);
    }
}
