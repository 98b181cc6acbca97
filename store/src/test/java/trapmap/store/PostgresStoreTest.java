package trapmap.store;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.io.IOException;
import java.net.ServerSocket;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermissions;
import java.nio.file.attribute.UserPrincipal;
import java.time.Clock;
import java.time.Instant;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import trapmap.maps.batch.WaferResult;

/**
 * The same schema and store on a real PostgreSQL server that the test starts on a temporary data directory, on a
 * free localhost port, with password authentication (scram-sha-256). As root (PostgreSQL refuses to run as root) the
 * server runs as the user {@code postgres} or {@code nobody} through {@code runuser}. Skipped, with the reason, only
 * when no server can be started here ({@code initdb}/{@code pg_ctl} missing, or root without such a user).
 */
class PostgresStoreTest {
    private static final String USER = "trapmap";
    private static final String PASSWORD = "test-only-password";
    private static Path base;
    private static Path data;
    private static List<String> asUser;
    private static Path pgCtl;
    private static int port;
    private static String skipped;

    @BeforeAll
    static void startServer() throws Exception {
        Path initdb = tool("initdb");
        pgCtl = tool("pg_ctl");
        if (initdb == null || pgCtl == null) {
            skipped = "initdb/pg_ctl not found on PATH, /usr/local/bin or /usr/lib/postgresql/*/bin";
            return;
        }
        asUser = new ArrayList<>();
        base = Files.createTempDirectory("trapmap-pg");
        if ("root".equals(System.getProperty("user.name"))) {
            String runAs = null;
            for (String u : List.of("postgres", "nobody")) {
                if (run(List.of("id", "-u", u), 10) == 0) {
                    runAs = u;
                    break;
                }
            }
            Path runuser = Stream.of("/usr/sbin/runuser", "/sbin/runuser", "/usr/bin/runuser").map(Path::of)
                    .filter(Files::isExecutable).findFirst().orElse(null);
            if (runAs == null || runuser == null) {
                skipped = "running as root without runuser and a user postgres or nobody to run the server as";
                return;
            }
            asUser = List.of(runuser.toString(), "-u", runAs, "--");
            UserPrincipal owner = base.getFileSystem().getUserPrincipalLookupService().lookupPrincipalByName(runAs);
            Files.setOwner(base, owner);
        }
        Files.setPosixFilePermissions(base, PosixFilePermissions.fromString("rwx--x--x"));
        data = base.resolve("data");
        Path pw = base.resolve("pw");
        Files.writeString(pw, PASSWORD + "\n");
        Files.setPosixFilePermissions(pw, PosixFilePermissions.fromString("rw-r--r--"));
        if (!asUser.isEmpty()) {
            Files.setOwner(pw, Files.getOwner(base));
        }
        int init = run(cmd(initdb.toString(), "-D", data.toString(), "-U", USER, "--pwfile=" + pw,
                "-A", "scram-sha-256", "-N", "-E", "UTF8", "--locale=C"), 120);
        if (init != 0) {
            skipped = "initdb failed (exit " + init + ")";
            return;
        }
        try (ServerSocket s = new ServerSocket(0)) {
            port = s.getLocalPort();
        }
        int start = run(cmd(pgCtl.toString(), "-D", data.toString(), "-l", base.resolve("log").toString(), "-w",
                "-t", "60", "-o", "-p " + port + " -k " + base + " -c listen_addresses=localhost", "start"), 90);
        if (start != 0) {
            String log = Files.exists(base.resolve("log")) ? Files.readString(base.resolve("log")) : "";
            skipped = "the server did not start (exit " + start + "): " + log.lines().reduce((a, b) -> b).orElse("");
            port = 0;
        }
    }

    @AfterAll
    static void stopServer() throws Exception {
        if (port != 0) {
            run(cmd(pgCtl.toString(), "-D", data.toString(), "-m", "immediate", "-w", "stop"), 60);
        }
        if (base != null) {
            try (Stream<Path> all = Files.walk(base)) {
                all.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
            }
        }
    }

    private static List<String> cmd(String... args) {
        List<String> c = new ArrayList<>(asUser);
        c.addAll(List.of(args));
        return c;
    }

    private static int run(List<String> command, int timeoutS) throws IOException, InterruptedException {
        Process p = new ProcessBuilder(command).redirectErrorStream(true)
                .redirectOutput(ProcessBuilder.Redirect.DISCARD).start();
        if (!p.waitFor(timeoutS, TimeUnit.SECONDS)) {
            p.destroyForcibly();
            return -1;
        }
        return p.exitValue();
    }

    private static Path tool(String name) throws IOException {
        List<Path> places = new ArrayList<>();
        for (String d : System.getenv().getOrDefault("PATH", "").split(":")) {
            places.add(Path.of(d, name));
        }
        places.add(Path.of("/usr/local/bin", name));
        Path lib = Path.of("/usr/lib/postgresql");
        if (Files.isDirectory(lib)) {
            try (Stream<Path> versions = Files.list(lib)) {
                versions.sorted(Comparator.reverseOrder()).forEach(v -> places.add(v.resolve("bin").resolve(name)));
            }
        }
        return places.stream().filter(Files::isExecutable).findFirst().orElse(null);
    }

    private static ResultsStore open(Map<String, String> env) {
        return ResultsStore.open("postgresql://localhost:" + port + "/postgres", env,
                Clock.fixed(Instant.parse("2026-12-01T00:00:00Z"), ZoneOffset.UTC));
    }

    @Test
    void theSchemaAndAnIdempotentWaferOnPostgresql() throws Exception {
        assumeTrue(skipped == null, () -> "no PostgreSQL server could be started here: " + skipped);
        Map<String, String> env = Map.of("PGUSER", USER, "PGPASSWORD", PASSWORD);
        Path map = Files.createTempFile(base, "W1", ".tif");
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
        assertThatThrownBy(() -> open(Map.of("PGUSER", USER, "PGPASSWORD", "wrong")))
                .isInstanceOf(StoreException.class).hasMessageContaining("postgresql://localhost:" + port)
                .hasMessageNotContaining("wrong");
    }
}
