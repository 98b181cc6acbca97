package trapmap.store;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.time.Duration;
import java.time.Instant;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.EnumSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.WaferResult;
import trapmap.maps.trend.Baseline;
import trapmap.maps.trend.ChartKind;
import trapmap.maps.trend.ControlChart;
import trapmap.maps.trend.RunRule;
import trapmap.maps.trend.TrendSettings;

/**
 * The trend of a batch over its store: which points are the batch's (its files judged by the same rules, wafers of
 * earlier runs with those rules included), the signals after the baseline, the writer's wait for its wafers.
 */
class BatchTrendTest {
    @TempDir
    Path dir;

    private static final Instant T0 = Instant.parse("2026-10-01T08:00:00Z");
    private static final String FIGURE = "trap_density_p50_cm3";

    private ResultsStore open() {
        return ResultsStore.open(dir.resolve("results.db").toString(), Map.of(),
                Clock.fixed(Instant.parse("2026-12-01T00:00:00Z"), ZoneOffset.UTC));
    }

    private static RunInfo run(String rulesSha) {
        return new RunInfo(Instant.parse("2026-11-30T10:00:00Z"), "rules.json", rulesSha, "{}", "s0", "test");
    }

    /** Wafer {@code i}: measured {@code i} hours after T0, in tube T1 or T2 (alternately), with that density. */
    private WaferRecord wafer(int i, double density) throws Exception {
        String name = String.format("W%03d", i);
        Path f = dir.resolve(name + ".tif");
        Files.writeString(f, name);
        String tube = i % 2 == 0 ? "T1" : "T2";
        Files.writeString(dir.resolve(name + ".json"), "{\"wafer_id\": \"" + name + "\", \"conditions\": {"
                + "\"measured_at\": \"" + T0.plus(Duration.ofHours(i)) + "\", \"lot\": \"L" + (i / 3)
                + "\", \"furnace_tube\": \"" + tube + "\"}}");
        Map<String, Double> figures = new LinkedHashMap<>();
        figures.put(FIGURE, density);
        return WaferRecord.of(new WaferResult(f.toString(), name, WaferResult.Status.PASS, "A", "default", "fe-i",
                figures, List.of(), List.of(), List.of(), "", null), null);
    }

    /** A steady level with a small deterministic wobble (the baseline's spread). */
    private static double steady(int i) {
        return 1e10 * (1 + 0.02 * ((i * 7) % 5 - 2));
    }

    @Test
    void theBatchsWafersAreMarkedAndItsJumpSignalsAfterTheBaseline() throws Exception {
        try (ResultsStore s = open()) {
            String earlier = s.startRun(run("r1"));
            for (int i = 0; i < 24; i++) {
                s.write(earlier, wafer(i, steady(i)));
            }
            String batch = s.startRun(run("r1"));
            List<String> files = new ArrayList<>();
            for (int i = 24; i < 30; i++) {
                WaferRecord w = wafer(i, i % 2 == 1 ? 3e10 : steady(i)); // tube T2 jumps threefold
                s.write(batch, w);
                files.add(w.result().file());
            }
            // the same map judged by other rules: the file is the batch's, but this result is not
            String other = s.startRun(run("r2"));
            s.write(other, wafer(26, steady(26)));

            TrendSettings byTube = new TrendSettings(FIGURE, "furnace_tube", Baseline.first(8),
                    EnumSet.of(RunRule.BEYOND_3_SIGMA));
            BatchTrend t = BatchTrend.of(s, byTube, batch, files);
            assertThat(t.problem()).isEmpty();
            assertThat(t.valueCharts()).extracting(ControlChart::kind)
                    .containsOnly(ChartKind.GROUP_INDIVIDUALS).hasSize(2);
            assertThat(t.valueCharts()).extracting(ControlChart::title)
                    .containsExactly("individuals (X) of T1", "individuals (X) of T2");

            ControlChart t2 = t.valueCharts().get(1);
            // T2: 12 earlier wafers, then 3 of the batch
            assertThat(t2.points()).hasSize(15);
            for (int k = 0; k < t2.points().size(); k++) {
                assertThat(t.ofBatch(t2, k)).as("point %d", k).isEqualTo(k >= 12);
            }
            ControlChart t1 = t.valueCharts().get(0);
            // T1 holds W026 twice (rules r1 and r2): only the batch's rules' result is the batch's
            assertThat(t1.points()).hasSize(16);
            assertThat(java.util.stream.IntStream.range(0, 16).filter(k -> t.ofBatch(t1, k)).count()).isEqualTo(3);
            StoreTrend.Outcome o = t.outcome().orElseThrow();
            assertThat(o.stored().stream().filter(t::ofBatch).map(StoredPoint::file).toList())
                    .containsExactlyInAnyOrderElementsOf(files);

            List<BatchTrend.LateSignal> late = t.lateSignals();
            List<BatchTrend.LateSignal> beyond = late.stream()
                    .filter(l -> l.signal().rule() == RunRule.BEYOND_3_SIGMA).toList();
            assertThat(beyond).hasSize(3).allSatisfy(l -> {
                assertThat(l.chart()).isSameAs(t2);
                assertThat(l.ofBatch()).isTrue();
                assertThat(l.alarms()).isTrue();
                assertThat(l.signal().upward()).isTrue();
                assertThat(l.point().baseline()).isFalse();
            });
            assertThat(late).filteredOn(l -> l.signal().rule() != RunRule.BEYOND_3_SIGMA)
                    .allSatisfy(l -> assertThat(l.alarms()).isFalse());
            assertThat(late).noneMatch(l -> l.chart() == t1 && l.signal().rule() == RunRule.BEYOND_3_SIGMA);
        }
    }

    @Test
    void onTheMovingRangeTheLaterWaferCountsAndOnASubgroupAnyWaferDoes() throws Exception {
        try (ResultsStore s = open()) {
            String earlier = s.startRun(run("r1"));
            for (int i = 0; i < 22; i++) {
                s.write(earlier, wafer(i, steady(i)));
            }
            String batch = s.startRun(run("r1"));
            List<String> files = new ArrayList<>();
            for (int i = 22; i < 27; i++) { // lot L7 = wafers 21, 22, 23: one earlier wafer, two of the batch
                WaferRecord w = wafer(i, steady(i));
                s.write(batch, w);
                files.add(w.result().file());
            }
            BatchTrend t = BatchTrend.of(s, TrendSettings.defaults(FIGURE), batch, files);
            StoreTrend.Outcome o = t.outcome().orElseThrow();
            ControlChart mr = o.result().movingRange();
            assertThat(t.ofBatch(mr, 21)).isFalse(); // wafers 20 and 21
            assertThat(t.ofBatch(mr, 22)).isTrue(); // wafers 21 and 22
            ControlChart x = o.result().individuals();
            assertThat(t.ofBatch(x, 21)).isFalse();
            assertThat(t.ofBatch(x, 22)).isTrue();
            ControlChart means = o.result().subgroupMean().orElseThrow();
            List<String> marked = new ArrayList<>();
            for (int k = 0; k < means.points().size(); k++) {
                if (t.ofBatch(means, k)) {
                    marked.add(means.points().get(k).label());
                }
            }
            assertThat(marked).containsExactly("L7", "L8");
            assertThat(t.valueCharts()).extracting(ControlChart::kind)
                    .containsExactly(ChartKind.INDIVIDUALS, ChartKind.SUBGROUP_MEAN);
        }
    }

    @Test
    void aTrendThatCannotBeChartedSaysWhy() throws Exception {
        try (ResultsStore s = open()) {
            String batch = s.startRun(run("r1"));
            s.write(batch, wafer(0, 1e10));
            BatchTrend t = BatchTrend.of(s, TrendSettings.defaults(FIGURE), batch, List.of());
            assertThat(t.outcome()).isEmpty();
            assertThat(t.problem()).hasValueSatisfying(p -> assertThat(p).contains("baseline").doesNotContain("\n"));
            assertThat(t.valueCharts()).isEmpty();
            assertThat(t.lateSignals()).isEmpty();
        }
    }

    @Test
    void theWriterWaitsForItsWafersAndStaysOpen() throws Exception {
        try (ResultsStore s = open()) {
            String run = s.startRun(run("r1"));
            try (StoreWriter w = new StoreWriter(s, run, null, null)) {
                for (int i = 0; i < 40; i++) {
                    w.wafer(wafer(i, steady(i)).result(), Map.of());
                }
                w.awaitStored();
                assertThat(w.stored()).isEqualTo(40);
                assertThat(s.points(FIGURE, "lot", null, null)).hasSize(40);
                w.wafer(wafer(40, steady(40)).result(), Map.of());
                w.awaitStored();
                assertThat(s.points(FIGURE, "lot", null, null)).hasSize(41)
                        .allSatisfy(p -> assertThat(p.runId()).isEqualTo(run));
            }
        }
    }
}
