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
                .hasMessageContaining("'12.10.2026' is not a UTC date");
        assertThatThrownBy(() -> StoreHistory.baseline(1, null)).isInstanceOf(IllegalArgumentException.class);
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
