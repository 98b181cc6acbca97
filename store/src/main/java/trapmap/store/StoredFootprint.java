package trapmap.store;

import java.time.Instant;
import java.util.Objects;
import trapmap.maps.batch.Footprint;

/**
 * One stored wafer's footprint (where it was evaluated and where flagged), as {@link ResultsStore#footprints} gives it.
 *
 * @param waferId   wafer id
 * @param lot       lot, or null
 * @param time      the measured time where the wafer has one ({@code measured}), else the time it was stored
 * @param measured  whether {@code time} is the measured time
 * @param file      the map file as given to the run
 * @param profile   the rules profile that judged it
 * @param group     the wafer's value of the grouping asked for ({@link ResultsStore#NO_GROUP} without one;
 *                  {@link ResultsStore#ALL} without a grouping)
 * @param footprint the footprint
 */
public record StoredFootprint(String waferId, String lot, Instant time, boolean measured, String file,
                              String profile, String group, Footprint footprint) {
    public StoredFootprint {
        Objects.requireNonNull(footprint, "footprint");
        Objects.requireNonNull(group, "group");
    }
}
