package trapmap.store;

import java.util.ArrayList;
import java.util.Collection;
import java.util.List;
import java.util.Objects;
import java.util.Optional;
import java.util.Set;
import trapmap.maps.trend.ChartKind;
import trapmap.maps.trend.ChartPoint;
import trapmap.maps.trend.ControlChart;
import trapmap.maps.trend.Signal;
import trapmap.maps.trend.TrendSettings;
import trapmap.shared.error.InvalidValueException;

/**
 * The trend of a batch's rules ({@link TrendSettings}, the rules' {@code trend} block) over its results store, once
 * the batch's wafers are stored: the charts ({@link StoreTrend}, the same as {@code trapmap trend} draws), which
 * points hold a wafer of the batch, and the signals after the baseline. What the batch summary's trend page shows;
 * a trend that cannot be computed (the store unreadable, too few baseline wafers) is kept with its reason instead.
 */
public final class BatchTrend {
    /** Where the settings of a trend from a rules {@code trend} block come from, in words. */
    public static final String FROM_BLOCK = "the rules' trend block";
    /** Where the settings come from when the rules have no {@code trend} block. */
    public static final String FROM_DEFAULTS = "the rules have no trend block: these are the defaults";

    private final TrendSettings settings;
    private String origin = FROM_BLOCK;
    private final String storeName;
    private final StoreTrend.Outcome outcome;
    private final String problem;
    private final Set<String> files;
    private final Set<String> runs;

    private BatchTrend(TrendSettings settings, String storeName, StoreTrend.Outcome outcome, String problem,
                       Set<String> files, Set<String> runs) {
        this.settings = Objects.requireNonNull(settings, "settings");
        this.storeName = storeName;
        this.outcome = outcome;
        this.problem = problem;
        this.files = Set.copyOf(files);
        this.runs = Set.copyOf(runs);
    }

    /**
     * The trend of {@code settings} over every wafer of {@code store}; the batch's wafers are the stored results of
     * {@code batchFiles} (the files of its results rows) judged as run {@code runId} judges (the same rules and
     * settings: {@link ResultsStore#runsJudgingAs}, so that wafers kept from a resumed run count too). A store that
     * cannot be read or a trend that cannot be charted gives a trend with its {@link #problem()}.
     */
    public static BatchTrend of(ResultsStore store, TrendSettings settings, String runId,
                                Collection<String> batchFiles) {
        StoreTrend.Request request = new StoreTrend.Request(settings.figure(), settings.by(), null, null,
                settings.baseline());
        try {
            Set<String> runs = store.runsJudgingAs(runId);
            StoreTrend.Outcome o = StoreTrend.analyse(store, request);
            return new BatchTrend(settings, store.name(), o, null, Set.copyOf(batchFiles), runs);
        } catch (StoreException | InvalidValueException e) {
            return failed(settings, store.name(), e.getMessage());
        }
    }

    /** A trend that could not be computed, with the reason in one line. */
    public static BatchTrend failed(TrendSettings settings, String storeName, String problem) {
        return new BatchTrend(settings, storeName, null, problem.replaceAll("\\s*\\R\\s*", " ").trim(), Set.of(),
                Set.of());
    }

    public TrendSettings settings() {
        return settings;
    }

    /** Where the settings come from, in words ({@link #FROM_BLOCK} unless told otherwise). */
    public String origin() {
        return origin;
    }

    /** This trend, its settings told as coming from {@code where} (e.g. {@link #FROM_DEFAULTS}). */
    public BatchTrend from(String where) {
        BatchTrend t = new BatchTrend(settings, storeName, outcome, problem, files, runs);
        t.origin = Objects.requireNonNull(where, "where");
        return t;
    }

    /** The store's name as it was opened. */
    public String storeName() {
        return storeName;
    }

    /** The charts with the stored wafers behind them; empty when there is a {@link #problem()}. */
    public Optional<StoreTrend.Outcome> outcome() {
        return Optional.ofNullable(outcome);
    }

    /** Why there is no trend, in one line; empty when there is one. */
    public Optional<String> problem() {
        return Optional.ofNullable(problem);
    }

    /** Whether a stored wafer is one of the batch's. */
    public boolean ofBatch(StoredPoint w) {
        return files.contains(w.file()) && runs.contains(w.runId());
    }

    /**
     * Whether point {@code index} of {@code chart} is new with the batch: on an individuals chart its wafer is one of
     * the batch's; on a moving-range chart the later of its two wafers is; on a subgroup chart any of its wafers is.
     */
    public boolean ofBatch(ControlChart chart, int index) {
        if (outcome == null) {
            return false;
        }
        List<StoredPoint> behind = outcome.wafersBehind(chart, index);
        return switch (chart.kind()) {
            case MOVING_RANGE, GROUP_MOVING_RANGE -> !behind.isEmpty() && ofBatch(behind.get(behind.size() - 1));
            default -> behind.stream().anyMatch(this::ofBatch);
        };
    }

    /**
     * The charts of single values whose run-rule signals matter: one individuals chart per group when the grouping
     * is a sidecar fact, else the individuals chart and, when there is one, the subgroup-mean chart. (The range charts
     * only flag points beyond their limits; {@code trapmap trend} draws them.)
     */
    public List<ControlChart> valueCharts() {
        if (outcome == null) {
            return List.of();
        }
        List<ControlChart> out = new ArrayList<>();
        for (ControlChart c : outcome.result().charts()) {
            boolean perGroup = !outcome.result().perGroup().isEmpty();
            if (perGroup ? c.kind() == ChartKind.GROUP_INDIVIDUALS
                    : c.kind() == ChartKind.INDIVIDUALS || c.kind() == ChartKind.SUBGROUP_MEAN) {
                out.add(c);
            }
        }
        return out;
    }

    /**
     * A signal at a point after the baseline.
     *
     * @param chart   the chart it is on
     * @param signal  the signal
     * @param point   the point that completes the pattern
     * @param ofBatch whether that point is new with the batch ({@link #ofBatch(ControlChart, int)})
     * @param alarms  whether its rule is one of the settings' alarm rules
     */
    public record LateSignal(ControlChart chart, Signal signal, ChartPoint point, boolean ofBatch, boolean alarms) {
    }

    /** The signals at points after the baseline on the {@link #valueCharts()}, chart by chart, in point order. */
    public List<LateSignal> lateSignals() {
        List<LateSignal> out = new ArrayList<>();
        for (ControlChart c : valueCharts()) {
            for (Signal s : c.signals()) {
                ChartPoint p = c.points().get(s.index());
                if (!p.baseline()) {
                    out.add(new LateSignal(c, s, p, ofBatch(c, s.index()), settings.alarms(s.rule())));
                }
            }
        }
        return out;
    }
}
