package trapmap.maps.trend;

import java.util.List;

/**
 * One control chart: its points with centre line and limits, and the signals found on it.
 *
 * @param kind      which chart
 * @param points    the points in time order
 * @param sigmaHat  the process σ estimated from the baseline, in the figure's unit
 * @param signals   the run-rule signals, ordered by point
 */
public record ControlChart(ChartKind kind, List<ChartPoint> points, double sigmaHat, List<Signal> signals) {
    public ControlChart {
        points = List.copyOf(points);
        signals = List.copyOf(signals);
    }

    /** The chart's title: its kind, and for a chart of one group, the group ("individuals (X) of T2"). */
    public String title() {
        return kind.perGroup() && !points.isEmpty() ? kind.title() + " of " + points.get(0).label() : kind.title();
    }
}
