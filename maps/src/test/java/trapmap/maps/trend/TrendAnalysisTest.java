package trapmap.maps.trend;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import trapmap.shared.error.InvalidValueException;

class TrendAnalysisTest {
    private static final Instant T0 = Instant.parse("2026-11-02T08:00:00Z");

    private static TrendPoint at(int hour, String group, double value) {
        return new TrendPoint(T0.plus(Duration.ofHours(hour)), group, value, true, List.of());
    }

    @Test
    void individualsLimitsFromTheMovingRange() {
        // R-SPC-5, hand-computed: values 10, 12, 11, 13, 12 → mean 11.6, moving ranges 2, 1, 2, 1 → MR̄ = 1.5,
        // σ̂ = 1.5/1.128 = 1.3298 (Montgomery §6.4), limits 11.6 ± 3.9894; mR chart UCL = 3.267 · 1.5 = 4.9005.
        double[] v = {10, 12, 11, 13, 12};
        List<TrendPoint> pts = new ArrayList<>();
        for (int i = 0; i < v.length; i++) {
            pts.add(at(i, "L" + i, v[i]));
        }
        TrendResult r = TrendAnalysis.analyse(pts, Baseline.first(5));
        ChartPoint p = r.individuals().points().get(0);
        assertThat(p.centre()).isCloseTo(11.6, within(1e-12));
        assertThat(r.individuals().sigmaHat()).isCloseTo(1.5 / 1.128, within(1e-3));
        assertThat(p.upper()).isCloseTo(15.589, within(2e-3));
        assertThat(p.lower()).isCloseTo(7.611, within(2e-3));
        ChartPoint mr = r.movingRange().points().get(1);
        assertThat(mr.value()).isEqualTo(2.0);
        assertThat(mr.centre()).isCloseTo(1.5, within(1e-12));
        assertThat(mr.upper()).isCloseTo(4.9005, within(2e-3));
        assertThat(mr.lower()).isZero();
        assertThat(r.movingRange().points().get(0).value()).isNaN();
        assertThat(r.individuals().signals()).isEmpty();
        // every group holds one wafer: there is no range, so no X̄/R chart
        assertThat(r.subgroupMean()).isEmpty();
        assertThat(r.charts()).hasSize(2);
    }

    @Test
    void perGroupChartsHaveTheirOwnBaselineAndShowAShiftThePooledChartHides() {
        // Two interleaved streams: A = 10, 12, 11, 13, 12, 12, 11 (baseline centre 11.6, σ̂ = 1.5/1.128, UCL 15.589 as
        // hand-computed above) and B = the same + 10, then 30 (B's UCL 25.589). Pooled, the first 5 wafers are
        // 10, 20, 12, 22, 11: centre 15, MR̄ = 9.75, σ̂ = 8.644, UCL 40.93, so B's 30 stays inside there.
        double[] a = {10, 12, 11, 13, 12, 12, 11};
        double[] b = {20, 22, 21, 23, 22, 30};
        List<TrendPoint> pts = new ArrayList<>();
        for (int i = 0; i < a.length; i++) {
            pts.add(at(2 * i, "A", a[i]));
            if (i < b.length) {
                pts.add(at(2 * i + 1, "B", b[i]));
            }
        }
        pts.add(at(20, "C", 15)); // one wafer: no chart of its own
        TrendResult r = TrendAnalysis.analyse(pts, Baseline.first(5), GroupCharts.PER_GROUP_INDIVIDUALS);
        assertThat(r.subgroupMean()).isEmpty();
        assertThat(r.perGroup()).extracting(ControlChart::kind).containsExactly(ChartKind.GROUP_INDIVIDUALS,
                ChartKind.GROUP_MOVING_RANGE, ChartKind.GROUP_INDIVIDUALS, ChartKind.GROUP_MOVING_RANGE);
        assertThat(r.charts()).hasSize(6);
        ControlChart ax = r.perGroup().get(0);
        ControlChart bx = r.perGroup().get(2);
        assertThat(ax.title()).isEqualTo("individuals (X) of A");
        assertThat(ax.points()).hasSize(7).allMatch(p -> p.label().equals("A"));
        assertThat(ax.points().get(0).centre()).isCloseTo(11.6, within(1e-12));
        assertThat(ax.points().get(0).upper()).isCloseTo(15.589, within(2e-3));
        assertThat(ax.points()).extracting(ChartPoint::baseline).containsExactly(true, true, true, true, true, false,
                false);
        assertThat(ax.signals()).isEmpty();
        assertThat(bx.points().get(0).centre()).isCloseTo(21.6, within(1e-12));
        assertThat(bx.signals()).anyMatch(s -> s.rule() == RunRule.BEYOND_3_SIGMA && s.index() == 5);
        int pooledIndex = 11; // B's 30 in time order: A0 B0 A1 B1 … B5
        assertThat(r.individuals().points().get(pooledIndex).value()).isEqualTo(30.0);
        assertThat(r.individuals().points().get(pooledIndex).upper()).isCloseTo(15 + 3 * 9.75 / 1.128, within(0.01));
        assertThat(r.individuals().signals()).noneMatch(s -> s.rule() == RunRule.BEYOND_3_SIGMA);
    }

    @Test
    void subgroupLimitsReproduceThePistonRingExample() {
        // R-SPC-4: Montgomery, Introduction to Statistical Quality Control, Example 6.1 (piston-ring inside diameter, 25
        // subgroups of 5; values from memory): x̿ = 74.001 mm, R̄ = 0.023 mm give X̄ limits 73.988 and 74.014 mm and
        // an R-chart UCL of 0.049 mm (LCL 0). Subgroups built here with exactly that grand mean and range.
        List<TrendPoint> pts = new ArrayList<>();
        for (int g = 0; g < 25; g++) {
            double m = 74.001 + (g % 2 == 0 ? 0.002 : -0.002) * (g == 24 ? 0 : 1);
            double[] values = {m - 0.0115, m - 0.001, m, m + 0.001, m + 0.0115};
            for (int k = 0; k < 5; k++) {
                pts.add(at(g * 5 + k, String.format("LOT-%02d", g), values[k]));
            }
        }
        TrendResult r = TrendAnalysis.analyse(pts, Baseline.first(125));
        ControlChart xbar = r.subgroupMean().orElseThrow();
        ControlChart range = r.subgroupRange().orElseThrow();
        assertThat(xbar.points()).hasSize(25);
        ChartPoint p = xbar.points().get(0);
        assertThat(p.centre()).isCloseTo(74.001, within(1e-4));
        assertThat(p.upper()).isCloseTo(74.014, within(6e-4));
        assertThat(p.lower()).isCloseTo(73.988, within(6e-4));
        ChartPoint rp = range.points().get(0);
        assertThat(rp.value()).isCloseTo(0.023, within(1e-9));
        assertThat(rp.centre()).isCloseTo(0.023, within(1e-9));
        assertThat(rp.upper()).isCloseTo(0.049, within(6e-4));
        assertThat(rp.lower()).isZero();
        assertThat(xbar.signals()).isEmpty();
        assertThat(range.signals()).isEmpty();
    }

    @Test
    void unequalSubgroupsGetTheirOwnLimits() {
        // σ̂ from R_i/d2(n_i): a pair with range 1.128 and a triple with range 1.693 both give σ̂ ≈ 1;
        // the pair's X̄ limits are then ±3/√2, the triple's ±3/√3, around the mean of all five values.
        List<TrendPoint> pts = List.of(at(0, "A", 0.0), at(1, "A", 1.128), at(2, "B", 0.0), at(3, "B", 1.0),
                at(4, "B", 1.693));
        TrendResult r = TrendAnalysis.analyse(pts, Baseline.first(5));
        ControlChart xbar = r.subgroupMean().orElseThrow();
        assertThat(xbar.sigmaHat()).isCloseTo(1.0, within(5e-4));
        double grand = (1.128 + 1.0 + 1.693) / 5;
        assertThat(xbar.points().get(0).centre()).isCloseTo(grand, within(1e-12));
        assertThat(xbar.points().get(0).upper() - grand).isCloseTo(3 / Math.sqrt(2), within(2e-3));
        assertThat(xbar.points().get(1).upper() - grand).isCloseTo(3 / Math.sqrt(3), within(2e-3));
        ControlChart range = r.subgroupRange().orElseThrow();
        assertThat(range.points().get(0).upper()).isCloseTo(3.267 * 1.128, within(5e-3));
        assertThat(range.points().get(1).upper()).isCloseTo(2.574 * 1.693, within(5e-3));
    }

    @Test
    void aSubgroupIsInTheBaselineOnlyWhenAllItsWafersAre() {
        // baseline: the first 3 wafers; group A (wafers 0, 1) is in it, B (2, 3) straddles its end and is not,
        // so σ̂ comes from A alone: |1 − 3|/d2(2) = 2/1.128 and x̿ from A's values only (2.0).
        List<TrendPoint> pts = List.of(at(0, "A", 1.0), at(1, "A", 3.0), at(2, "B", 5.0), at(3, "B", 9.0));
        ControlChart xbar = TrendAnalysis.analyse(pts, Baseline.first(3)).subgroupMean().orElseThrow();
        assertThat(xbar.points()).extracting(ChartPoint::baseline).containsExactly(true, false);
        assertThat(xbar.points().get(0).centre()).isEqualTo(2.0);
        assertThat(xbar.sigmaHat()).isCloseTo(2 / 1.128, within(2e-3));
        // B's mean 7 lies 5 above the centre, beyond 3σ̂/√2 = 3.76: one point beyond 3σ
        assertThat(xbar.signals()).extracting(Signal::rule, Signal::index)
                .containsExactly(org.assertj.core.groups.Tuple.tuple(RunRule.BEYOND_3_SIGMA, 1));
    }

    @Test
    void aShiftAfterTheBaselineIsSignalled() {
        // 20 baseline wafers alternating 10 ± 0.5 (MR̄ = 1, σ̂ = 0.887), then a shift of the mean to 12 (2.3 σ̂):
        // the second shifted point completes "2 of 3 beyond 2σ"; the last baseline wafer (10.5) is above the centre
        // too, so the seventh shifted point (index 26) completes "8 in a row".
        List<TrendPoint> pts = new ArrayList<>();
        for (int i = 0; i < 20; i++) {
            pts.add(at(i, "day1", i % 2 == 0 ? 9.5 : 10.5));
        }
        for (int i = 20; i < 30; i++) {
            pts.add(at(i, "day2", 12.0));
        }
        TrendResult r = TrendAnalysis.analyse(pts, Baseline.before(T0.plus(Duration.ofHours(20))));
        assertThat(r.individuals().points().get(19).baseline()).isTrue();
        assertThat(r.individuals().points().get(20).baseline()).isFalse();
        List<Signal> s = r.individuals().signals();
        assertThat(s).filteredOn(x -> x.rule() == RunRule.TWO_OF_THREE_BEYOND_2_SIGMA)
                .extracting(Signal::index).first().isEqualTo(21);
        assertThat(s).filteredOn(x -> x.rule() == RunRule.EIGHT_ON_ONE_SIDE)
                .extracting(Signal::index).first().isEqualTo(26);
        assertThat(s).noneMatch(x -> x.index() < 20);
        assertThat(s).noneMatch(x -> x.rule() == RunRule.BEYOND_3_SIGMA);
        // the jump itself (moving range 1.5 … 2.5) stays below the mR chart's UCL of 3.267
        assertThat(r.movingRange().signals()).isEmpty();
    }

    @Test
    void yieldParetoAndLeftOutWafers() {
        List<TrendPoint> pts = List.of(
                new TrendPoint(T0.plusSeconds(60), "L2", 1.0, false, List.of("fe_i_p95", "region_area")),
                new TrendPoint(T0, "L1", 2.0, true, List.of()),
                new TrendPoint(T0.plusSeconds(30), "L1", 3.0, false, List.of("fe_i_p95")),
                new TrendPoint(null, "L0", 4.0, false, List.of("edge")),
                new TrendPoint(T0.plusSeconds(90), "L2", Double.NaN, false, List.of("fe_i_p95")),
                new TrendPoint(T0.plusSeconds(120), "L3", 5.0, false, List.of("edge")));
        TrendResult r = TrendAnalysis.analyse(pts, Baseline.first(2));
        assertThat(r.wafers()).isEqualTo(6);
        assertThat(r.withoutTime()).isEqualTo(1);
        assertThat(r.withoutValue()).isEqualTo(1);
        assertThat(r.individuals().points()).extracting(ChartPoint::value).containsExactly(2.0, 3.0, 1.0, 5.0);
        assertThat(r.yields()).extracting(GroupYield::group).containsExactly("L1", "L2", "L3", "L0");
        assertThat(r.yields().get(0).yield()).isEqualTo(0.5);
        assertThat(r.yields().get(1).yield()).isZero();
        // failures: fe_i_p95 3, edge 2, region_area 1 of 6
        assertThat(r.pareto()).extracting(ParetoEntry::rule).containsExactly("fe_i_p95", "edge", "region_area");
        assertThat(r.pareto()).extracting(ParetoEntry::failures).containsExactly(3, 2, 1);
        assertThat(r.pareto().get(0).share()).isEqualTo(0.5);
        assertThat(r.pareto().get(1).cumulativeShare()).isCloseTo(5.0 / 6, within(1e-12));
        assertThat(r.pareto().get(2).cumulativeShare()).isEqualTo(1.0);
    }

    @Test
    void aBaselineOfFewerThanTwoWafersIsRefused() {
        List<TrendPoint> pts = List.of(at(0, "A", 1), at(5, "A", 2));
        assertThatThrownBy(() -> TrendAnalysis.analyse(pts, Baseline.before(T0.plusSeconds(1))))
                .isInstanceOf(InvalidValueException.class).hasMessageContaining("holds 1 wafer");
    }
}
