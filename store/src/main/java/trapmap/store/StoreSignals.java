package trapmap.store;

import java.util.ArrayList;
import java.util.Collection;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import trapmap.maps.trend.ChartKind;
import trapmap.maps.trend.ChartPoint;
import trapmap.maps.trend.ControlChart;
import trapmap.maps.trend.RunRule;
import trapmap.maps.trend.Signal;
import trapmap.maps.trend.TrendResult;
import trapmap.maps.trend.TrendSettings;
import trapmap.shared.error.InvalidValueException;

/**
 * The control-chart signals that newly stored wafers bring, for the watch's signal alarm: the trend of the store
 * ({@link StoreTrend}) is charted with the new wafers and without them, and a signal counts when its rule is one of
 * those asked for, its point lies after the baseline, the point includes one of the new wafers, and the same signal
 * (chart, rule, side, point) was not there without them. So a signal is raised once: with the wafer that brings it,
 * which is stored once; a restart, whose new wafers are only those not stored before, raises none of the earlier
 * ones, and a subgroup point (a lot) that keeps signalling as more of its wafers arrive is not raised again.
 *
 * <p>The charts watched are those of the level of the figure, on which the run rules apply (Western Electric,
 * <i>Statistical Quality Control Handbook</i>, 1956): one individuals chart per value when the grouping is a sidecar
 * fact, the subgroup-mean (X̄) chart when it is {@code lot}, {@code day} or {@code week} (and there is one), else the
 * individuals chart. The dispersion charts (moving range, range) are not: their points are skewed and, for the
 * moving range, correlated, so their beyond-limit points are not alarmed on.
 */
public final class StoreSignals {
    private StoreSignals() {
    }

    /**
     * One signal to raise.
     *
     * @param waferId the new wafer behind the signal's point (the newest of them on a subgroup point)
     * @param file    that wafer's map file as stored
     * @param rule    the rule met
     * @param group   the point's group: the fact's value (a tube), the subgroup (a lot, day, week) or {@code all}
     * @param figure  the figure charted
     * @param chart   the chart's title, e.g. {@code individuals (X) of T2}
     * @param point   the chart point that completes the pattern
     * @param upward  whether the pattern lies above the centre line (or rises)
     */
    public record Raised(String waferId, String file, RunRule rule, String group, String figure, String chart,
                         ChartPoint point, boolean upward) {
        /** The rule's name as the rules file writes it, e.g. {@code beyond_3_sigma}. */
        public String ruleName() {
            return TrendSettings.key(rule);
        }

        /** The signal in words: chart, rule, the point's time, value and limits. */
        public String describe() {
            return chart + ": " + rule.description() + (upward ? " (high)" : " (low)") + " at " + point.time()
                    + ", " + figure + " " + number(point.value()) + " (limits " + number(point.lower()) + " to "
                    + number(point.upper()) + ", centre " + number(point.centre()) + ")";
        }

        private static String number(double v) {
            return String.format(Locale.ROOT, "%.4g", v);
        }
    }

    /**
     * The signals of the rules' {@code trend} block ({@link TrendSettings}: figure, grouping, baseline, alarm rules)
     * that the wafers of {@code newFiles} bring, over every wafer of the store; see
     * {@link #brought(ResultsStore, StoreTrend.Request, Set, Collection)}.
     */
    public static List<Raised> brought(ResultsStore store, TrendSettings settings, Collection<String> newFiles) {
        return brought(store, new StoreTrend.Request(settings.figure(), settings.by(), null, null,
                settings.baseline()), settings.alarmRules(), newFiles);
    }

    /**
     * The signals that the wafers of {@code newFiles} (map files as the run gave them, already stored) bring to the
     * trend of {@code request}, in chart order.
     *
     * @param rules the rules to raise (others are left out)
     * @throws StoreException        when the store cannot be read
     * @throws InvalidValueException when the store cannot yet be charted (no wafer, or fewer than two in the
     *                               baseline): nothing can signal yet
     */
    public static List<Raised> brought(ResultsStore store, StoreTrend.Request request, Set<RunRule> rules,
                                       Collection<String> newFiles) {
        if (newFiles.isEmpty() || rules.isEmpty()) {
            return List.of();
        }
        Set<String> fresh = new HashSet<>(newFiles);
        StoreTrend.Outcome now = StoreTrend.analyse(store, request);
        List<StoredPoint> earlier = now.stored().stream().filter(p -> !fresh.contains(p.file())).toList();
        Set<String> before = new HashSet<>();
        if (!earlier.isEmpty()) {
            try {
                StoreTrend.Outcome then = StoreTrend.analyse(request, earlier, store.name());
                for (ControlChart c : watched(then)) {
                    for (Signal s : c.signals()) {
                        if (counts(c, s, rules)) {
                            before.add(key(then, c, s));
                        }
                    }
                }
            } catch (InvalidValueException e) {
                // the store could not be charted without the new wafers: no signal was there
            }
        }
        List<Raised> out = new ArrayList<>();
        for (ControlChart c : watched(now)) {
            for (Signal s : c.signals()) {
                if (!counts(c, s, rules) || before.contains(key(now, c, s))) {
                    continue;
                }
                List<StoredPoint> behind = now.wafersBehind(c, s.index());
                StoredPoint newest = null;
                for (StoredPoint w : behind) {
                    if (fresh.contains(w.file())) {
                        newest = w; // wafersBehind gives them oldest first
                    }
                }
                if (newest != null) {
                    ChartPoint p = c.points().get(s.index());
                    out.add(new Raised(newest.waferId(), newest.file(), s.rule(), p.label(), request.figure(),
                            c.title(), p, s.upward()));
                }
            }
        }
        return out;
    }

    /** The charts of the figure's level the alarm watches (see the class comment). */
    static List<ControlChart> watched(StoreTrend.Outcome outcome) {
        TrendResult r = outcome.result();
        if (outcome.request().perGroup()) {
            return r.perGroup().stream().filter(c -> c.kind() == ChartKind.GROUP_INDIVIDUALS).toList();
        }
        if (!outcome.request().by().equals("none") && r.subgroupMean().isPresent()) {
            return List.of(r.subgroupMean().get());
        }
        return List.of(r.individuals());
    }

    private static boolean counts(ControlChart c, Signal s, Set<RunRule> rules) {
        return rules.contains(s.rule()) && !c.points().get(s.index()).baseline();
    }

    /**
     * What makes a signal the same one in two chartings of the store: chart, rule, side and point (on a chart of
     * single wafers the wafer, on a subgroup chart the subgroup, whose value changes as its wafers arrive).
     */
    private static String key(StoreTrend.Outcome o, ControlChart c, Signal s) {
        ChartPoint p = c.points().get(s.index());
        String point = p.label();
        if (StoreTrend.singleWafers(c.kind())) {
            StoredPoint w = o.wafersBehind(c, s.index()).get(0);
            point = w.file() + "\n" + w.waferId() + "\n" + w.time();
        }
        return c.kind() + "\n" + c.title() + "\n" + s.rule() + "\n" + s.upward() + "\n" + point;
    }
}
