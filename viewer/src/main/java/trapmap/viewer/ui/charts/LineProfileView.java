package trapmap.viewer.ui.charts;

import java.awt.BasicStroke;
import java.awt.BorderLayout;
import java.awt.Dimension;
import javax.swing.JPanel;
import org.jfree.chart.ChartPanel;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.title.TextTitle;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import trapmap.maps.model.Quantity;
import trapmap.maps.profile.LineProfile;
import trapmap.viewer.graphics.ChartStyle;
import trapmap.viewer.graphics.Labels;

/**
 * A line profile: value against distance along the line (mm), with the band width averaged across the line in the
 * subtitle. Quantities that span decades get a logarithmic value axis when every sample is positive. Samples
 * without data leave gaps. Methods run on the Event Dispatch Thread.
 */
public class LineProfileView extends JPanel {
    private final ChartPanel chartPanel;

    public LineProfileView() {
        super(new BorderLayout());
        chartPanel = new ChartPanel(createChart(null, Quantity.UNKNOWN), false, true, false, true, true);
        chartPanel.setPreferredSize(new Dimension(520, 300));
        chartPanel.setMouseWheelEnabled(true);
        add(chartPanel, BorderLayout.CENTER);
    }

    /** Shows {@code profile} of a map of {@code quantity} (null profile clears). */
    public void show(LineProfile profile, Quantity quantity) {
        chartPanel.setChart(createChart(profile, quantity));
    }

    /** The chart shown, for export. */
    public JFreeChart chart() {
        return chartPanel.getChart();
    }

    /** What the chart without a line says: how to draw one. */
    public static final String EMPTY = "no line drawn: press L (View ▸ Line tool) and drag across the map";

    /** The profile chart (empty for a null profile, saying how to draw a line). */
    public static JFreeChart createChart(LineProfile p, Quantity q) {
        XYSeries s = new XYSeries(Labels.name(q), false, true);
        boolean allPositive = true;
        boolean any = false;
        if (p != null) {
            for (int i = 0; i < p.size(); i++) {
                double v = p.value(i);
                s.add(p.distanceMm(i), Double.isNaN(v) ? null : v);
                if (!Double.isNaN(v)) {
                    any = true;
                    allPositive &= v > 0;
                }
            }
        }
        boolean log = q.logarithmic() && any && allPositive;
        ValueAxis y = log ? ChartStyle.logAxis(Labels.axis(q)) : ChartStyle.linearAxis(Labels.axis(q));
        NumberAxis x = new NumberAxis("distance along the line (mm)");
        x.setAutoRangeIncludesZero(true);
        XYLineAndShapeRenderer r = new XYLineAndShapeRenderer(true, false);
        r.setSeriesPaint(0, ChartStyle.SERIES[0]);
        r.setSeriesStroke(0, new BasicStroke(1.5f));
        String unit = Labels.unit(q);
        r.setDefaultToolTipGenerator((ds, si, i) -> Labels.number(ds.getXValue(si, i)) + " mm: "
                + Labels.number(ds.getYValue(si, i)) + (unit.isEmpty() ? "" : " " + unit));
        XYPlot plot = new XYPlot(new XYSeriesCollection(s), x, y, r);
        JFreeChart chart = new JFreeChart(p == null ? "Line profile" : "Line profile of " + Labels.name(q),
                ChartStyle.TITLE, plot, false);
        if (p == null) {
            chart.addSubtitle(new TextTitle(EMPTY, ChartStyle.SUBTITLE));
        } else {
            String band = p.bandWidthMm() > 0 ? "averaged across a band " + Labels.number(p.bandWidthMm()) + " mm wide"
                    : "single line (no band)";
            chart.addSubtitle(new TextTitle(String.format(java.util.Locale.ROOT,
                    "from (%s, %s) mm to (%s, %s) mm, %s mm long, %s", Labels.number(p.xMm(0)),
                    Labels.number(p.yMm(0)), Labels.number(p.xMm(p.size() - 1)), Labels.number(p.yMm(p.size() - 1)),
                    Labels.number(p.lengthMm()), band), ChartStyle.SUBTITLE));
        }
        ChartStyle.apply(chart);
        return chart;
    }
}
