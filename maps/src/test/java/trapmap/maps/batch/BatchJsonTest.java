package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.IdentityHashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;

/**
 * results.json is written from the wafers' objects formatted one by one (by the workers, {@link
 * BatchInspection#waferJson}) and placed into the file as text: the file must be byte for byte the one the whole tree
 * ({@link BatchInspection#jsonTree}) gives written at once by the same writer.
 */
class BatchJsonTest {
    private static final String RULES = """
            {"edge_exclusion_mm": 2,
             "flag": {"quantity": "lifetime", "threshold": 10, "min_area_mm2": 1},
             "limits": {"p5_lifetime_us": {"min": 5}}}
            """;

    private static BatchInspection.Summary summary(int pass, int fail, int error) {
        return new BatchInspection.Summary(pass, fail, error, 1, Path.of("results.csv"), Path.of("results.json"),
                List.of());
    }

    private static Map<String, String> row(String file, String... cells) {
        Map<String, String> m = new LinkedHashMap<>();
        m.put("file", file);
        for (int i = 0; i + 1 < cells.length; i += 2) {
            m.put(cells[i], cells[i + 1]);
        }
        return m;
    }

    /** Rows with what the cells can hold: numbers, empty cells, booleans, texts to escape, a missing column. */
    private static List<Map<String, String>> rows() {
        List<Map<String, String>> rows = new ArrayList<>();
        rows.add(row("/maps/W01.tif", "wafer_id", "W01", "status", "pass", "grade", "A", "profile", "default",
                "defect", "fe-i", "p5_lifetime_us", "12.5", "worst_region_area_mm2", "1.0E-5",
                "worst_region_centroid_inside", "true", "worst_region_x_mm", "-3.25", "error", ""));
        rows.add(row("/maps/W \"02\"\\ünï.tif", "wafer_id", "line\nbreak\ttab", "status", "fail",
                "failed_rules", "p5_lifetime_us;flagged", "p5_lifetime_us", "4.9E-324",
                "worst_region_centroid_inside", "false", "worst_region_peak", "NaN", "error", ""));
        rows.add(row("/maps/W03.csv", "status", "error", "error", "could not be read: \u0001 control \u2028"));
        rows.add(row("C:\\maps\\W04.tif", "wafer_id", "{\"json\": [1, 2]}", "status", "pass",
                "p5_lifetime_us", "1.7976931348623157E308", "worst_region_y_mm", "0"));
        return rows;
    }

    @Test
    void piecewiseFileEqualsTheWholeTreeWritten() throws Exception {
        Rules rules = Rules.parse(RULES, "rules.json");
        List<String> columns = new ArrayList<>(BatchInspection.columns(rules));
        columns.add("extra_fe_cm3"); // a column no row has: null in every object
        List<Map<String, String>> rows = rows();
        // some rows formatted ahead (as by the workers), the others when the file is written (kept rows)
        Map<Map<String, String>, String> ahead = new IdentityHashMap<>();
        ahead.put(rows.get(0), BatchInspection.waferJson(rows.get(0), columns));
        ahead.put(rows.get(2), BatchInspection.waferJson(rows.get(2), columns));
        BatchInspection.Summary s = summary(2, 1, 1);
        byte[] reference = BatchInspection.jsonTreeBytes(s, rules, columns, rows);
        assertThat(new String(BatchInspection.jsonBytes(s, rules, columns, rows, ahead), StandardCharsets.UTF_8))
                .isEqualTo(new String(reference, StandardCharsets.UTF_8));
        assertThat(BatchInspection.jsonBytes(s, rules, columns, rows, new IdentityHashMap<>())).isEqualTo(reference);
        // the text really is nested: the wafers' members two levels in
        assertThat(new String(reference, StandardCharsets.UTF_8)).contains("\"wafers\" : [ {\n    \"file\" : ");
    }

    @Test
    void oneWaferAndNoWaferAlike() throws Exception {
        Rules rules = Rules.parse(RULES, "rules.json");
        List<String> columns = BatchInspection.columns(rules);
        List<Map<String, String>> one = rows().subList(1, 2);
        Map<Map<String, String>, String> ahead = new IdentityHashMap<>();
        ahead.put(one.get(0), BatchInspection.waferJson(one.get(0), columns));
        BatchInspection.Summary s = summary(0, 1, 0);
        assertThat(BatchInspection.jsonBytes(s, rules, columns, one, ahead))
                .isEqualTo(BatchInspection.jsonTreeBytes(s, rules, columns, one));
        BatchInspection.Summary none = summary(0, 0, 0);
        assertThat(BatchInspection.jsonBytes(none, rules, columns, List.of(), ahead))
                .isEqualTo(BatchInspection.jsonTreeBytes(none, rules, columns, List.of()));
    }
}
