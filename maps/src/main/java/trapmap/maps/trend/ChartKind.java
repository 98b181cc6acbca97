package trapmap.maps.trend;

/** The control charts drawn over a trend (Montgomery, <i>Introduction to Statistical Quality Control</i>, ch. 6). */
public enum ChartKind {
    /** Individual values, limits centre ± 3 MR̄/d2(2). */
    INDIVIDUALS("individuals (X)"),
    /** Moving ranges of two successive values, limits [0, D4(2) MR̄]. */
    MOVING_RANGE("moving range (mR)"),
    /** Subgroup means, limits x̿ ± 3σ̂/√n. */
    SUBGROUP_MEAN("subgroup mean (X-bar)"),
    /** Subgroup ranges, limits [D3 d2 σ̂, D4 d2 σ̂] for the subgroup's n. */
    SUBGROUP_RANGE("subgroup range (R)"),
    /** Individual values of the wafers of one group only, with that group's own baseline and limits. */
    GROUP_INDIVIDUALS("individuals (X)"),
    /** Moving ranges within one group, beside {@link #GROUP_INDIVIDUALS}. */
    GROUP_MOVING_RANGE("moving range (mR)");

    private final String title;

    ChartKind(String title) {
        this.title = title;
    }

    public String title() {
        return title;
    }

    /** Whether the chart holds the wafers of one group only. */
    public boolean perGroup() {
        return this == GROUP_INDIVIDUALS || this == GROUP_MOVING_RANGE;
    }
}
