package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assumptions.assumeThat;

import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.demo.HistoryScenario;
import trapmap.store.PostgresServer;

/**
 * The invented production history ({@link HistoryScenario}: tube T2 drifts from {@link HistoryScenario#CHANGE_AT},
 * boat slot {@value HistoryScenario#BAD_SLOT} carries a contamination spot at ({@value HistoryScenario#SPOT_X_MM},
 * {@value HistoryScenario#SPOT_Y_MM}) mm) inspected once into a SQLite store and once into a real PostgreSQL server
 * ({@link PostgresServer}; that half is skipped, with the reason, only where no server can run): {@code trend --by
 * furnace_tube} flags T2 within a few T2 lots of the change and never T1, {@code recurrence --by boat_slot} shows one
 * hot spot, for slot 7 only, at the planted spot, and both stores give byte-identical tables and maps. The store's
 * recurrence of all wafers equals the batch's own recurrence files.
 */
class HistoryStoreRecurrenceTest {
    static final String FIGURE = "trap_density_p50_cm3";
    /** The first T2 lot after the change with a point beyond 3σ must be at most this one (measured: the 3rd). */
    static final int MAX_T2_LOTS_TO_DETECT = 4;
    /** The hot spot's centroid must lie this close to the planted spot, mm (measured: 0.27 mm). */
    static final double SPOT_TOLERANCE_MM = 3;
    /**
     * The hot spot's cells, 1 mm: the planted spot of radius 6 mm, about 113 mm², flagged on the maps' 2.6 mm pixels
     * (measured: 129 cells, the 19 flagged pixels' 128 mm²).
     */
    static final int MIN_SPOT_CELLS = 90;
    static final int MAX_SPOT_CELLS = 160;

    @TempDir
    static Path dir;
    static Path hist;
    static PostgresServer server;

    @BeforeAll
    static void inspectIntoSqlite() throws Exception {
        hist = dir.resolve("history");
        HistoryScenario.write(hist);
        Path db = dir.resolve("results.sqlite");
        Cli.Run inspect = Cli.run(inspectArgs("sqlite-report", db.toString()).toArray(String[]::new));
        assertThat(inspect.code()).as(inspect.err()).isIn(Exit.OK, Exit.SOME_WAFERS_NOT_PASSED);
        for (List<String> q : queries(db.toString(), "sqlite")) {
            Cli.Run r = Cli.run(q.toArray(String[]::new));
            assertThat(r.code()).as(q + ": " + r.err()).isIn(Exit.OK, Exit.TREND_SIGNALS);
        }
        server = PostgresServer.start();
    }

    @AfterAll
    static void stopServer() throws Exception {
        if (server != null) {
            server.close();
        }
    }

    private static List<String> inspectArgs(String out, String store) {
        return List.of("inspect", hist.toString(), "--rules", hist.resolve(HistoryScenario.RULES).toString(),
                "--out", dir.resolve(out).toString(), "--store", store, "--no-pdf", "--no-thumbnails");
    }

    /** The trend and recurrence queries of one store, their outputs named by {@code tag}. */
    private static List<List<String>> queries(String store, String tag) {
        return List.of(
                List.of("trend", "--store", store, "--figure", FIGURE, "--by", "furnace_tube", "--baseline-until",
                        "2026-10-12", "-o", dir.resolve("trend-" + tag + ".csv").toString()),
                List.of("recurrence", "--store", store, "--by", "boat_slot", "-o",
                        dir.resolve("slots-" + tag).toString()),
                List.of("recurrence", "--store", store, "-o", dir.resolve("all-" + tag).toString()),
                List.of("recurrence", "--store", store, "--where", "boat_slot=7", "--lot", "L0020", "--lot", "L0030",
                        "--lot", "L0041", "--since", "2026-10-12", "--until", "2026-10-18", "-o",
                        dir.resolve("some-" + tag).toString()));
    }

    @Test
    void theDriftingTubeIsFlaggedWithinAFewLotsAndTheSteadyTubeNever() throws Exception {
        List<CSVRecord> rows = read(dir.resolve("trend-sqlite.csv"));
        Map<Instant, HistoryScenario.Wafer> wafers = new HashMap<>();
        for (HistoryScenario.Wafer w : HistoryScenario.build()) {
            wafers.put(w.measuredAt(), w);
        }
        assertThat(chart(rows, HistoryScenario.STEADY_TUBE)).isNotEmpty()
                .filteredOn(r -> r.get("baseline").equals("false"))
                .noneMatch(r -> r.get("signals").contains("beyond 3 sigma"));
        List<String> t2LotsAfter = new ArrayList<>(new LinkedHashSet<>(wafers.values().stream()
                .filter(w -> w.furnaceTube().equals(HistoryScenario.DRIFT_TUBE))
                .filter(w -> w.processedAt().isAfter(HistoryScenario.CHANGE_AT))
                .sorted(Comparator.comparing(HistoryScenario.Wafer::processedAt))
                .map(HistoryScenario.Wafer::lot).toList()));
        String firstBeyond = chart(rows, HistoryScenario.DRIFT_TUBE).stream()
                .filter(r -> r.get("signals").contains("beyond 3 sigma"))
                .map(r -> wafers.get(Instant.parse(r.get("time"))))
                .filter(w -> w.processedAt().isAfter(HistoryScenario.CHANGE_AT))
                .map(HistoryScenario.Wafer::lot).findFirst().orElseThrow();
        assertThat(t2LotsAfter.indexOf(firstBeyond) + 1).as("T2 lots after the change until a point beyond 3 sigma")
                .isBetween(1, MAX_T2_LOTS_TO_DETECT);
    }

    @Test
    void theBadSlotAloneHasAHotSpotAtThePlantedSpot() throws Exception {
        Path slots = dir.resolve("slots-sqlite");
        List<CSVRecord> maps = read(slots.resolve("recurrence.csv"));
        assertThat(maps).extracting(r -> r.get("group")).containsExactly("2", "7", "14");
        assertThat(maps).allSatisfy(r -> assertThat(r.get("wafers")).isEqualTo(
                Integer.toString(HistoryScenario.DAYS * HistoryScenario.LOTS_PER_DAY)));
        List<CSVRecord> spots = read(slots.resolve("hotspots.csv"));
        assertThat(spots).singleElement().satisfies(s -> {
            assertThat(s.get("group")).isEqualTo(Integer.toString(HistoryScenario.BAD_SLOT));
            double dx = Double.parseDouble(s.get("centroid_x_mm")) - HistoryScenario.SPOT_X_MM;
            double dy = Double.parseDouble(s.get("centroid_y_mm")) - HistoryScenario.SPOT_Y_MM;
            assertThat(Math.hypot(dx, dy)).as("hot spot centroid to the planted spot, mm")
                    .isLessThanOrEqualTo(SPOT_TOLERANCE_MM);
            // the spot is one set of touching cells on 1 mm cells, though the pixels are 2.6 mm
            assertThat(Integer.parseInt(s.get("cells"))).isBetween(MIN_SPOT_CELLS, MAX_SPOT_CELLS);
            // every slot-7 wafer carries the spot: its cells are flagged on all of them
            assertThat(Double.parseDouble(s.get("peak_share"))).isEqualTo(1.0);
        });
        for (CSVRecord m : maps) {
            assertThat(slots.resolve(m.get("file"))).isRegularFile();
            assertThat(slots.resolve(m.get("file").replace(".tif", ".png"))).isRegularFile();
        }
    }

    @Test
    void theStoresRecurrenceOfAllWafersIsTheBatchsOwn() throws Exception {
        Path batch = dir.resolve("sqlite-report");
        Path all = dir.resolve("all-sqlite");
        assertThat(Files.readString(all.resolve("recurrence.csv")))
                .isEqualTo(Files.readString(batch.resolve("recurrence.csv")));
        for (CSVRecord m : read(batch.resolve("recurrence.csv"))) {
            String tif = m.get("file");
            assertThat(Files.mismatch(all.resolve(tif), batch.resolve(tif))).as(tif).isEqualTo(-1L);
            String png = tif.replace(".tif", ".png");
            assertThat(Files.mismatch(all.resolve(png), batch.resolve(png))).as(png).isEqualTo(-1L);
        }
    }

    @Test
    void theFiltersTakeTheWafersOfTheirSlotLotsAndDays() throws Exception {
        long expected = HistoryScenario.build().stream()
                .filter(w -> w.boatSlot() == HistoryScenario.BAD_SLOT)
                .filter(w -> List.of("L0020", "L0030", "L0041").contains(w.lot()))
                .filter(w -> !w.measuredAt().isBefore(Instant.parse("2026-10-12T00:00:00Z"))
                        && w.measuredAt().isBefore(Instant.parse("2026-10-19T00:00:00Z")))
                .count();
        assertThat(expected).as("wafers the query must take").isEqualTo(2);
        assertThat(read(dir.resolve("some-sqlite").resolve("recurrence.csv"))).singleElement()
                .satisfies(r -> assertThat(r.get("wafers")).isEqualTo(Long.toString(expected)));
    }

    @Test
    void postgresqlGivesTheSameTablesAndMapsAsSqlite() throws Exception {
        assumeThat(server.skipped()).as("no PostgreSQL server could be started here: %s", server.skipped())
                .isNull();
        String url = server.newDatabase();
        run(inspectArgs("pg-report", url), Exit.OK, Exit.SOME_WAFERS_NOT_PASSED);
        for (List<String> q : queries(url, "pg")) {
            run(q, Exit.OK, Exit.TREND_SIGNALS);
        }
        assertThat(Files.mismatch(dir.resolve("trend-pg.csv"), dir.resolve("trend-sqlite.csv"))).isEqualTo(-1L);
        for (String out : List.of("slots", "all", "some")) {
            Path pg = dir.resolve(out + "-pg");
            Path sqlite = dir.resolve(out + "-sqlite");
            List<String> names = names(sqlite);
            assertThat(names(pg)).isEqualTo(names).contains("recurrence.csv", "hotspots.csv");
            for (String n : names) {
                assertThat(Files.mismatch(pg.resolve(n), sqlite.resolve(n))).as(out + "/" + n).isEqualTo(-1L);
            }
        }
    }

    /**
     * Runs the command line in a process of its own with the server's user and password in its environment, as a
     * user would (the store takes credentials only from there).
     */
    private static void run(List<String> args, Integer... codes) throws Exception {
        List<String> cmd = new ArrayList<>(List.of(Path.of(System.getProperty("java.home"), "bin", "java").toString(),
                "-Xshare:auto", "-XX:TieredStopAtLevel=1", "-cp", System.getProperty("java.class.path"),
                TrapmapCommand.class.getName()));
        cmd.addAll(args);
        Path log = Files.createTempFile(dir, "child", ".log");
        ProcessBuilder b = new ProcessBuilder(cmd).redirectErrorStream(true).redirectOutput(log.toFile());
        b.environment().putAll(server.env());
        Process p = b.start();
        if (!p.waitFor(240, TimeUnit.SECONDS)) {
            p.destroyForcibly();
            throw new AssertionError(args + " did not end in 240 s: " + Files.readString(log));
        }
        assertThat(p.exitValue()).as(args + ": " + Files.readString(log)).isIn((Object[]) codes);
    }

    private static List<String> names(Path folder) throws Exception {
        try (Stream<Path> s = Files.list(folder)) {
            return s.map(p -> p.getFileName().toString()).sorted().toList();
        }
    }

    private static List<CSVRecord> chart(List<CSVRecord> rows, String tube) {
        return rows.stream().filter(r -> r.get("chart").equals("group_individuals"))
                .filter(r -> r.get("group").equals(tube)).toList();
    }

    private static List<CSVRecord> read(Path csv) throws Exception {
        try (Reader r = Files.newBufferedReader(csv)) {
            return new ArrayList<>(CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).get().parse(r)
                    .getRecords());
        }
    }
}
