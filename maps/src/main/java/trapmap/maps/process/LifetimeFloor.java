package trapmap.maps.process;

import trapmap.physics.conversion.TrapDensityConverter;

/**
 * Counts the pixels of an effective-lifetime map (µs) below the physical floor of
 * {@link TrapDensityConverter#LIFETIME_FLOOR_US} (1 ns), and those of them that read as seconds would be ordinary
 * lifetimes, over any number of bands; {@link #note()} is {@link MapConversion#lifetimeFloorNote}'s text.
 */
final class LifetimeFloor {
    private long below;
    private long likeSeconds;

    /** Counts {@code s[from, to)}. */
    void add(float[] s, int from, int to) {
        for (int i = from; i < to; i++) {
            float v = s[i];
            if (v > 0 && v < TrapDensityConverter.LIFETIME_FLOOR_US) {
                below++;
                double asSeconds = v * 1e6;
                if (asSeconds >= TrapDensityConverter.LIFETIME_FLOOR_US && asSeconds <= 1e5) {
                    likeSeconds++;
                }
            }
        }
    }

    /** Adds the counts of {@code other}. */
    void add(LifetimeFloor other) {
        below += other.below;
        likeSeconds += other.likeSeconds;
    }

    /** The one-line warning, naming the likely unit mistake when most look like seconds; empty when none is below. */
    String note() {
        return note(below, likeSeconds);
    }

    /** {@link #note()} of the counts {@code below} and {@code likeSeconds}. */
    static String note(long below, long likeSeconds) {
        if (below == 0) {
            return "";
        }
        String note = below + " pixel(s) with a lifetime below 1 ns (0.001 µs) are invalid";
        if (likeSeconds * 2 > below) {
            note += "; their values look like lifetimes in seconds read as µs: give the map's unit (\"unit\": \"s\" in"
                    + " the sidecar, or # unit=s in a CSV file)";
        }
        return note;
    }
}
