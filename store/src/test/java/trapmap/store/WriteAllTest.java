package trapmap.store;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.nio.file.Path;
import java.sql.Statement;
import java.time.Clock;
import java.time.Instant;
import java.time.ZoneOffset;
import java.util.BitSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.function.Supplier;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.FlaggedRegions;
import trapmap.maps.batch.Footprint;
import trapmap.maps.batch.WaferResult;
import trapmap.maps.region.Region;

/**
 * The bulk path ({@link ResultsStore#writeAll}, many wafers per transaction) leaves a store equal, table for table, to
 * writing the same wafers one by one ({@link ResultsStore#write}), whatever the batch size (1, a batch that is not
 * full, all in one), with a wafer replacing one stored before and two wafers of one result key in a batch; a batch
 * that fails leaves the store as it was and writing it again completes it. On SQLite and on PostgreSQL.
 */
class WriteAllTest {
    private static final Clock CLOCK = Clock.fixed(Instant.parse("2026-12-01T00:00:00Z"), ZoneOffset.UTC);
    /** The run's id differs between stores by design. */
    private static final Set<String> RUN = Set.of("run_id");
    private static PostgresServer server;

    @TempDir
    Path dir;
    private int stores;

    @BeforeAll
    static void startServer() throws Exception {
        server = PostgresServer.start();
    }

    @AfterAll
    static void stopServer() throws Exception {
        server.close();
    }

    private static RunInfo run() {
        return new RunInfo(Instant.parse("2026-11-30T10:00:00Z"), "rules.json", "r1", "{}", "s1", "test");
    }

    private static Footprint footprint(int flaggedBit) {
        BitSet covered = new BitSet();
        covered.set(0, 6);
        BitSet flagged = new BitSet();
        flagged.set(1);
        flagged.set(flaggedBit);
        return new Footprint("round-156", 1.0, -1, -1, 3, 2, covered, flagged);
    }

    /** A wafer whose map content hashes to {@code content}'s SHA-256: its result key follows from it. */
    private static WaferRecord wafer(String file, String content, WaferResult.Status status, double density,
                                     boolean withFootprint) {
        Map<String, Double> figures = new LinkedHashMap<>();
        figures.put("median_density_cm3", density);
        figures.put("flagged_area_fraction", Double.NaN);
        List<FlaggedRegions.FlaggedRegion> regions = status == WaferResult.Status.FAIL
                ? List.of(new FlaggedRegions.FlaggedRegion(new Region(1, 40, 12.5, 3.25, -4.0,
                new Region.BoundsMm(1.0, -6.0, 5.5, -2.0), 0.8, 3.0, -4.5, 0.6, 50.25, true, 3.0, -4.0),
                density * 4, density * 2))
                : List.of();
        WaferResult r = new WaferResult(file, file.replace(".tif", ""), status,
                status == WaferResult.Status.PASS ? "A" : "C", "default", "fe-i", figures,
                status == WaferResult.Status.FAIL ? List.of("median_density_cm3", "largest_region_mm2") : List.of(),
                List.of(), regions, "", withFootprint ? footprint(status == WaferResult.Status.FAIL ? 5 : 3) : null);
        return new WaferRecord(r, WaferRecord.sha256(content), Map.of("lot", "L1", "furnace_tube", file.substring(0,
                2)), "L1", Instant.parse("2026-11-0" + (1 + Math.abs(content.hashCode()) % 9) + "T08:00:00Z"),
                List.of());
    }

    /** The wafer stored before the batches, then replaced by {@code W1} of {@link #batch}. */
    private static final WaferRecord EARLIER = wafer("W1-old.tif", "one", WaferResult.Status.PASS, 1e11, true);

    /** Wafers to write: W1 replaces {@link #EARLIER}, W2b replaces W2 (the same content) within the list. */
    private static List<WaferRecord> batch() {
        return List.of(wafer("W1.tif", "one", WaferResult.Status.FAIL, 5e11, true),
                wafer("W2.tif", "two", WaferResult.Status.PASS, 2e11, true),
                wafer("W3.tif", "three", WaferResult.Status.FAIL, 7e11, false),
                wafer("W2b.tif", "two", WaferResult.Status.FAIL, 6e11, true),
                wafer("W4.tif", "four", WaferResult.Status.PASS, Double.NaN, true),
                wafer("W5.tif", "five", WaferResult.Status.FAIL, 8e11, true));
    }

    private void bulkEqualsOneByOne(Supplier<ResultsStore> fresh) throws Exception {
        Map<String, List<String>> want;
        List<String> keys;
        try (ResultsStore s = fresh.get()) {
            String run = s.startRun(run());
            s.write(run, EARLIER);
            keys = batch().stream().map(w -> s.write(run, w)).toList();
            want = StoreTables.rows(s, RUN);
        }
        assertThat(want.get("wafers")).hasSize(5).anyMatch(r -> r.contains("file=W2b.tif"))
                .noneMatch(r -> r.contains("file=W2.tif") || r.contains("file=W1-old.tif"));
        assertThat(want.get("wafer_regions")).hasSize(4); // the failed W1, W3, W2b (in place of W2) and W5
        assertThat(want.get("footprint_cells")).hasSize(8);
        for (int size : List.of(1, 2, 4, 6, 500)) { // 4: a full batch and one that is not; 500: never full
            try (ResultsStore s = fresh.get()) {
                String run = s.startRun(run());
                s.writeAll(run, List.of(EARLIER));
                List<WaferRecord> all = batch();
                List<String> got = new java.util.ArrayList<>();
                for (int i = 0; i < all.size(); i += size) {
                    got.addAll(s.writeAll(run, all.subList(i, Math.min(all.size(), i + size))));
                }
                assertThat(got).as("keys, batch " + size).isEqualTo(keys);
                assertThat(StoreTables.rows(s, RUN)).as("batch of " + size).isEqualTo(want);
                // a rerun of the whole load replaces every wafer: the same rows again
                s.writeAll(s.startRun(run()), all);
                assertThat(StoreTables.rows(s, RUN)).as("rerun, batch of " + size).isEqualTo(want);
            }
        }
    }

    /**
     * A batch whose last table refuses its rows ({@code refuse} makes it refuse, {@code allow} lifts that) is written
     * not at all, the rows it would have replaced kept; written again it lands whole.
     */
    private void aFailedBatchLeavesNothingAndARerunCompletesIt(Supplier<ResultsStore> fresh, String refuse,
                                                               String allow) throws Exception {
        Map<String, List<String>> complete;
        try (ResultsStore s = fresh.get()) {
            String run = s.startRun(run());
            s.write(run, EARLIER);
            batch().forEach(w -> s.write(run, w));
            complete = StoreTables.rows(s, RUN);
        }
        try (ResultsStore s = fresh.get()) {
            String run = s.startRun(run());
            s.writeAll(run, List.of(EARLIER));
            Map<String, List<String>> before = StoreTables.rows(s, RUN);
            try (Statement st = s.connection().createStatement()) {
                st.execute(refuse);
            }
            assertThatThrownBy(() -> s.writeAll(run, batch())).isInstanceOf(StoreException.class)
                    .hasMessageContaining("6 wafers (W1.tif to W5.tif, none of them) not written");
            assertThat(StoreTables.rows(s, RUN)).isEqualTo(before);
            try (Statement st = s.connection().createStatement()) {
                st.execute(allow);
            }
            s.writeAll(run, batch());
            assertThat(StoreTables.rows(s, RUN)).isEqualTo(complete);
        }
    }

    private Supplier<ResultsStore> sqlite() {
        return () -> ResultsStore.open(dir.resolve("store-" + (++stores) + ".db").toString(), Map.of(), CLOCK);
    }

    private static Supplier<ResultsStore> postgres() {
        assumeTrue(server.skipped() == null, () -> "no PostgreSQL server could be started here: "
                + server.skipped());
        return () -> {
            try {
                return server.open(server.newDatabase(), CLOCK);
            } catch (java.sql.SQLException e) {
                throw new IllegalStateException(e);
            }
        };
    }

    @Test
    void bulkWritesEqualOneByOneOnSqlite() throws Exception {
        bulkEqualsOneByOne(sqlite());
    }

    @Test
    void aFailedBatchLeavesNothingOnSqlite() throws Exception {
        aFailedBatchLeavesNothingAndARerunCompletesIt(sqlite(), "CREATE TRIGGER refuse BEFORE INSERT ON"
                + " footprint_cells BEGIN SELECT RAISE(ABORT, 'refused by the test'); END", "DROP TRIGGER refuse");
    }

    @Test
    void bulkWritesEqualOneByOneOnPostgresql() throws Exception {
        bulkEqualsOneByOne(postgres());
    }

    @Test
    void aFailedBatchLeavesNothingOnPostgresql() throws Exception {
        aFailedBatchLeavesNothingAndARerunCompletesIt(postgres(), "ALTER TABLE footprint_cells ADD CONSTRAINT refuse"
                + " CHECK (cell_i < -1000) NOT VALID", "ALTER TABLE footprint_cells DROP CONSTRAINT refuse");
    }
}
