package trapmap.viewer.ui.charts;

import java.awt.BasicStroke;
import java.awt.BorderLayout;
import java.awt.Color;
import java.awt.Dimension;
import javax.swing.JPanel;
import org.jfree.chart.ChartPanel;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.DeviationRenderer;
import org.jfree.chart.title.TextTitle;
import org.jfree.data.xy.YIntervalSeries;
import org.jfree.data.xy.YIntervalSeriesCollection;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.profile.RadialProfile;
import trapmap.maps.raster.Mask;
import trapmap.viewer.graphics.ChartStyle;
import trapmap.viewer.graphics.Labels;

/**
 * A radial profile: the mean of each ring against the ring's middle radius (mm), optionally with a band of ± one
 * standard deviation of the ring's pixels. Log value axis for quantities that span decades when all means are
 * positive. Methods run on the Event Dispatch Thread.
 */
public class RadialProfileView extends JPanel {
    private final ChartPanel chartPanel;

    public RadialProfileView() {
        super(new BorderLayout());
        chartPanel = new ChartPanel(createChart(null, Quantity.UNKNOWN, null), false, true, false, true, true);
        chartPanel.setPreferredSize(new Dimension(520, 300));
        chartPanel.setMouseWheelEnabled(true);
        add(chartPanel, BorderLayout.CENTER);
    }

    /** Shows ring means only. */
    public void show(RadialProfile profile, Quantity quantity) {
        show(profile, quantity, null);
    }

    /**
     * Shows ring means with a spread band.
     *
     * @param spread per ring, the half-width of the band in the map's unit (e.g. from {@link #ringStandardDeviations});
     *               null for none
     */
    public void show(RadialProfile profile, Quantity quantity, double[] spread) {
        chartPanel.setChart(createChart(profile, quantity, spread));
    }

    /** The chart shown, for export. */
    public JFreeChart chart() {
        return chartPanel.getChart();
    }

    /**
     * The sample standard deviation of the pixels of each ring of {@code profile} (same rings, centre, mask and
     * NaN rule as the profile); NaN for rings with fewer than two pixels.
     */
    public static double[] ringStandardDeviations(WaferMap map, Mask mask, RadialProfile profile) {
        int rings = profile.ringCount();
        double[] sum2 = new double[rings];
        long[] n = new long[rings];
        float[] s = map.raster().samples();
        int w = map.width();
        for (int y = 0; y < map.height(); y++) {
            double dy = map.grid().yMm(y) - profile.centreYMm();
            for (int x = 0; x < w; x++) {
                int i = y * w + x;
                float v = s[i];
                if (v != v || mask != null && !mask.containsIndex(i)) {
                    continue;
                }
                double dx = map.grid().xMm(x) - profile.centreXMm();
                int ring = (int) (Math.sqrt(dx * dx + dy * dy) / profile.ringWidthMm());
                if (ring >= rings) {
                    ring = rings - 1;
                }
                double d = v - profile.mean(ring);
                sum2[ring] += d * d;
                n[ring]++;
            }
        }
        double[] sd = new double[rings];
        for (int k = 0; k < rings; k++) {
            sd[k] = n[k] < 2 ? Double.NaN : Math.sqrt(sum2[k] / (n[k] - 1));
        }
        return sd;
    }

    /** The profile chart (empty for a null profile). */
    public static JFreeChart createChart(RadialProfile p, Quantity q, double[] spread) {
        YIntervalSeries s = new YIntervalSeries("ring mean" + (spread != null ? " ± 1 standard deviation" : ""),
                false, true);
        boolean allPositive = true;
        boolean any = false;
        if (p != null) {
            for (int k = 0; k < p.ringCount(); k++) {
                double m = p.mean(k);
                if (Double.isNaN(m)) {
                    continue;
                }
                any = true;
                allPositive &= m > 0;
                double d = spread == null || Double.isNaN(spread[k]) ? 0 : spread[k];
                double lo = m - d;
                s.add(p.radiusMm(k), m, lo, m + d);
            }
        }
        boolean log = q.logarithmic() && any && allPositive;
        if (log && spread != null) {
            // a band reaching zero or below has no place on a log axis: clip its lower edge
            YIntervalSeries clipped = new YIntervalSeries(s.getKey(), false, true);
            for (int i = 0; i < s.getItemCount(); i++) {
                double m = s.getYValue(i);
                double lo = s.getYLowValue(i);
                clipped.add(s.getX(i).doubleValue(), m, lo > 0 ? lo : m / 10, s.getYHighValue(i));
            }
            s = clipped;
        }
        ValueAxis y = log ? ChartStyle.logAxis(Labels.axis(q)) : ChartStyle.linearAxis(Labels.axis(q));
        NumberAxis x = new NumberAxis("radius from the wafer centre (mm)");
        DeviationRenderer r = new DeviationRenderer(true, p != null && p.ringCount() < 40);
        r.setSeriesPaint(0, ChartStyle.SERIES[0]);
        r.setSeriesFillPaint(0, new Color(0x9EBCDA));
        r.setSeriesStroke(0, new BasicStroke(1.5f));
        r.setAlpha(spread != null ? 0.45f : 0f);
        String unit = Labels.unit(q);
        r.setDefaultToolTipGenerator((ds, si, i) -> "r = " + Labels.number(ds.getXValue(si, i)) + " mm: mean "
                + Labels.number(ds.getYValue(si, i)) + (unit.isEmpty() ? "" : " " + unit));
        YIntervalSeriesCollection dataset = new YIntervalSeriesCollection();
        dataset.addSeries(s);
        XYPlot plot = new XYPlot(dataset, x, y, r);
        JFreeChart chart = new JFreeChart("Radial profile of " + Labels.name(q), ChartStyle.TITLE, plot,
                spread != null);
        if (p != null) {
            chart.addSubtitle(new TextTitle("rings " + Labels.number(p.ringWidthMm()) + " mm wide about ("
                    + Labels.number(p.centreXMm()) + ", " + Labels.number(p.centreYMm()) + ") mm",
                    ChartStyle.SUBTITLE));
        }
        ChartStyle.apply(chart);
        return chart;
    }
}
