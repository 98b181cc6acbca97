package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.shared.progress.ProgressListener;

/** Iron figures of the demonstration FeB pair in a batch, and a pair missing its partner. */
class BatchIronPairsTest {
    private static final Path DEMO = Path.of("..", "demo-data");
    private static final Path FEB = DEMO.resolve("LOT-A03-W02-feb-state.tif");
    private static final Path FEI = DEMO.resolve("LOT-A03-W02-fe-i-state.tif");
    private static final String RULES = "{\"conditions\": {\"doping\": \"p:1.5ohmcm\", \"injection_cm3\": 1e13},"
            + " \"flag\": {\"quantity\": \"lifetime\", \"threshold\": 1}, \"fail_grade\": \"R\","
            + " \"iron\": {\"feb_state\": \"*-feb-state.*\", \"fei_state\": \"*-fe-i-state.*\","
            + " \"limits\": {\"iron_median_cm3\": {\"max\": %s}, \"iron_p95_cm3\": {\"max\": 5e11}}}}";

    @TempDir
    Path dir;

    private Map<String, CSVRecord> run(String medianMax, List<Path> files) throws Exception {
        String text = String.format(RULES, medianMax);
        BatchInspection b = new BatchInspection(Rules.parse(text, "r.json"))
                .withIron(IronPairRules.parse(text, "r.json").orElseThrow());
        b.run(files, dir, new BatchInspection.Options(1, false, false, ProgressListener.NONE, true));
        Map<String, CSVRecord> rows = new HashMap<>();
        try (Reader r = Files.newBufferedReader(dir.resolve(BatchInspection.CSV_NAME))) {
            for (CSVRecord rec : CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).get().parse(r)) {
                rows.put(Path.of(rec.get("file")).getFileName().toString(), rec);
            }
        }
        return rows;
    }

    @Test
    void pairGetsItsIronFiguresAndPassesItsLimits() throws Exception {
        Map<String, CSVRecord> rows = run("1e11", List.of(FEB, FEI));
        CSVRecord feb = rows.get("LOT-A03-W02-feb-state.tif");
        assertThat(feb.get("iron_status")).isEqualTo("pass");
        assertThat(feb.get("status")).isEqualTo("pass");
        assertThat(feb.get("iron_partner")).endsWith("LOT-A03-W02-fe-i-state.tif");
        double median = Double.parseDouble(feb.get("iron_median_cm3"));
        double p95 = Double.parseDouble(feb.get("iron_p95_cm3"));
        // background iron of the demo wafer a few 1e10 cm^-3 (truth.json), the spot and edge zone above 1e12
        assertThat(median).isBetween(2e10, 1e11);
        assertThat(p95).isGreaterThan(median).isLessThan(5e11);
        assertThat(Double.parseDouble(feb.get("iron_registration_score"))).isGreaterThan(0.9);
        CSVRecord fei = rows.get("LOT-A03-W02-fe-i-state.tif");
        assertThat(fei.get("iron_status")).isEqualTo("paired");
        assertThat(fei.get("iron_partner")).endsWith("LOT-A03-W02-feb-state.tif");
        JsonNode json = new ObjectMapper().readTree(dir.resolve(BatchInspection.JSON_NAME).toFile());
        assertThat(json.get("wafers").findValues("iron_median_cm3")).anyMatch(JsonNode::isNumber);
    }

    @Test
    void ironBeyondItsLimitFailsTheWafer() throws Exception {
        CSVRecord feb = run("1e10", List.of(FEB, FEI)).get("LOT-A03-W02-feb-state.tif");
        assertThat(feb.get("iron_status")).isEqualTo("fail");
        assertThat(feb.get("status")).isEqualTo("fail");
        assertThat(feb.get("grade")).isEqualTo("R");
        assertThat(feb.get("failed_rules")).contains("iron_median_cm3");
    }

    @Test
    void aStateWithoutItsPartnerIsReportedAndFails() throws Exception {
        CSVRecord feb = run("1e11", List.of(FEB)).get("LOT-A03-W02-feb-state.tif");
        assertThat(feb.get("iron_status")).isEqualTo("error");
        assertThat(feb.get("iron_note")).contains("no Fe_i-state partner LOT-A03-W02-fe-i-state.tif");
        assertThat(feb.get("status")).isEqualTo("fail");
        assertThat(feb.get("failed_rules")).contains("iron");
        CSVRecord fei = run("1e11", List.of(FEI)).get("LOT-A03-W02-fe-i-state.tif");
        assertThat(fei.get("iron_note")).contains("no FeB-state partner LOT-A03-W02-feb-state.tif");
    }
}
