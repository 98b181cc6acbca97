package trapmap.cluster;

import static org.assertj.core.api.Assertions.assertThat;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.ResultSet;
import java.sql.ResultSetMetaData;
import java.sql.Statement;
import java.time.Clock;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.stream.Stream;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.SparkSession;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.LotPattern;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.RunManifest;
import trapmap.maps.demo.HistoryScenario;
import trapmap.shared.progress.ProgressListener;
import trapmap.store.PostgresServer;
import trapmap.store.ResultsStore;
import trapmap.store.RunInfo;
import trapmap.store.StoreTables;
import trapmap.store.StoreWriter;

/**
 * The archive job's tables loaded into a results store ({@link StoreLoad}) hold what {@code inspect --store} stores
 * for the same maps and rules: every table of the two SQLite stores is equal row for row (result keys, lots, measured
 * times, verdicts, grades, figures, failed rules, facts, regions, footprints and their cells), apart from the run ids,
 * the file names (paths there, URIs here) and the times of storing; loading twice replaces, it does not add. So for
 * every batch size of the bulk path (wafers per transaction) and the per-wafer path, into SQLite and PostgreSQL.
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

    /** The first two days of the invented history: 6 lots, 18 wafers. */
    @TempDir
    static Path shared;
    private static Path rulesFile;
    /** The store {@code inspect --store} wrote of the maps, one wafer per transaction. */
    private static Path inspected;
    /** The archive job's tables of the same maps. */
    private static String output;
    private static PostgresServer server;

    @BeforeAll
    static void inspectAndArchive() throws Exception {
        Path all = shared.resolve("history");
        HistoryScenario.write(all);
        Path maps = Files.createDirectories(shared.resolve("maps"));
        try (Stream<Path> s = Files.list(all)) {
            for (Path p : s.filter(p -> p.getFileName().toString().matches("L000[1-6]-S\\d+\\.(tif|json)")).toList()) {
                Files.copy(p, maps.resolve(p.getFileName()));
            }
        }
        rulesFile = all.resolve(HistoryScenario.RULES);
        String text = Files.readString(rulesFile);
        Rules rules = Rules.parse(text, rulesFile.toString());
        List<Path> files;
        try (Stream<Path> s = Files.list(maps)) {
            files = s.filter(p -> p.toString().endsWith(".tif")).sorted().toList();
        }
        assertThat(files).hasSize(18);

        inspected = shared.resolve("inspect.db");
        try (ResultsStore store = ResultsStore.open(inspected.toString())) {
            String run = store.startRun(RunInfo.of(RunManifest.Source.of(trapmap.shared.Version.LINE, rulesFile,
                    text), rules.physics(), Instant.now()));
            try (StoreWriter w = new StoreWriter(store, run, LotPattern.parse(text, rulesFile.toString())
                    .orElse(null), null)) {
                new BatchInspection(rules).tellingWafers(w).run(files, shared.resolve("report"),
                        new BatchInspection.Options(1, false, false, ProgressListener.NONE));
            }
        }
        SparkSession spark = LocalSpark.start();
        try {
            output = shared.resolve("archive").toString();
            ArchiveJob.run(spark, new ArchiveJob.Request(List.of(maps.toString()), rulesFile.toString(), output,
                    PartitionKey.DAY, false));
        } finally {
            spark.stop();
        }
        server = PostgresServer.start();
    }

    @AfterAll
    static void stopServer() throws Exception {
        if (server != null) {
            server.close();
        }
    }

    private void assertEqualsInspected(Path loaded) throws Exception {
        for (String table : StoreTables.TABLES) {
            List<String> want = rows(inspected, table);
            assertThat(rows(loaded, table)).as(table).isEqualTo(want);
            if (!table.equals("wafer_failed_rules")) {
                assertThat(want).as(table).isNotEmpty();
            }
        }
    }

    @Test
    void loadedTablesEqualWhatInspectStores() throws Exception {
        Path loaded = dir.resolve("loaded.db");
        SparkSession spark = LocalSpark.start();
        try {
            assertThat(StoreLoad.load(spark, output, rulesFile.toString(), loaded.toString())).isEqualTo(18);
            assertThat(StoreLoad.load(spark, output, rulesFile.toString(), loaded.toString())).isEqualTo(18);
        } finally {
            spark.stop();
        }
        assertEqualsInspected(loaded);
        assertThat(rows(loaded, "wafers")).hasSize(18);
        assertThat(rows(loaded, "wafers")).allMatch(r -> r.contains("lot=L000") && r.contains("measured_at=2026-10-0"));
    }

    @Test
    void everyBatchSizeLoadsTheSameTables() throws Exception {
        SparkSession spark = LocalSpark.start();
        try {
            // one wafer per transaction; one per batch; batches of 7 (two full, one of 4); the per-wafer path
            for (int batch : List.of(1, 7, 0)) {
                Path loaded = dir.resolve("loaded-" + batch + ".db");
                assertThat(StoreLoad.load(spark, output, rulesFile.toString(), loaded.toString(), batch))
                        .isEqualTo(18);
                assertEqualsInspected(loaded);
            }
            // a rerun into a store holding the wafers (batches of 7 replacing the rows batch 1 wrote)
            Path loaded = dir.resolve("loaded-1.db");
            assertThat(StoreLoad.load(spark, output, rulesFile.toString(), loaded.toString(), 7)).isEqualTo(18);
            assertEqualsInspected(loaded);
            assertThat(rows(loaded, "wafers")).hasSize(18);
        } finally {
            spark.stop();
        }
    }

    @Test
    void loadedIntoPostgresqlAsInspectStoresIntoSqlite() throws Exception {
        assumeTrue(server.skipped() == null, () -> "no PostgreSQL server could be started here: "
                + server.skipped());
        Map<String, List<String>> want;
        try (ResultsStore s = ResultsStore.open(inspected.toString())) {
            want = StoreTables.rows(s, DIFFERENT);
        }
        SparkSession spark = LocalSpark.start();
        try {
            for (int batch : List.of(7, 0)) {
                try (ResultsStore s = server.open(server.newDatabase(), Clock.systemUTC())) {
                    StoreLoad.Loading l = StoreLoad.prepare(spark, rulesFile.toString());
                    assertThat(StoreLoad.load(spark, output, s, l, batch)).isEqualTo(18);
                    assertThat(StoreTables.rows(s, DIFFERENT)).as("batch " + batch).isEqualTo(want);
                    assertThat(StoreLoad.load(spark, output, s, l, batch)).isEqualTo(18); // a rerun replaces
                    assertThat(StoreTables.rows(s, DIFFERENT)).as("rerun, batch " + batch).isEqualTo(want);
                }
            }
        } finally {
            spark.stop();
        }
        assertThat(want.get("wafers")).hasSize(18);
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
