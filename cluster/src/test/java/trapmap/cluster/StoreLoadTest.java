package trapmap.cluster;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.ResultSet;
import java.sql.ResultSetMetaData;
import java.sql.Statement;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import java.util.stream.Stream;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.SparkSession;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.LotPattern;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.RunManifest;
import trapmap.maps.demo.HistoryScenario;
import trapmap.shared.progress.ProgressListener;
import trapmap.store.ResultsStore;
import trapmap.store.RunInfo;
import trapmap.store.StoreWriter;

/**
 * The archive job's tables loaded into a results store ({@link StoreLoad}) hold what {@code inspect --store} stores
 * for the same maps and rules: every table of the two SQLite stores is equal row for row (result keys, lots, measured
 * times, verdicts, grades, figures, failed rules, facts, regions, footprints and their cells), apart from the run ids,
 * the file names (paths there, URIs here) and the times of storing; loading twice replaces, it does not add.
 */
class StoreLoadTest {
    @TempDir
    Path dir;

    /** Columns that name the run, the file as given or the moment of storing, which differ by design. */
    private static final Set<String> DIFFERENT = Set.of("run_id", "file", "inspected_at_ms", "error");

    private static List<String> rows(Path db, String table) throws Exception {
        List<String> out = new ArrayList<>();
        try (Connection c = DriverManager.getConnection("jdbc:sqlite:" + db);
             Statement s = c.createStatement();
             ResultSet r = s.executeQuery("SELECT * FROM " + table)) {
            ResultSetMetaData m = r.getMetaData();
            while (r.next()) {
                StringBuilder b = new StringBuilder();
                for (int i = 1; i <= m.getColumnCount(); i++) {
                    if (!DIFFERENT.contains(m.getColumnName(i).toLowerCase(java.util.Locale.ROOT))) {
                        b.append(m.getColumnName(i)).append('=').append(r.getString(i)).append(' ');
                    }
                }
                out.add(b.toString());
            }
        }
        out.sort(null);
        return out;
    }

    @Test
    void loadedTablesEqualWhatInspectStores() throws Exception {
        Path all = dir.resolve("history");
        HistoryScenario.write(all);
        Path maps = Files.createDirectories(dir.resolve("maps"));
        try (Stream<Path> s = Files.list(all)) { // the first two days: 6 lots, 18 wafers
            for (Path p : s.filter(p -> p.getFileName().toString().matches("L000[1-6]-S\\d+\\.(tif|json)")).toList()) {
                Files.copy(p, maps.resolve(p.getFileName()));
            }
        }
        Path rulesFile = all.resolve(HistoryScenario.RULES);
        String text = Files.readString(rulesFile);
        Rules rules = Rules.parse(text, rulesFile.toString());
        List<Path> files;
        try (Stream<Path> s = Files.list(maps)) {
            files = s.filter(p -> p.toString().endsWith(".tif")).sorted().toList();
        }
        assertThat(files).hasSize(18);

        Path inspected = dir.resolve("inspect.db");
        try (ResultsStore store = ResultsStore.open(inspected.toString())) {
            String run = store.startRun(RunInfo.of(RunManifest.Source.of(trapmap.shared.Version.LINE, rulesFile,
                    text), rules.physics(), Instant.now()));
            try (StoreWriter w = new StoreWriter(store, run, LotPattern.parse(text, rulesFile.toString())
                    .orElse(null), null)) {
                new BatchInspection(rules).tellingWafers(w).run(files, dir.resolve("report"),
                        new BatchInspection.Options(1, false, false, ProgressListener.NONE));
            }
        }

        Path loaded = dir.resolve("loaded.db");
        SparkSession spark = LocalSpark.start();
        try {
            String output = dir.resolve("archive").toString();
            ArchiveJob.run(spark, new ArchiveJob.Request(List.of(maps.toString()), rulesFile.toString(), output,
                    PartitionKey.DAY, false));
            assertThat(StoreLoad.load(spark, output, rulesFile.toString(), loaded.toString())).isEqualTo(18);
            assertThat(StoreLoad.load(spark, output, rulesFile.toString(), loaded.toString())).isEqualTo(18);
        } finally {
            spark.stop();
        }
        for (String table : List.of("wafers", "wafer_figures", "wafer_failed_rules", "wafer_attributes",
                "wafer_regions", "wafer_footprints", "footprint_cells")) {
            List<String> want = rows(inspected, table);
            assertThat(rows(loaded, table)).as(table).isEqualTo(want);
            if (!table.equals("wafer_failed_rules")) {
                assertThat(want).as(table).isNotEmpty();
            }
        }
        assertThat(rows(loaded, "wafers")).hasSize(18);
        assertThat(rows(loaded, "wafers")).allMatch(r -> r.contains("lot=L000") && r.contains("measured_at=2026-10-0"));
    }

    @Test
    void aWaferFailedByItsIronPairIsStoredWithItsOwnVerdictAsInspectStoresIt() throws Exception {
        Path demo = Path.of("..", "demo-data").toAbsolutePath().normalize();
        Path maps = Files.createDirectories(dir.resolve("pair"));
        for (String f : List.of("LOT-A03-W02-feb-state", "LOT-A01-W01")) { // the Fe_i-state partner left out
            Files.copy(demo.resolve(f + ".tif"), maps.resolve(f + ".tif"));
            Files.copy(demo.resolve(f + ".json"), maps.resolve(f + ".json"));
        }
        Path rulesFile = demo.resolve("rules-example.json");
        String text = Files.readString(rulesFile);
        Rules rules = Rules.parse(text, rulesFile.toString());
        List<Path> files = List.of(maps.resolve("LOT-A01-W01.tif"), maps.resolve("LOT-A03-W02-feb-state.tif"));
        Path inspected = dir.resolve("inspect.db");
        try (ResultsStore store = ResultsStore.open(inspected.toString())) {
            String run = store.startRun(RunInfo.of(RunManifest.Source.of(trapmap.shared.Version.LINE, rulesFile,
                    text), rules.physics(), Instant.now()));
            try (StoreWriter w = new StoreWriter(store, run, LotPattern.parse(text, rulesFile.toString())
                    .orElse(null), null)) {
                new BatchInspection(rules).withIron(trapmap.maps.batch.IronPairRules.parse(text,
                        rulesFile.toString()).orElseThrow()).tellingWafers(w).run(files, dir.resolve("report"),
                        new BatchInspection.Options(1, false, false, ProgressListener.NONE));
            }
        }
        Path loaded = dir.resolve("loaded.db");
        SparkSession spark = LocalSpark.start();
        try {
            String output = dir.resolve("archive").toString();
            ArchiveJob.run(spark, new ArchiveJob.Request(List.of(maps.toString()), rulesFile.toString(), output,
                    PartitionKey.DAY, false));
            Row feb = spark.read().parquet(output + "/" + ArchiveJob.RESULTS)
                    .where("file like '%feb-state.tif'").first();
            // the results row has its missing pair merged (the iron rule failed), the map's own verdict has not
            assertThat((String) feb.getAs("status")).isEqualTo("fail");
            assertThat(feb.<String>getList(feb.fieldIndex("failed_rules"))).contains("iron");
            Row own = feb.getStruct(feb.fieldIndex(WaferRows.MAP_VERDICT));
            assertThat(own.<String>getList(own.fieldIndex("failed_rules"))).doesNotContain("iron");
            assertThat(StoreLoad.load(spark, output, rulesFile.toString(), loaded.toString())).isEqualTo(2);
        } finally {
            spark.stop();
        }
        for (String table : List.of("wafers", "wafer_figures", "wafer_failed_rules", "wafer_attributes")) {
            assertThat(rows(loaded, table)).as(table).isEqualTo(rows(inspected, table));
        }
        assertThat(rows(loaded, "wafers")).hasSize(2);
    }
}
