package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.shared.progress.ProgressListener;

/**
 * File names and wafer ids that a spreadsheet could take for formulas are written quoted into the batch's CSV tables,
 * raw into results.json, and come back raw when a batch is resumed.
 */
class BatchCsvCellsTest {
    private static final String HYPERLINK = "=HYPERLINK(\"x\")";
    private static final String DDE = "=cmd|' /C calc'!A0";

    @TempDir
    Path dir;

    private static List<CSVRecord> csv(Path file) throws Exception {
        try (Reader r = Files.newBufferedReader(file);
             CSVParser p = CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).build().parse(r)) {
            return new ArrayList<>(p.getRecords());
        }
    }

    @Test
    void formulaLikeNamesAndIdsAreQuotedInTheTablesRawInJsonAndRoundTripOnResume() throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        Path evil = SyntheticWafers.spot(in, HYPERLINK, 80, 20, -10, 5, 4);
        Files.writeString(in.resolve(HYPERLINK + ".json"), "{\"wafer_id\": \"=cmd|' /C calc'!A0\"}");
        Path minus = SyntheticWafers.clean(in, "-2+3", 80);
        Path plain = SyntheticWafers.clean(in, "w9", 80);
        Rules rules = Rules.parse("{\"flag\": {\"quantity\": \"lifetime\", \"threshold\": 10, \"min_area_mm2\": 1},"
                + " \"limits\": {\"flagged_area_fraction\": {\"max\": 0.001}}}", "rules.json");
        Path out = dir.resolve("out");
        // a run stopped after two wafers: its rows are in the partial table, which a resumed run reads back
        BatchInspectionTest.interruptedAfter(new BatchInspection(rules), List.of(evil, minus, plain), out, 2);

        List<CSVRecord> first = csv(out.resolve(BatchInspection.PARTIAL_NAME));
        // the file column holds the whole path: it starts with the folder, so it stays as it is
        assertThat(first.get(0).get("file")).isEqualTo(evil.toString()).startsWith("/");
        assertThat(first.get(0).get("wafer_id")).isEqualTo("'" + DDE);
        assertThat(first.get(1).get("wafer_id")).isEqualTo("'-2+3");
        List<CSVRecord> regions = csv(out.resolve(BatchInspection.REGIONS_NAME + ".partial"));
        assertThat(regions).extracting(r -> r.get("wafer_id")).containsExactly("'" + DDE);
        assertThat(regions.get(0).get("file")).isEqualTo(evil.toString());

        BatchInspection.Options resume = new BatchInspection.Options(1, true, false, ProgressListener.NONE);
        BatchInspection.Summary s = new BatchInspection(rules).run(List.of(evil, minus, plain), out, resume);
        assertThat(s.skipped()).isEqualTo(2);
        List<CSVRecord> after = csv(out.resolve(BatchInspection.CSV_NAME));
        assertThat(after).extracting(r -> r.get("wafer_id")).containsExactly("'" + DDE, "'-2+3", "w9");
        assertThat(after.get(0).get("file")).isEqualTo(evil.toString());
        assertThat(after.get(0).get("status")).isEqualTo("fail");
        assertThat(csv(out.resolve(BatchInspection.REGIONS_NAME))).extracting(r -> r.get("wafer_id"))
                .containsExactly("'" + DDE);

        JsonNode json = new ObjectMapper().readTree(out.resolve(BatchInspection.JSON_NAME).toFile());
        JsonNode wafers = json.get("wafers");
        assertThat(wafers.get(0).get("file").asText()).isEqualTo(evil.toString());
        assertThat(wafers.get(0).get("wafer_id").asText()).isEqualTo(DDE);
        assertThat(wafers.get(1).get("wafer_id").asText()).isEqualTo("-2+3");
        // the kept wafers count in the recurrence map again: their footprints were read back by their raw names
        assertThat(Files.readString(out.resolve(BatchInspection.RECURRENCE_NAME))).contains(",3,");
    }
}
