package trapmap.maps.batch;

import java.util.BitSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import trapmap.maps.region.Region;

/**
 * The inspection of one wafer map.
 *
 * @param file        the map file as given
 * @param waferId     wafer identifier ("" when the file could not be read)
 * @param status      pass, fail or error
 * @param grade       a passing wafer: the first grade whose limits it meets ("" when none does); a failed wafer:
 *                    the profile's fail grade; "" on error
 * @param profile     name of the rules profile that judged the wafer ("" on error)
 * @param defectId    defect of its trap densities, or "" when none was computed
 * @param figures     every figure of the profile by name (NaN when it cannot be computed)
 * @param failed      names of the figures outside their limits
 * @param gradedDownBy a passing wafer: names of the figures that kept it from a better grade
 * @param regions     the flagged regions, in scan order
 * @param error       the one-line reason of an error result, "" otherwise
 * @param footprint   where the wafer was evaluated and flagged, for the recurrence map; null on error
 * @param worst       the flagged region that explains the verdict, with the rule it belongs to; null when there is
 *                    no flagged region
 */
public record WaferResult(String file, String waferId, Status status, String grade, String profile, String defectId,
                          Map<String, Double> figures, List<String> failed, List<String> gradedDownBy,
                          List<FlaggedRegions.FlaggedRegion> regions,
                          String error, Footprint footprint, Worst worst) {

    /**
     * The region behind a wafer's verdict.
     *
     * @param region the region
     * @param rule   the failed rule it explains ({@code largest_interior_region_mm2}, {@code largest_region_mm2} or
     *               {@code flagged_area_fraction}), or "" when it is simply the largest region (a passing wafer, or
     *               one failed only by figures no single region explains)
     */
    public record Worst(FlaggedRegions.FlaggedRegion region, String rule) {
        /**
         * The region behind the first failed limit (in the order of the profile's limits) that a region explains:
         * for {@code largest_interior_region_mm2} the largest interior region, for {@code largest_region_mm2} and
         * {@code flagged_area_fraction} the largest region (its largest part); otherwise the largest region, with
         * rule "". Null when there is no region.
         *
         * @param failedLimits    the failed limits' figures, in the profile's order
         * @param largest         the largest region, or null
         * @param largestInterior the largest interior region, or null when there is none (or no outline)
         */
        public static Worst behind(List<Figure> failedLimits, FlaggedRegions.FlaggedRegion largest,
                                   FlaggedRegions.FlaggedRegion largestInterior) {
            if (largest == null) {
                return null;
            }
            for (Figure f : failedLimits) {
                switch (f.kind()) {
                    case LARGEST_INTERIOR_REGION -> {
                        if (largestInterior != null) {
                            return new Worst(largestInterior, f.name());
                        }
                    }
                    case LARGEST_REGION, FLAGGED_AREA_FRACTION -> {
                        return new Worst(largest, f.name());
                    }
                    default -> {
                    }
                }
            }
            return new Worst(largest, "");
        }
    }

    /** A result whose worst region is its largest one (rule ""). */
    public WaferResult(String file, String waferId, Status status, String grade, String profile, String defectId,
                       Map<String, Double> figures, List<String> failed, List<String> gradedDownBy,
                       List<FlaggedRegions.FlaggedRegion> regions, String error, Footprint footprint) {
        this(file, waferId, status, grade, profile, defectId, figures, failed, gradedDownBy, regions, error,
                footprint, Worst.behind(List.of(), new FlaggedRegions(regions, new BitSet()).largest(), null));
    }

    /** Outcome of one wafer. */
    public enum Status {
        PASS, FAIL, ERROR;

        public String key() {
            return name().toLowerCase(Locale.ROOT);
        }
    }

    public WaferResult {
        figures = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(figures));
        failed = List.copyOf(failed);
        gradedDownBy = List.copyOf(gradedDownBy);
        regions = List.copyOf(regions);
        grade = grade == null ? "" : grade;
        profile = profile == null ? "" : profile;
        defectId = defectId == null ? "" : defectId;
        error = error == null ? "" : error;
    }

    /** An error result with its one-line reason. */
    public static WaferResult error(String file, String reason) {
        return new WaferResult(file, "", Status.ERROR, "", "", "", Map.of(), List.of(), List.of(), List.of(),
                oneLine(reason),
                null);
    }

    static String oneLine(String s) {
        return s == null ? "unknown error" : s.replaceAll("\\s*\\R\\s*", " ").trim();
    }

    /** The region behind the verdict ({@link #worst()}), or null when none. */
    public Region worstRegion() {
        return worst == null ? null : worst.region().region();
    }

    /** The rule the worst region belongs to ("" when it is simply the largest, or there is none). */
    public String worstRegionRule() {
        return worst == null ? "" : worst.rule();
    }

    /** The result without its footprint (what is kept once the recurrence map has taken it). */
    public WaferResult withoutFootprint() {
        return new WaferResult(file, waferId, status, grade, profile, defectId, figures, failed, gradedDownBy, regions,
                error, null, worst);
    }
}
