package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.PreparedStatement;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.demo.HistoryScenario;
import trapmap.maps.trend.Baseline;
import trapmap.maps.trend.ChartKind;
import trapmap.maps.trend.ControlChart;
import trapmap.maps.trend.RunRule;
import trapmap.maps.trend.Signal;
import trapmap.store.ResultsStore;
import trapmap.store.StoreTrend;
import trapmap.store.StoredPoint;

/**
 * The watch's alarm on a control-chart signal over the invented production history ({@link HistoryScenario}: tube T2
 * drifts up 15 %/day from {@link HistoryScenario#CHANGE_AT}, T1 is steady), its lots arriving in four parts, each
 * watched by a new start of {@code watch --store} with a rules {@code trend} block (Fe_i median by furnace tube,
 * baseline before 2026-10-12, alarm on a point beyond 3σ): T2's drift raises the alarm within a few T2 lots of the
 * change, T1 never; every alarm is raised once, and the alarms are exactly the signals of the final store's T2 chart
 * after its baseline; a restart with nothing new raises nothing, and a start after a kill raises the signals of the
 * wafers the killed watch did not store or did not look at, once each, and no other.
 *
 * <p>Measured on this history (this test's rules): 43 alarms, all on T2's chart, one of them before the change
 * (2026-10-14, a point of the baseline spread beyond its limit, as {@code trend} shows too); the first after the change
 * is in the 3rd T2 lot processed after it.
 */
class WatchSignalAlarmHistoryTest {
    private static final String FIGURE = TrendByTubeHistoryTest.FIGURE;
    private static final String BASELINE_UNTIL = "2026-10-12";
    /** The lots (1-based, inclusive) each start of the watch finds: before, around and after the change. */
    private static final int[] PARTS = {21, 36, 48, 63};

    @TempDir
    Path dir;

    @Test
    void theDriftingTubeRaisesTheAlarmOnceForEachSignalAndTheSteadyTubeNever() throws Exception {
        Path hist = dir.resolve("history");
        HistoryScenario.write(hist);
        ObjectMapper json = new ObjectMapper();
        ObjectNode rules = (ObjectNode) json.readTree(hist.resolve(HistoryScenario.RULES).toFile());
        ObjectNode trend = rules.putObject("trend");
        trend.put("figure", FIGURE).put("by", "furnace_tube").put("baseline_until", BASELINE_UNTIL);
        trend.putArray("alarm_rules").add("beyond_3_sigma");
        Path rulesFile = dir.resolve("rules-trend.json");
        json.writeValue(rulesFile.toFile(), rules);

        Map<String, HistoryScenario.Wafer> wafers = new HashMap<>();
        for (HistoryScenario.Wafer w : HistoryScenario.build()) {
            wafers.put(String.format(Locale.ROOT, "%s-S%02d", w.lot(), w.boatSlot()), w);
        }
        Path in = Files.createDirectories(dir.resolve("in"));
        Path db = dir.resolve("results.sqlite");
        Path alarms = dir.resolve("alarms.tsv");
        String[] args = {"watch", in.toString(), "--rules", rulesFile.toString(), "--out",
            dir.resolve("report").toString(), "--store", db.toString(), "--settle-s", "0", "--exit-idle-s", "1",
            "--threads", "2", "--no-thumbnails", "--alarm-file", alarms.toString()};
        int copied = 0;
        for (int last : PARTS) {
            for (HistoryScenario.Wafer w : wafers.values()) {
                int lot = Integer.parseInt(w.lot().substring(1));
                String stem = String.format(Locale.ROOT, "%s-S%02d", w.lot(), w.boatSlot());
                if (lot <= last && !Files.exists(in.resolve(stem + ".tif"))) {
                    Files.copy(hist.resolve(stem + ".json"), in.resolve(stem + ".json"));
                    Files.copy(hist.resolve(stem + ".tif"), in.resolve(stem + ".tif"));
                    copied++;
                }
            }
            Cli.Run r = Cli.run(args);
            assertThat(r.code()).as(r.err()).isZero();
            assertThat(r.out().lines().filter(l -> !l.contains(" signal ")).count()).isEqualTo(copied);
            copied = 0;
        }

        List<String[]> signals = signalLines(alarms);
        assertThat(signals).isNotEmpty().allSatisfy(f -> {
            assertThat(f[3]).isEqualTo("beyond_3_sigma " + HistoryScenario.DRIFT_TUBE + " " + FIGURE);
            assertThat(wafers.get(f[1]).furnaceTube()).isEqualTo(HistoryScenario.DRIFT_TUBE);
        });
        List<String> ids = signals.stream().map(f -> f[1]).toList();
        assertThat(ids).as("each signal raised once").doesNotHaveDuplicates();

        // the alarms are the final store's T2 signals after the baseline, nothing more or less (T1 has none)
        Set<String> charted = new TreeSet<>();
        try (ResultsStore s = ResultsStore.open(db.toString())) {
            StoreTrend.Outcome o = StoreTrend.analyse(s, new StoreTrend.Request(FIGURE, "furnace_tube", null, null,
                    Baseline.before(java.time.Instant.parse(BASELINE_UNTIL + "T00:00:00Z"))));
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
        assertThat(new TreeSet<>(ids)).isEqualTo(charted);

        // T2's drift: raised within a few T2 lots processed after the change
        List<String> t2LotsAfter = new ArrayList<>(new LinkedHashSet<>(wafers.values().stream()
                .filter(w -> w.furnaceTube().equals(HistoryScenario.DRIFT_TUBE))
                .filter(w -> w.processedAt().isAfter(HistoryScenario.CHANGE_AT))
                .sorted(Comparator.comparing(HistoryScenario.Wafer::processedAt))
                .map(HistoryScenario.Wafer::lot).toList()));
        String firstLot = ids.stream().map(wafers::get).filter(w -> w.processedAt().isAfter(
                HistoryScenario.CHANGE_AT)).min(Comparator.comparing(HistoryScenario.Wafer::processedAt))
                .orElseThrow().lot();
        assertThat(t2LotsAfter.indexOf(firstLot) + 1).as("T2 lots after the change until the alarm")
                .isBetween(1, TrendByTubeHistoryTest.MAX_T2_LOTS_TO_DETECT);

        // a restart with nothing new raises nothing new
        String before = Files.readString(alarms);
        Cli.Run again = Cli.run(args);
        assertThat(again.code()).as(again.err()).isZero();
        assertThat(again.out()).isEmpty();
        assertThat(Files.readString(alarms)).isEqualTo(before);

        // a wafer whose signal was raised, lost from the store afterwards: stored again, its signal not raised again
        Path ledger = dir.resolve("report").resolve(trapmap.maps.watch.AlarmLedger.SIGNALS);
        int storedBefore = storedWafers(db);
        forget(db, ids.get(0));
        Cli.Run restored = Cli.run(args);
        assertThat(restored.code()).as(restored.err()).isZero();
        assertThat(storedWafers(db)).isEqualTo(storedBefore);
        assertThat(restored.out()).isEmpty();
        assertThat(Files.readString(alarms)).isEqualTo(before);

        // killed before a wafer's store write (its rows in the folder, not in the store, not looked at), and killed
        // between another's store write and the look at its signals: the next start raises each of them once
        String unstored = ids.get(ids.size() / 2);
        String unlooked = ids.get(ids.size() - 1);
        forget(db, unstored);
        List<String> looked = new ArrayList<>(Files.readAllLines(ledger));
        assertThat(looked.removeIf(f -> f.endsWith(unstored + ".tif") || f.endsWith(unlooked + ".tif"))).isTrue();
        Files.write(ledger, looked);
        Cli.Run killed = Cli.run(args);
        assertThat(killed.code()).as(killed.err()).isZero();
        assertThat(storedWafers(db)).isEqualTo(storedBefore);
        assertThat(killed.out().lines().toList()).hasSize(2)
                .anySatisfy(l -> assertThat(l).contains(" " + unstored + " signal beyond_3_sigma T2 " + FIGURE
                        + ": individuals (X) of T2: "))
                .anySatisfy(l -> assertThat(l).contains(" " + unlooked + " signal beyond_3_sigma T2 " + FIGURE));
        String added = Files.readString(alarms).substring(before.length());
        assertThat(added.lines().map(l -> l.split("\t")[1])).containsExactlyInAnyOrder(unstored, unlooked);

        // a folder watched without the ledger (before the alarm existed) does not raise its history
        String withBoth = Files.readString(alarms);
        Files.delete(ledger);
        Cli.Run upgraded = Cli.run(args);
        assertThat(upgraded.code()).as(upgraded.err()).isZero();
        assertThat(upgraded.out()).isEmpty();
        assertThat(Files.readString(alarms)).isEqualTo(withBoth);
        assertThat(ledger).exists();
    }

    @Test
    void aTrendBlockWithoutAStoreSaysSoAndAStoreThatCannotBeChartedYetSaysOnceThatTheAlarmWaits() throws Exception {
        Path demo = Path.of("..", "demo-data");
        ObjectMapper json = new ObjectMapper();
        ObjectNode rules = (ObjectNode) json.readTree(demo.resolve("rules-example.json").toFile());
        rules.putObject("trend").put("figure", "harmonic_mean_lifetime_us");
        Path rulesFile = dir.resolve("rules-trend.json");
        json.writeValue(rulesFile.toFile(), rules);
        Path in = Files.createDirectories(dir.resolve("in"));
        for (String stem : List.of("LOT-A01-W01", "LOT-A01-W02")) {
            Files.copy(demo.resolve(stem + ".json"), in.resolve(stem + ".json"));
            Files.copy(demo.resolve(stem + ".tif"), in.resolve(stem + ".tif"));
        }
        Cli.Run plain = Cli.run("watch", in.toString(), "--rules", rulesFile.toString(), "--out",
                dir.resolve("plain").toString(), "--settle-s", "0", "--exit-idle-s", "1", "--threads", "1",
                "--no-thumbnails");
        assertThat(plain.code()).as(plain.err()).isZero();
        assertThat(plain.err()).contains("watch: the rules' trend block needs --store: no signal alarm");

        Cli.Run stored = Cli.run("watch", in.toString(), "--rules", rulesFile.toString(), "--out",
                dir.resolve("stored").toString(), "--store", dir.resolve("r.db").toString(), "--settle-s", "0",
                "--exit-idle-s", "1", "--threads", "1", "--no-thumbnails");
        assertThat(stored.code()).as(stored.err()).isZero();
        assertThat(stored.errLines().stream().filter(l -> l.startsWith("watch: signal alarm waits: the trend"
                + " cannot be charted yet: ")).count()).as(stored.err()).isOne();
        assertThat(stored.out().lines().filter(l -> l.contains(" signal "))).isEmpty();
    }

    /** The signal lines of the alarm file, split at tabs. */
    private static List<String[]> signalLines(Path alarms) throws Exception {
        List<String[]> out = new ArrayList<>();
        for (String l : Files.readAllLines(alarms)) {
            String[] f = l.split("\t", -1);
            assertThat(f).hasSize(4);
            if (f[2].equals("signal")) {
                out.add(f);
            }
        }
        return out;
    }

    private static int storedWafers(Path db) throws Exception {
        try (ResultsStore s = ResultsStore.open(db.toString())) {
            Set<String> ids = new HashSet<>();
            for (StoredPoint p : s.points(FIGURE, null, null, null)) {
                assertThat(ids.add(p.file())).as("stored once: %s", p.file()).isTrue();
            }
            return ids.size();
        }
    }

    /** Removes every row of wafer {@code id} from the store, as if its write had never happened. */
    private static void forget(Path db, String id) throws Exception {
        try (Connection c = DriverManager.getConnection("jdbc:sqlite:" + db)) {
            String key = "(SELECT result_key FROM wafers WHERE wafer_id = ?)";
            for (String table : List.of("footprint_cells", "wafer_footprints", "wafer_regions", "wafer_attributes",
                    "wafer_failed_rules", "wafer_figures")) {
                try (PreparedStatement p = c.prepareStatement("DELETE FROM " + table + " WHERE result_key IN "
                        + key)) {
                    p.setString(1, id);
                    p.executeUpdate();
                }
            }
            try (PreparedStatement p = c.prepareStatement("DELETE FROM wafers WHERE wafer_id = ?")) {
                p.setString(1, id);
                assertThat(p.executeUpdate()).isOne();
            }
        }
    }
}
