package trapmap.viewer.graphics;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Rectangle2D;
import java.util.List;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.annotations.XYTextAnnotation;
import org.jfree.chart.axis.LogAxis;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.IntervalMarker;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYErrorRenderer;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.title.TextTitle;
import org.jfree.chart.ui.Layer;
import org.jfree.chart.ui.RectangleAnchor;
import org.jfree.chart.ui.RectangleInsets;
import org.jfree.chart.ui.TextAnchor;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import org.jfree.data.xy.YIntervalSeries;
import org.jfree.data.xy.YIntervalSeriesCollection;
import trapmap.physics.spectroscopy.DefectOnCurve;
import trapmap.physics.spectroscopy.DpssFit;
import trapmap.physics.spectroscopy.DpssPoint;
import trapmap.physics.spectroscopy.DpssResult;
import trapmap.physics.spectroscopy.RankingStatus;

/**
 * The two charts of defect identification from several injection levels, in the common {@link ChartStyle}; they only
 * draw what the physics module computed ({@link FitCurves}, {@link DpssResult}). No Swing.
 * <ul>
 * <li>{@link #lifetimeFit}: τ_SRH against Δn on log–log axes, the measured levels with ±1 standard-uncertainty bars
 * and the fitted τ_SRH(Δn) = K(Δn)/N_t of the best candidates, each named in the legend with N_t, χ², ν and p;</li>
 * <li>{@link #dpss}: the DPSS k(E_t) = σ_n/σ_p against E_t − E_i (Rein et al., JAP 91, 2059 (2002)), lower and upper
 * half of the gap as two curves, the minimum-residual band shaded, the library defects marked at their (E_t, k) and
 * labelled (filled when they lie on the curve), and a note when the curve does not tell the half.</li>
 * </ul>
 */
public final class IdentificationCharts {
    /** Title of the lifetime chart. */
    public static final String FIT_TITLE = "SRH lifetime against injection";
    /** Title of the DPSS chart. */
    public static final String DPSS_TITLE = "Defect parameter solution surface";
    /** Shade of the minimum-residual band. */
    public static final Color BAND = new Color(0x1F5FA8 & 0xFFFFFF | 0x30000000, true);
    /** Decades shown beyond the band's and the library's k. */
    static final double K_MARGIN = 30;

    private IdentificationCharts() {
    }

    /** The τ_SRH(Δn) chart of {@code c} (an empty chart for null). */
    public static JFreeChart lifetimeFit(FitCurves c) {
        YIntervalSeriesCollection measured = new YIntervalSeriesCollection();
        XYSeriesCollection fits = new XYSeriesCollection();
        LogAxis x = new DecadeAxis("injection Δn (cm⁻³)");
        LogAxis y = new DecadeAxis("SRH lifetime τ_SRH (µs)");
        if (c != null) {
            YIntervalSeries m = new YIntervalSeries("measured τ_SRH (bars: ±1 standard uncertainty)", false, true);
            double lo = Double.POSITIVE_INFINITY;
            double hi = 0;
            for (FitCurves.Point p : c.points()) {
                m.add(p.injectionPerCm3(), p.tauUs(), p.lowUs(), p.highUs());
                lo = Math.min(lo, p.lowUs());
                hi = Math.max(hi, p.highUs());
            }
            measured.addSeries(m);
            for (FitCurves.Candidate k : c.candidates()) {
                XYSeries s = new XYSeries(k.label(), false, true);
                double[] dn = k.injectionPerCm3();
                double[] t = k.tauUs();
                for (int i = 0; i < dn.length; i++) {
                    if (t[i] > 0 && Double.isFinite(t[i])) {
                        s.add(dn[i], t[i]);
                        if (lo < Double.POSITIVE_INFINITY) {
                            // keep the fits within two decades of the data so the points stay readable
                            lo = Math.min(lo, Math.max(t[i], lo / 100));
                            hi = Math.max(hi, Math.min(t[i], hi * 100));
                        }
                    }
                }
                fits.addSeries(s);
            }
            x.setRange(c.minInjectionPerCm3(), c.maxInjectionPerCm3());
            if (hi > 0 && lo < Double.POSITIVE_INFINITY) {
                y.setRange(lo / 1.5, hi * 1.5);
            }
        }
        XYLineAndShapeRenderer lr = new XYLineAndShapeRenderer(true, false);
        float[][] dashes = {null, {7f, 4f}, {2f, 3f}};
        for (int i = 0; i < 6; i++) {
            lr.setSeriesPaint(i, ChartStyle.SERIES[i % ChartStyle.SERIES.length]);
            float[] d = dashes[i % dashes.length];
            lr.setSeriesStroke(i, d == null ? new BasicStroke(2.0f)
                    : new BasicStroke(1.6f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 10f, d, 0f));
        }
        lr.setDefaultToolTipGenerator((ds, s, i) -> ds.getSeriesKey(s) + " — at Δn = " + Labels.number(
                ds.getXValue(s, i)) + " cm⁻³: τ_SRH = " + Labels.number(ds.getYValue(s, i)) + " µs");
        XYErrorRenderer er = new XYErrorRenderer();
        er.setDrawXError(false);
        er.setDrawYError(true);
        er.setDefaultLinesVisible(false);
        er.setDefaultShapesVisible(true);
        er.setSeriesPaint(0, ChartStyle.MARKER);
        er.setErrorPaint(ChartStyle.MARKER);
        er.setErrorStroke(new BasicStroke(1.4f));
        er.setCapLength(10);
        er.setSeriesShape(0, new Ellipse2D.Double(-3.5, -3.5, 7, 7));
        er.setDefaultToolTipGenerator((ds, s, i) -> "measured at Δn = " + Labels.number(ds.getXValue(s, i))
                + " cm⁻³: τ_SRH = " + Labels.number(ds.getYValue(s, i)) + " µs");
        XYPlot plot = new XYPlot(measured, x, y, er);
        plot.setDataset(1, fits);
        plot.setRenderer(1, lr);
        JFreeChart chart = new JFreeChart(FIT_TITLE, ChartStyle.TITLE, plot, true);
        if (c != null) {
            String line = "ranking: " + status(c.ranking().status()) + " — " + Labels.prose(c.ranking().reason());
            if (!c.unusable().isEmpty()) {
                line += " (" + c.unusable().size() + " level(s) without a finite positive τ_SRH not drawn)";
            }
            TextTitle sub = new TextTitle(line, ChartStyle.SUBTITLE);
            sub.setMaximumLinesToDisplay(3);
            chart.addSubtitle(sub);
        }
        ChartStyle.apply(chart);
        chart.setPadding(new RectangleInsets(2, 2, 2, 16));
        return chart;
    }

    /** The DPSS chart of {@code r} (an empty chart for null). */
    public static JFreeChart dpss(DpssResult r) {
        XYSeriesCollection curves = new XYSeriesCollection();
        XYSeriesCollection library = new XYSeriesCollection();
        NumberAxis x = ChartStyle.linearAxis("trap level E_t − E_i (eV)");
        LogAxis y = new DecadeAxis("capture ratio k = σ_n/σ_p");
        XYPlot plot = new XYPlot(curves, x, y, null);
        if (r != null && !r.points().isEmpty()) {
            XYSeries lower = new XYSeries("k(E_t), E_t below E_i (lower half)", true, false);
            XYSeries upper = new XYSeries("k(E_t), E_t above E_i (upper half)", true, false);
            double kLo = Double.POSITIVE_INFINITY;
            double kHi = 0;
            for (DpssPoint p : r.points()) {
                double k = p.captureRatio();
                if (!(k > 0) || !Double.isFinite(k)) {
                    continue;
                }
                // E_t = E_i belongs to both halves, so that the two curves meet there
                if (p.energyFromIntrinsicEv() <= 0) {
                    lower.add(p.energyFromIntrinsicEv(), k);
                }
                if (p.energyFromIntrinsicEv() >= 0) {
                    upper.add(p.energyFromIntrinsicEv(), k);
                }
            }
            curves.addSeries(lower);
            curves.addSeries(upper);
            double[] kr = r.bandRatioRange();
            if (kr[0] > 0 && Double.isFinite(kr[1])) {
                kLo = kr[0];
                kHi = kr[1];
            }
            XYSeries lib = new XYSeries("library defects (E_t, k)", false, true);
            XYSeries on = new XYSeries("library defects on the curve", false, true);
            for (DefectOnCurve d : r.defects()) {
                double k = d.libraryRatio();
                if (!(k > 0) || !Double.isFinite(k)) {
                    continue;
                }
                (d.onCurve() ? on : lib).add(d.energyFromIntrinsicEv(), k);
                kLo = Math.min(kLo, k);
                kHi = Math.max(kHi, k);
                // names in the right fifth of the axis stand left of their point, so the edge does not cut them
                double e0 = r.points().get(0).energyFromIntrinsicEv();
                double e1 = r.points().get(r.points().size() - 1).energyFromIntrinsicEv();
                boolean nearRight = (d.energyFromIntrinsicEv() - e0) / (e1 - e0) > 0.8;
                XYTextAnnotation a = new XYTextAnnotation(nearRight ? d.defect().id() + " " : " " + d.defect().id(),
                        d.energyFromIntrinsicEv(), k);
                a.setFont(ChartStyle.TICKS.deriveFont(d.onCurve() ? Font.BOLD : Font.PLAIN));
                a.setTextAnchor(nearRight ? TextAnchor.BOTTOM_RIGHT : TextAnchor.BOTTOM_LEFT);
                a.setPaint(d.onCurve() ? ChartStyle.MARKER : Color.DARK_GRAY);
                plot.addAnnotation(a);
            }
            library.addSeries(lib);
            library.addSeries(on);
            for (double[] b : r.band()) {
                IntervalMarker m = new IntervalMarker(b[0], b[1] == b[0] ? b[0] + 1e-4 : b[1]);
                m.setPaint(BAND);
                m.setOutlinePaint(null);
                plot.addDomainMarker(m, Layer.BACKGROUND);
            }
            if (!r.band().isEmpty()) {
                IntervalMarker first = (IntervalMarker) plot.getDomainMarkers(Layer.BACKGROUND).iterator().next();
                first.setLabel("χ² ≤ χ²_min + " + Labels.compact(DpssFit.DEFAULT_DELTA_CHI_SQUARED));
                first.setLabelFont(ChartStyle.TICKS);
                first.setLabelAnchor(RectangleAnchor.TOP_LEFT);
                first.setLabelTextAnchor(TextAnchor.TOP_LEFT);
            }
            ValueMarker mid = new ValueMarker(0, Color.GRAY, new BasicStroke(0.8f, BasicStroke.CAP_BUTT,
                    BasicStroke.JOIN_MITER, 10f, new float[] {3f, 3f}, 0f));
            mid.setLabel("E_i");
            mid.setLabelFont(ChartStyle.TICKS);
            plot.addDomainMarker(mid);
            List<DpssPoint> pts = r.points();
            x.setRange(pts.get(0).energyFromIntrinsicEv(), pts.get(pts.size() - 1).energyFromIntrinsicEv());
            ChartStyle.labelInside(mid, x);
            if (kHi > 0 && kLo < Double.POSITIVE_INFINITY) {
                y.setRange(kLo / K_MARGIN, kHi * K_MARGIN);
            }
        }
        XYLineAndShapeRenderer cr = new XYLineAndShapeRenderer(true, false);
        cr.setSeriesPaint(0, ChartStyle.SERIES[0]);
        cr.setSeriesStroke(0, new BasicStroke(2.0f));
        cr.setSeriesPaint(1, ChartStyle.SERIES[1]);
        cr.setSeriesStroke(1, new BasicStroke(2.0f));
        cr.setDefaultToolTipGenerator((ds, s, i) -> "E_t − E_i = " + Labels.number(ds.getXValue(s, i)) + " eV: k = "
                + Labels.number(ds.getYValue(s, i)));
        plot.setRenderer(0, cr);
        XYLineAndShapeRenderer lr = new XYLineAndShapeRenderer(false, true);
        lr.setSeriesPaint(0, Color.DARK_GRAY);
        lr.setSeriesShape(0, new Rectangle2D.Double(-4, -4, 8, 8));
        lr.setSeriesShapesFilled(0, false);
        lr.setSeriesPaint(1, ChartStyle.MARKER);
        lr.setSeriesShape(1, new Rectangle2D.Double(-5, -5, 10, 10));
        lr.setSeriesShapesFilled(1, true);
        lr.setDefaultToolTipGenerator((ds, s, i) -> "library defect at E_t − E_i = " + Labels.number(
                ds.getXValue(s, i)) + " eV, k = " + Labels.number(ds.getYValue(s, i)));
        plot.setDataset(1, library);
        plot.setRenderer(1, lr);
        JFreeChart chart = new JFreeChart(DPSS_TITLE, ChartStyle.TITLE, plot, true);
        if (r != null) {
            TextTitle half = new TextTitle(note(r), ChartStyle.SUBTITLE.deriveFont(Font.BOLD));
            half.setPaint(r.ambiguousHalf() ? ChartStyle.MARKER : Color.DARK_GRAY);
            chart.addSubtitle(half);
            TextTitle sub = new TextTitle(Labels.prose(r.reason()), ChartStyle.SUBTITLE);
            sub.setMaximumLinesToDisplay(3);
            chart.addSubtitle(sub);
        }
        ChartStyle.apply(chart);
        chart.setPadding(new RectangleInsets(2, 2, 2, 16));
        return chart;
    }

    /**
     * The DPSS note on the half of the gap: ambiguous when both halves reach the minimum-residual band, else the half
     * of the least-χ² point.
     */
    static String note(DpssResult r) {
        if (r.points().isEmpty()) {
            return "no DPSS: too few usable levels";
        }
        if (r.ambiguousHalf()) {
            return "Ambiguous half: both halves of the gap reach the band, so the curve does not tell whether E_t lies"
                    + " above or below E_i";
        }
        return "E_t " + (r.best().energyFromIntrinsicEv() < 0 ? "below" : "above") + " E_i: only the "
                + (r.best().energyFromIntrinsicEv() < 0 ? "lower" : "upper") + " half of the gap reaches the band";
    }

    /** A ranking status as shown in charts, tables and readouts. */
    public static String status(RankingStatus s) {
        return switch (s) {
            case OK -> "OK";
            case BELOW_LIMIT -> "below limit at some levels";
            case TOO_FEW_LEVELS -> "too few levels";
            case NO_SINGLE_DEFECT -> "no single defect";
        };
    }
}
