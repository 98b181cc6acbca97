package trapmap.viewer.graphics;

import java.util.ArrayList;
import java.util.List;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.StandardXYBarPainter;
import org.jfree.chart.renderer.xy.XYBarRenderer;
import org.jfree.chart.title.TextTitle;
import org.jfree.chart.ui.Layer;
import org.jfree.data.xy.XYIntervalSeries;
import org.jfree.data.xy.XYIntervalSeriesCollection;
import trapmap.maps.model.Quantity;
import trapmap.maps.raster.PitchPrecision;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.Mask;
import trapmap.maps.stats.Histogram;
import trapmap.maps.stats.InvalidArea;
import trapmap.maps.stats.MapStatistics;
import trapmap.maps.stats.StatisticsRequest;

/**
 * Histogram of a map's pixels with data inside a mask, as share of the counted area per bin, with logarithmic bins
 * for quantities that span decades ({@link Quantity#logarithmic()}) and linear bins otherwise; an optional threshold
 * is drawn as a vertical line; and the statistics with their units. No Swing: the viewer's histogram view and the
 * wafer report both draw it.
 */
public final class HistogramChart {
    /** Bins per decade of logarithmic histograms. */
    public static final int BINS_PER_DECADE = 20;
    /** Bins of linear histograms. */
    public static final int LINEAR_BINS = 50;

    /** One line of the statistics table. */
    public record Row(String name, String value, String unit) {
    }

    /**
     * What the view shows.
     *
     * @param quantity   the map's quantity (name and unit)
     * @param histogram  the bins (null when no pixel has data)
     * @param statistics the statistics over the same pixels
     * @param threshold  the threshold in the map's unit, NaN for none
     * @param invalid    the unusable share of the evaluated area (maps module {@link InvalidArea}), or null when not
     *                   given
     * @param belowLimitFraction the share of the evaluated area below the detection limit, NaN when not given
     */
    public record Data(Quantity quantity, Histogram histogram, MapStatistics statistics, double threshold,
                       InvalidArea invalid, double belowLimitFraction) {

        /** Data without the invalid and below-limit areas. */
        public Data(Quantity quantity, Histogram histogram, MapStatistics statistics, double threshold) {
            this(quantity, histogram, statistics, threshold, null, Double.NaN);
        }

        /** The same data, reporting the invalid area and the below-limit share (NaN: unknown) beside it. */
        public Data withAreas(InvalidArea invalidArea, double belowLimit) {
            return new Data(quantity, histogram, statistics, threshold, invalidArea, belowLimit);
        }

        /** The statistics as table rows, each with its unit. */
        public List<Row> rows() {
            MapStatistics s = statistics;
            String u = Labels.unit(quantity);
            List<Row> r = new ArrayList<>();
            r.add(new Row("pixels counted", Integer.toString(s.count()), "px"));
            r.add(new Row("area", PitchPrecision.areaOfPixels(s.areaMm2(), s.count()), "mm²"));
            if (!categorical(quantity)) {
                r.add(new Row("mean", Labels.number(s.mean()), u));
                boolean harmonic = harmonicMeanSuits(quantity);
                if (harmonic) {
                    r.add(new Row("harmonic mean", Labels.number(s.harmonicMean()), u));
                }
                if (quantity.logarithmic()) {
                    r.add(new Row("geometric mean", Labels.number(s.geometricMean()), u));
                }
                r.add(new Row("median", Labels.number(s.median()), u));
                r.add(new Row("standard deviation", Labels.number(s.standardDeviation()), u));
                r.add(new Row("minimum", Labels.number(s.min()), u));
                for (MapStatistics.PercentileValue p : s.percentiles()) {
                    r.add(new Row("P" + Labels.number(p.percent()), Labels.number(p.value()), u));
                }
                r.add(new Row("maximum", Labels.number(s.max()), u));
                if (s.nonPositiveCount() > 0 && (harmonic || quantity.logarithmic())) {
                    r.add(new Row("pixels ≤ 0 (not in " + (harmonic && quantity.logarithmic() ? "harmonic/geometric"
                            : harmonic ? "harmonic" : "geometric") + " mean)", Integer.toString(s.nonPositiveCount()),
                            "px"));
                }
            }
            if (invalid != null) {
                r.add(new Row("invalid area (" + Labels.percent(invalid.fraction()) + " of evaluated)",
                        Integer.toString(invalid.invalidCount()), "px"));
                r.add(new Row("  non-finite (no data, ±∞)", Integer.toString(invalid.nonFiniteCount()), "px"));
                r.add(new Row("  ≤ 0", Integer.toString(invalid.nonPositiveCount()), "px"));
                r.add(new Row("  invalid conversion", Integer.toString(invalid.invalidConversionCount()), "px"));
                if (invalid.aboveDefaultLimit()) {
                    r.add(new Row("  above the default limit", Labels.percent(InvalidArea.DEFAULT_LIMIT), ""));
                }
            }
            if (!Double.isNaN(belowLimitFraction)) {
                r.add(new Row("below detection limit (of evaluated)", Labels.percent(belowLimitFraction), ""));
            }
            if (!Double.isNaN(threshold) && !s.areaFractions().isEmpty()) {
                MapStatistics.AreaFraction a = s.areaFraction(threshold);
                r.add(new Row("threshold", Labels.number(threshold), u));
                r.add(new Row("below threshold (" + Labels.percent(a.fractionBelow()) + ")",
                        Labels.number(a.areaBelowMm2()), "mm²"));
                r.add(new Row("above threshold (" + Labels.percent(a.fractionAbove()) + ")",
                        Labels.number(a.areaAboveMm2()), "mm²"));
            }
            return r;
        }
    }

    private HistogramChart() {
    }

    /**
     * True for the lifetimes (effective, SRH, at the reference injection), the quantities whose harmonic mean means
     * something: the lifetime of the mean recombination rate. A probability, a density or an index has none.
     */
    public static boolean harmonicMeanSuits(Quantity q) {
        return q == Quantity.EFFECTIVE_LIFETIME || q == Quantity.SRH_LIFETIME || q == Quantity.LIFETIME_AT_REFERENCE;
    }

    /**
     * True for maps whose values are categories (defect legend indices, identification and pixel statuses, region
     * numbers; {@link Quantity#categorical}): their mean, median, spread and percentiles mean nothing, so the table
     * lists only counts and areas.
     */
    public static boolean categorical(Quantity q) {
        return q.categorical();
    }

    /**
     * Histogram and statistics of {@code map} over {@code mask} (null: every pixel with data).
     *
     * @param threshold threshold in the map's unit to mark and to report the area above and below, NaN for none
     */
    public static Data compute(WaferMap map, Mask mask, double threshold) {
        StatisticsRequest request = Double.isNaN(threshold) ? StatisticsRequest.DEFAULT
                : StatisticsRequest.withThresholds(threshold);
        MapStatistics stats = MapStatistics.of(map, mask, request);
        Histogram.Binning binning = binning(map, mask, stats);
        Histogram h = binning == null ? null : Histogram.of(map, mask, binning);
        return new Data(map.quantity(), h, stats, threshold);
    }

    /**
     * Bins that cover every counted value: logarithmic from the smallest positive value to the largest for
     * logarithmic quantities ({@value #BINS_PER_DECADE} per decade, at least 10), linear from the smallest to the
     * largest value otherwise; null when no pixel has data.
     */
    public static Histogram.Binning binning(WaferMap map, Mask mask, MapStatistics stats) {
        if (stats.count() == 0) {
            return null;
        }
        if (map.quantity().logarithmic() && stats.positiveCount() > 0) {
            double lo = stats.min() > 0 ? stats.min() : smallestPositive(map, mask);
            double hi = stats.max();
            if (!(hi > lo)) {
                lo /= 1.1;
                hi *= 1.1;
            }
            int bins = (int) Math.max(10, Math.min(400, Math.round(Math.log10(hi / lo) * BINS_PER_DECADE)));
            return Histogram.Binning.logarithmic(lo, hi, bins);
        }
        double lo = stats.min();
        double hi = stats.max();
        if (!(hi > lo)) {
            double pad = lo == 0 ? 0.5 : Math.abs(lo) * 0.05;
            lo -= pad;
            hi += pad;
        }
        return Histogram.Binning.linear(lo, hi, LINEAR_BINS);
    }

    private static double smallestPositive(WaferMap map, Mask mask) {
        float[] s = map.raster().samples();
        double min = Double.POSITIVE_INFINITY;
        for (int i = mask == null ? 0 : mask.nextIndex(0); i >= 0 && i < s.length;
             i = mask == null ? i + 1 : mask.nextIndex(i + 1)) {
            if (s[i] > 0 && s[i] < min) {
                min = s[i];
            }
        }
        return min;
    }

    /** Share of the value axis kept free above the tallest bar for the threshold's label. */
    static final double LABEL_BAND = 0.3;

    /** The histogram chart of {@code d} (an empty chart for null), also for reports. */
    public static JFreeChart createChart(Data d) {
        XYIntervalSeriesCollection dataset = new XYIntervalSeriesCollection();
        XYIntervalSeries series = new XYIntervalSeries("share of area", false, true);
        Quantity q = d == null ? Quantity.UNKNOWN : d.quantity();
        boolean log = d != null && d.histogram() != null
                && d.histogram().binning().spacing() == Histogram.Spacing.LOGARITHMIC;
        if (d != null && d.histogram() != null) {
            Histogram h = d.histogram();
            double[] e = h.edges();
            for (int b = 0; b < h.binCount(); b++) {
                double pct = 100 * h.areaFraction(b);
                series.add(h.binCentre(b), e[b], e[b + 1], pct, 0, pct);
            }
        }
        dataset.addSeries(series);
        ValueAxis x = log ? ChartStyle.logAxis(Labels.axis(q)) : ChartStyle.linearAxis(Labels.axis(q));
        NumberAxis y = new NumberAxis("share of area (%)");
        XYBarRenderer r = new XYBarRenderer();
        r.setBarPainter(new StandardXYBarPainter());
        r.setShadowVisible(false);
        r.setDrawBarOutline(false);
        r.setSeriesPaint(0, ChartStyle.BARS);
        String unit = Labels.unit(q);
        r.setDefaultToolTipGenerator((ds, s, i) -> {
            XYIntervalSeriesCollection c = (XYIntervalSeriesCollection) ds;
            return Labels.number(c.getStartXValue(s, i)) + " – " + Labels.number(c.getEndXValue(s, i)) + " " + unit
                    + ": " + Labels.number(c.getYValue(s, i)) + " % of the area";
        });
        XYPlot plot = new XYPlot(dataset, x, y, r);
        JFreeChart chart = new JFreeChart(d == null ? "Histogram" : "Histogram of " + Labels.name(q),
                ChartStyle.TITLE, plot, false);
        if (d != null && d.histogram() != null) {
            chart.addSubtitle(new TextTitle(d.statistics().count() + " px, "
                    + PitchPrecision.areaOfPixels(d.statistics().areaMm2(), d.statistics().count())
                    + " mm², " + d.histogram().binCount() + (log ? " logarithmic" : " linear") + " bins",
                    ChartStyle.SUBTITLE));
            Histogram h = d.histogram();
            double lo = h.edges()[0];
            double hi = h.edges()[h.binCount()];
            if (!Double.isNaN(d.threshold())) {
                ValueMarker m = new ValueMarker(d.threshold(), ChartStyle.MARKER, new java.awt.BasicStroke(1.6f));
                m.setLabel("threshold " + Labels.number(d.threshold(), q.unit()));
                m.setLabelFont(ChartStyle.TICKS);
                m.setLabelPaint(ChartStyle.MARKER);
                // the label stands in a band above the tallest bar, on no box of its own: it hides no bar
                m.setLabelBackgroundColor(new java.awt.Color(255, 255, 255, 0));
                y.setUpperMargin(LABEL_BAND);
                plot.addDomainMarker(m);
                if (!log || d.threshold() > 0) {
                    lo = Math.min(lo, d.threshold());
                    hi = Math.max(hi, d.threshold());
                }
            }
            if (log) {
                x.setRange(lo / Math.pow(hi / lo, 0.03), hi * Math.pow(hi / lo, 0.03));
            } else {
                double pad = 0.03 * (hi - lo);
                x.setRange(lo - pad, hi + pad);
            }
            if (plot.getDomainMarkers(Layer.FOREGROUND) != null) {
                for (Object o : plot.getDomainMarkers(Layer.FOREGROUND)) {
                    if (o instanceof ValueMarker m) {
                        ChartStyle.labelInside(m, x);
                    }
                }
            }
        }
        ChartStyle.apply(chart);
        return chart;
    }
}
