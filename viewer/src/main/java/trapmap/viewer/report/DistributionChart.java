package trapmap.viewer.report;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.util.Arrays;
import java.util.List;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.StandardXYBarPainter;
import org.jfree.chart.renderer.xy.XYBarRenderer;
import org.jfree.data.xy.XYIntervalSeries;
import org.jfree.data.xy.XYIntervalSeriesCollection;
import trapmap.maps.batch.Figure;
import trapmap.maps.batch.Rules;
import trapmap.viewer.graphics.ChartStyle;
import trapmap.viewer.graphics.Labels;

/**
 * The histogram of one figure over the wafers of one profile, with that profile's limits as red lines. Trap-density
 * figures are on a log axis labelled with the profile's defect: one defect per axis.
 */
final class DistributionChart {
    static final Color LIMIT = new Color(0xC62828);
    private static final Color BARS = new Color(0x3A6EA5);

    private DistributionChart() {
    }

    /** The unit of a results column, from the figure's definition ("" when unknown or dimensionless). */
    static String unitOf(String figure) {
        try {
            return Typeset.unit(Figure.parse(figure).unit());
        } catch (IllegalArgumentException e) {
            return "";
        }
    }

    static boolean isTrapDensity(String figure) {
        return figure.startsWith("trap_density_");
    }

    /** The figure's readable name without unit ("largest interior region"); the name itself when unknown. */
    static String what(String figure) {
        try {
            return Figure.parse(figure).what();
        } catch (IllegalArgumentException e) {
            return figure;
        }
    }

    /** "figure (unit)", with the defect for a trap-density figure: the axis label. */
    static String label(String figure, String defect) {
        String unit = unitOf(figure);
        String u = unit.isEmpty() ? "" : unit;
        if (isTrapDensity(figure) && defect != null && !defect.isEmpty()) {
            u = u.isEmpty() ? defect : u + ", " + defect;
        }
        return what(figure) + (u.isEmpty() ? "" : " (" + u + ")");
    }

    /** The limits of {@code figure} in {@code profile} (min and max where given), empty when none or no profile. */
    static double[] limits(Rules.Profile profile, String figure) {
        if (profile == null) {
            return new double[0];
        }
        List<Rules.Limit> own = figure.equals(Figure.INVALID_AREA_FRACTION) ? List.of(profile.invalidAreaLimit())
                : profile.limits();
        return own.stream().filter(l -> l.figure().name().equals(figure))
                .flatMapToDouble(l -> Arrays.stream(new double[] {l.min(), l.max()})).filter(d -> !Double.isNaN(d))
                .toArray();
    }

    /** The histogram of the finite {@code values}, with {@code limits} marked. */
    static JFreeChart of(String figure, String defect, double[] values, double[] limits) {
        double[] v = Arrays.stream(values).filter(Double::isFinite).toArray();
        boolean log = isTrapDensity(figure);
        XYIntervalSeries s = new XYIntervalSeries("wafers", false, true);
        double lo = Arrays.stream(v).min().orElse(0);
        double hi = Arrays.stream(v).max().orElse(1);
        for (double l : limits) {
            if (!log || l > 0) {
                lo = Math.min(lo, l);
                hi = Math.max(hi, l);
            }
        }
        log &= lo > 0;
        if (!(hi > lo) && lo == 0) {
            // every wafer at 0 (no area below the limit): the figures are never negative, so the axis starts there
            hi = 1;
        } else if (!(hi > lo)) {
            double pad = Math.abs(lo) * 0.1;
            lo -= pad;
            hi += pad;
        }
        int bins = Math.max(5, Math.min(20, (int) Math.ceil(Math.sqrt(Math.max(v.length, 1))) * 2));
        double a = log ? Math.log10(lo) : lo;
        double b = log ? Math.log10(hi) : hi;
        double width = (b - a) / bins;
        int[] counts = new int[bins];
        for (double x : v) {
            double t = log ? Math.log10(x) : x;
            int k = (int) Math.min(bins - 1, Math.max(0, Math.floor((t - a) / width)));
            counts[k]++;
        }
        for (int k = 0; k < bins; k++) {
            double e0 = a + k * width;
            double e1 = e0 + width;
            double x0 = log ? Math.pow(10, e0) : e0;
            double x1 = log ? Math.pow(10, e1) : e1;
            s.add(log ? Math.sqrt(x0 * x1) : (x0 + x1) / 2, x0, x1, counts[k], 0, counts[k]);
        }
        XYIntervalSeriesCollection ds = new XYIntervalSeriesCollection();
        ds.addSeries(s);
        String label = label(figure, defect);
        ValueAxis x;
        if (log) {
            x = ChartStyle.logAxis(label);
        } else {
            NumberAxis nx = new NumberAxis(label);
            nx.setAutoRangeIncludesZero(false);
            nx.setNumberFormatOverride(ChartStyle.TICK_FORMAT);
            x = nx;
        }
        double pad = log ? Math.pow(hi / lo, 0.05) : 0.05 * (hi - lo);
        x.setRange(log ? lo / pad : lo - pad, log ? hi * pad : hi + pad);
        NumberAxis y = new NumberAxis("wafers");
        y.setStandardTickUnits(NumberAxis.createIntegerTickUnits());
        XYBarRenderer r = new XYBarRenderer(0.08);
        r.setBarPainter(new StandardXYBarPainter());
        r.setShadowVisible(false);
        r.setSeriesPaint(0, BARS);
        XYPlot plot = new XYPlot(ds, x, y, r);
        for (double l : limits) {
            plot.addDomainMarker(new ValueMarker(l, LIMIT, new BasicStroke(1.5f)));
        }
        JFreeChart chart = new JFreeChart(null, null, plot, false);
        chart.setBackgroundPaint(Color.WHITE);
        plot.setBackgroundPaint(Color.WHITE);
        plot.setRangeGridlinePaint(new Color(0xDDDDDD));
        plot.setDomainGridlinePaint(new Color(0xDDDDDD));
        Font small = new Font(Font.SANS_SERIF, Font.PLAIN, 10);
        Font tick = new Font(Font.SANS_SERIF, Font.PLAIN, 9);
        x.setLabelFont(small);
        x.setTickLabelFont(tick);
        y.setLabelFont(small);
        y.setTickLabelFont(tick);
        return chart;
    }

    /** The limits as text: "≥ 50", "≤ 4e11", "0.1 – 2", "none". */
    static String limitText(Rules.Profile profile, String figure) {
        if (profile == null) {
            return "";
        }
        List<Rules.Limit> ls = profile.limits().stream().filter(l -> l.figure().name().equals(figure)).toList();
        if (ls.isEmpty() && figure.equals(Figure.INVALID_AREA_FRACTION)) {
            return "≤ " + Labels.number(profile.invalidAreaLimit().max()) + " (default)";
        }
        if (ls.isEmpty()) {
            return "none";
        }
        Rules.Limit l = ls.get(0);
        if (!Double.isNaN(l.min()) && !Double.isNaN(l.max())) {
            return Labels.number(l.min()) + " to " + Labels.number(l.max());
        }
        return Double.isNaN(l.min()) ? "≤ " + Labels.number(l.max()) : "≥ " + Labels.number(l.min());
    }
}
