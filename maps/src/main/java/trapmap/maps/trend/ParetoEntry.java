package trapmap.maps.trend;

/**
 * One bar of the Pareto of failed rules.
 *
 * @param rule            the rule's name
 * @param failures        how many wafers failed it
 * @param share           failures / all rule failures, 0–1
 * @param cumulativeShare the share of this bar and every bar before it, 0–1
 */
public record ParetoEntry(String rule, int failures, double share, double cumulativeShare) {
}
