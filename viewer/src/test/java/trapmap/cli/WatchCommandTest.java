package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermissions;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.RunManifest;

/**
 * {@code trapmap watch}: one line per wafer, the alarm program (arguments, no shell) and file, SIGTERM in a child
 * process and the restart that continues it.
 */
class WatchCommandTest {
    private static final Path DEMO = Path.of("..", "demo-data");
    private static final String RULES = DEMO.resolve("rules-example.json").toString();

    private static void copyWafer(String stem, Path in) throws IOException {
        Files.copy(DEMO.resolve(stem + ".json"), in.resolve(stem + ".json"));
        Files.copy(DEMO.resolve(stem + ".tif"), in.resolve(stem + ".tif"));
    }

    @Test
    void eachWaferGetsOneLineAndTheFailedOnesRaiseTheAlarmProgramWithoutAShellAndTheAlarmFile(@TempDir Path dir)
            throws IOException {
        Path in = Files.createDirectories(dir.resolve("in"));
        copyWafer("LOT-A01-W01", in); // passes
        // fails; its id carries shell syntax, which must reach the program as one plain argument
        String id = "LOT-A01-W02;touch PWNED";
        Files.copy(DEMO.resolve("LOT-A01-W02.tif"), in.resolve("LOT-A01-W02.tif"));
        Files.writeString(in.resolve("LOT-A01-W02.json"), Files.readString(DEMO.resolve("LOT-A01-W02.json"))
                .replace("\"wafer_id\" : \"LOT-A01-W02\"", "\"wafer_id\" : \"" + id + "\""));
        Files.write(in.resolve("BROKEN-W09.tif"), new byte[] {'I', 'I', 42, 0, 1});
        Files.write(in.resolve("BROKEN-W09.tif.done"), new byte[0]);
        Path log = dir.resolve("hook.log");
        Path hook = dir.resolve("hook.sh");
        Files.writeString(hook, "#!/bin/sh\nprintf '%s|%s|%s\\n' \"$#\" \"$1\" \"$2\" >> '" + log + "'\n");
        Files.setPosixFilePermissions(hook, PosixFilePermissions.fromString("rwx------"));
        Path alarms = dir.resolve("alarms.txt");
        Path out = dir.resolve("report");

        Cli.Run r = Cli.run("watch", in.toString(), "--rules", RULES, "--out", out.toString(), "--settle-s", "0",
                "--exit-idle-s", "1", "--threads", "1", "--no-thumbnails", "--on-fail", hook.toString(),
                "--alarm-file", alarms.toString());

        assertThat(r.code()).as(r.err()).isZero();
        List<String> lines = r.out().lines().toList();
        assertThat(lines).hasSize(3);
        assertThat(lines).anySatisfy(l -> assertThat(l).matches("\\S+Z LOT-A01-W01 pass A LOT-A01-W01\\.tif"));
        assertThat(lines).anySatisfy(l -> assertThat(l).contains(id + " fail R LOT-A01-W02.tif: "));
        assertThat(lines).anySatisfy(l -> assertThat(l).contains(" BROKEN-W09 error BROKEN-W09.tif: "));
        assertThat(r.err()).contains("watch: idle for 1 s; 3 wafers inspected by this watch");
        assertThat(Files.readAllLines(log)).containsExactlyInAnyOrder("2|" + id + "|fail", "2|BROKEN-W09|error");
        assertThat(dir.resolve("PWNED")).doesNotExist();
        assertThat(in.resolve("PWNED")).doesNotExist();
        List<String> alarmLines = Files.readAllLines(alarms);
        assertThat(alarmLines).hasSize(2);
        assertThat(alarmLines).anySatisfy(l -> assertThat(l.split("\t", -1)).hasSize(4)
                .satisfies(f -> assertThat(f[1]).isEqualTo(id)).satisfies(f -> assertThat(f[2]).isEqualTo("fail"))
                .satisfies(f -> assertThat(f[3]).endsWith("LOT-A01-W02.tif")));
        assertThat(RunManifest.read(out).state()).isEqualTo(RunManifest.State.COMPLETE);
    }

    @Test
    void withAStoreEachWaferIsStoredOnceAcrossARestart(@TempDir Path dir) throws IOException {
        Path in = Files.createDirectories(dir.resolve("in"));
        copyWafer("LOT-A01-W01", in);
        copyWafer("LOT-A01-W02", in);
        Path db = dir.resolve("results.db");
        String[] args = {"watch", in.toString(), "--rules", RULES, "--out", dir.resolve("report").toString(),
            "--settle-s", "0", "--exit-idle-s", "1", "--threads", "1", "--no-thumbnails", "--store", db.toString()};
        Cli.Run first = Cli.run(args);
        assertThat(first.code()).as(first.err()).isZero();
        copyWafer("LOT-A01-W03", in);
        Cli.Run second = Cli.run(args);
        assertThat(second.code()).as(second.err()).isZero();
        assertThat(second.out().lines().count()).isOne();
        try (trapmap.store.ResultsStore s = trapmap.store.ResultsStore.open(db.toString())) {
            List<trapmap.store.StoredPoint> points = s.points("harmonic_mean_lifetime_us", "lot", null, null);
            assertThat(points).extracting(trapmap.store.StoredPoint::waferId)
                    .containsExactlyInAnyOrder("LOT-A01-W01", "LOT-A01-W02", "LOT-A01-W03");
            assertThat(points).allSatisfy(p -> assertThat(p.lot()).isEqualTo("LOT-A01"));
        }
    }

    @Test
    void badOptionsAreRefusedWithOneLine(@TempDir Path dir) {
        Cli.Run r = Cli.run("watch", dir.resolve("nowhere").toString(), "--rules", RULES, "--out",
                dir.resolve("o").toString());
        assertThat(r.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(r.err()).contains("FOLDER " + dir.resolve("nowhere") + " does not exist");
        Cli.Run s = Cli.run("watch", dir.toString(), "--rules", RULES, "--out", dir.resolve("o").toString(),
                "--settle-s", "-1");
        assertThat(s.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(s.err()).contains("--settle-s must be in [0, 86400] s (got -1)");
        // an alarm file that could never take a line is refused at the start, not at the first alarm
        Path alarms = dir.resolve("no-such-folder").resolve("a.txt");
        Cli.Run a = Cli.run("watch", dir.toString(), "--rules", RULES, "--out", dir.resolve("o").toString(),
                "--alarm-file", alarms.toString(), "--exit-idle-s", "1");
        assertThat(a.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(a.err().strip()).isEqualTo("trapmap watch: --alarm-file " + alarms + " cannot take alarm lines:"
                + " its folder " + alarms.getParent() + " does not exist");
        assertThat(dir.resolve("o")).doesNotExist();
    }

    @Test
    void sigtermStopsCleanlyAndARestartInspectsTheRestOnceEach(@TempDir Path dir) throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        List<String> stems = new ArrayList<>();
        for (int i = 1; i <= 8; i++) {
            String stem = "LOT-A01-W0" + i;
            copyWafer(stem, in);
            stems.add(stem);
        }
        Path out = dir.resolve("report");
        Path childLog = dir.resolve("child.log");
        String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        Process p = new ProcessBuilder(java, "-Xshare:auto", "-XX:TieredStopAtLevel=1", "-cp",
                System.getProperty("java.class.path"), TrapmapCommand.class.getName(), "watch", in.toString(),
                "--rules", RULES, "--out", out.toString(), "--settle-s", "0", "--threads", "1")
                .redirectErrorStream(true).redirectOutput(childLog.toFile()).start();
        try {
            long end = System.nanoTime() + TimeUnit.SECONDS.toNanos(120);
            while (System.nanoTime() < end && p.isAlive()
                    && Files.readString(childLog, StandardCharsets.UTF_8).lines().filter(l -> l.contains(" pass ")
                    || l.contains(" fail ")).count() < 2) {
                Thread.sleep(20);
            }
            p.destroy(); // SIGTERM
            assertThat(p.waitFor(60, TimeUnit.SECONDS)).as("ended after SIGTERM").isTrue();
        } finally {
            p.destroyForcibly();
        }
        String childText = Files.readString(childLog, StandardCharsets.UTF_8);
        assertThat(p.exitValue()).as(childText).isEqualTo(143);
        assertThat(childText).contains("watch: stopped; ");
        try (Stream<Path> files = Files.list(out)) {
            assertThat(files.map(f -> f.getFileName().toString()))
                    .noneMatch(n -> n.endsWith(".tmp") || n.endsWith(".new"));
        }
        List<String> before = BatchInspection.listedFiles(out);
        assertThat(before).isNotEmpty();

        Cli.Run r = Cli.run("watch", in.toString(), "--rules", RULES, "--out", out.toString(), "--settle-s", "0",
                "--exit-idle-s", "1", "--threads", "1");
        assertThat(r.code()).as(r.err()).isZero();
        List<String> names = BatchInspection.listedFiles(out).stream()
                .map(f -> Path.of(f).getFileName().toString()).toList();
        assertThat(names).doesNotHaveDuplicates()
                .containsExactlyInAnyOrderElementsOf(stems.stream().map(s -> s + ".tif").toList());
        assertThat(r.out().lines().count()).as("lines of the restart: only the maps not listed before")
                .isEqualTo(stems.size() - before.size());
        for (String f : before) {
            assertThat(r.out()).doesNotContain(" " + Path.of(f).getFileName());
        }
        assertThat(RunManifest.read(out).state()).isEqualTo(RunManifest.State.COMPLETE);
    }
}
