package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.TreeMap;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code inspect --store} in a child JVM killed (SIGKILL) at seeded random moments and resumed with the same store:
 * the store must end with the same wafers, verdicts, grades and figures as an uninterrupted run's, also when a wafer's
 * rows reached the folder while its store write still waited.
 */
class InspectStoreKillTest {
    private static final Path DEMO = Path.of("..", "demo-data");
    private static final String RULES = DEMO.resolve("rules-example.json").toString();
    private static final int MAPS = 12;

    @TempDir
    Path dir;

    /** The first {@code n} demonstration maps (by name). */
    static List<Path> demoMaps(int n) throws java.io.IOException {
        List<Path> maps;
        try (Stream<Path> s = Files.list(DEMO)) {
            maps = s.filter(p -> p.getFileName().toString().endsWith(".tif")).sorted().limit(n).toList();
        }
        assertThat(maps).hasSize(n);
        return maps;
    }

    /** Copies the sidecar of {@code map}, when it has one, into {@code folder}. */
    static void copySidecar(Path map, Path folder) throws java.io.IOException {
        Path sidecar = map.resolveSibling(map.getFileName().toString().replace(".tif", ".json"));
        if (Files.exists(sidecar)) {
            Files.copy(sidecar, folder.resolve(sidecar.getFileName()));
        }
    }

    @Test
    void killedAndResumedRunsStoreWhatAnUninterruptedRunStores() throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        for (Path m : demoMaps(MAPS)) {
            Files.copy(m, in.resolve(m.getFileName()));
            copySidecar(m, in);
        }
        Path a = dir.resolve("a.db");
        Cli.Run ref = Cli.run(args(in, dir.resolve("a"), a).toArray(String[]::new));
        assertThat(ref.code()).as(ref.err()).isIn(0, 1);
        Map<String, String> expected = wafers(a);
        assertThat(expected).hasSize(MAPS);

        Path b = dir.resolve("b.db");
        Path out = dir.resolve("b");
        Random random = new Random(20261205L);
        List<String> codes = new ArrayList<>();
        for (int i = 0; i < 3; i++) {
            List<String> cmd = new ArrayList<>(List.of(Path.of(System.getProperty("java.home"), "bin", "java")
                    .toString(), "-Xshare:auto", "-XX:TieredStopAtLevel=1", "-cp",
                    System.getProperty("java.class.path"), TrapmapCommand.class.getName()));
            cmd.addAll(args(in, out, b));
            if (i > 0) {
                cmd.add("--resume");
            }
            Path log = dir.resolve("child" + i + ".log");
            Process p = new ProcessBuilder(cmd).redirectErrorStream(true).redirectOutput(log.toFile()).start();
            int after = 1 + random.nextInt(4); // progress lines seen before the kill
            try {
                long end = System.nanoTime() + TimeUnit.SECONDS.toNanos(60);
                while (System.nanoTime() < end && p.isAlive() && progress(log) < after) {
                    Thread.sleep(5);
                }
                Thread.sleep(random.nextInt(40));
            } finally {
                p.destroyForcibly(); // SIGKILL
                assertThat(p.waitFor(60, TimeUnit.SECONDS)).isTrue();
            }
            codes.add(p.exitValue() + " after " + progress(log));
        }
        List<String> last = args(in, out, b);
        last.add("--resume");
        Cli.Run done = Cli.run(last.toArray(String[]::new));
        assertThat(done.code()).as(done.err()).isEqualTo(ref.code());
        assertThat(Files.readString(out.resolve("results.csv")))
                .isEqualTo(Files.readString(dir.resolve("a").resolve("results.csv")).replace(
                        dir.resolve("a").toString(), out.toString()));
        assertThat(wafers(b)).as("kills (exit status, progress lines): %s", codes).isEqualTo(expected);
    }

    /** The progress lines ({@code inspect: N/TOTAL FILE}) in a child's log so far. */
    private static long progress(Path log) throws IOException {
        return Files.readString(log, StandardCharsets.UTF_8).lines().filter(l -> l.startsWith("inspect: ")
                && l.contains("/")).count();
    }

    private static List<String> args(Path in, Path out, Path store) {
        return new ArrayList<>(List.of("inspect", in.toString(), "--rules", RULES, "--out", out.toString(),
                "--store", store.toString(), "--threads", "1", "--no-pdf", "--no-thumbnails"));
    }

    /** Each stored wafer by file: wafer id, verdict, grade, failed rules and every figure (run ids and times left out). */
    static Map<String, String> wafers(Path db) throws SQLException {
        Map<String, String> rows = new TreeMap<>();
        try (Connection c = DriverManager.getConnection("jdbc:sqlite:" + db);
             Statement s = c.createStatement()) {
            try (ResultSet r = s.executeQuery("SELECT file, wafer_id, verdict, grade, profile, result_key FROM wafers")) {
                while (r.next()) {
                    String old = rows.put(r.getString(1), r.getString(2) + " " + r.getString(3) + " " + r.getString(4)
                            + " " + r.getString(5) + " " + r.getString(6));
                    assertThat(old).as("stored once: %s", r.getString(1)).isNull();
                }
            }
            appendEach(s, rows, "SELECT w.file, f.figure || '=' || COALESCE(f.value, 'NULL') FROM wafer_figures f"
                    + " JOIN wafers w ON w.result_key = f.result_key ORDER BY w.file, f.figure");
            appendEach(s, rows, "SELECT w.file, 'failed ' || f.rule FROM wafer_failed_rules f"
                    + " JOIN wafers w ON w.result_key = f.result_key ORDER BY w.file, f.position");
        }
        return rows;
    }

    private static void appendEach(Statement s, Map<String, String> rows, String sql) throws SQLException {
        try (ResultSet r = s.executeQuery(sql)) {
            while (r.next()) {
                rows.merge(r.getString(1), r.getString(2), (x, y) -> x + " " + y);
            }
        }
    }
}
