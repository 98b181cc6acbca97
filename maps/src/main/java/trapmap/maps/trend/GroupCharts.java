package trapmap.maps.trend;

/** What the groups of a trend are charted as, beside the individuals chart of all wafers. */
public enum GroupCharts {
    /**
     * Each group is a rational subgroup (a lot, a day, a week): one X̄ and R chart over the groups (Montgomery §6.2).
     */
    SUBGROUP_MEANS,
    /**
     * Each group is a stream of its own (a furnace tube, a boat slot, a tool): one individuals and moving-range chart
     * per group, with the group's own baseline, centre and limits, so that a shift of one stream shows on its chart
     * and is not averaged with, nor hidden by the spread between, the others (Montgomery §6.4; a group chart of
     * several streams would hide a shift of one).
     */
    PER_GROUP_INDIVIDUALS
}
