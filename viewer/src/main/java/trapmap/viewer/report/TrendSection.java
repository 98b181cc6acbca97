package trapmap.viewer.report;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.geom.Ellipse2D;
import java.io.IOException;
import java.util.ArrayList;
import java.util.Collection;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import trapmap.maps.trend.ChartPoint;
import trapmap.maps.trend.ControlChart;
import trapmap.maps.trend.TrendSettings;
import trapmap.store.BatchTrend;
import trapmap.store.StoreTrend;
import trapmap.viewer.graphics.Labels;

/**
 * The trend page of a batch summary, when the batch stored its wafers ({@code --store}) and its rules have a
 * {@code trend} block: the control charts of the block's figure over the whole store after this run's wafers
 * ({@link BatchTrend}; drawn as {@code trapmap trend} draws them, {@link TrendReport}), this run's points ringed, the
 * signals after the baseline listed, and the caution. Centre line and 3σ limits come from the baseline (Montgomery,
 * <i>Introduction to Statistical Quality Control</i>, ch. 6); signals by the Western Electric rules (1956) and
 * Nelson's trend rule (1984).
 */
final class TrendSection {
    /** The ring around a point of this run. */
    static final Color THIS_RUN = new Color(0xEF6C00);
    /** The series name of the rings (the charts' legend). */
    static final String THIS_RUN_SERIES = "this run";
    /** Charts drawn at most; the rest are counted. */
    static final int CHARTS = 8;
    /** Signals listed at most (the latest); the rest are counted. */
    static final int LISTED = 40;
    private static final int CHART_W = 1000;
    private static final int CHART_H = 380;
    /** What the trend page adds to the usual caution. */
    static final String CAUTION = "Control limits describe the baseline period only: a signal says that the figure"
            + " moved against that period, not why, and a point within its limits is not a pass. ";

    private TrendSection() {
    }

    static void draw(ReportFlow flow, BatchTrend t) throws IOException {
        TrendSettings s = t.settings();
        flow.part("Trend over the results store: " + s.figure());
        flow.paragraph("Store " + PdfPage.clean(t.storeName()) + ", after this run's wafers; " + s.describe()
                + " (" + t.origin() + ").", PdfPage.REGULAR, 8.5f);
        if (t.problem().isPresent()) {
            flow.paragraph("No trend: " + PdfPage.clean(t.problem().get()), PdfPage.BOLD, 9);
            flow.down(4);
            flow.caution(CAUTION + trapmap.maps.model.Caution.TEXT);
            return;
        }
        StoreTrend.Outcome o = t.outcome().orElseThrow();
        flow.paragraph(o.result().wafers() + " stored wafers, " + o.result().withoutTime() + " without a measured"
                + " time and " + o.result().withoutValue() + " without a value (left out of the charts). Points of"
                + " this run's wafers are ringed in orange; signals are red; the baseline is shaded. Centre line and"
                + " 3-sigma limits from the baseline (Montgomery, ch. 6); signals: Western Electric rules (1956),"
                + " 6 rising or falling (Nelson 1984). Range charts and the yield: trapmap trend.",
                PdfPage.REGULAR, 8.5f);
        List<ControlChart> charts = t.valueCharts();
        float w = ReportFlow.FULL;
        float h = w * CHART_H / CHART_W;
        for (ControlChart c : charts.subList(0, Math.min(CHARTS, charts.size()))) {
            JFreeChart chart = chart(t, c);
            flow.image(chart.createBufferedImage(CHART_W * 2, CHART_H * 2, CHART_W, CHART_H, null),
                    ReportFlow.LEFT, w, h);
            flow.down(h + 8);
        }
        if (charts.size() > CHARTS) {
            flow.paragraph("Showing " + CHARTS + " of " + charts.size() + " charts; trapmap trend --by " + s.by()
                    + " draws them all.", PdfPage.REGULAR, 8.5f);
        }
        signals(flow, t);
        flow.down(4);
        flow.caution(CAUTION + trapmap.maps.model.Caution.TEXT);
    }

    /** The chart as {@code trapmap trend} draws it, with a ring around each point of this run. */
    static JFreeChart chart(BatchTrend t, ControlChart c) {
        JFreeChart chart = TrendReport.controlChart(c, t.settings().figure());
        XYPlot plot = chart.getXYPlot();
        XYSeries ours = new XYSeries(THIS_RUN_SERIES, false, true);
        for (int i = 0; i < c.points().size(); i++) {
            ChartPoint p = c.points().get(i);
            if (!Double.isNaN(p.value()) && t.ofBatch(c, i)) {
                ours.add(p.time().toEpochMilli(), p.value());
            }
        }
        XYSeriesCollection ds = (XYSeriesCollection) plot.getDataset();
        int at = ds.getSeriesCount();
        ds.addSeries(ours);
        XYLineAndShapeRenderer r = (XYLineAndShapeRenderer) plot.getRenderer();
        r.setSeriesPaint(at, THIS_RUN);
        r.setSeriesLinesVisible(at, false);
        r.setSeriesShapesFilled(at, false);
        r.setSeriesStroke(at, new BasicStroke(1.5f));
        r.setSeriesShape(at, new Ellipse2D.Double(-4.5, -4.5, 9, 9));
        return chart;
    }

    /**
     * The signals after the baseline: per chart a count, then a table of the points where a rule fires (the rules of
     * one point on one row), the latest {@value #LISTED}.
     */
    private static void signals(ReportFlow flow, BatchTrend t) throws IOException {
        List<BatchTrend.LateSignal> late = t.lateSignals();
        flow.heading("Signals after the baseline", 40);
        if (late.isEmpty()) {
            flow.paragraph("No signal after the baseline: every later point lies within its limits and no run rule"
                    + " fires.", PdfPage.REGULAR, 8.5f);
            return;
        }
        Map<ControlChart, Map<Integer, List<BatchTrend.LateSignal>>> byPoint = new LinkedHashMap<>();
        for (BatchTrend.LateSignal l : late) {
            byPoint.computeIfAbsent(l.chart(), k -> new TreeMap<>())
                    .computeIfAbsent(l.signal().index(), k -> new ArrayList<>()).add(l);
        }
        List<List<BatchTrend.LateSignal>> points = new ArrayList<>();
        for (Map.Entry<ControlChart, Map<Integer, List<BatchTrend.LateSignal>>> e : byPoint.entrySet()) {
            Collection<List<BatchTrend.LateSignal>> at = e.getValue().values();
            long alarming = at.stream().filter(p -> p.stream().anyMatch(BatchTrend.LateSignal::alarms)).count();
            long ours = at.stream().filter(p -> p.get(0).ofBatch()).count();
            flow.paragraph(e.getKey().title() + ": " + at.size() + " point(s) with a signal after the baseline, "
                    + ours + " of this run; " + alarming + " by an alarm rule (" + alarmRules(t.settings()) + ").",
                    PdfPage.REGULAR, 8.5f);
            points.addAll(at);
        }
        points.sort(Comparator.comparing((List<BatchTrend.LateSignal> p) -> p.get(0).point().time()));
        List<List<BatchTrend.LateSignal>> shown = points.subList(Math.max(0, points.size() - LISTED), points.size());
        if (points.size() > LISTED) {
            flow.paragraph("The latest " + LISTED + " of the " + points.size() + " points are listed; trapmap trend"
                    + " lists them all.", PdfPage.REGULAR, 8.5f);
        }
        List<String[]> rows = new ArrayList<>();
        for (List<BatchTrend.LateSignal> p : shown) {
            BatchTrend.LateSignal first = p.get(0);
            rows.add(new String[] {first.point().time().toString(), first.chart().title(),
                PdfPage.clean(first.point().label()),
                String.join("; ", p.stream().map(l -> l.signal().rule().description()
                        + (l.signal().upward() ? " (up)" : " (down)")).toList()),
                Labels.compact(first.point().value()), first.ofBatch() ? "yes" : "",
                p.stream().anyMatch(BatchTrend.LateSignal::alarms) ? "yes" : ""});
        }
        float f = ReportFlow.FULL;
        flow.table(new float[] {0.17f * f, 0.17f * f, 0.06f * f, 0.36f * f, 0.09f * f, 0.08f * f, 0.07f * f},
                new boolean[] {false, false, false, false, true, false, false},
                new String[] {"measured (UTC)", "chart", "group", "rules that fire", Typeset.headed("value",
                    DistributionChart.unitOf(t.settings().figure())), "this run", "alarm"}, rows, 7.5f);
    }

    private static String alarmRules(TrendSettings s) {
        return s.alarmRules().isEmpty() ? "none"
                : String.join(", ", s.alarmRules().stream().map(TrendSettings::key).toList());
    }
}
