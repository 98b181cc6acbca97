package trapmap.maps.trend;

import java.time.Instant;

/**
 * One plotted point of a control chart with its own centre line and limits (they vary with the subgroup size).
 *
 * @param time     the point's time: the wafer's measured time, or the first measured time of a subgroup
 * @param label    the subgroup (or, on the individuals chart, the group the wafer belongs to)
 * @param value    the plotted value, in the figure's unit
 * @param centre   the centre line there
 * @param lower    the lower control limit there
 * @param upper    the upper control limit there
 * @param baseline whether the point belongs to the baseline period the centre and limits come from
 * @param size     the number of wafers behind the point (1 on the individuals chart, 2 on the moving-range chart)
 */
public record ChartPoint(Instant time, String label, double value, double centre, double lower, double upper,
        boolean baseline, int size) {

    /** (value − centre)/σ with σ the chart's one-sigma distance on the point's side; NaN when the value is. */
    public double standardised() {
        double sigma = (upper - centre) / 3.0;
        if (Double.isNaN(value)) {
            return Double.NaN;
        }
        double d = value - centre;
        if (d == 0.0) {
            return 0.0;
        }
        return d / sigma;
    }
}
