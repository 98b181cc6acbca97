package trapmap.store;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.time.Instant;
import java.time.ZoneOffset;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import trapmap.maps.batch.WaferResult;

/**
 * The same schema and store on a real PostgreSQL server ({@link PostgresServer}: started by the test on a temporary
 * data directory, or the one {@code .ci/run} started; password authentication), in a database of its own. Skipped, with the reason, only when no server can be started here.
 */
class PostgresStoreTest {
    private static PostgresServer server;
    /** A database of this test's own on the server. */
    private static String url;

    @BeforeAll
    static void startServer() throws Exception {
        server = PostgresServer.start();
        if (server.skipped() == null) {
            url = server.newDatabase();
        }
    }

    @AfterAll
    static void stopServer() throws Exception {
        server.close();
    }

    private static ResultsStore open(Map<String, String> env) {
        return ResultsStore.open(url, env,
                Clock.fixed(Instant.parse("2026-12-01T00:00:00Z"), ZoneOffset.UTC));
    }

    @Test
    void theSchemaAndAnIdempotentWaferOnPostgresql() throws Exception {
        assumeTrue(server.skipped() == null, () -> "no PostgreSQL server could be started here: "
                + server.skipped());
        Map<String, String> env = server.env();
        Path map = Files.createTempFile(server.base(), "W1", ".tif");
        Files.writeString(map, "content");
        Map<String, Double> figures = new LinkedHashMap<>();
        figures.put("median_density_cm3", 2.5e11);
        figures.put("flagged_area_fraction", Double.NaN);
        WaferResult r = new WaferResult(map.toString(), "LOT-P-W01", WaferResult.Status.FAIL, "C", "default",
                "fe-i", figures, List.of("median_density_cm3"), List.of(), List.of(), "", null);
        try (ResultsStore s = open(env)) {
            assertThat(s.schemaVersion()).isEqualTo("1");
            String run = s.startRun(new RunInfo(Instant.parse("2026-11-30T10:00:00Z"), "rules.json", "r1", "{}",
                    "s1", "test"));
            s.write(run, WaferRecord.of(r, java.util.regex.Pattern.compile("^(LOT-[A-Z]+)-W")));
            s.write(run, WaferRecord.of(r, java.util.regex.Pattern.compile("^(LOT-[A-Z]+)-W")));
            assertThat(s.count("wafers")).isEqualTo(1);
            assertThat(s.count("wafer_figures")).isEqualTo(2);
            assertThat(s.points("median_density_cm3", "lot", null, "default")).singleElement().satisfies(p -> {
                assertThat(p.value()).isEqualTo(2.5e11);
                assertThat(p.group()).isEqualTo("LOT-P");
                assertThat(p.failedRules()).containsExactly("median_density_cm3");
                assertThat(p.pass()).isFalse();
            });
        }
        try (ResultsStore s = open(env)) { // reopened: migrated once, the rows kept
            assertThat(s.count("flyway_schema_history")).isEqualTo(1);
            assertThat(s.count("wafers")).isEqualTo(1);
        }
        assertThatThrownBy(() -> open(Map.of("PGUSER", PostgresServer.USER, "PGPASSWORD", "wrong")))
                .isInstanceOf(StoreException.class).hasMessageContaining(url)
                .hasMessageNotContaining("wrong");
    }
}
