package trapmap.store;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Collections;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.WaferResult;
import trapmap.maps.trend.Baseline;
import trapmap.maps.trend.ChartKind;
import trapmap.maps.trend.ChartPoint;
import trapmap.maps.trend.ControlChart;

/**
 * {@link StoreTrend.Outcome#wafersBehind}: every chart point leads back to the stored wafers it was computed from, on
 * the individuals, moving-range, subgroup mean and range charts and on the charts of one group each; and the store's
 * lists of figures and facts.
 */
class StoreTrendTest {
    @TempDir
    Path dir;

    /** One wafer as written: id, lot, tube, measured time (null: none), value (NaN: none). */
    private record Wafer(String id, String lot, String tube, Instant time, double value) {
    }

    private final List<Wafer> wafers = new ArrayList<>();
    private String store;

    @BeforeEach
    void writeStore() {
        Instant day = Instant.parse("2026-10-05T06:00:00Z");
        double[][] values = {{3.1e10, 3.4e10, 2.9e10}, {3.0e10, 3.6e10, 3.3e10}, {2.8e10, 3.2e10, 3.5e10},
            {4.1e10, 4.4e10, 3.9e10}};
        for (int lot = 0; lot < values.length; lot++) {
            for (int w = 0; w < 3; w++) {
                // lot L3's wafers W2 and W3 share one measured time: the store orders them by wafer id
                int minutes = lot == 2 && w == 2 ? 10 : 10 * w;
                wafers.add(new Wafer("L" + (lot + 1) + "-W" + (w + 1), "L" + (lot + 1), lot % 2 == 0 ? "T1" : "T2",
                        day.plusSeconds(86_400L * lot + 60L * minutes), values[lot][w]));
            }
        }
        // a lot of one wafer (no range of its own), one wafer without a value, one without a measured time
        wafers.add(new Wafer("L5-W1", "L5", "T1", day.plusSeconds(86_400L + 3_600), 3.7e10));
        wafers.add(new Wafer("L2-W4", "L2", "T2", day.plusSeconds(86_400L + 60 * 5), Double.NaN));
        wafers.add(new Wafer("L9-W1", "L9", "T2", null, 5e10));
        List<Wafer> shuffled = new ArrayList<>(wafers);
        Collections.shuffle(shuffled, new Random(7)); // the order written must not matter
        store = dir.resolve("history.db").toString();
        try (ResultsStore s = ResultsStore.open(store)) {
            String run = s.startRun(new RunInfo(Instant.parse("2026-11-30T10:00:00Z"), "rules.json", "r1", "{}",
                    "s0", "test"));
            for (Wafer w : shuffled) {
                Map<String, Double> figures = new LinkedHashMap<>();
                figures.put("trap_density_p50_cm3", w.value());
                figures.put("flagged_area_fraction", 0.01);
                boolean pass = !(w.value() > 4e10);
                WaferResult r = new WaferResult(dir.resolve(w.id() + ".tif").toString(), w.id(),
                        pass ? WaferResult.Status.PASS : WaferResult.Status.FAIL, pass ? "A" : "C", "default", "fe-i",
                        figures, pass ? List.of() : List.of("trap_density_p50_cm3"), List.of(), List.of(), "", null);
                Map<String, String> facts = new LinkedHashMap<>();
                facts.put("lot", w.lot());
                facts.put("furnace_tube", w.tube());
                if (w.time() != null) {
                    facts.put("measured_at", w.time().toString());
                }
                s.write(run, new WaferRecord(r, "sha-" + w.id(), facts, w.lot(), w.time(), List.of()));
            }
        }
    }

    private StoreTrend.Outcome analyse(String by) {
        try (ResultsStore s = ResultsStore.open(store)) {
            return StoreTrend.analyse(s, new StoreTrend.Request("trap_density_p50_cm3", by, null, null,
                    Baseline.first(6)));
        }
    }

    /** The charted wafers (a time and a value) in the charts' order: time, then wafer id, as the store orders. */
    private List<Wafer> charted(String tube) {
        return wafers.stream().filter(w -> w.time() != null && Double.isFinite(w.value()))
                .filter(w -> tube == null || w.tube().equals(tube))
                .sorted(Comparator.comparing(Wafer::time).thenComparing(Wafer::id)).toList();
    }

    private static List<String> ids(List<StoredPoint> points) {
        return points.stream().map(StoredPoint::waferId).toList();
    }

    @Test
    void eachIndividualsPointIsTheWaferInTimeOrder() {
        StoreTrend.Outcome o = analyse("lot");
        ControlChart x = o.result().individuals();
        List<Wafer> expected = charted(null);
        assertThat(x.points()).hasSize(expected.size()).hasSize(13);
        assertThat(expected.get(6).id()).isEqualTo("L5-W1");
        assertThat(List.of(expected.get(8).id(), expected.get(9).id())).as("a tie keeps the wafer-id order")
                .containsExactly("L3-W2", "L3-W3");
        for (int i = 0; i < expected.size(); i++) {
            List<StoredPoint> behind = o.wafersBehind(x, i);
            assertThat(ids(behind)).as("point %d", i).containsExactly(expected.get(i).id());
            assertThat(behind.get(0).value()).isEqualTo(x.points().get(i).value());
            assertThat(behind.get(0).time()).isEqualTo(x.points().get(i).time());
            assertThat(behind.get(0).file()).endsWith(expected.get(i).id() + ".tif");
        }
        assertThat(o.result().withoutTime()).isEqualTo(1);
        assertThat(o.result().withoutValue()).isEqualTo(1);
        assertThat(StoreTrend.singleWafers(x.kind())).isTrue();
    }

    @Test
    void aMovingRangePointIsItsTwoWafersWhoseDifferenceItPlots() {
        StoreTrend.Outcome o = analyse("lot");
        ControlChart mr = o.result().movingRange();
        List<Wafer> expected = charted(null);
        assertThat(ids(o.wafersBehind(mr, 0))).containsExactly(expected.get(0).id());
        assertThat(mr.points().get(0).value()).isNaN();
        for (int i = 1; i < expected.size(); i++) {
            List<StoredPoint> behind = o.wafersBehind(mr, i);
            assertThat(ids(behind)).as("point %d", i).containsExactly(expected.get(i - 1).id(), expected.get(i).id());
            assertThat(Math.abs(behind.get(1).value() - behind.get(0).value()))
                    .isCloseTo(mr.points().get(i).value(), within(1e-6 * mr.points().get(i).value() + 1e-30));
        }
        assertThat(StoreTrend.singleWafers(mr.kind())).isFalse();
    }

    @Test
    void aSubgroupPointIsEveryChartedWaferOfItsLot() {
        StoreTrend.Outcome o = analyse("lot");
        ControlChart mean = o.result().subgroupMean().orElseThrow();
        assertThat(mean.points().stream().map(ChartPoint::label).toList())
                .containsExactly("L1", "L2", "L5", "L3", "L4");
        for (int i = 0; i < mean.points().size(); i++) {
            ChartPoint p = mean.points().get(i);
            List<StoredPoint> behind = o.wafersBehind(mean, i);
            assertThat(behind).as("wafers of %s", p.label()).hasSize(p.size())
                    .allMatch(w -> w.lot().equals(p.label()));
            assertThat(behind.stream().mapToDouble(StoredPoint::value).average().orElseThrow())
                    .isCloseTo(p.value(), within(1e-6 * p.value()));
        }
        assertThat(ids(o.wafersBehind(mean, 1))).as("L2 without its wafer that has no value")
                .containsExactly("L2-W1", "L2-W2", "L2-W3");
        // the range chart has no point for the lot of one wafer: its points are found by their lot, not position
        ControlChart range = o.result().subgroupRange().orElseThrow();
        assertThat(range.points().stream().map(ChartPoint::label).toList()).containsExactly("L1", "L2", "L3", "L4");
        for (int i = 0; i < range.points().size(); i++) {
            ChartPoint p = range.points().get(i);
            List<StoredPoint> behind = o.wafersBehind(range, i);
            double[] v = behind.stream().mapToDouble(StoredPoint::value).toArray();
            assertThat(behind).allMatch(w -> w.lot().equals(p.label()));
            assertThat(java.util.Arrays.stream(v).max().orElseThrow() - java.util.Arrays.stream(v).min().orElseThrow())
                    .isCloseTo(p.value(), within(1e-6 * p.value()));
        }
    }

    @Test
    void theChartsOfOneTubeLeadToThatTubesWafersOnly() {
        StoreTrend.Outcome o = analyse("furnace_tube");
        List<ControlChart> per = o.result().perGroup();
        assertThat(per.stream().map(c -> c.kind() + " " + c.points().get(0).label()).toList()).containsExactly(
                "GROUP_INDIVIDUALS T1", "GROUP_MOVING_RANGE T1", "GROUP_INDIVIDUALS T2", "GROUP_MOVING_RANGE T2");
        for (int c = 0; c < per.size(); c += 2) {
            ControlChart x = per.get(c);
            ControlChart mr = per.get(c + 1);
            String tube = x.points().get(0).label();
            List<Wafer> expected = charted(tube);
            assertThat(x.points()).hasSize(expected.size());
            for (int i = 0; i < expected.size(); i++) {
                assertThat(ids(o.wafersBehind(x, i))).as("%s point %d", tube, i).containsExactly(expected.get(i).id());
                assertThat(o.wafersBehind(x, i).get(0).value()).isEqualTo(x.points().get(i).value());
                if (i > 0) {
                    List<StoredPoint> pair = o.wafersBehind(mr, i);
                    assertThat(ids(pair)).containsExactly(expected.get(i - 1).id(), expected.get(i).id());
                    assertThat(Math.abs(pair.get(1).value() - pair.get(0).value()))
                            .isCloseTo(mr.points().get(i).value(), within(1e-6 * mr.points().get(i).value()));
                }
            }
        }
        assertThat(charted("T1")).extracting(Wafer::id).containsExactly("L1-W1", "L1-W2", "L1-W3", "L5-W1", "L3-W1",
                "L3-W2", "L3-W3");
        // the wafer L2-W4 has no value and L9-W1 no time: neither is behind any point
        for (ControlChart chart : o.result().charts()) {
            for (int i = 0; i < chart.points().size(); i++) {
                assertThat(ids(o.wafersBehind(chart, i))).doesNotContain("L2-W4", "L9-W1");
            }
        }
        assertThat(o.result().charts()).extracting(ControlChart::kind).doesNotContain(ChartKind.SUBGROUP_MEAN);
    }

    @Test
    void theStoreListsItsFiguresAndFactsSorted() {
        try (ResultsStore s = ResultsStore.open(store)) {
            assertThat(s.figures()).containsExactly("flagged_area_fraction", "trap_density_p50_cm3");
            assertThat(s.attributeNames()).containsExactly("furnace_tube", "lot", "measured_at");
        }
        try (ResultsStore empty = ResultsStore.open(dir.resolve("empty.db").toString())) {
            assertThat(empty.figures()).isEmpty();
            assertThat(empty.attributeNames()).isEmpty();
        }
    }
}
