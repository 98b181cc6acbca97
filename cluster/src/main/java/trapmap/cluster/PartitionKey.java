package trapmap.cluster;

import java.util.Locale;

/** The column the Parquet tables are partitioned by (one folder per value, e.g. {@code day=2026-10-05}). */
public enum PartitionKey {
    /** The UTC date of the sidecar's {@code measured_at} ({@code yyyy-MM-dd}); null (Spark's default partition) without one. */
    DAY,
    /** The sidecar's {@code lot}, else the first group of the rules' {@code lot_pattern} in the wafer id; else null. */
    LOT;

    /** The column name. */
    public String column() {
        return name().toLowerCase(Locale.ROOT);
    }
}
