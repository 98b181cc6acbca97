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
import org.jfree.chart.axis.NumberTickUnit;
import org.jfree.chart.axis.TickUnits;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.plot.XYPlot;

/** The common look of the charts of the viewer and the reports: white plot, light grid, readable fonts, log axes with decade labels. */
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

    /** A base-10 logarithmic axis labelled at decades, e.g. 10¹², 10¹³. */
    public static LogAxis logAxis(String label) {
        LogAxis a = new ZeroWidthLogAxis(label);
        a.setBase(10);
        a.setSmallestValue(1e-300);
        a.setMinorTickMarksVisible(true);
        a.setNumberFormatOverride(TICK_FORMAT);
        // steps in powers of ten: fine steps for narrow ranges, whole decades for wide ones (no half decades, whose
        // labels such as 3.16e12 read badly)
        TickUnits steps = new TickUnits();
        for (double step : new double[] {0.05, 0.1, 0.2, 1, 2, 5, 10, 20, 50}) {
            steps.add(new NumberTickUnit(step, TICK_FORMAT));
        }
        a.setStandardTickUnits(steps);
        return a;
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
    }

    /** A linear axis that need not include zero. */
    public static NumberAxis linearAxis(String label) {
        NumberAxis a = new NumberAxis(label);
        a.setAutoRangeIncludesZero(false);
        return a;
    }
}
