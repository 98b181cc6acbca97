package trapmap.store;

import java.time.Instant;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Objects;
import trapmap.maps.trend.Baseline;
import trapmap.maps.trend.ChartKind;
import trapmap.maps.trend.ChartPoint;
import trapmap.maps.trend.ControlChart;
import trapmap.maps.trend.GroupCharts;
import trapmap.maps.trend.Signal;
import trapmap.maps.trend.TrendAnalysis;
import trapmap.maps.trend.TrendPoint;
import trapmap.maps.trend.TrendResult;
import trapmap.shared.error.InvalidValueException;

/**
 * The trend of one figure over the wafers of a results store: the one path from a store query to the control charts,
 * used alike by the {@code trend} command, the batch summary's trend page, the watch's signal alarm and the viewer's
 * history view, so that the same store never gives two different charts.
 */
public final class StoreTrend {
    private StoreTrend() {
    }

    /**
     * What to chart.
     *
     * @param figure   a figure name as in results.csv, e.g. {@code trap_density_p50_cm3}
     * @param by       {@code lot}, {@code day}, {@code week}, {@code none} (X̄/R charts by subgroup) or the name of a
     *                 sidecar fact such as {@code furnace_tube} (one individuals chart per value)
     * @param filter   the wafers charted (a period, a profile, lots, sidecar facts); {@link StoreFilter#ALL} for all
     * @param baseline where centre lines and limits come from
     */
    public record Request(String figure, String by, StoreFilter filter, Baseline baseline) {
        public Request {
            Objects.requireNonNull(figure, "figure");
            by = by == null || by.isBlank() ? "none" : by.trim();
            filter = filter == null ? StoreFilter.ALL : filter;
            Objects.requireNonNull(baseline, "baseline");
        }

        /**
         * @param since   only wafers at or after this time; null for all
         * @param profile only wafers of this rules profile; null for all
         */
        public Request(String figure, String by, Instant since, String profile, Baseline baseline) {
            this(figure, by, new StoreFilter(since, null, profile, List.of(), java.util.Map.of()), baseline);
        }

        /** Whether the groups are the values of a sidecar fact (one individuals chart each). */
        public boolean perGroup() {
            return ResultsStore.groupsByAttribute(by);
        }

        /** The request in words, for captions: figure, grouping, baseline and filters. */
        public String describe() {
            return "figure " + figure + "; by " + by + "; baseline " + baseline.describe()
                    + (filter.equals(StoreFilter.ALL) ? "" : "; " + filter.describe());
        }
    }

    /**
     * A request's charts with the stored wafers behind them.
     *
     * @param request the request
     * @param stored  every wafer the query gave, oldest first (also those left out of the charts)
     * @param result  the charts, signals, yield and Pareto
     */
    public record Outcome(Request request, List<StoredPoint> stored, TrendResult result) {
        public Outcome {
            stored = List.copyOf(stored);
        }

        /** The request and the counts in words: wafers, and those left out of the charts and why. */
        public String describe() {
            return request.describe() + "; " + result.wafers() + " wafers, " + result.withoutTime()
                    + " without a measured time, " + result.withoutValue() + " without a value (left out of the"
                    + " charts)";
        }

        /** Signals at points outside the baseline, over all charts. */
        public long lateSignals() {
            long n = 0;
            for (ControlChart c : result.charts()) {
                for (Signal s : c.signals()) {
                    if (!c.points().get(s.index()).baseline()) {
                        n++;
                    }
                }
            }
            return n;
        }

        /**
         * The stored wafers behind point {@code index} of {@code chart}: one wafer on an individuals chart, the two
         * wafers of a moving range (older first), every charted wafer of the subgroup on a subgroup chart.
         */
        public List<StoredPoint> wafersBehind(ControlChart chart, int index) {
            ChartPoint p = chart.points().get(index);
            List<StoredPoint> charted = charted(chart.kind().perGroup() ? p.label() : null);
            return switch (chart.kind()) {
                case INDIVIDUALS, GROUP_INDIVIDUALS -> List.of(charted.get(index));
                case MOVING_RANGE, GROUP_MOVING_RANGE -> index == 0 ? List.of(charted.get(0))
                        : List.of(charted.get(index - 1), charted.get(index));
                default -> charted.stream().filter(w -> w.group().equals(p.label())).toList();
            };
        }

        /** The charted wafers (a measured time and a value) in the charts' order, of one group or (null) all. */
        private List<StoredPoint> charted(String group) {
            List<StoredPoint> out = new ArrayList<>();
            for (StoredPoint w : stored) {
                if (w.measured() && Double.isFinite(w.value()) && (group == null || w.group().equals(group))) {
                    out.add(w);
                }
            }
            out.sort(Comparator.comparing(StoredPoint::time)); // stable, as the analysis sorts
            return out;
        }
    }

    /**
     * Reads the request's wafers from {@code store} and charts them.
     *
     * @throws StoreException        when the store cannot be read
     * @throws InvalidValueException when the store holds no wafer for the request (field {@code store}), or the
     *                               baseline holds fewer than two charted wafers (field {@code baseline}; the message
     *                               gives the counts)
     */
    public static Outcome analyse(ResultsStore store, Request request) {
        return analyse(store, request, null);
    }

    /**
     * {@link #analyse(ResultsStore, Request)} that another thread may stop through {@code query} (null: none): the
     * store's read is cancelled, or the charting is not begun, and this throws {@link StoreQuery.Cancelled}.
     */
    public static Outcome analyse(ResultsStore store, Request request, StoreQuery query) {
        List<StoredPoint> stored = store.points(query, request.figure(), request.by(), request.filter());
        if (query != null) {
            query.check("store " + store.name() + ": the trend of " + request.figure());
        }
        if (stored.isEmpty()) {
            throw new InvalidValueException("store", "", store.name() + " holds no wafer"
                    + (request.filter().equals(StoreFilter.ALL) ? "" : " for " + request.filter().describe()));
        }
        return analyse(request, stored, store.name());
    }

    /**
     * Charts wafers already read from a store ({@link ResultsStore#points} with the request's figure and grouping,
     * or a part of them, oldest first), e.g. the store as it was before some wafers were added.
     *
     * @param storeName the store's name, for messages
     * @throws InvalidValueException as {@link #analyse(ResultsStore, Request)}
     */
    public static Outcome analyse(Request request, List<StoredPoint> stored, String storeName) {
        List<TrendPoint> points = new ArrayList<>(stored.size());
        long charted = 0;
        for (StoredPoint p : stored) {
            TrendPoint t = new TrendPoint(p.measured() ? p.time() : null, p.group(), p.value(), p.pass(),
                    p.failedRules());
            charted += t.charted() ? 1 : 0;
            points.add(t);
        }
        try {
            return new Outcome(request, stored, TrendAnalysis.analyse(points, request.baseline(),
                    request.perGroup() ? GroupCharts.PER_GROUP_INDIVIDUALS : GroupCharts.SUBGROUP_MEANS));
        } catch (InvalidValueException e) {
            throw new InvalidValueException(e.field(), e.unit(), e.getMessage() + " (" + request.figure() + " in "
                    + storeName + ": " + stored.size() + " wafers, " + charted
                    + " with a measured time and a value)");
        }
    }

    /** Whether {@code kind} is a chart of single wafers (individuals), whose points each open one wafer. */
    public static boolean singleWafers(ChartKind kind) {
        return kind == ChartKind.INDIVIDUALS || kind == ChartKind.GROUP_INDIVIDUALS;
    }
}
