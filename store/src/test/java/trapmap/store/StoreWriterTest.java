package trapmap.store;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.ResultSet;
import java.sql.Statement;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.LotPattern;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.RunManifest;

/**
 * A real batch over demonstration maps writing into a store: the store holds what the batch's tables hold, and the
 * tables are the same with and without the store.
 */
class StoreWriterTest {
    private static final Path DEMO = Path.of("..", "demo-data");
    private static final ObjectMapper JSON = new ObjectMapper();

    @TempDir
    Path dir;

    /** Three demonstration maps with a measured time and a furnace tube added to their sidecars' facts. */
    private List<Path> maps() throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        List<Path> files = new ArrayList<>();
        String[] names = {"LOT-A01-W01", "LOT-A01-W02", "LOT-N01-W01"};
        for (int i = 0; i < names.length; i++) {
            Path map = Files.copy(DEMO.resolve(names[i] + ".tif"), in.resolve(names[i] + ".tif"));
            ObjectNode side = (ObjectNode) JSON.readTree(DEMO.resolve(names[i] + ".json").toFile());
            ObjectNode conditions = (ObjectNode) side.get("conditions");
            conditions.put("measured_at", "2026-11-0" + (i + 1) + "T08:15:00Z");
            conditions.put("furnace_tube", i % 2 == 0 ? "T1" : "T2");
            JSON.writeValue(in.resolve(names[i] + ".json").toFile(), side);
            files.add(map);
        }
        return files;
    }

    private static List<CSVRecord> csv(Path f) throws Exception {
        try (CSVParser p = CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).build()
                .parse(Files.newBufferedReader(f))) {
            return p.getRecords();
        }
    }

    @Test
    void theBatchStoresEveryWaferAsItsTablesHoldItAndItsTablesDoNotChange() throws Exception {
        List<Path> files = maps();
        String text = Rules.readText(DEMO.resolve("rules-example.json"));
        Rules rules = Rules.parse(text, "rules-example.json");
        RunManifest.Source source = RunManifest.Source.of("test", DEMO.resolve("rules-example.json"), text);
        Path plain = dir.resolve("plain");
        new BatchInspection(rules).withSource(source).run(files, plain,
                new BatchInspection.Options(2, false, false, null));

        Path stored = dir.resolve("stored");
        try (ResultsStore store = ResultsStore.open(dir.resolve("r.db").toString())) {
            List<String> warnings = new ArrayList<>();
            String run = store.startRun(RunInfo.of(source, rules.physics(), Instant.now()));
            try (StoreWriter w = new StoreWriter(store, run, LotPattern.parse(text, "x").orElse(null),
                    warnings::add)) {
                new BatchInspection(rules).withSource(source).tellingWafers(w).run(files, stored,
                        new BatchInspection.Options(2, false, false, null));
                w.close();
                assertThat(w.stored()).isEqualTo(3);
            }
            assertThat(warnings).isEmpty();
            for (String table : List.of(BatchInspection.CSV_NAME, BatchInspection.REGIONS_NAME,
                    BatchInspection.FOOTPRINTS_NAME)) {
                assertThat(Files.readString(stored.resolve(table))).as(table)
                        .isEqualTo(Files.readString(plain.resolve(table)));
            }

            List<CSVRecord> rows = csv(stored.resolve(BatchInspection.CSV_NAME));
            assertThat(store.count("wafers")).isEqualTo(rows.size()).isEqualTo(3);
            assertThat(store.count("wafer_regions")).isEqualTo(csv(stored.resolve(BatchInspection.REGIONS_NAME)).size());
            assertThat(store.count("wafer_footprints"))
                    .isEqualTo(csv(stored.resolve(BatchInspection.FOOTPRINTS_NAME)).size());
            Map<String, String> verdicts = new TreeMap<>();
            try (Statement st = store.connection().createStatement();
                 ResultSet rs = st.executeQuery("SELECT wafer_id, verdict, lot FROM wafers")) {
                while (rs.next()) {
                    verdicts.put(rs.getString(1), rs.getString(2) + " " + rs.getString(3));
                }
            }
            Map<String, String> expected = new TreeMap<>();
            for (CSVRecord r : rows) {
                expected.put(r.get("wafer_id"), r.get("status") + " " + r.get("wafer_id").substring(0, 7));
            }
            assertThat(verdicts).isEqualTo(expected);

            String figure = rows.get(0).toMap().keySet().stream().filter(k -> k.endsWith("_cm3")).findFirst()
                    .orElseThrow();
            List<StoredPoint> points = store.points(figure, "furnace_tube", null, null);
            assertThat(points).extracting(StoredPoint::waferId)
                    .containsExactly("LOT-A01-W01", "LOT-A01-W02", "LOT-N01-W01");
            assertThat(points).extracting(StoredPoint::group).containsExactly("T1", "T2", "T1");
            for (StoredPoint p : points) {
                CSVRecord row = rows.stream().filter(r -> r.get("wafer_id").equals(p.waferId())).findFirst()
                        .orElseThrow();
                String cell = row.get(figure);
                if (cell.isEmpty()) {
                    assertThat(p.value()).isNaN();
                } else { // the table rounds for reading; the store keeps the double
                    assertThat(p.value()).isCloseTo(Double.parseDouble(cell),
                            org.assertj.core.api.Assertions.withinPercentage(0.1));
                }
                assertThat(p.pass()).isEqualTo(row.get("status").equals("pass"));
            }
        }
    }
}
