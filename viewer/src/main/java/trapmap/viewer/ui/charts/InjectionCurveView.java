package trapmap.viewer.ui.charts;

import java.awt.BasicStroke;
import java.awt.BorderLayout;
import java.awt.Dimension;
import java.awt.geom.Ellipse2D;
import javax.swing.JPanel;
import org.jfree.chart.ChartPanel;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.LogAxis;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.title.TextTitle;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import trapmap.physics.conversion.InjectionSweep;
import trapmap.physics.conversion.PixelStatus;
import trapmap.viewer.graphics.ChartStyle;
import trapmap.viewer.graphics.DecadeAxis;
import trapmap.viewer.graphics.Labels;

/**
 * The injection dependence of the probed pixel ({@link InjectionSweep}) on log–log axes: τ_SRH of the defect at the
 * pixel's N_t, the intrinsic and surface limits, the effective lifetime they combine to, and the operating point
 * (Δn, τ measured). Methods run on the Event Dispatch Thread.
 */
public class InjectionCurveView extends JPanel {
    private final ChartPanel chartPanel;
    private InjectionSweep curve;

    public InjectionCurveView() {
        super(new BorderLayout());
        chartPanel = new ChartPanel(createChart(null), false, true, false, true, true);
        chartPanel.setPreferredSize(new Dimension(520, 340));
        chartPanel.setMouseWheelEnabled(true);
        add(chartPanel, BorderLayout.CENTER);
    }

    /** Shows the curves (null clears). */
    public void show(InjectionSweep c) {
        this.curve = c;
        chartPanel.setChart(createChart(c));
    }

    public InjectionSweep curve() {
        return curve;
    }

    /** The chart shown, for export. */
    public JFreeChart chart() {
        return chartPanel.getChart();
    }

    /** The chart of {@code c} (empty for null). */
    public static JFreeChart createChart(InjectionSweep c) {
        XYSeriesCollection lines = new XYSeriesCollection();
        XYSeriesCollection point = new XYSeriesCollection();
        if (c != null) {
            XYSeries srh = new XYSeries("τ_SRH (" + c.defectId() + ", N_t = " + Labels.number(
                    c.pixel().trapDensityPerCm3()) + " cm⁻³)", false, true);
            XYSeries intr = new XYSeries("τ_intrinsic (radiative + Auger)", false, true);
            XYSeries surf = new XYSeries("τ_surface", false, true);
            XYSeries eff = new XYSeries("τ_eff", false, true);
            double[] dn = c.injectionPerCm3();
            for (int i = 0; i < dn.length; i++) {
                srh.add(dn[i], c.srhUs()[i]);
                intr.add(dn[i], c.intrinsicUs()[i]);
                eff.add(dn[i], c.effectiveUs()[i]);
            }
            lines.addSeries(eff);
            lines.addSeries(srh);
            lines.addSeries(intr);
            if (Double.isFinite(c.surfaceUs())) {
                surf.add(dn[0], c.surfaceUs());
                surf.add(dn[dn.length - 1], c.surfaceUs());
                lines.addSeries(surf);
            }
            XYSeries op = new XYSeries("measured: Δn = " + Labels.number(c.pixel().injectionPerCm3()) + " cm⁻³, τ = "
                    + Labels.number(c.measuredUs()) + " µs", false, true);
            op.add(c.pixel().injectionPerCm3(), c.measuredUs());
            point.addSeries(op);
        }
        LogAxis x = new DecadeAxis("injection Δn (cm⁻³)");
        x.setRange(InjectionSweep.MIN_INJECTION_PER_CM3, InjectionSweep.MAX_INJECTION_PER_CM3);
        LogAxis y = new DecadeAxis("lifetime (µs)");
        if (c != null) {
            y.setRange(yRange(c)[0], yRange(c)[1]);
        }
        XYLineAndShapeRenderer lr = new XYLineAndShapeRenderer(true, false);
        float[] dash = {6f, 4f};
        lr.setSeriesPaint(0, ChartStyle.SERIES[4]);
        lr.setSeriesStroke(0, new BasicStroke(2.4f));
        lr.setSeriesPaint(1, ChartStyle.SERIES[0]);
        lr.setSeriesStroke(1, new BasicStroke(1.6f));
        lr.setSeriesPaint(2, ChartStyle.SERIES[2]);
        lr.setSeriesStroke(2, new BasicStroke(1.6f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 10f, dash, 0f));
        lr.setSeriesPaint(3, ChartStyle.SERIES[3]);
        lr.setSeriesStroke(3, new BasicStroke(1.6f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 10f,
                new float[] {2f, 3f}, 0f));
        lr.setDefaultToolTipGenerator((ds, s, i) -> ds.getSeriesKey(s) + " at Δn = " + Labels.number(ds.getXValue(s, i))
                + " cm⁻³: " + Labels.number(ds.getYValue(s, i)) + " µs");
        XYLineAndShapeRenderer pr = new XYLineAndShapeRenderer(false, true);
        pr.setSeriesPaint(0, ChartStyle.MARKER);
        pr.setSeriesShape(0, new Ellipse2D.Double(-5, -5, 10, 10));
        pr.setDefaultToolTipGenerator((ds, s, i) -> "operating point: Δn = " + Labels.number(ds.getXValue(s, i))
                + " cm⁻³, τ measured = " + Labels.number(ds.getYValue(s, i)) + " µs");
        XYPlot plot = new XYPlot(lines, x, y, lr);
        plot.setDataset(1, point);
        plot.setRenderer(1, pr);
        JFreeChart chart = new JFreeChart("Lifetime against injection", ChartStyle.TITLE, plot, true);
        if (c == null) {
            chart.addSubtitle(new TextTitle(EMPTY, ChartStyle.SUBTITLE));
        } else {
            String status = c.pixel().status() == PixelStatus.BELOW_LIMIT
                    ? "below the detection limit: N_t is an upper bound" : "status " + c.pixel().status().name();
            chart.addSubtitle(new TextTitle("defect " + c.defectId() + ", N_t = " + Labels.number(
                    c.pixel().trapDensityPerCm3()) + " cm⁻³ (" + status + ")", ChartStyle.SUBTITLE));
        }
        ChartStyle.apply(chart);
        // room on the right for half of the last decade label (10¹⁷ at the end of the Δn axis)
        chart.setPadding(new org.jfree.chart.ui.RectangleInsets(2, 2, 2, 16));
        return chart;
    }

    /** What the empty chart says: how to get a curve. */
    public static final String EMPTY = "no pixel yet: point at the map with this tab open; the curve is the pixel's"
            + " under the cursor, for the chosen defect";

    /** A lifetime range that shows τ_eff, the operating point and the limits near them (at most six decades). */
    private static double[] yRange(InjectionSweep c) {
        double lo = c.measuredUs();
        double hi = c.measuredUs();
        for (double v : c.effectiveUs()) {
            lo = Math.min(lo, v);
            hi = Math.max(hi, v);
        }
        for (double[] a : new double[][] {c.srhUs(), c.intrinsicUs()}) {
            for (double v : a) {
                if (v > 0 && Double.isFinite(v)) {
                    hi = Math.max(hi, Math.min(v, lo * 1e6));
                }
            }
        }
        if (Double.isFinite(c.surfaceUs())) {
            hi = Math.max(hi, Math.min(c.surfaceUs(), lo * 1e6));
        }
        return new double[] {lo / 2, hi * 2};
    }
}
