package trapmap.maps.batch;

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
 * @param grade       the first grade whose limits the wafer meets; "" when none does or on error
 * @param figures     every figure of the rules by name (NaN when it cannot be computed)
 * @param failed      names of the figures outside their limits
 * @param worstRegion the largest flagged region, or null when none
 * @param error       the one-line reason of an error result, "" otherwise
 * @param footprint   where the wafer was evaluated and flagged, for the recurrence map; null on error
 */
public record WaferResult(String file, String waferId, Status status, String grade, Map<String, Double> figures,
                          List<String> failed, Region worstRegion, String error, Footprint footprint) {

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
        grade = grade == null ? "" : grade;
        error = error == null ? "" : error;
    }

    /** An error result with its one-line reason. */
    public static WaferResult error(String file, String reason) {
        return new WaferResult(file, "", Status.ERROR, "", Map.of(), List.of(), null, oneLine(reason), null);
    }

    static String oneLine(String s) {
        return s == null ? "unknown error" : s.replaceAll("\\s*\\R\\s*", " ").trim();
    }

    /** The result without its footprint (what is kept once the recurrence map has taken it). */
    public WaferResult withoutFootprint() {
        return new WaferResult(file, waferId, status, grade, figures, failed, worstRegion, error, null);
    }
}
