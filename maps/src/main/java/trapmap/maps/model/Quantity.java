package trapmap.maps.model;

import java.util.Locale;

/** What the samples of a map mean, with the unit they are stored in. */
public enum Quantity {
    EFFECTIVE_LIFETIME("effective-lifetime", "µs", true),
    PL_COUNTS("pl-counts", "counts", false),
    INJECTION("injection", "cm^-3", true),
    TRAP_DENSITY("trap-density", "cm^-3", true),
    TRAP_DENSITY_MIN("density-min", "cm^-3", true),
    TRAP_DENSITY_MAX("density-max", "cm^-3", true),
    OCCUPANCY("occupancy", "", false),
    SRH_LIFETIME("srh-lifetime", "µs", true),
    LIFETIME_AT_REFERENCE("lifetime-at-reference", "µs", true),
    /** 1-based index into the legend of a defect identification (best or runner-up defect); NaN: none. */
    DEFECT_INDEX("defect-index", "", false),
    /** χ² of a fit (dimensionless). */
    CHI_SQUARED("chi-squared", "", true),
    /** Outcome code of a defect identification (RankingStatus ordinal); NaN: no data. */
    IDENTIFICATION_STATUS("identification-status", "", false),
    /** 1-based region number of a region map; 0: in no region, NaN: no data. */
    REGION_LABEL("region", "", false),
    IRON_DENSITY("iron-density", "cm^-3", true),
    NORMALISED_DENSITY("normalised-density", "1/µs", false),
    STATUS("status", "", false),
    DIFFERENCE("difference", "", false),
    RATIO("ratio", "", true),
    RELATIVE_CHANGE("relative-change", "", false),
    FRACTION("fraction", "", false),
    /** P(N_t &gt; N*) of a pixel over the uncertainties, 0 to 1 ({@code trapmap.maps.process.ExceedanceMaps}). */
    EXCEEDANCE_PROBABILITY("exceedance-probability", "", false),
    /** A confidence quantile of the equivalent trap density (its level in the map's history), cm⁻³. */
    DENSITY_QUANTILE("density-quantile", "cm^-3", true),
    UNKNOWN("unknown", "", false);

    private final String key;
    private final String unit;
    private final boolean logarithmic;

    Quantity(String key, String unit, boolean logarithmic) {
        this.key = key;
        this.unit = unit;
        this.logarithmic = logarithmic;
    }

    /** Short name used in files and on the command line, e.g. {@code trap-density}. */
    public String key() {
        return key;
    }

    /** Unit of the stored samples ({@code ""} for dimensionless). */
    public String unit() {
        return unit;
    }

    /** True when the quantity spans decades, so that log scales and log bins suit it. */
    public boolean logarithmic() {
        return logarithmic;
    }

    /**
     * True for maps whose values are category codes rather than amounts (defect legend indices, identification and
     * pixel statuses, region numbers): a mean, median or spread of them means nothing, and a zoomed-out picture
     * shows each block's most common code rather than its mean, which would be another category or none. The one
     * place that says which quantities these are.
     */
    public boolean categorical() {
        return this == DEFECT_INDEX || this == IDENTIFICATION_STATUS || this == REGION_LABEL || this == STATUS;
    }

    /**
     * True for a share from 0 to 1 (a reduction 1 − after/before, a recurrence fraction, an exceedance probability): shown as a percentage on a
     * fixed 0–100 % scale ({@link #defaultRange()}) unless the user sets a range, so that maps of such shares compare
     * by colour.
     */
    public boolean isFraction() {
        return this == FRACTION || this == EXCEEDANCE_PROBABILITY;
    }

    /**
     * The display range a map of this quantity takes before the user sets one: {0, 1} for a fraction, null where the
     * range follows the data (its percentiles).
     */
    public double[] defaultRange() {
        return isFraction() ? new double[] {0, 1} : null;
    }

    /**
     * The quantity with this key (case-insensitive).
     *
     * @throws IllegalArgumentException listing the known keys
     */
    public static Quantity ofKey(String key) {
        String k = key.trim().toLowerCase(Locale.ROOT);
        for (Quantity q : values()) {
            if (q.key.equals(k)) {
                return q;
            }
        }
        StringBuilder known = new StringBuilder();
        for (Quantity q : values()) {
            known.append(known.length() == 0 ? "" : ", ").append(q.key);
        }
        throw new IllegalArgumentException("unknown quantity '" + key + "' (known: " + known + ")");
    }
}
