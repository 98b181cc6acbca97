package trapmap.viewer.report;

import java.nio.file.Path;
import java.time.ZonedDateTime;
import java.util.ArrayList;
import java.util.Collections;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import trapmap.maps.batch.HotSpots;
import trapmap.maps.batch.IronPairs;
import trapmap.maps.batch.Recurrence;
import trapmap.maps.batch.Rules;
import trapmap.store.BatchTrend;

/**
 * What the batch summary shows, read from a batch's output folder ({@link BatchFolder}).
 *
 * @param outputDir  the batch's output folder (thumbnails are looked up in it)
 * @param rules      the rules of the batch (profiles with their limits and flags), null when unknown
 * @param rows       the results, in the results' order
 * @param recurrence family → recurrence (share of wafers flagged and wafers evaluated per cell)
 * @param created    the date printed
 * @param hotSpots   when a recurrence cell is a hot spot
 * @param recurrenceLeftOut why wafers were left out of the recurrence maps ({@code RecurrenceMap.refused()}), one
 *                   line each
 * @param trend      the trend of the rules' {@code trend} block over the batch's results store, after its wafers;
 *                   null when the batch stored nothing or the rules have no such block (then no trend page)
 */
public record BatchContent(Path outputDir, Rules rules, List<Row> rows, Map<String, Recurrence> recurrence,
                           ZonedDateTime created, HotSpots.Criteria hotSpots, List<String> recurrenceLeftOut,
                           BatchTrend trend) {

    /** Content without a trend page. */
    public BatchContent(Path outputDir, Rules rules, List<Row> rows, Map<String, Recurrence> recurrence,
                        ZonedDateTime created, HotSpots.Criteria hotSpots, List<String> recurrenceLeftOut) {
        this(outputDir, rules, rows, recurrence, created, hotSpots, recurrenceLeftOut, null);
    }

    /** The same content with the trend page of {@code t} (null: none). */
    public BatchContent withTrend(BatchTrend t) {
        return new BatchContent(outputDir, rules, rows, recurrence, created, hotSpots, recurrenceLeftOut, t);
    }

    /** Content with no wafer left out of the recurrence maps. */
    public BatchContent(Path outputDir, Rules rules, List<Row> rows, Map<String, Recurrence> recurrence,
                        ZonedDateTime created, HotSpots.Criteria hotSpots) {
        this(outputDir, rules, rows, recurrence, created, hotSpots, List.of());
    }

    /**
     * One row of {@code results.csv}.
     *
     * @param file          the map file as given to the batch
     * @param waferId       wafer id ("" when it could not be read)
     * @param status        pass, fail or error
     * @param grade         grade ("" for none)
     * @param profile       the rules profile that judged the wafer ("" on error)
     * @param defect        the defect of its trap densities ("" when none were computed)
     * @param figures       figure name → value (NaN when empty), in the results' column order
     * @param failed        figures outside their limits
     * @param worstAreaMm2  area of the largest flagged region, mm² (NaN: none)
     * @param worstXMm      its centroid x in wafer coordinates, mm
     * @param worstYMm      its centroid y, mm
     * @param worstPeak     its peak value in the unit of the profile's flag
     * @param error         the reason of an error row
     * @param iron          the row's iron columns ({@code iron_…} of {@code results.csv}, text as written; empty
     *                      when the batch mapped no iron), by column name
     */
    public record Row(String file, String waferId, String status, String grade, String profile, String defect,
                      Map<String, Double> figures, List<String> failed, double worstAreaMm2, double worstXMm,
                      double worstYMm, double worstPeak, String error, Map<String, String> iron) {
        public Row {
            figures = Collections.unmodifiableMap(new LinkedHashMap<>(figures));
            failed = List.copyOf(failed);
            iron = iron == null ? Map.of() : Collections.unmodifiableMap(new LinkedHashMap<>(iron));
        }

        /** A row without iron columns. */
        public Row(String file, String waferId, String status, String grade, String profile, String defect,
                   Map<String, Double> figures, List<String> failed, double worstAreaMm2, double worstXMm,
                   double worstYMm, double worstPeak, String error) {
            this(file, waferId, status, grade, profile, defect, figures, failed, worstAreaMm2, worstXMm, worstYMm,
                    worstPeak, error, Map.of());
        }

        /** Whether the row carries an iron pair's figures (its FeB-state map's row: status pass, fail or error). */
        public boolean ironPair() {
            String st = iron.getOrDefault(IronPairs.STATUS, "");
            return st.equals("pass") || st.equals("fail") || st.equals("error");
        }

        /** The wafer id, or the file name when there is none. */
        public String name() {
            return waferId.isEmpty() ? Path.of(file).getFileName().toString() : waferId;
        }

        /** The value of a figure, NaN when the row has none. */
        public double figure(String name) {
            return figures.getOrDefault(name, Double.NaN);
        }

        public boolean inspected() {
            return !status.equals("error");
        }
    }

    public BatchContent {
        rows = List.copyOf(rows);
        recurrence = Collections.unmodifiableMap(new TreeMap<>(recurrence));
        created = created == null ? ZonedDateTime.now() : created;
        hotSpots = hotSpots == null ? HotSpots.Criteria.DEFAULT : hotSpots;
        recurrenceLeftOut = recurrenceLeftOut == null ? List.of() : List.copyOf(recurrenceLeftOut);
    }

    long count(String status) {
        return rows.stream().filter(r -> r.status().equals(status)).count();
    }

    /**
     * The inspected wafers grouped by the profile that judged them: profiles in the rules' order (default first),
     * then any other name the results carry; profiles that judged no wafer are left out.
     */
    Map<String, List<Row>> byProfile() {
        Map<String, List<Row>> out = new LinkedHashMap<>();
        if (rules != null) {
            rules.allProfiles().forEach(p -> out.put(p.name(), new ArrayList<>()));
        }
        for (Row r : rows) {
            if (r.inspected()) {
                out.computeIfAbsent(r.profile(), k -> new ArrayList<>()).add(r);
            }
        }
        out.values().removeIf(List::isEmpty);
        return out;
    }

    /** The profile of that name in the rules, or null (no rules, or a name they do not hold). */
    Rules.Profile profile(String name) {
        return profile(rules, name);
    }

    /** The profile of that name in {@code rules}, or null (no rules, or a name they do not hold). */
    static Rules.Profile profile(Rules rules, String name) {
        if (rules == null) {
            return null;
        }
        return rules.allProfiles().stream().filter(p -> p.name().equals(name)).findFirst().orElse(null);
    }

    /** The failed wafers, worst first: most failed rules, then the largest flagged area fraction. */
    List<Row> failedWorstFirst() {
        return rows.stream().filter(r -> r.status().equals("fail")).sorted(WORST_FIRST).toList();
    }

    /** Most failed rules first, then the largest flagged area fraction (none: last); a stable sort keeps ties. */
    static final Comparator<Row> WORST_FIRST = Comparator.<Row>comparingInt(r -> r.failed().size()).reversed()
            .thenComparing(Comparator.<Row>comparingDouble(r -> {
                double f = r.figure("flagged_area_fraction");
                return Double.isNaN(f) ? -1 : f;
            }).reversed());
}
