package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.ResultSet;
import java.sql.Statement;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.BatchInspection;

/**
 * {@code watch --store} in a child JVM killed (SIGKILL) at seeded random moments, several times, and started again
 * with the same folder and store: the store must end with the same wafers, verdicts, grades and figures as an
 * uninterrupted watch's, each stored once, also when a wafer's rows reached the folder while its store write still
 * waited (a restart inspects the listed maps the store misses again).
 */
class WatchStoreKillTest {
    private static final Path DEMO = Path.of("..", "demo-data");
    private static final String RULES = DEMO.resolve("rules-example.json").toString();
    private static final int MAPS = 12;
    private static final int KILLS = 4;

    @TempDir
    Path dir;

    @Test
    void killedAndRestartedWatchesStoreWhatAnUninterruptedWatchStores() throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        for (Path m : InspectStoreKillTest.demoMaps(MAPS)) {
            InspectStoreKillTest.copySidecar(m, in); // the sidecar first: a map counts once it has one
            Files.copy(m, in.resolve(m.getFileName()));
            Files.write(in.resolve(m.getFileName() + ".done"), new byte[0]); // complete without settling
        }
        Path a = dir.resolve("a.db");
        Path refOut = dir.resolve("a");
        Cli.Run ref = Cli.run(args(in, refOut, a, true).toArray(String[]::new));
        assertThat(ref.code()).as(ref.err()).isZero();
        Map<String, String> expected = InspectStoreKillTest.wafers(a);
        assertThat(expected).hasSize(MAPS);

        Path b = dir.resolve("b.db");
        Path out = dir.resolve("b");
        Random random = new Random(20261206L);
        List<String> kills = new ArrayList<>();
        for (int i = 0; i < KILLS; i++) {
            int listed = Files.exists(out) ? BatchInspection.listedFiles(out).size() : 0;
            List<String> cmd = new ArrayList<>(List.of(Path.of(System.getProperty("java.home"), "bin", "java")
                    .toString(), "-Xshare:auto", "-XX:TieredStopAtLevel=1", "-cp",
                    System.getProperty("java.class.path"), TrapmapCommand.class.getName()));
            cmd.addAll(args(in, out, b, false));
            Path log = dir.resolve("child" + i + ".log");
            Process p = new ProcessBuilder(cmd).redirectErrorStream(true).redirectOutput(log.toFile()).start();
            int after = Math.min(MAPS - listed, 1 + random.nextInt(3)); // wafer lines seen before the kill
            try {
                long end = System.nanoTime() + TimeUnit.SECONDS.toNanos(60);
                while (System.nanoTime() < end && p.isAlive() && waferLines(log) < after) {
                    Thread.sleep(5);
                }
                Thread.sleep(random.nextInt(after == 0 ? 800 : 40));
            } finally {
                p.destroyForcibly(); // SIGKILL
                assertThat(p.waitFor(60, TimeUnit.SECONDS)).isTrue();
            }
            kills.add(p.exitValue() + " after " + waferLines(log) + " lines: " + (Files.exists(out)
                    ? BatchInspection.listedFiles(out).size() : 0) + " listed, " + stored(b) + " stored");
        }
        Cli.Run done = Cli.run(args(in, out, b, true).toArray(String[]::new));
        assertThat(done.code()).as(done.err()).isZero();
        assertThat(sortedRows(out.resolve("results.csv"), out))
                .isEqualTo(sortedRows(refOut.resolve("results.csv"), refOut));
        assertThat(InspectStoreKillTest.wafers(b)).as("kills (exit status, lines, listed, stored): %s", kills)
                .isEqualTo(expected);
    }

    /** The wafer lines ({@code TIME ID VERDICT ...}) in a child's log so far. */
    private static long waferLines(Path log) throws IOException {
        return Files.readString(log, StandardCharsets.UTF_8).lines()
                .filter(l -> l.matches("\\S+Z \\S+ (pass|fail|error) .*")).count();
    }

    /** The wafers a store holds now (0 when it does not exist yet). */
    private static long stored(Path db) throws Exception {
        if (!Files.exists(db)) {
            return 0;
        }
        try (Connection c = DriverManager.getConnection("jdbc:sqlite:" + db);
             Statement s = c.createStatement();
             ResultSet r = s.executeQuery("SELECT COUNT(*) FROM wafers")) {
            return r.next() ? r.getLong(1) : 0;
        } catch (java.sql.SQLException e) {
            return -1; // no schema yet
        }
    }

    /** The rows of a results table in sorted order, with its folder's path made neutral. */
    private static List<String> sortedRows(Path csv, Path folder) throws IOException {
        return Files.readAllLines(csv).stream().map(l -> l.replace(folder.toString(), "OUT")).sorted().toList();
    }

    private static List<String> args(Path in, Path out, Path store, boolean idle) {
        List<String> a = new ArrayList<>(List.of("watch", in.toString(), "--rules", RULES, "--out", out.toString(),
                "--store", store.toString(), "--settle-s", "0", "--threads", "1", "--no-thumbnails"));
        if (idle) {
            a.addAll(List.of("--exit-idle-s", "1"));
        }
        return a;
    }
}
