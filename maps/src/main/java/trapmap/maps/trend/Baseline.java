package trapmap.maps.trend;

import java.time.Instant;
import java.util.Objects;
import trapmap.shared.check.Checks;

/**
 * The period the centre line and limits are computed from (Montgomery, §6.2: limits from a phase-I period, then
 * applied to later data): either the first {@code count} charted wafers in time order, or every wafer measured before
 * {@code until}. The period is one for all charts: a subgroup belongs to it when all its wafers do, so no limit is
 * computed from a wafer after it.
 */
public record Baseline(int count, Instant until) {
    /** Montgomery's rule of thumb for phase I: 20 to 25 subgroups; 20 is the default here. */
    public static final int DEFAULT_COUNT = 20;

    public Baseline {
        if (until == null) {
            Checks.inRange(count, 2, Integer.MAX_VALUE, "baseline", "points");
        }
    }

    /** The first {@code count} charted wafers. */
    public static Baseline first(int count) {
        return new Baseline(count, null);
    }

    /** The wafers measured before {@code until}. */
    public static Baseline before(Instant until) {
        return new Baseline(0, Objects.requireNonNull(until, "until"));
    }

    boolean contains(int index, Instant time) {
        return until == null ? index < count : time.isBefore(until);
    }

    /** The baseline in words, for a chart's caption. */
    public String describe() {
        return until == null ? "first " + count + " wafers" : "wafers measured before " + until;
    }
}
