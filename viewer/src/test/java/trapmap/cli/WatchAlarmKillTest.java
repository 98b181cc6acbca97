package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermissions;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeSet;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.demo.HistoryScenario;
import trapmap.maps.trend.Baseline;
import trapmap.maps.trend.ChartKind;
import trapmap.maps.trend.ControlChart;
import trapmap.maps.trend.RunRule;
import trapmap.maps.trend.Signal;
import trapmap.maps.watch.AlarmLedger;
import trapmap.store.ResultsStore;
import trapmap.store.StoreTrend;

/**
 * The watch's alarms are raised at least once whatever moment the watch is killed at: a child {@code watch} is killed
 * (SIGKILL) by its own {@code --on-fail} program at the first alarm of a kind, before that alarm gets through (the
 * program ends the watch, its parent, and logs nothing); a new start then raises every alarm the killed one had not
 * finished, so that the program has seen each failed wafer and each signal exactly once (the killed alarm is the one
 * raised again). Keeping the ledger before the alarm and marking it raised only afterwards is what makes this hold:
 * recorded-then-raised alone loses the killed alarm.
 */
class WatchAlarmKillTest {
    private static final Path DEMO = Path.of("..", "demo-data");
    private static final String FIGURE = TrendByTubeHistoryTest.FIGURE;

    @TempDir
    Path dir;

    @Test
    void aWatchKilledWhileRaisingAFailedWafersAlarmRaisesItOnTheNextStart() throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        for (Path m : InspectStoreKillTest.demoMaps(8)) {
            InspectStoreKillTest.copySidecar(m, in);
            Files.copy(m, in.resolve(m.getFileName()));
            Files.write(in.resolve(m.getFileName() + ".done"), new byte[0]);
        }
        Path log = dir.resolve("program.log");
        Path hook = killingProgram(log, "");
        Path out = dir.resolve("report");
        List<String> args = List.of("watch", in.toString(), "--rules", DEMO.resolve("rules-example.json").toString(),
                "--out", out.toString(), "--settle-s", "0", "--threads", "1", "--no-thumbnails", "--on-fail",
                hook.toString(), "--exit-idle-s", "1");

        assertThat(child(args)).as("killed by its alarm program").isEqualTo(137);
        assertThat(log).doesNotExist(); // the first alarm did not get through
        Cli.Run again = Cli.run(args.toArray(String[]::new));
        assertThat(again.code()).as(again.err()).isZero();

        List<String> failed = new ArrayList<>();
        for (Map<String, String> row : BatchInspection.listedRows(out)) {
            if (!row.get("status").equals("pass")) {
                failed.add(row.get("wafer_id") + "|" + row.get("status"));
            }
        }
        assertThat(failed).hasSizeGreaterThanOrEqualTo(4); // demo W02, W04, W05, W07 fail
        assertThat(Files.readAllLines(log)).as(again.err()).containsExactlyInAnyOrderElementsOf(failed);
        assertThat(Files.readString(out.resolve(AlarmLedger.FAILURES))).doesNotContain("\n\n"); // none pending
    }

    @Test
    void aWatchKilledWhileRaisingASignalAlarmRaisesItOnTheNextStart() throws Exception {
        Path hist = dir.resolve("history");
        HistoryScenario.write(hist);
        ObjectMapper json = new ObjectMapper();
        ObjectNode rules = (ObjectNode) json.readTree(hist.resolve(HistoryScenario.RULES).toFile());
        rules.putObject("trend").put("figure", FIGURE).put("by", "furnace_tube").put("baseline_until", "2026-10-12")
                .putArray("alarm_rules").add("beyond_3_sigma");
        Path rulesFile = dir.resolve("rules-trend.json");
        json.writeValue(rulesFile.toFile(), rules);
        Path in = Files.createDirectories(dir.resolve("in"));
        for (HistoryScenario.Wafer w : HistoryScenario.build()) {
            if (Integer.parseInt(w.lot().substring(1)) <= 36) { // past T2's change: signals in the last lots
                String stem = String.format(Locale.ROOT, "%s-S%02d", w.lot(), w.boatSlot());
                Files.copy(hist.resolve(stem + ".json"), in.resolve(stem + ".json"));
                Files.copy(hist.resolve(stem + ".tif"), in.resolve(stem + ".tif"));
            }
        }
        Path log = dir.resolve("program.log");
        Path hook = killingProgram(log, "signal");
        Path out = dir.resolve("report");
        Path db = dir.resolve("results.sqlite");
        List<String> args = List.of("watch", in.toString(), "--rules", rulesFile.toString(), "--out",
                out.toString(), "--store", db.toString(), "--settle-s", "0", "--threads", "2", "--no-thumbnails",
                "--on-fail", hook.toString(), "--exit-idle-s", "1");

        assertThat(child(args)).as("killed by its alarm program").isEqualTo(137);
        assertThat(Files.readString(out.resolve(AlarmLedger.SIGNALS))).as("the killed alarm left pending")
                .contains("\n\n");
        Cli.Run again = Cli.run(args.toArray(String[]::new));
        assertThat(again.code()).as(again.err()).isZero();
        assertThat(again.err()).contains("signal alarm").contains("had not finished raising");

        List<String> signals = Files.readAllLines(log).stream().filter(l -> l.contains("|signal|")).toList();
        assertThat(signals).isNotEmpty().allSatisfy(l -> assertThat(l).endsWith(
                "|signal|beyond_3_sigma|" + HistoryScenario.DRIFT_TUBE + "|" + FIGURE));
        List<String> ids = signals.stream().map(l -> l.substring(0, l.indexOf('|'))).toList();
        assertThat(ids).as("each signal seen once").doesNotHaveDuplicates();
        assertThat(new TreeSet<>(ids)).isEqualTo(chartedSignals(db));
        assertThat(Files.readString(out.resolve(AlarmLedger.SIGNALS))).doesNotContain("\n\n");
    }

    /**
     * An alarm program that, at its first alarm whose verdict is {@code kind} (empty: any), ends the watch that ran
     * it (its parent) by SIGKILL and logs nothing; afterwards it logs its arguments joined by {@code |}.
     */
    private Path killingProgram(Path log, String kind) throws Exception {
        Path marker = dir.resolve("killed-once");
        Path hook = dir.resolve("alarm.sh");
        Files.writeString(hook, "#!/bin/sh\n"
                + "if { [ -z '" + kind + "' ] || [ \"$2\" = '" + kind + "' ]; } && [ ! -e '" + marker + "' ]; then\n"
                + "  : > '" + marker + "'\n  kill -9 $PPID\n  sleep 30\n  exit 1\nfi\n"
                + "(IFS='|'; printf '%s\\n' \"$*\") >> '" + log + "'\n");
        Files.setPosixFilePermissions(hook, PosixFilePermissions.fromString("rwx------"));
        return hook;
    }

    /** Runs the command in a child JVM until it ends (at most 5 min); its exit status. */
    private int child(List<String> args) throws Exception {
        List<String> cmd = new ArrayList<>(List.of(Path.of(System.getProperty("java.home"), "bin", "java")
                .toString(), "-Xshare:auto", "-XX:TieredStopAtLevel=1", "-cp", System.getProperty("java.class.path"),
                TrapmapCommand.class.getName()));
        cmd.addAll(args);
        Process p = new ProcessBuilder(cmd).redirectErrorStream(true)
                .redirectOutput(dir.resolve("child.log").toFile()).start();
        try {
            assertThat(p.waitFor(5, TimeUnit.MINUTES)).as("the child ended").isTrue();
        } finally {
            p.destroyForcibly();
        }
        return p.exitValue();
    }

    /** The wafers behind the beyond-3σ signals after the baseline on the final store's per-tube charts. */
    private static TreeSet<String> chartedSignals(Path db) throws Exception {
        TreeSet<String> charted = new TreeSet<>();
        try (ResultsStore s = ResultsStore.open(db.toString())) {
            StoreTrend.Outcome o = StoreTrend.analyse(s, new StoreTrend.Request(FIGURE, "furnace_tube", null, null,
                    Baseline.before(java.time.Instant.parse("2026-10-12T00:00:00Z"))));
            for (ControlChart c : o.result().perGroup()) {
                if (c.kind() != ChartKind.GROUP_INDIVIDUALS) {
                    continue;
                }
                for (Signal sig : c.signals()) {
                    if (sig.rule() == RunRule.BEYOND_3_SIGMA && !c.points().get(sig.index()).baseline()) {
                        charted.add(o.wafersBehind(c, sig.index()).get(0).waferId());
                    }
                }
            }
        }
        return charted;
    }
}
