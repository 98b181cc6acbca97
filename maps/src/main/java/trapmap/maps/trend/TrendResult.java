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
 */
public record TrendResult(ControlChart individuals, ControlChart movingRange, Optional<ControlChart> subgroupMean,
        Optional<ControlChart> subgroupRange, List<GroupYield> yields, List<ParetoEntry> pareto, int wafers,
        int withoutTime, int withoutValue) {
    public TrendResult {
        yields = List.copyOf(yields);
        pareto = List.copyOf(pareto);
    }

    /** The charts there are, in the order they are drawn. */
    public List<ControlChart> charts() {
        return subgroupMean.isPresent()
                ? List.of(individuals, movingRange, subgroupMean.get(), subgroupRange.get())
                : List.of(individuals, movingRange);
    }
}
