package trapmap.maps.trend;

/**
 * One firing of a run rule: the point at which the rule is met (the last point of its window) and the first point of
 * that window.
 *
 * @param rule       the rule met
 * @param index      the index, in the chart's points, of the point that completes the pattern
 * @param firstIndex the index of the first point of the pattern's window
 * @param upward     whether the pattern lies above the centre line (or rises); false below (or falls)
 */
public record Signal(RunRule rule, int index, int firstIndex, boolean upward) {
}
