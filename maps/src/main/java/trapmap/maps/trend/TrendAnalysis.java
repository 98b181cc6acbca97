package trapmap.maps.trend;

import java.time.Instant;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.EnumSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.TreeMap;
import trapmap.shared.error.InvalidValueException;

/**
 * Control charts, yield and Pareto from trend points.
 * <ul>
 * <li><b>Individuals and moving range</b> (Montgomery, <i>Introduction to Statistical Quality Control</i>, §6.4):
 * the charted wafers in time order; centre x̄ of the baseline values, σ̂ = MR̄/d2(2) with MR̄ the mean of the
 * baseline's moving ranges |x<sub>i</sub> − x<sub>i−1</sub>|, limits x̄ ± 3σ̂; the mR chart has centre MR̄ and
 * limits [D3(2) MR̄, D4(2) MR̄] = [0, 3.267 MR̄].</li>
 * <li><b>X̄ and R by subgroup</b> (Montgomery §6.2): one subgroup per group, placed at its first measured time; a
 * subgroup is in the baseline when all its wafers are ({@link Baseline}). x̿ is the mean of all baseline values; σ̂ the mean of R<sub>i</sub>/d2(n<sub>i</sub>) over the baseline subgroups of at
 * least two wafers (unbiased since E[R] = d2 σ; for equal sizes it is R̄/d2). Subgroup i has limits
 * x̿ ± 3σ̂/√n<sub>i</sub> (= x̿ ± A2 R̄ for equal sizes) and, when n<sub>i</sub> ≥ 2, an R point with centre
 * d2(n<sub>i</sub>) σ̂ and limits [D3, D4] · d2(n<sub>i</sub>) σ̂ (= D3 R̄, D4 R̄). Constants: {@link ControlConstants}.</li>
 * <li><b>Per group</b> ({@link GroupCharts#PER_GROUP_INDIVIDUALS}, instead of X̄ and R): an individuals and
 * moving-range chart as above over the wafers of each group alone, its baseline the group's wafers in the baseline
 * period (for a count, the group's first {@code count} wafers). A group with fewer than two wafers in its baseline has
 * no chart of its own.</li>
 * <li><b>Signals</b>: all {@link RunRule}s on the individuals and X̄ charts; on the range charts only a point beyond
 * its limits (their points are skewed and, for moving ranges, correlated, which the zone rules do not assume).</li>
 * </ul>
 * A baseline whose values are all equal gives σ̂ = 0: every later point off the centre is then beyond the limits.
 */
public final class TrendAnalysis {
    private static final Set<RunRule> ZONE_RULES = EnumSet.allOf(RunRule.class);
    private static final Set<RunRule> LIMITS_ONLY = EnumSet.of(RunRule.BEYOND_3_SIGMA);

    private TrendAnalysis() {
    }

    /**
     * Analyses {@code points}.
     *
     * @throws InvalidValueException when the baseline holds fewer than two charted wafers
     */
    public static TrendResult analyse(List<TrendPoint> points, Baseline baseline) {
        return analyse(points, baseline, GroupCharts.SUBGROUP_MEANS);
    }

    /**
     * Analyses {@code points}, charting the groups as {@code groupCharts} says.
     *
     * @throws InvalidValueException when the baseline holds fewer than two charted wafers
     */
    public static TrendResult analyse(List<TrendPoint> points, Baseline baseline, GroupCharts groupCharts) {
        List<TrendPoint> charted = new ArrayList<>();
        int withoutTime = 0;
        int withoutValue = 0;
        for (TrendPoint p : points) {
            if (p.time() == null) {
                withoutTime++;
            } else if (!Double.isFinite(p.value())) {
                withoutValue++;
            } else {
                charted.add(p);
            }
        }
        charted.sort(Comparator.comparing(TrendPoint::time)); // stable: ties keep the order given
        ControlChart[] xmr = individuals(charted, baseline, ChartKind.INDIVIDUALS, ChartKind.MOVING_RANGE);
        if (groupCharts == GroupCharts.PER_GROUP_INDIVIDUALS) {
            return new TrendResult(xmr[0], xmr[1], Optional.empty(), Optional.empty(), yields(points),
                    pareto(points), points.size(), withoutTime, withoutValue, perGroup(charted, baseline));
        }
        Optional<ControlChart[]> xr = subgroups(charted, baseline);
        return new TrendResult(xmr[0], xmr[1], xr.map(c -> c[0]), xr.map(c -> c[1]), yields(points),
                pareto(points), points.size(), withoutTime, withoutValue);
    }

    private static List<ControlChart> perGroup(List<TrendPoint> charted, Baseline baseline) {
        Map<String, List<TrendPoint>> groups = new LinkedHashMap<>(); // in order of first time
        for (TrendPoint p : charted) {
            groups.computeIfAbsent(p.group(), g -> new ArrayList<>()).add(p);
        }
        List<ControlChart> out = new ArrayList<>();
        for (List<TrendPoint> members : groups.values()) {
            int inBaseline = 0;
            for (int i = 0; i < members.size(); i++) {
                if (baseline.contains(i, members.get(i).time())) {
                    inBaseline++;
                }
            }
            if (inBaseline >= 2) {
                out.addAll(List.of(individuals(members, baseline, ChartKind.GROUP_INDIVIDUALS,
                        ChartKind.GROUP_MOVING_RANGE)));
            }
        }
        return out;
    }

    private static ControlChart[] individuals(List<TrendPoint> charted, Baseline baseline, ChartKind xKind,
            ChartKind mrKind) {
        int n = charted.size();
        int inBaseline = 0;
        double sum = 0.0;
        double mrSum = 0.0;
        int mrCount = 0;
        for (int i = 0; i < n; i++) {
            TrendPoint p = charted.get(i);
            if (!baseline.contains(i, p.time())) {
                continue;
            }
            inBaseline++;
            sum += p.value();
            if (i > 0 && baseline.contains(i - 1, charted.get(i - 1).time())) {
                mrSum += Math.abs(p.value() - charted.get(i - 1).value());
                mrCount++;
            }
        }
        if (inBaseline < 2) {
            throw new InvalidValueException("baseline", "wafers", "the baseline (" + baseline.describe()
                    + ") holds " + inBaseline + " wafer(s) with a measured time and a value; at least 2 are needed");
        }
        double centre = sum / inBaseline;
        double mrBar = mrSum / mrCount;
        ControlConstants two = ControlConstants.of(2);
        double sigma = mrBar / two.d2();
        List<ChartPoint> x = new ArrayList<>(n);
        List<ChartPoint> mr = new ArrayList<>(n);
        for (int i = 0; i < n; i++) {
            TrendPoint p = charted.get(i);
            boolean base = baseline.contains(i, p.time());
            x.add(new ChartPoint(p.time(), p.group(), p.value(), centre, centre - 3 * sigma, centre + 3 * sigma,
                    base, 1));
            double range = i == 0 ? Double.NaN : Math.abs(p.value() - charted.get(i - 1).value());
            boolean mrBase = base && i > 0 && baseline.contains(i - 1, charted.get(i - 1).time());
            mr.add(new ChartPoint(p.time(), p.group(), range, mrBar, two.bigD3() * mrBar, two.bigD4() * mrBar,
                    mrBase, 2));
        }
        return new ControlChart[] {
            new ControlChart(xKind, x, sigma, RunRules.evaluate(standardised(x), ZONE_RULES)),
            new ControlChart(mrKind, mr, sigma, RunRules.evaluate(standardised(mr), LIMITS_ONLY))
        };
    }

    private static Optional<ControlChart[]> subgroups(List<TrendPoint> charted, Baseline baseline) {
        Map<String, List<TrendPoint>> groups = new LinkedHashMap<>(); // in order of first time
        Map<String, Boolean> allInBaseline = new java.util.HashMap<>();
        for (int i = 0; i < charted.size(); i++) {
            TrendPoint p = charted.get(i);
            groups.computeIfAbsent(p.group(), g -> new ArrayList<>()).add(p);
            allInBaseline.merge(p.group(), baseline.contains(i, p.time()), Boolean::logicalAnd);
        }
        List<String> names = new ArrayList<>(groups.keySet());
        int m = names.size();
        double[] mean = new double[m];
        double[] range = new double[m];
        int[] size = new int[m];
        Instant[] start = new Instant[m];
        boolean[] base = new boolean[m];
        double baseSum = 0.0;
        int baseValues = 0;
        double sigmaSum = 0.0;
        int sigmaCount = 0;
        for (int g = 0; g < m; g++) {
            List<TrendPoint> members = groups.get(names.get(g));
            double lo = Double.POSITIVE_INFINITY;
            double hi = Double.NEGATIVE_INFINITY;
            double s = 0.0;
            for (TrendPoint p : members) {
                s += p.value();
                lo = Math.min(lo, p.value());
                hi = Math.max(hi, p.value());
            }
            size[g] = members.size();
            mean[g] = s / size[g];
            range[g] = size[g] >= 2 ? hi - lo : Double.NaN;
            start[g] = members.get(0).time();
            base[g] = allInBaseline.get(names.get(g));
            if (size[g] > ControlConstants.MAX_N) {
                throw new InvalidValueException("by", "wafers", "group " + names.get(g) + " holds " + size[g]
                        + " wafers; the range chart takes at most " + ControlConstants.MAX_N
                        + " a subgroup (group by something finer)");
            }
            if (base[g]) {
                baseSum += s;
                baseValues += size[g];
                if (size[g] >= 2) {
                    sigmaSum += range[g] / ControlConstants.of(size[g]).d2();
                    sigmaCount++;
                }
            }
        }
        if (sigmaCount == 0) {
            return Optional.empty();
        }
        double grand = baseSum / baseValues;
        double sigma = sigmaSum / sigmaCount;
        List<ChartPoint> xbar = new ArrayList<>(m);
        List<ChartPoint> r = new ArrayList<>(m);
        for (int g = 0; g < m; g++) {
            double half = 3 * sigma / Math.sqrt(size[g]);
            xbar.add(new ChartPoint(start[g], names.get(g), mean[g], grand, grand - half, grand + half, base[g],
                    size[g]));
            if (size[g] >= 2) {
                ControlConstants c = ControlConstants.of(size[g]);
                double centre = c.d2() * sigma;
                r.add(new ChartPoint(start[g], names.get(g), range[g], centre, c.bigD3() * centre,
                        c.bigD4() * centre, base[g], size[g]));
            }
        }
        return Optional.of(new ControlChart[] {
            new ControlChart(ChartKind.SUBGROUP_MEAN, xbar, sigma, RunRules.evaluate(standardised(xbar), ZONE_RULES)),
            new ControlChart(ChartKind.SUBGROUP_RANGE, r, sigma, RunRules.evaluate(standardisedRange(r), LIMITS_ONLY))
        });
    }

    private static double[] standardised(List<ChartPoint> points) {
        double[] z = new double[points.size()];
        for (int i = 0; i < z.length; i++) {
            z[i] = points.get(i).standardised();
        }
        return z;
    }

    /** For asymmetric limits only the side matters: a value past a limit maps beyond ±3, anything else inside. */
    private static double[] standardisedRange(List<ChartPoint> points) {
        double[] z = new double[points.size()];
        for (int i = 0; i < z.length; i++) {
            ChartPoint p = points.get(i);
            z[i] = p.value() > p.upper() ? 4.0 : p.value() < p.lower() ? -4.0 : 0.0;
        }
        return z;
    }

    private static List<GroupYield> yields(List<TrendPoint> points) {
        Map<String, Instant> first = new TreeMap<>();
        Map<String, int[]> counts = new TreeMap<>();
        for (TrendPoint p : points) {
            int[] c = counts.computeIfAbsent(p.group(), g -> new int[2]);
            c[0]++;
            if (p.pass()) {
                c[1]++;
            }
            if (p.time() != null) {
                first.merge(p.group(), p.time(), (a, b) -> a.isBefore(b) ? a : b);
            }
        }
        List<String> names = new ArrayList<>(counts.keySet()); // by name
        names.sort(Comparator.comparing((String g) -> first.get(g),
                Comparator.nullsLast(Comparator.naturalOrder())));
        List<GroupYield> out = new ArrayList<>();
        for (String g : names) {
            int[] c = counts.get(g);
            out.add(new GroupYield(g, c[0], c[1]));
        }
        return out;
    }

    private static List<ParetoEntry> pareto(List<TrendPoint> points) {
        Map<String, Integer> counts = new TreeMap<>();
        int total = 0;
        for (TrendPoint p : points) {
            for (String rule : p.failedRules()) {
                counts.merge(rule, 1, Integer::sum);
                total++;
            }
        }
        List<Map.Entry<String, Integer>> entries = new ArrayList<>(counts.entrySet());
        entries.sort(Map.Entry.<String, Integer>comparingByValue().reversed()); // stable: ties stay by name
        List<ParetoEntry> out = new ArrayList<>();
        int cumulative = 0;
        for (Map.Entry<String, Integer> e : entries) {
            cumulative += e.getValue();
            out.add(new ParetoEntry(e.getKey(), e.getValue(), (double) e.getValue() / total,
                    (double) cumulative / total));
        }
        return out;
    }
}
