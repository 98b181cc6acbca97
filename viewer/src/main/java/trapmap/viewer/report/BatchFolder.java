package trapmap.viewer.report;

import java.io.IOException;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.ZonedDateTime;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.io.CsvCells;
import trapmap.maps.batch.HotSpots;
import trapmap.maps.batch.IronPairs;
import trapmap.maps.batch.RecurrenceMap;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.RunManifest;

/**
 * Reads a finished batch's output folder into a {@link BatchContent}: the rows of {@code results.csv} (so that rows
 * kept from a resumed run are included) and the recurrence per wafer family from {@code footprints.csv} (the same
 * footprints the batch's recurrence maps were made of, with the wafers evaluated at each cell).
 */
final class BatchFolder {
    private static final List<String> IDENTIFYING = List.of("grade", "profile", "defect");

    private BatchFolder() {
    }

    /**
     * @throws IOException when the folder's run record ({@link RunManifest}) is missing, says the run is unfinished,
     *                     or names other physics settings than {@code rules}'
     */
    static BatchContent read(Path outputDir, Rules rules) throws IOException {
        return read(outputDir, rules, null);
    }

    /** As {@link #read(Path, Rules)}, with the batch's recurrence in memory (null: read from footprints.csv). */
    static BatchContent read(Path outputDir, Rules rules, RecurrenceMap built) throws IOException {
        RunManifest.requireResults(outputDir, rules.physics());
        Path csv = outputDir.resolve(BatchInspection.CSV_NAME);
        List<BatchContent.Row> rows = new ArrayList<>();
        try (Reader r = Files.newBufferedReader(csv, StandardCharsets.UTF_8);
             CSVParser p = CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).build().parse(r)) {
            List<String> header = p.getHeaderNames();
            // figure columns: between the last identifying column (grade, profile, defect) and failed_rules
            int from = IDENTIFYING.stream().mapToInt(header::indexOf).max().orElse(-1) + 1;
            int to = header.indexOf("failed_rules");
            if (from <= 0 || to < from) {
                throw new IOException(csv + ": not a results table (columns grade … failed_rules missing)");
            }
            List<String> figureColumns = List.copyOf(header.subList(from, to));
            for (CSVRecord rec : p) {
                if (!rec.isConsistent()) {
                    continue;
                }
                Map<String, String> cells = new HashMap<>();
                rec.toMap().forEach((k, v) -> cells.put(k, CsvCells.raw(v)));
                rows.add(row(cells, figureColumns));
            }
        }
        RecurrenceMap recurrence = built != null ? built
                : RecurrenceMap.read(outputDir.resolve(BatchInspection.FOOTPRINTS_NAME));
        return new BatchContent(outputDir, rules, rows, recurrence.families(), ZonedDateTime.now(),
                HotSpots.Criteria.DEFAULT, recurrence.refused());
    }

    /** The figure columns of a results table under {@code rules}: one per figure of the rules, in their order. */
    static List<String> figureColumns(Rules rules) {
        return rules.figures().stream().map(trapmap.maps.batch.Figure::name).toList();
    }

    /**
     * A row of the results table from its cells as the batch made them (before {@link CsvCells#text}; a missing or
     * null cell is empty): text as it is, numbers parsed (empty: NaN), {@code figureColumns} the figures.
     */
    static BatchContent.Row row(Map<String, String> cells, List<String> figureColumns) {
        Map<String, Double> figures = new LinkedHashMap<>();
        for (String f : figureColumns) {
            figures.put(f, number(text(cells, f)));
        }
        String failed = text(cells, "failed_rules");
        return new BatchContent.Row(text(cells, "file"), text(cells, "wafer_id"), text(cells, "status"),
                text(cells, "grade"), text(cells, "profile"), text(cells, "defect"), figures,
                failed.isEmpty() ? List.of() : List.of(failed.split(";")), number(text(cells, "worst_region_area_mm2")),
                number(text(cells, "worst_region_x_mm")), number(text(cells, "worst_region_y_mm")),
                number(text(cells, "worst_region_peak")), text(cells, "error"), iron(cells));
    }

    /**
     * The iron columns of a row ({@code iron_…}, as {@code IronPairs} names them), text as the batch made it; empty
     * cells left out.
     */
    static Map<String, String> iron(Map<String, String> cells) {
        Map<String, String> out = new java.util.TreeMap<>();
        cells.forEach((k, v) -> {
            if (k != null && k.startsWith("iron_") && v != null && !v.isEmpty()) {
                out.put(k, v);
            }
        });
        return out;
    }

    private static String text(Map<String, String> cells, String column) {
        String v = cells.get(column);
        return v == null ? "" : v;
    }

    private static double number(String s) {
        if (s == null || s.isEmpty()) {
            return Double.NaN;
        }
        try {
            return Double.parseDouble(s);
        } catch (NumberFormatException e) {
            return Double.NaN;
        }
    }
}
