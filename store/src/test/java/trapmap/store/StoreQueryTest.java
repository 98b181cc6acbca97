package trapmap.store;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.nio.file.Path;
import java.sql.Statement;
import java.time.Clock;
import java.time.Instant;
import java.time.ZoneOffset;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@link StoreQuery}: a cancel from another thread stops a store read that would otherwise run for hours, the read
 * ends with {@link StoreQuery.Cancelled}, and the same store answers the next read at once and in full. The endless
 * read is the store's own points query over a session-local view {@code wafers} that shadows the table (SQLite: a
 * TEMP view, PostgreSQL: one in {@code pg_temp}, both searched before the main schema) and whose every row costs
 * about 10^10 steps (SQLite) or an hour's sleep (PostgreSQL).
 */
class StoreQueryTest {
    private static final Clock CLOCK = Clock.fixed(Instant.parse("2026-12-01T00:00:00Z"), ZoneOffset.UTC);
    private static final String COLUMNS = " 'L1' AS lot, 'pass' AS verdict, 'W1' AS wafer_id, 'f1' AS file,"
            + " 'default' AS profile, 'r1' AS run_id";
    /**
     * Longest wait for a cancelled read to end, s: generous, the uncancelled read takes hours (and holds the store,
     * whose close then waits: the test's timeout ends it).
     */
    private static final long BOUND_S = 60;

    @TempDir
    Path dir;

    @Test
    @Timeout(value = 3, unit = TimeUnit.MINUTES, threadMode = Timeout.ThreadMode.SEPARATE_THREAD) // a read not stopped
    void aCancelStopsALongSqliteReadAndTheStoreAnswersTheNextOne() throws Exception {
        try (ResultsStore s = ResultsStore.open(dir.resolve("r.db").toString(), Map.of(), CLOCK)) {
            cancelsAndRecovers(s, "CREATE TEMP VIEW wafers AS SELECT 'k1' AS result_key, (WITH RECURSIVE c(x) AS"
                    + " (SELECT 1 UNION ALL SELECT x + 1 FROM c WHERE x < 10000000000) SELECT max(x) FROM c)"
                    + " AS measured_at_ms, 1 AS inspected_at_ms," + COLUMNS);
        }
    }

    @Test
    @Timeout(value = 3, unit = TimeUnit.MINUTES, threadMode = Timeout.ThreadMode.SEPARATE_THREAD) // a read not stopped
    void aCancelStopsALongPostgresqlRead() throws Exception {
        try (PostgresServer server = PostgresServer.start()) {
            assumeTrue(server.skipped() == null, () -> "no PostgreSQL server could be started here: "
                    + server.skipped());
            try (ResultsStore s = server.open(server.newDatabase(), CLOCK)) {
                cancelsAndRecovers(s, "CREATE TEMP VIEW wafers AS SELECT 'k1'::text AS result_key,"
                        + " (SELECT 1 FROM pg_sleep(3600))::bigint AS measured_at_ms, 1::bigint AS inspected_at_ms,"
                        + COLUMNS);
            }
        }
    }

    private static void cancelsAndRecovers(ResultsStore s, String endlessView) throws Exception {
        try (Statement st = s.connection().createStatement()) {
            st.execute(endlessView);
        }
        StoreQuery q = new StoreQuery();
        CompletableFuture<Throwable> read = CompletableFuture.supplyAsync(() -> {
            try {
                s.points(q, "median_density_cm3", "lot", StoreFilter.ALL);
                return null;
            } catch (RuntimeException e) {
                return e;
            }
        });
        Thread.sleep(1000);
        assertThat(read).as("the read runs").isNotDone();
        long t0 = System.nanoTime();
        q.cancel();
        Throwable ended = read.get(BOUND_S, TimeUnit.SECONDS);
        long waitedMs = (System.nanoTime() - t0) / 1_000_000;
        assertThat(ended).as("ended %d ms after the cancel", waitedMs).isInstanceOf(StoreQuery.Cancelled.class)
                .hasMessageContaining("points of median_density_cm3").hasMessageContaining("cancelled");
        assertThat(q.cancelled()).isTrue();
        // a cancelled handle stops a read at once; a new one reads in full on the same connection
        assertThatThrownBy(() -> s.points(q, "median_density_cm3", "lot", StoreFilter.ALL))
                .isInstanceOf(StoreQuery.Cancelled.class);
        try (Statement st = s.connection().createStatement()) {
            st.execute("DROP VIEW wafers");
        }
        assertThat(s.points(new StoreQuery(), "median_density_cm3", "lot", StoreFilter.ALL)).isEqualTo(List.of());
        assertThat(s.figures()).isEmpty();
    }
}
