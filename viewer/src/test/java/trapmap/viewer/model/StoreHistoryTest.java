package trapmap.viewer.model;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.WaferResult;
import trapmap.maps.trend.Baseline;
import trapmap.maps.trend.ControlChart;
import trapmap.shared.error.InvalidValueException;
import trapmap.store.ResultsStore;
import trapmap.store.RunInfo;
import trapmap.store.StoreException;
import trapmap.store.StoreFilter;
import trapmap.store.StoreTrend;
import trapmap.store.StoredPoint;
import trapmap.store.WaferRecord;

/** The history window's queries without a display: the store address, choices, baseline, signals and map files. */
class StoreHistoryTest {
    @TempDir
    Path dir;

    /** A store of {@code n} wafers an hour apart, in lots of three, with a tube fact; maps named W01.tif… in dir. */
    private Path store(int n, double jumpFrom) {
        Path file = dir.resolve("h.db");
        try (ResultsStore s = ResultsStore.open(file.toString())) {
            Instant start = Instant.parse("2026-10-05T06:00:00Z");
            String run = s.startRun(new RunInfo(start, "rules.json", "r", "{}", "s", "test"));
            for (int i = 0; i < n; i++) {
                Map<String, Double> figures = new LinkedHashMap<>();
                figures.put("trap_density_p50_cm3", (i >= jumpFrom ? 9e10 : 3e10) * (1 + 0.01 * (i % 4)));
                figures.put("flagged_area_fraction", 0.0);
                String id = String.format("W%02d", i + 1);
                WaferResult r = new WaferResult("maps/" + id + ".tif", id, WaferResult.Status.PASS, "A", "default",
                        "fe-i", figures, List.of(), List.of(), List.of(), "", null);
                Instant t = start.plusSeconds(3600L * i);
                String lot = "L" + (i / 3 + 1);
                s.write(run, new WaferRecord(r, "sha" + i, Map.of("lot", lot, "measured_at", t.toString(),
                        "boat_slot", String.valueOf(i % 3 + 1)), lot, t, List.of()));
            }
        }
        return file;
    }

    @Test
    void anAddressIsAnExistingFileOrAPostgresqlAddress() throws Exception {
        Path f = store(3, 99);
        assertThat(StoreHistory.address(f.toString())).isEqualTo(f.toAbsolutePath().toString());
        assertThat(StoreHistory.address(" jdbc:sqlite:" + f + " ")).isEqualTo(f.toAbsolutePath().toString());
        assertThat(StoreHistory.address("postgresql://db.example:5432/results"))
                .isEqualTo("postgresql://db.example:5432/results");
        Path missing = dir.resolve("none.db");
        assertThatThrownBy(() -> StoreHistory.address(missing.toString())).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("none.db does not exist");
        assertThat(missing).doesNotExist();
        assertThatThrownBy(() -> StoreHistory.address(dir.toString())).hasMessageContaining("is a folder");
        assertThatThrownBy(() -> StoreHistory.address("  ")).hasMessageContaining("give a results store");
        // a file that is no store: opening it says so in one message naming it
        Path text = Files.writeString(dir.resolve("notes.db"), "not a database, just text that is long enough to"
                + " fill the header of a SQLite file and then some more text");
        assertThatThrownBy(() -> ResultsStore.open(StoreHistory.address(text.toString())).close())
                .isInstanceOf(StoreException.class).hasMessageContaining("notes.db");
    }

    @Test
    void theChoicesAreTheStoresFiguresAndItsFactsButLotAndTime() {
        try (ResultsStore s = ResultsStore.open(store(6, 99).toString())) {
            StoreHistory.Choices c = StoreHistory.choices(s);
            assertThat(c.figures()).containsExactly("flagged_area_fraction", "trap_density_p50_cm3");
            assertThat(c.figure()).isEqualTo("trap_density_p50_cm3");
            assertThat(c.groupings()).containsExactly("none", "lot", "day", "week", "boat_slot");
        }
        try (ResultsStore empty = ResultsStore.open(dir.resolve("empty.db").toString())) {
            StoreHistory.Choices c = StoreHistory.choices(empty);
            assertThat(c.figures()).isEmpty();
            assertThat(c.figure()).isNull();
        }
    }

    @Test
    void theBaselineIsACountOrAUtcDateOrTime() {
        assertThat(StoreHistory.baseline(12, "")).isEqualTo(Baseline.first(12));
        assertThat(StoreHistory.baseline(12, "2026-10-12"))
                .isEqualTo(Baseline.before(Instant.parse("2026-10-12T00:00:00Z")));
        assertThat(StoreHistory.baseline(12, " 2026-10-12T06:30:00Z "))
                .isEqualTo(Baseline.before(Instant.parse("2026-10-12T06:30:00Z")));
        assertThatThrownBy(() -> StoreHistory.baseline(12, "12.10.2026")).isInstanceOf(InvalidValueException.class)
                .hasMessage("baseline must be a UTC date (2026-11-02) or time (2026-11-02T08:00:00Z) but was 12.10.2026");
        assertThatThrownBy(() -> StoreHistory.baseline(1, null)).isInstanceOf(IllegalArgumentException.class);
    }

    @Test
    void theFilterFieldsReadDatesLotsAndFactsAsTheTrendCommandDoes() {
        StoreFilter f = StoreHistory.filter(" 2026-10-05 ", "2026-10-06", " default ", "L1, L2,, ",
                "boat_slot=1 , furnace_tube = T2");
        assertThat(f.since()).isEqualTo(Instant.parse("2026-10-05T00:00:00Z"));
        // an until date takes that whole UTC day: up to the start of the next one
        assertThat(f.until()).isEqualTo(Instant.parse("2026-10-07T00:00:00Z"));
        assertThat(f.profile()).isEqualTo("default");
        assertThat(f.lots()).containsExactly("L1", "L2");
        assertThat(f.attributes()).containsExactly(Map.entry("boat_slot", "1"), Map.entry("furnace_tube", "T2"));
        // an until time is taken as it is
        assertThat(StoreHistory.filter("", "2026-10-06T08:00:00Z", "", "", "").until())
                .isEqualTo(Instant.parse("2026-10-06T08:00:00Z"));
        assertThat(StoreHistory.filter(null, " ", "", " , ", "")).isEqualTo(StoreFilter.ALL);
        // a lot or a fact holding a comma in double quotes, as in a CSV file; the message names the field
        StoreFilter quoted = StoreHistory.filter("", "", "", "L1, \"A,1\"", "\"recipe=B,2\", furnace_tube=T2");
        assertThat(quoted.lots()).containsExactly("L1", "A,1");
        assertThat(quoted.attributes()).containsExactly(Map.entry("recipe", "B,2"), Map.entry("furnace_tube", "T2"));
        assertThatThrownBy(() -> StoreHistory.filter("", "", "", "\"A,1", ""))
                .isInstanceOf(InvalidValueException.class).hasMessageStartingWith("lot has a quote that does not"
                        + " close its item").extracting(e -> ((InvalidValueException) e).field()).isEqualTo("lot");
        // the window's messages are the command's without the dashes
        assertThatThrownBy(() -> StoreHistory.filter("5.10.2026", "", "", "", ""))
                .isInstanceOf(InvalidValueException.class)
                .hasMessage("since must be a UTC date (2026-11-02) or time (2026-11-02T08:00:00Z) but was 5.10.2026")
                .extracting(e -> ((InvalidValueException) e).field()).isEqualTo("since");
        assertThatThrownBy(() -> StoreHistory.filter("2026-10-06", "2026-10-05", "", "", ""))
                .hasMessage("until 2026-10-05 must be after since 2026-10-06");
        assertThatThrownBy(() -> StoreHistory.filter("", "", "", "", "boat_slot=1, furnace_tube"))
                .isInstanceOf(InvalidValueException.class)
                .hasMessage("where must be NAME=VALUE (e.g. furnace_tube=T2) but was furnace_tube");
        assertThatThrownBy(() -> StoreHistory.filter("", "", "", "", "=T2")).hasMessageContaining("but was =T2");
        assertThatThrownBy(() -> StoreHistory.filter("", "", "", "", "boat_slot=1, boat_slot=2"))
                .isInstanceOf(InvalidValueException.class)
                .hasMessage("where names boat_slot twice; a wafer has one value of each fact");
        // the command line reads the same text with its flags' names
        assertThatThrownBy(() -> StoreFilter.parse(null, null, null, List.of(), List.of("slot"), "--"))
                .hasMessage("--where must be NAME=VALUE (e.g. furnace_tube=T2) but was slot");
    }

    @Test
    void theFilterChoosesTheWafersCharted() {
        // 30 wafers an hour apart from 2026-10-05T06:00Z: 18 on that day, lots of three, slots 1..3 in turn
        try (ResultsStore s = ResultsStore.open(store(30, 99).toString())) {
            int all = wafers(s, StoreHistory.filter("", "", "", "", ""));
            assertThat(all).isEqualTo(30);
            assertThat(wafers(s, StoreHistory.filter("", "2026-10-05", "", "", ""))).isEqualTo(18);
            assertThat(wafers(s, StoreHistory.filter("2026-10-06", "", "", "", ""))).isEqualTo(12);
            assertThat(wafers(s, StoreHistory.filter("", "", "", "L1,L3", ""))).isEqualTo(6);
            assertThat(wafers(s, StoreHistory.filter("", "", "", "", "boat_slot=1"))).isEqualTo(10);
            assertThat(wafers(s, StoreHistory.filter("", "2026-10-05", "", "", "boat_slot=2"))).isEqualTo(6);
        }
    }

    private static int wafers(ResultsStore s, StoreFilter f) {
        return StoreTrend.analyse(s, new StoreTrend.Request("trap_density_p50_cm3", "lot", f, Baseline.first(3)))
                .result().wafers();
    }

    @Test
    void theSignalRowsAreTheChartsSignalsWithTheirPoints() {
        StoreTrend.Outcome o;
        try (ResultsStore s = ResultsStore.open(store(24, 15).toString())) {
            o = StoreTrend.analyse(s, new StoreTrend.Request("trap_density_p50_cm3", "lot", null, null,
                    Baseline.first(12)));
        }
        List<StoreHistory.SignalRow> rows = StoreHistory.signals(o.result());
        long total = o.result().charts().stream().mapToLong(c -> c.signals().size()).sum();
        assertThat(rows).hasSize((int) total).isNotEmpty();
        // the jump to 3x from the 16th wafer: the first individuals signal is a point beyond 3 sigma there, upward
        StoreHistory.SignalRow first = rows.get(0);
        assertThat(first.title()).isEqualTo("individuals (X)");
        assertThat(first.point()).isEqualTo(15);
        assertThat(first.rule()).isEqualTo("1 point beyond 3 sigma");
        assertThat(first.upward()).isTrue();
        assertThat(first.inBaseline()).isFalse();
        ControlChart chart = o.result().charts().get(first.chart());
        assertThat(first.value()).isEqualTo(chart.points().get(first.point()).value());
        assertThat(o.wafersBehind(chart, first.point())).extracting(StoredPoint::waferId).containsExactly("W16");
        assertThat(rows.stream().filter(r -> !r.inBaseline()).count()).isEqualTo(o.lateSignals());
    }

    @Test
    void aMapIsFoundAsGivenOrBesideTheStoreAndAMissingOneIsTold() throws Exception {
        Path f = store(3, 99);
        List<StoredPoint> points;
        try (ResultsStore s = ResultsStore.open(f.toString())) {
            points = s.points("trap_density_p50_cm3", "lot", null, null);
        }
        StoredPoint w1 = points.get(0);
        assertThat(w1.file()).isEqualTo("maps/W01.tif");
        StoreHistory.MapFile gone = StoreHistory.mapFile(w1, f.toString());
        assertThat(gone.found()).isFalse();
        assertThat(gone.problem()).startsWith("wafer W01: its map maps/W01.tif is no longer there (looked in ")
                .contains(dir.resolve("maps").toString());
        Files.createDirectories(dir.resolve("maps"));
        Files.writeString(dir.resolve("maps/W01.tif"), "x");
        StoreHistory.MapFile found = StoreHistory.mapFile(w1, f.toString());
        assertThat(found.found()).isTrue();
        assertThat(found.path()).isEqualTo(dir.resolve("maps/W01.tif").toAbsolutePath().normalize());
        assertThat(StoreHistory.label(w1, "cm⁻³")).isEqualTo("W01  ·  2026-10-05T06:00:00Z  ·  3.00e+10 cm⁻³  ·  pass");
    }
}
