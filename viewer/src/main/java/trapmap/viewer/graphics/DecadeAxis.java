package trapmap.viewer.graphics;

import java.awt.FontMetrics;
import java.awt.Graphics2D;
import java.awt.geom.Rectangle2D;
import java.math.BigDecimal;
import java.util.ArrayList;
import java.util.List;
import org.jfree.chart.axis.LogAxis;
import org.jfree.chart.axis.NumberTick;
import org.jfree.chart.axis.TickType;
import org.jfree.chart.axis.ValueTick;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.chart.ui.TextAnchor;
import org.jfree.data.Range;

/**
 * A base-10 logarithmic axis whose ticks are the decades (labelled 10¹², 10¹³, …; plain numbers from 0.001 to 1000)
 * with unlabelled minor ticks at 2…9 times each decade. Labels are placed only where their boxes, measured with the
 * tick-label font on the axis being drawn, keep a gap of {@value #GAP_PX} px to every other label: on a short axis some
 * decades go unlabelled (they keep their tick and grid line); on an axis spanning less than two labelled decades the
 * 5× and then 2× ticks are labelled where they fit. So labels never run together, whatever the chart's size.
 */
public final class DecadeAxis extends LogAxis {
    private static final long serialVersionUID = 1L;
    /** Smallest free space between two tick labels, px. */
    public static final double GAP_PX = 6;

    public DecadeAxis(String label) {
        super(label);
        setBase(10);
        setSmallestValue(1e-300);
        setMinorTickMarksVisible(true);
    }

    @Override
    @SuppressWarnings("rawtypes")
    protected List refreshTicksHorizontal(Graphics2D g2, Rectangle2D dataArea, RectangleEdge edge) {
        return ticks(g2, dataArea, edge, true);
    }

    @Override
    @SuppressWarnings("rawtypes")
    protected List refreshTicksVertical(Graphics2D g2, Rectangle2D dataArea, RectangleEdge edge) {
        return ticks(g2, dataArea, edge, false);
    }

    private List<ValueTick> ticks(Graphics2D g2, Rectangle2D area, RectangleEdge edge, boolean horizontal) {
        List<ValueTick> out = new ArrayList<>();
        Range r = getRange();
        double lo = r.getLowerBound();
        double hi = r.getUpperBound();
        if (!(lo > 0) || !(hi > lo) || !Double.isFinite(hi)) {
            return out;
        }
        FontMetrics fm = g2.getFontMetrics(getTickLabelFont());
        int first = (int) Math.floor(Math.log10(lo));
        int last = (int) Math.ceil(Math.log10(hi));
        List<int[]> candidates = new ArrayList<>();
        for (int e = first; e <= last; e++) {
            for (int m = 1; m <= 9; m++) {
                double v = m * Math.pow(10, e);
                if (v >= lo * (1 - 1e-12) && v <= hi * (1 + 1e-12)) {
                    candidates.add(new int[] {m, e});
                }
            }
        }
        String[] labels = new String[candidates.size()];
        List<double[]> taken = new ArrayList<>();
        int labelled = place(candidates, 1, labels, taken, fm, area, edge, horizontal);
        if (labelled < 2) {
            labelled += place(candidates, 5, labels, taken, fm, area, edge, horizontal);
        }
        if (labelled < 2) {
            place(candidates, 2, labels, taken, fm, area, edge, horizontal);
        }
        TextAnchor anchor = horizontal ? (edge == RectangleEdge.TOP ? TextAnchor.BOTTOM_CENTER : TextAnchor.TOP_CENTER)
                : (edge == RectangleEdge.LEFT ? TextAnchor.CENTER_RIGHT : TextAnchor.CENTER_LEFT);
        for (int i = 0; i < candidates.size(); i++) {
            int[] c = candidates.get(i);
            TickType type = c[0] == 1 || labels[i] != null ? TickType.MAJOR : TickType.MINOR;
            out.add(new NumberTick(type, c[0] * Math.pow(10, c[1]), labels[i] == null ? "" : labels[i], anchor,
                    anchor, 0.0));
        }
        return out;
    }

    /** Labels the candidates of mantissa {@code m} whose boxes keep clear of the boxes taken; returns how many. */
    private int place(List<int[]> candidates, int m, String[] labels, List<double[]> taken, FontMetrics fm,
                      Rectangle2D area, RectangleEdge edge, boolean horizontal) {
        int n = 0;
        for (int i = 0; i < candidates.size(); i++) {
            int[] c = candidates.get(i);
            if (c[0] != m || labels[i] != null) {
                continue;
            }
            String text = label(c[0], c[1]);
            double p = valueToJava2D(c[0] * Math.pow(10, c[1]), area, edge);
            double half = (horizontal ? fm.stringWidth(text) : fm.getAscent() + fm.getDescent()) / 2.0;
            double[] box = {p - half, p + half};
            boolean free = true;
            for (double[] t : taken) {
                if (box[0] < t[1] + GAP_PX && t[0] < box[1] + GAP_PX) {
                    free = false;
                    break;
                }
            }
            if (free) {
                taken.add(box);
                labels[i] = text;
                n++;
            }
        }
        return n;
    }

    /**
     * The label of {@code mantissa × 10^exponent}: a plain number from 0.001 to 9000 (0.002, 50, 1000), otherwise
     * 10¹² or 2×10¹² with a superscript exponent.
     */
    public static String label(int mantissa, int exponent) {
        if (exponent >= -3 && exponent <= 3) {
            return BigDecimal.valueOf(mantissa).scaleByPowerOfTen(exponent).toPlainString();
        }
        String power = "10" + superscript(exponent);
        return mantissa == 1 ? power : mantissa + "×" + power;
    }

    private static String superscript(int n) {
        String digits = "⁰¹²³⁴⁵⁶⁷⁸⁹";
        StringBuilder b = new StringBuilder(n < 0 ? "⁻" : "");
        for (char ch : Integer.toString(Math.abs(n)).toCharArray()) {
            b.append(digits.charAt(ch - '0'));
        }
        return b.toString();
    }
}
