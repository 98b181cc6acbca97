package trapmap.store;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.time.Instant;
import java.time.ZoneOffset;
import java.util.EnumSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.WaferResult;
import trapmap.maps.trend.Baseline;
import trapmap.maps.trend.RunRule;
import trapmap.maps.trend.TrendSettings;
import trapmap.shared.error.InvalidValueException;

/**
 * The store's part of {@code watch --store}: the control-chart signals that newly stored wafers bring
 * ({@link StoreSignals}: raised once, with the wafer that brings them, only after the baseline, only for the rules
 * asked for), the cheap check of which listed maps a store holds ({@link ResultsStore#storedOf}) and the wait for the
 * wafers handed to the writer ({@link StoreWriter#awaitStored}).
 *
 * <p>The values are chosen so that the charts are known by hand: a baseline alternating 10, 11 has a mean moving
 * range of 1, so σ̂ = 1/d2(2) = 1/1.128 = 0.887 and the individuals limits are 10.5 ± 2.66 = [7.84, 13.16]
 * (Montgomery, <i>Introduction to Statistical Quality Control</i>, §6.4).
 */
class WatchStoreTest {
    private static final String FIGURE = "median_density_cm3";
    private static final Instant BASELINE_UNTIL = Instant.parse("2026-11-10T00:00:00Z");

    @TempDir
    Path dir;

    private ResultsStore store;
    private String run;

    @BeforeEach
    void open() {
        store = ResultsStore.open(dir.resolve("results.db").toString(), Map.of(),
                Clock.fixed(Instant.parse("2026-12-01T00:00:00Z"), ZoneOffset.UTC));
        run = store.startRun(new RunInfo(Instant.parse("2026-11-30T10:00:00Z"), "rules.json", "r1", "{}", "s1",
                "test"));
    }

    @org.junit.jupiter.api.AfterEach
    void close() {
        store.close();
    }

    /** Stores wafer {@code id} of {@code lot} in {@code tube}, measured on day {@code day} of November at hour h. */
    private String wafer(String id, String lot, String tube, int day, int hour, double value) throws Exception {
        Path f = dir.resolve(id + ".tif");
        Files.writeString(f, id);
        Files.writeString(dir.resolve(id + ".json"), "{\"wafer_id\": \"" + id + "\", \"conditions\": {\"lot\": \""
                + lot + "\", \"furnace_tube\": \"" + tube + "\", \"measured_at\": \""
                + String.format("2026-11-%02dT%02d:00:00Z", day, hour) + "\"}}");
        Map<String, Double> figures = new LinkedHashMap<>();
        figures.put(FIGURE, value);
        store.write(run, WaferRecord.of(new WaferResult(f.toString(), id, WaferResult.Status.PASS, "A", "default",
                "fe-i", figures, List.of(), List.of(), List.of(), "", null), null));
        return f.toString();
    }

    private static TrendSettings byTube(Set<RunRule> rules) {
        return new TrendSettings(FIGURE, "furnace_tube", Baseline.before(BASELINE_UNTIL), rules);
    }

    /** Six baseline wafers per tube, alternating 10 and 11; returns their files. */
    private List<String> baseline() throws Exception {
        List<String> files = new java.util.ArrayList<>();
        for (int i = 0; i < 6; i++) {
            files.add(wafer("T1-W" + i, "L" + i, "T1", 1 + i, 6, 10 + i % 2));
            files.add(wafer("T2-W" + i, "L" + i, "T2", 1 + i, 7, 10 + i % 2));
        }
        return files;
    }

    @Test
    void aPointBeyondTheLimitsIsRaisedOnceWithItsWaferAndOnlyOnItsTubesChart() throws Exception {
        List<String> base = baseline();
        Set<RunRule> beyond = EnumSet.of(RunRule.BEYOND_3_SIGMA);
        assertThat(StoreSignals.brought(store, byTube(beyond), base)).as("baseline points never alarm").isEmpty();

        String high = wafer("T1-W9", "L9", "T1", 12, 6, 20.0); // far above 13.16
        String ok = wafer("T2-W9", "L9", "T2", 12, 7, 10.5);
        List<StoreSignals.Raised> raised = StoreSignals.brought(store, byTube(beyond), List.of(high, ok));
        assertThat(raised).singleElement().satisfies(r -> {
            assertThat(r.waferId()).isEqualTo("T1-W9");
            assertThat(r.file()).isEqualTo(high);
            assertThat(r.group()).isEqualTo("T1");
            assertThat(r.ruleName()).isEqualTo("beyond_3_sigma");
            assertThat(r.upward()).isTrue();
            assertThat(r.chart()).isEqualTo("individuals (X) of T1");
            assertThat(r.point().upper()).isCloseTo(10.5 + 3 / 1.128, org.assertj.core.api.Assertions.within(0.01));
            assertThat(r.describe()).contains("1 point beyond 3 sigma (high)").contains("20.00");
        });

        // the next round's wafers do not bring the earlier signal again
        String next = wafer("T1-W10", "L10", "T1", 13, 6, 10.4);
        assertThat(StoreSignals.brought(store, byTube(beyond), List.of(next))).isEmpty();
        // a rule not asked for is not raised
        assertThat(StoreSignals.brought(store, byTube(EnumSet.of(RunRule.EIGHT_ON_ONE_SIDE)), List.of(high)))
                .isEmpty();
        assertThat(StoreSignals.brought(store, byTube(beyond), List.of())).isEmpty();
    }

    @Test
    void aLotThatKeepsSignallingAsItsWafersArriveIsRaisedOnceAndALotMadeBadByItsLastWaferIsRaisedThen()
            throws Exception {
        for (int i = 0; i < 6; i++) { // lots of two wafers, 10 and 11: R = 1, x-double-bar 10.5
            wafer("B" + i + "-1", "L" + i, "T1", 1 + i, 6, 10);
            wafer("B" + i + "-2", "L" + i, "T1", 1 + i, 7, 11);
        }
        TrendSettings byLot = new TrendSettings(FIGURE, "lot", Baseline.before(BASELINE_UNTIL),
                EnumSet.of(RunRule.BEYOND_3_SIGMA));
        String first = wafer("B9-1", "L9", "T1", 12, 6, 20);
        assertThat(StoreSignals.brought(store, byLot, List.of(first))).singleElement().satisfies(r -> {
            assertThat(r.waferId()).isEqualTo("B9-1");
            assertThat(r.group()).isEqualTo("L9");
            assertThat(r.chart()).isEqualTo("subgroup mean (X-bar)");
        });
        String second = wafer("B9-2", "L9", "T1", 12, 7, 21);
        assertThat(StoreSignals.brought(store, byLot, List.of(second))).as("L9 signalled before").isEmpty();

        String fine = wafer("B10-1", "L10", "T1", 13, 6, 10.5);
        assertThat(StoreSignals.brought(store, byLot, List.of(fine))).isEmpty();
        String bad = wafer("B10-2", "L10", "T1", 13, 7, 30); // lot mean 20.25
        assertThat(StoreSignals.brought(store, byLot, List.of(bad))).singleElement()
                .satisfies(r -> assertThat(r.waferId()).isEqualTo("B10-2"));
    }

    @Test
    void aStoreThatCannotBeChartedYetSaysSo() throws Exception {
        String only = wafer("T1-W0", "L0", "T1", 1, 6, 10);
        assertThatThrownBy(() -> StoreSignals.brought(store, TrendSettings.defaults(FIGURE), List.of(only)))
                .isInstanceOf(InvalidValueException.class).hasMessageContaining("baseline");
    }

    @Test
    void storedOfNamesTheListedMapsHeldUnderTheRunsRulesAndSettings() throws Exception {
        String a = wafer("A", "L1", "T1", 1, 6, 10);
        String b = dir.resolve("B.tif").toString(); // listed but never stored
        assertThat(store.storedOf(run, List.of(a, b))).containsExactly(a);
        String other = store.startRun(new RunInfo(Instant.parse("2026-11-30T11:00:00Z"), "rules.json", "r2", "{}",
                "s1", "test"));
        assertThat(store.storedOf(other, List.of(a, b))).as("other rules").isEmpty();
    }

    @Test
    void awaitStoredReturnsOnceEveryWaferHandedOverIsWritten() throws Exception {
        try (StoreWriter w = new StoreWriter(store, run, null, null)) {
            for (int i = 0; i < 20; i++) {
                Path f = dir.resolve("W" + i + ".tif");
                Files.writeString(f, "map " + i);
                w.wafer(new WaferResult(f.toString(), "W" + i, WaferResult.Status.PASS, "A", "default", "fe-i",
                        Map.of(FIGURE, 1.0 + i), List.of(), List.of(), List.of(), "", null), Map.of());
            }
            w.awaitStored();
            assertThat(store.count("wafers")).isEqualTo(20);
            assertThat(w.stored()).isEqualTo(20);
        }
    }
}
