package trapmap.viewer.graphics;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.text.FieldPosition;
import java.text.NumberFormat;
import java.text.ParsePosition;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.LogAxis;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.ui.RectangleAnchor;
import org.jfree.chart.ui.TextAnchor;

/** The common look of the charts of the viewer and the reports: white plot, light grid, readable fonts, log axes with 1-2-5 ticks. */
public final class ChartStyle {
    public static final Color GRID = new Color(0xDDDDDD);
    public static final Color BARS = new Color(0x3A6EA5);
    public static final Color MARKER = new Color(0xC2185B);
    public static final Color[] SERIES = {new Color(0x1F5FA8), new Color(0xD55E00), new Color(0x009E73),
        new Color(0x6A3D9A), new Color(0x555555)};
    public static final Font TITLE = new Font(Font.SANS_SERIF, Font.BOLD, 13);
    public static final Font SUBTITLE = new Font(Font.SANS_SERIF, Font.PLAIN, 11);
    public static final Font AXIS = new Font(Font.SANS_SERIF, Font.PLAIN, 11);
    public static final Font TICKS = new Font(Font.SANS_SERIF, Font.PLAIN, 10);

    /** Tick labels of three significant digits ({@link Labels#compact}): 150, 2.5e12. */
    public static final NumberFormat TICK_FORMAT = new NumberFormat() {
        @Override
        public StringBuffer format(double number, StringBuffer toAppendTo, FieldPosition pos) {
            return toAppendTo.append(Labels.compact(number));
        }

        @Override
        public StringBuffer format(long number, StringBuffer toAppendTo, FieldPosition pos) {
            return toAppendTo.append(Labels.compact(number));
        }

        @Override
        public Number parse(String source, ParsePosition parsePosition) {
            return null;
        }
    };

    private ChartStyle() {
    }

    /** White background, light grid lines, the fonts above on both axes. */
    public static void apply(JFreeChart chart) {
        chart.setBackgroundPaint(Color.WHITE);
        if (chart.getTitle() != null) {
            chart.getTitle().setFont(TITLE);
        }
        if (chart.getPlot() instanceof XYPlot plot) {
            plot.setBackgroundPaint(Color.WHITE);
            plot.setDomainGridlinePaint(GRID);
            plot.setRangeGridlinePaint(GRID);
            plot.setDomainGridlineStroke(new BasicStroke(0.6f));
            plot.setRangeGridlineStroke(new BasicStroke(0.6f));
            plot.setOutlinePaint(Color.GRAY);
            for (int i = 0; i < plot.getDomainAxisCount(); i++) {
                fonts(plot.getDomainAxis(i));
            }
            for (int i = 0; i < plot.getRangeAxisCount(); i++) {
                fonts(plot.getRangeAxis(i));
            }
        }
        if (chart.getLegend() != null) {
            chart.getLegend().setItemFont(TICKS);
            chart.getLegend().setFrame(org.jfree.chart.block.BlockBorder.NONE);
        }
    }

    private static void fonts(ValueAxis a) {
        if (a != null) {
            a.setLabelFont(AXIS);
            a.setTickLabelFont(TICKS);
        }
    }

    /**
     * A base-10 logarithmic axis with ticks at 1, 2 and 5 × 10^k where they fit, else at decades ({@link LogTicks}:
     * 10, 20, 50, 100 …), labelled by {@link #TICK_FORMAT}.
     */
    public static LogAxis logAxis(String label) {
        LogAxis a = new ZeroWidthLogAxis(label);
        a.setBase(10);
        a.setSmallestValue(1e-300);
        a.setMinorTickMarksVisible(false);
        a.setNumberFormatOverride(TICK_FORMAT);
        return a;
    }

    /**
     * How many tick labels fit along an axis of {@code lengthPx}: the largest count whose {@link LogTicks} labels,
     * each {@code labelExtent} wide (horizontal axis: text width; vertical: text height) plus a gap, fit the length.
     * A label that would stand closer than the gap to the one kept before it, both centred on their places on the
     * log scale, is left out: round linear steps on a log scale crowd towards its high end (6e10, 7e10, 8e10).
     */
    static double[] fittingLogTicks(double low, double high, double lengthPx,
                                    java.util.function.ToDoubleFunction<String> labelExtent, double gapPx) {
        // evenly stepped ticks where at least two fit as they are; else the most that fit once crowded ones are out
        int most = Math.max(2, (int) (lengthPx / 12));
        for (int max = most; max >= 2; max--) {
            double[] t = LogTicks.ticks(low, high, max);
            if (t.length >= 2 && fits(t, lengthPx, labelExtent, gapPx)
                    && apart(t, low, high, lengthPx, labelExtent, gapPx).length == t.length) {
                return t;
            }
        }
        for (int max = most; max >= 2; max--) {
            double[] t = apart(LogTicks.ticks(low, high, max), low, high, lengthPx, labelExtent, gapPx);
            if (fits(t, lengthPx, labelExtent, gapPx)) {
                return t;
            }
        }
        return apart(LogTicks.ticks(low, high, 1), low, high, lengthPx, labelExtent, gapPx);
    }

    /** Whether the labels of {@code ticks}, each with a gap, add up to no more than the axis length. */
    private static boolean fits(double[] ticks, double lengthPx, java.util.function.ToDoubleFunction<String> labelExtent,
                                double gapPx) {
        double need = 0;
        for (double v : ticks) {
            need += labelExtent.applyAsDouble(TICK_FORMAT.format(v)) + gapPx;
        }
        return need <= lengthPx;
    }

    /** {@code ticks} less each one whose label, centred on its log-scale place, comes too near the last one kept. */
    private static double[] apart(double[] ticks, double low, double high, double lengthPx,
                                  java.util.function.ToDoubleFunction<String> labelExtent, double gapPx) {
        if (!(high > low) || ticks.length < 2) {
            return ticks;
        }
        double decades = Math.log10(high / low);
        double[] kept = new double[ticks.length];
        int n = 0;
        for (double v : ticks) {
            if (n > 0) {
                double distance = lengthPx * Math.log10(v / kept[n - 1]) / decades;
                double half = (labelExtent.applyAsDouble(TICK_FORMAT.format(kept[n - 1]))
                        + labelExtent.applyAsDouble(TICK_FORMAT.format(v))) / 2;
                if (distance < half + gapPx) {
                    continue;
                }
            }
            kept[n++] = v;
        }
        return java.util.Arrays.copyOf(kept, n);
    }

    /**
     * A logarithmic axis whose automatic range survives data of one value (a uniform map, a single ring): JFreeChart's
     * {@link LogAxis} then asks for a range of zero length and throws, where {@link NumberAxis} widens it by its
     * minimum range size. This one widens such a range by a factor of 1.1 each way.
     */
    static final class ZeroWidthLogAxis extends LogAxis {
        private static final long serialVersionUID = 1L;
        /** Factor the single value is widened by on either side. */
        static final double WIDEN = 1.1;

        ZeroWidthLogAxis(String label) {
            super(label);
        }

        @Override
        protected void autoAdjustRange() {
            if (getPlot() instanceof org.jfree.chart.plot.ValueAxisPlot vap) {
                org.jfree.data.Range r = vap.getDataRange(this);
                if (r != null && r.getLength() == 0 && r.getLowerBound() > 0) {
                    setRange(new org.jfree.data.Range(r.getLowerBound() / WIDEN, r.getUpperBound() * WIDEN), false,
                            false);
                    return;
                }
            }
            super.autoAdjustRange();
        }

        @Override
        protected java.util.List refreshTicksHorizontal(java.awt.Graphics2D g2, java.awt.geom.Rectangle2D dataArea,
                                                        org.jfree.chart.ui.RectangleEdge edge) {
            return ticks(g2, dataArea.getWidth(), true, edge);
        }

        @Override
        protected java.util.List refreshTicksVertical(java.awt.Graphics2D g2, java.awt.geom.Rectangle2D dataArea,
                                                      org.jfree.chart.ui.RectangleEdge edge) {
            return ticks(g2, dataArea.getHeight(), false, edge);
        }

        private java.util.List<org.jfree.chart.axis.ValueTick> ticks(java.awt.Graphics2D g2, double lengthPx,
                                                                     boolean horizontal,
                                                                     org.jfree.chart.ui.RectangleEdge edge) {
            java.util.List<org.jfree.chart.axis.ValueTick> out = new java.util.ArrayList<>();
            org.jfree.data.Range r = getRange();
            if (!(r.getLowerBound() > 0) || !(r.getUpperBound() >= r.getLowerBound())) {
                return out;
            }
            java.awt.FontMetrics fm = g2.getFontMetrics(getTickLabelFont());
            double[] values = fittingLogTicks(r.getLowerBound(), r.getUpperBound(), lengthPx,
                    horizontal ? fm::stringWidth : t -> fm.getHeight(), horizontal ? 10 : 6);
            org.jfree.chart.ui.TextAnchor anchor;
            if (horizontal) {
                anchor = edge == org.jfree.chart.ui.RectangleEdge.TOP ? TextAnchor.BOTTOM_CENTER
                        : TextAnchor.TOP_CENTER;
            } else {
                anchor = edge == org.jfree.chart.ui.RectangleEdge.LEFT ? TextAnchor.CENTER_RIGHT
                        : TextAnchor.CENTER_LEFT;
            }
            for (double v : values) {
                out.add(new org.jfree.chart.axis.NumberTick(org.jfree.chart.axis.TickType.MAJOR, v,
                        TICK_FORMAT.format(v), anchor, anchor, 0.0));
            }
            return out;
        }
    }

    /** A linear axis that need not include zero. */
    public static NumberAxis linearAxis(String label) {
        NumberAxis a = new NumberAxis(label);
        a.setAutoRangeIncludesZero(false);
        return a;
    }

    /**
     * Puts the label of a vertical marker on the side of its line that faces the middle of {@code axis}: right of the
     * line in the left half, left of it in the right half, so that no label near the right edge is cut off.
     */
    public static void labelInside(ValueMarker m, ValueAxis axis) {
        double lo = axis.getLowerBound();
        double hi = axis.getUpperBound();
        double v = m.getValue();
        boolean log = axis instanceof LogAxis;
        double position = log && lo > 0 && v > 0 ? Math.log(v / lo) / Math.log(hi / lo) : (v - lo) / (hi - lo);
        if (position > 0.5) {
            m.setLabelAnchor(RectangleAnchor.TOP_LEFT);
            m.setLabelTextAnchor(TextAnchor.TOP_RIGHT);
        } else {
            m.setLabelAnchor(RectangleAnchor.TOP_RIGHT);
            m.setLabelTextAnchor(TextAnchor.TOP_LEFT);
        }
    }
}
