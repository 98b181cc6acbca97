package trapmap.maps.trend;

import java.util.Collections;
import java.util.EnumSet;
import java.util.Objects;
import java.util.Set;

/**
 * The trend a batch follows over its results store: the rules' optional top-level {@code "trend"} block. With it,
 * {@code inspect --store} and {@code watch --store} add a trend page to the batch summary and the watch raises an
 * alarm on a control-chart signal; without it nothing trend-related happens.
 *
 * <p>The charts are those of {@code trapmap trend}: centre line and 3σ limits from the {@code baseline} period
 * (Montgomery, <i>Introduction to Statistical Quality Control</i>, ch. 6), signals by the run rules of {@link RunRule}
 * (Western Electric handbook, 1956; Nelson 1984).
 *
 * @param figure     the figure charted, a column of results.csv, e.g. {@code trap_density_p50_cm3}
 * @param by         the subgroups: {@code lot}, {@code day}, {@code week}, {@code none}, or the name of a sidecar fact
 *                   such as {@code furnace_tube} (one individuals chart per value)
 * @param baseline   where centre lines and limits come from
 * @param alarmRules the run rules whose signals after the baseline raise the watch's alarm (every signal is still
 *                   listed on the trend page); in {@link RunRule} order, possibly empty
 */
public record TrendSettings(String figure, String by, Baseline baseline, Set<RunRule> alarmRules) {
    /** The grouping when the block gives none. */
    public static final String DEFAULT_BY = "lot";

    public TrendSettings {
        Objects.requireNonNull(figure, "figure");
        by = by == null || by.isBlank() ? DEFAULT_BY : by.trim();
        Objects.requireNonNull(baseline, "baseline");
        EnumSet<RunRule> rules = EnumSet.noneOf(RunRule.class);
        rules.addAll(Objects.requireNonNull(alarmRules, "alarmRules"));
        alarmRules = Collections.unmodifiableSet(rules);
    }

    /**
     * The settings of a block that gives only the figure: by lot, the first {@value Baseline#DEFAULT_COUNT} charted
     * wafers as the baseline, an alarm on a point beyond 3σ.
     */
    public static TrendSettings defaults(String figure) {
        return new TrendSettings(figure, DEFAULT_BY, Baseline.first(Baseline.DEFAULT_COUNT),
                EnumSet.of(RunRule.BEYOND_3_SIGMA));
    }

    /** Whether a signal of {@code rule} raises the alarm. */
    public boolean alarms(RunRule rule) {
        return alarmRules.contains(rule);
    }

    /** The rules key of a run rule: its name in lower case, e.g. {@code beyond_3_sigma}. */
    public static String key(RunRule rule) {
        return rule.name().toLowerCase(java.util.Locale.ROOT);
    }

    /** The settings in words, for captions: figure, grouping, baseline and alarm rules. */
    public String describe() {
        return "figure " + figure + "; by " + by + "; baseline " + baseline.describe() + "; alarm on "
                + (alarmRules.isEmpty() ? "no signal"
                        : String.join(", ", alarmRules.stream().map(RunRule::description).toList()));
    }
}
