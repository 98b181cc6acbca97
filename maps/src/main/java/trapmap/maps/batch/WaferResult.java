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
 */
public record WaferResult(String file, String waferId, Status status, String grade, String profile, String defectId,
                          Map<String, Double> figures, List<String> failed, List<String> gradedDownBy,
                          List<FlaggedRegions.FlaggedRegion> regions,
                          String error, Footprint footprint) {

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

    /** The largest flagged region (the first in scan order among equals), or null when none. */
    public Region worstRegion() {
        FlaggedRegions.FlaggedRegion r = new FlaggedRegions(regions, new BitSet()).largest();
        return r == null ? null : r.region();
    }

    /** The result without its footprint (what is kept once the recurrence map has taken it). */
    public WaferResult withoutFootprint() {
        return new WaferResult(file, waferId, status, grade, profile, defectId, figures, failed, gradedDownBy, regions,
                error,
                null);
    }
}
