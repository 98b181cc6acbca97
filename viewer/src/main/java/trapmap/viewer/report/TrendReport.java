package trapmap.viewer.report;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Rectangle2D;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import javax.imageio.ImageIO;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.CategoryAxis;
import org.jfree.chart.axis.CategoryLabelPositions;
import org.jfree.chart.axis.DateAxis;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.CategoryPlot;
import org.jfree.chart.plot.DatasetRenderingOrder;
import org.jfree.chart.plot.IntervalMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.category.BarRenderer;
import org.jfree.chart.renderer.category.LineAndShapeRenderer;
import org.jfree.chart.renderer.category.StandardBarPainter;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.chart.title.TextTitle;
import org.jfree.data.category.DefaultCategoryDataset;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import trapmap.maps.io.AtomicFiles;
import trapmap.maps.trend.ChartPoint;
import trapmap.maps.trend.ControlChart;
import trapmap.maps.trend.GroupYield;
import trapmap.maps.trend.ParetoEntry;
import trapmap.maps.trend.Signal;
import trapmap.maps.trend.TrendResult;
import trapmap.viewer.graphics.ChartStyle;
import trapmap.viewer.graphics.Labels;

/**
 * Draws a {@link TrendResult}: each control chart (values, centre line, 3σ limits, the baseline period shaded, the
 * points where a run rule fires in red), the yield per group and the Pareto of failed rules, as a PDF (with the list of
 * signals and the caution) or as one PNG picture. Computation is in {@code trapmap.maps.trend}; this class only draws.
 */
public final class TrendReport {
    static final Color VALUES = new Color(0x1F5FA8);
    static final Color LIMITS = DistributionChart.LIMIT;
    static final Color CENTRE = new Color(0x2E7D32);
    static final Color SIGNAL = new Color(0xD50000);
    static final Color BASELINE = new Color(0xEEF3FA);
    /** The series of a control chart's points: item {@code i} is point {@code i} ({@link #controlChart}). */
    public static final int VALUES_SERIES = 0;
    /** The series of a control chart's signals: item {@code k} is signal {@code k} ({@link #controlChart}). */
    public static final int SIGNALS_SERIES = 4;
    private static final int CHART_W = 1000;
    private static final int CHART_H = 380;
    /** Signals listed in the PDF; the rest are counted (all are in the CSV and JSON). */
    static final int LISTED_SIGNALS = 60;

    /**
     * What the report says about where the points came from.
     *
     * @param figure   the figure charted (a results column)
     * @param subtitle one line: the store, grouping, baseline, filters, wafers left out
     */
    public record Caption(String figure, String subtitle) {
    }

    private TrendReport() {
    }

    /**
     * The charts in drawing order: the control charts (chart {@code i} draws {@code r.charts().get(i)}), then yield
     * and Pareto (when any wafer failed a rule). The PDF, the PNG and the viewer's history window all draw these.
     */
    public static List<JFreeChart> charts(TrendResult r, Caption caption) {
        List<JFreeChart> out = new ArrayList<>();
        for (ControlChart c : r.charts()) {
            out.add(controlChart(c, caption.figure()));
        }
        out.add(yieldChart(r.yields()));
        if (!r.pareto().isEmpty()) {
            out.add(paretoChart(r.pareto()));
        }
        return out;
    }

    /**
     * One control chart: series 0 the values (item {@code i} is point {@code i}), 1 the centre line, 2 and 3 the
     * limits, 4 the points where a rule fires (item {@code k} is signal {@code k} of {@code c.signals()}); the
     * baseline period shaded.
     */
    public static JFreeChart controlChart(ControlChart c, String figure) {
        XYSeries values = new XYSeries("values", false, true);
        XYSeries centre = new XYSeries("centre line", false, true);
        XYSeries upper = new XYSeries("upper limit (3σ)", false, true);
        XYSeries lower = new XYSeries("lower limit (3σ)", false, true);
        XYSeries signals = new XYSeries("signal", false, true);
        long baselineEnd = Long.MIN_VALUE;
        long first = Long.MAX_VALUE;
        for (ChartPoint p : c.points()) {
            long t = p.time().toEpochMilli();
            first = Math.min(first, t);
            if (p.baseline()) {
                baselineEnd = Math.max(baselineEnd, t);
            }
            values.add(t, Double.isNaN(p.value()) ? null : p.value()); // item i is point i (VALUES_SERIES)
            centre.add(t, p.centre());
            upper.add(t, p.upper());
            lower.add(t, p.lower());
        }
        for (Signal s : c.signals()) {
            ChartPoint p = c.points().get(s.index());
            signals.add(p.time().toEpochMilli(), p.value());
        }
        XYSeriesCollection ds = new XYSeriesCollection();
        ds.addSeries(values);
        ds.addSeries(centre);
        ds.addSeries(upper);
        ds.addSeries(lower);
        ds.addSeries(signals);
        DateAxis x = new DateAxis("measured (UTC)");
        x.setTimeZone(java.util.TimeZone.getTimeZone("UTC"));
        String unit = DistributionChart.unitOf(figure);
        String what = c.kind().name().endsWith("RANGE") ? "range of " + figure : figure;
        NumberAxis y = new NumberAxis(what + (unit.isEmpty() ? "" : " (" + unit + ")"));
        y.setAutoRangeIncludesZero(false);
        y.setNumberFormatOverride(ChartStyle.TICK_FORMAT);
        XYLineAndShapeRenderer rd = new XYLineAndShapeRenderer();
        rd.setSeriesPaint(0, VALUES);
        rd.setSeriesShape(0, new Ellipse2D.Double(-2.5, -2.5, 5, 5));
        rd.setSeriesStroke(0, new BasicStroke(1f));
        rd.setSeriesPaint(1, CENTRE);
        rd.setSeriesShapesVisible(1, false);
        float[] dash = {6f, 4f};
        for (int s = 2; s <= 3; s++) {
            rd.setSeriesPaint(s, LIMITS);
            rd.setSeriesShapesVisible(s, false);
            rd.setSeriesStroke(s, new BasicStroke(1.2f, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 10f, dash, 0f));
        }
        rd.setSeriesPaint(4, SIGNAL);
        rd.setSeriesLinesVisible(4, false);
        rd.setSeriesShape(4, new Ellipse2D.Double(-5, -5, 10, 10));
        XYPlot plot = new XYPlot(ds, x, y, rd);
        if (baselineEnd != Long.MIN_VALUE) {
            IntervalMarker m = new IntervalMarker(first, baselineEnd, BASELINE);
            m.setLabel("baseline");
            m.setLabelFont(ChartStyle.TICKS);
            m.setLabelAnchor(org.jfree.chart.ui.RectangleAnchor.TOP_LEFT);
            m.setLabelTextAnchor(org.jfree.chart.ui.TextAnchor.TOP_LEFT);
            plot.addDomainMarker(m, org.jfree.chart.ui.Layer.BACKGROUND);
        }
        JFreeChart chart = new JFreeChart(c.title() + ": " + figure, ChartStyle.TITLE, plot, true);
        chart.addSubtitle(new TextTitle(c.points().size() + " points, σ̂ = " + Labels.compact(c.sigmaHat())
                + (unit.isEmpty() ? "" : " " + unit) + ", " + c.signals().size() + " signal(s)", ChartStyle.SUBTITLE));
        ChartStyle.apply(chart);
        return chart;
    }

    /** Most categories whose labels are written across the axis. */
    static final int FEW_CATEGORIES = 6;

    /** The yield per group as bars, %. */
    public static JFreeChart yieldChart(List<GroupYield> yields) {
        DefaultCategoryDataset ds = new DefaultCategoryDataset();
        for (GroupYield y : yields) {
            ds.addValue(100.0 * y.yield(), "yield", y.group());
        }
        CategoryAxis x = new CategoryAxis("group");
        // a few groups (furnace tubes, slots) read across; many (days, lots) stand upright
        x.setCategoryLabelPositions(yields.size() <= FEW_CATEGORIES ? CategoryLabelPositions.STANDARD
                : CategoryLabelPositions.UP_90);
        x.setTickLabelFont(ChartStyle.TICKS);
        NumberAxis y = new NumberAxis("yield (%)");
        y.setRange(0, 100);
        BarRenderer r = new BarRenderer();
        r.setBarPainter(new StandardBarPainter());
        r.setShadowVisible(false);
        r.setSeriesPaint(0, ChartStyle.BARS);
        CategoryPlot plot = new CategoryPlot(ds, x, y, r);
        plot.setBackgroundPaint(Color.WHITE);
        plot.setRangeGridlinePaint(ChartStyle.GRID);
        JFreeChart chart = new JFreeChart("Yield per group", ChartStyle.TITLE, plot, false);
        chart.setBackgroundPaint(Color.WHITE);
        return chart;
    }

    /** The failed rules as bars, most frequent first, with the cumulative share (%). */
    public static JFreeChart paretoChart(List<ParetoEntry> pareto) {
        DefaultCategoryDataset bars = new DefaultCategoryDataset();
        DefaultCategoryDataset cumulative = new DefaultCategoryDataset();
        for (ParetoEntry p : pareto) {
            // the figure's name as the summary writes it ("largest interior region"), not its column name
            String rule = trapmap.maps.batch.Figure.readable(p.rule());
            bars.addValue(p.failures(), "wafers failing", rule);
            cumulative.addValue(100.0 * p.cumulativeShare(), "cumulative share (%)", rule);
        }
        CategoryAxis x = new CategoryAxis("failed rule");
        x.setCategoryLabelPositions(pareto.size() <= FEW_CATEGORIES ? CategoryLabelPositions.STANDARD
                : CategoryLabelPositions.UP_45);
        x.setMaximumCategoryLabelLines(3);
        x.setTickLabelFont(ChartStyle.TICKS);
        NumberAxis y = new NumberAxis("wafers failing");
        y.setStandardTickUnits(NumberAxis.createIntegerTickUnits());
        BarRenderer r = new BarRenderer();
        r.setBarPainter(new StandardBarPainter());
        r.setShadowVisible(false);
        r.setSeriesPaint(0, ChartStyle.BARS);
        CategoryPlot plot = new CategoryPlot(bars, x, y, r);
        NumberAxis share = new NumberAxis("cumulative share (%)");
        // room above 100 % for the last point's marker
        share.setRange(0, 105);
        plot.setRangeAxis(1, share);
        plot.setDataset(1, cumulative);
        plot.mapDatasetToRangeAxis(1, 1);
        LineAndShapeRenderer line = new LineAndShapeRenderer();
        line.setSeriesPaint(0, LIMITS);
        plot.setRenderer(1, line);
        plot.setDatasetRenderingOrder(DatasetRenderingOrder.FORWARD);
        plot.setBackgroundPaint(Color.WHITE);
        plot.setRangeGridlinePaint(ChartStyle.GRID);
        JFreeChart chart = new JFreeChart("Pareto of failed rules", ChartStyle.TITLE, plot, true);
        chart.setBackgroundPaint(Color.WHITE);
        return chart;
    }

    /**
     * The signals in words, one line each: "2026-11-03T08:15:00Z  individuals (X), L5: 2 of 3 beyond 2 sigma, same
     * side (up), value 2e11", with "[in the baseline]" for a signal inside the baseline period.
     */
    public static List<String> signalLines(TrendResult r) {
        List<String> out = new ArrayList<>();
        for (ControlChart c : r.charts()) {
            for (Signal s : c.signals()) {
                ChartPoint p = c.points().get(s.index());
                out.add(p.time() + "  " + c.title() + ", " + p.label() + ": " + s.rule().description()
                        + (s.upward() ? " (up)" : " (down)") + ", value " + Labels.compact(p.value())
                        + (p.baseline() ? " [in the baseline]" : ""));
            }
        }
        return out;
    }

    /** Writes the charts one below the other as one PNG picture, atomically. */
    public static void writePng(Path png, TrendResult r, Caption caption) throws IOException {
        List<JFreeChart> charts = charts(r, caption);
        BufferedImage img = new BufferedImage(CHART_W, CHART_H * charts.size(), BufferedImage.TYPE_INT_RGB);
        Graphics2D g = img.createGraphics();
        try {
            g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
            g.setColor(Color.WHITE);
            g.fillRect(0, 0, img.getWidth(), img.getHeight());
            for (int i = 0; i < charts.size(); i++) {
                charts.get(i).draw(g, new Rectangle2D.Double(0, i * CHART_H, CHART_W, CHART_H));
            }
        } finally {
            g.dispose();
        }
        AtomicFiles.write(png, tmp -> {
            if (!ImageIO.write(img, "png", tmp.toFile())) {
                throw new IOException("no PNG writer");
            }
        });
    }

    /**
     * Writes the PDF, atomically: a title page part with the caption and the first charts, two charts a page, then
     * the signals (the first {@value #LISTED_SIGNALS}; all are in the CSV and JSON); the caution in every footer.
     */
    public static void writePdf(Path pdf, TrendResult r, Caption caption) throws IOException {
        List<JFreeChart> charts = charts(r, caption);
        List<String> signals = signalLines(r);
        AtomicFiles.write(pdf, tmp -> {
            try (PDDocument doc = new PDDocument()) {
                float w = PdfPage.WIDTH - 2 * PdfPage.MARGIN;
                float h = w * CHART_H / CHART_W;
                for (int i = 0; i < charts.size(); i += 2) {
                    try (PdfPage page = new PdfPage(doc)) {
                        float y = PdfPage.MARGIN;
                        if (i == 0) {
                            page.text("Trend of " + caption.figure(), PdfPage.MARGIN, y, PdfPage.BOLD, 14);
                            y += 20;
                            for (String line : PdfPage.wrap(caption.subtitle(), PdfPage.REGULAR, 8.5f, w)) {
                                page.text(line, PdfPage.MARGIN, y, PdfPage.REGULAR, 8.5f, PdfPage.MUTED);
                                y += 11;
                            }
                            y += 6;
                        }
                        for (int k = i; k < Math.min(i + 2, charts.size()); k++) {
                            page.image(picture(charts.get(k)), PdfPage.MARGIN, y, w, h);
                            y += h + 10;
                        }
                    }
                }
                signalPages(doc, signals);
                PdfPage.footers(doc, "trapmap trend - " + WaferReport.CAUTION);
                doc.save(tmp.toFile());
            }
        });
    }

    private static void signalPages(PDDocument doc, List<String> signals) throws IOException {
        List<String> lines = new ArrayList<>();
        lines.add(signals.isEmpty() ? "No signal: every point lies within its limits and no run rule fires."
                : signals.size() + " signal(s) (Western Electric 1956 rules; 6 rising/falling: Nelson 1984):");
        lines.addAll(signals.subList(0, Math.min(LISTED_SIGNALS, signals.size())));
        if (signals.size() > LISTED_SIGNALS) {
            lines.add("… and " + (signals.size() - LISTED_SIGNALS) + " more (all are in the CSV and --json output)");
        }
        float size = 8.5f;
        float bottom = PdfPage.HEIGHT - PdfPage.MARGIN - 40;
        PdfPage page = new PdfPage(doc);
        try {
            float y = PdfPage.MARGIN;
            page.text("Signals", PdfPage.MARGIN, y, PdfPage.BOLD, 12);
            y += 18;
            for (String l : lines) {
                if (y > bottom) {
                    page.close();
                    page = new PdfPage(doc);
                    y = PdfPage.MARGIN;
                }
                page.text(PdfPage.fit(l, PdfPage.REGULAR, size, PdfPage.WIDTH - 2 * PdfPage.MARGIN),
                        PdfPage.MARGIN, y, PdfPage.REGULAR, size);
                y += size * 1.35f;
            }
        } finally {
            page.close();
        }
    }

    /** The chart drawn at twice its size for print. */
    private static BufferedImage picture(JFreeChart chart) {
        return chart.createBufferedImage(CHART_W * 2, CHART_H * 2, CHART_W, CHART_H, null);
    }

    /** The unit of a figure named as in results.csv, typeset as on the charts' axes ("cm⁻³"); "" when none. */
    public static String unitOf(String figure) {
        return DistributionChart.unitOf(figure);
    }

    /** Lower-case file extension of {@code p} ("" when none). */
    public static String extension(Path p) {
        String n = p.getFileName().toString();
        int dot = n.lastIndexOf('.');
        return dot < 0 ? "" : n.substring(dot + 1).toLowerCase(Locale.ROOT);
    }
}
