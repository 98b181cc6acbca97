package trapmap.maps.trend;

import java.util.List;
import java.util.Optional;

/**
 * Everything a trend shows.
 *
 * @param individuals  the individuals chart over the wafers in time order
 * @param movingRange  the moving-range chart beside it
 * @param subgroupMean the X̄ chart by group, empty when no baseline group holds two wafers
 * @param subgroupRange the R chart by group (groups of one wafer have no range and are not on it), empty likewise
 * @param yields       the yield per group, groups in order of their first measured time (groups without any at
 *                     the end, by name)
 * @param pareto       the failed rules, most frequent first (ties by name)
 * @param wafers       the wafers given
 * @param withoutTime  wafers left out of the charts for want of a measured time
 * @param withoutValue wafers left out of the charts for want of a finite value of the figure
 * @param perGroup     the individuals and moving-range charts of each group on its own (X, mR, X, mR, … in order of
 *                     the groups' first measured time); empty unless asked for ({@link GroupCharts#PER_GROUP_INDIVIDUALS})
 */
public record TrendResult(ControlChart individuals, ControlChart movingRange, Optional<ControlChart> subgroupMean,
        Optional<ControlChart> subgroupRange, List<GroupYield> yields, List<ParetoEntry> pareto, int wafers,
        int withoutTime, int withoutValue, List<ControlChart> perGroup) {
    public TrendResult {
        yields = List.copyOf(yields);
        pareto = List.copyOf(pareto);
        perGroup = List.copyOf(perGroup);
    }

    /** A result without charts per group. */
    public TrendResult(ControlChart individuals, ControlChart movingRange, Optional<ControlChart> subgroupMean,
            Optional<ControlChart> subgroupRange, List<GroupYield> yields, List<ParetoEntry> pareto, int wafers,
            int withoutTime, int withoutValue) {
        this(individuals, movingRange, subgroupMean, subgroupRange, yields, pareto, wafers, withoutTime,
                withoutValue, List.of());
    }

    /** The charts there are, in the order they are drawn. */
    public List<ControlChart> charts() {
        List<ControlChart> out = new java.util.ArrayList<>(List.of(individuals, movingRange));
        subgroupMean.ifPresent(out::add);
        subgroupRange.ifPresent(out::add);
        out.addAll(perGroup);
        return List.copyOf(out);
    }
}
