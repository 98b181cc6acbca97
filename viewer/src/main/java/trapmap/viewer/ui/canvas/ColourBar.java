package trapmap.viewer.ui.canvas;

import java.awt.Color;
import java.awt.Dimension;
import java.awt.Font;
import java.awt.FontMetrics;
import java.awt.Graphics;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import javax.swing.JComponent;
import javax.swing.UIManager;
import trapmap.viewer.graphics.Categories;
import trapmap.viewer.graphics.DisplayStyle;
import trapmap.viewer.graphics.LogTicks;

/**
 * Vertical colour scale for a {@link DisplayStyle}: the colours from {@code low} (bottom) to {@code high} (top), tick
 * labels at round values (multiples of 1, 2 or 5 × 10^k on a linear scale, {@link LogTicks} on a log scale), and a label
 * naming the quantity and unit above the bar, e.g. {@code τ (µs)} or {@code N_t (cm⁻³)}. Values outside the range take
 * the end colours on the map, which the small arrows at the ends recall. A map of categories
 * ({@link #setCategories}) shows instead one swatch per category with its name, top to bottom, and no scale.
 */
public class ColourBar extends JComponent {
    /** Width of the colour strip, pixels. */
    static final int BAR_WIDTH = 16;
    /** At most this many tick labels. */
    static final int MAX_TICKS = 8;

    /** Space left of the strip and right of the widest label, pixels. */
    static final int PAD = 6;
    /** From the strip's right edge to the start of a tick label (tick mark and gap), pixels. */
    static final int LABEL_GAP = 7;

    /** The last row of a list of categories: the canvas's colour of pixels without data. */
    static final String NO_DATA = "no data";

    private DisplayStyle style;
    private String label = "";
    private boolean percent;
    private Categories categories;

    /** An empty bar; give it a style with {@link #setStyle}. Its preferred width fits its widest label. */
    public ColourBar() {
    }

    /** A bar for {@code style} with a quantity-and-unit label such as {@code τ (µs)}. */
    public ColourBar(DisplayStyle style, String label) {
        this();
        setStyle(style);
        setLabel(label);
    }

    /** The style shown, or null (nothing drawn). */
    public DisplayStyle style() {
        return style;
    }

    /** Shows the colours and range of {@code style}; null shows nothing. */
    public void setStyle(DisplayStyle style) {
        this.style = style;
        setToolTipText(style == null ? null : style.colours().displayName() + ": " + style.colours().description()
                + (style.logarithmic() ? " (log scale)" : " (linear scale)"));
        revalidate();
        repaint();
    }

    /**
     * Lists {@code categories} (one swatch and name each) instead of a continuous scale; null returns to the scale of
     * the style.
     */
    public void setCategories(Categories categories) {
        this.categories = categories;
        if (categories != null) {
            setToolTipText("Categories: each colour names one value (listed with its number); " + NO_DATA
                    + ": pixels without data");
        } else {
            setStyle(style);
        }
        revalidate();
        repaint();
    }

    /** The categories listed, or null when a continuous scale is shown. */
    public Categories categories() {
        return categories;
    }

    /** Shows values of a 0–1 fraction as percentages (0.2 reads "20 %"). */
    public void setPercent(boolean percent) {
        this.percent = percent;
        revalidate();
        repaint();
    }

    /** The tick labels of the current style, bottom to top (none without a style). */
    List<String> tickLabels() {
        List<String> out = new ArrayList<>();
        if (categories != null) {
            categories.entries().forEach(c -> out.add(c.label()));
            out.add(NO_DATA);
            return out;
        }
        if (style == null) {
            return out;
        }
        double[] ticks = ticks(style, MAX_TICKS);
        double step = ticks.length > 1 ? ticks[1] - ticks[0] : Math.abs(style.high() - style.low());
        for (double v : ticks) {
            out.add(percent ? format(100 * v, 100 * step) + " %" : format(v, style.logarithmic() ? v : step));
        }
        return out;
    }

    /**
     * The width that shows the strip, every tick label and the label above in full with {@code fm}: the strip,
     * the tick gap and the widest tick label, or the label above if wider, plus the margins.
     */
    int widthFor(FontMetrics fm) {
        int widest = 0;
        for (String t : tickLabels()) {
            widest = Math.max(widest, fm.stringWidth(t));
        }
        int ticksWidth = PAD + BAR_WIDTH + LABEL_GAP + widest + PAD;
        int labelWidth = PAD + fm.stringWidth(label) + PAD;
        return Math.max(Math.max(ticksWidth, labelWidth), PAD + BAR_WIDTH + LABEL_GAP + PAD);
    }

    private Font barFont() {
        return getFont() != null ? getFont() : new Font(Font.SANS_SERIF, Font.PLAIN, 12);
    }

    @Override
    public Dimension getPreferredSize() {
        if (isPreferredSizeSet()) {
            return super.getPreferredSize();
        }
        FontMetrics fm = getFontMetrics(barFont());
        int rows = categories == null ? 0 : categories.entries().size() + 2;
        return new Dimension(widthFor(fm), Math.max(320, rows * (fm.getHeight() + 2) + 2 * PAD));
    }

    @Override
    public Dimension getMinimumSize() {
        if (isMinimumSizeSet()) {
            return super.getMinimumSize();
        }
        return new Dimension(getPreferredSize().width, 120);
    }

    /** The quantity-and-unit label above the bar. */
    public String label() {
        return label;
    }

    /** Sets the quantity-and-unit text above the bar, e.g. {@code τ (µs)} or {@code N_t (cm⁻³)}; null means none. */
    public void setLabel(String label) {
        this.label = label == null ? "" : label;
        revalidate();
        repaint();
    }

    /** Tick values for a style, ascending, at most {@code maxTicks} (see the class comment). */
    static double[] ticks(DisplayStyle s, int maxTicks) {
        return s.logarithmic() ? logTicks(s.low(), s.high(), maxTicks) : linearTicks(s.low(), s.high(), maxTicks);
    }

    /** Multiples of a 1, 2 or 5 × 10^k step inside [low, high], as many as fit ({@link LogTicks#linear}). */
    static double[] linearTicks(double low, double high, int maxTicks) {
        return LogTicks.linear(low, high, maxTicks);
    }

    /** The log-scale ticks: {@link LogTicks} (1-2-5 values when they fit, else decades). */
    static double[] logTicks(double low, double high, int maxTicks) {
        return LogTicks.ticks(low, high, maxTicks);
    }

    /** Text of a tick value: plain for moderate magnitudes, m×10ⁿ with superscript digits otherwise. */
    static String format(double v, double step) {
        double a = Math.abs(v);
        if (v == 0) {
            return "0";
        }
        if (a >= 1e-3 && a < 1e5) {
            int decimals = Math.max(0, (int) Math.ceil(-Math.log10(step) - 1e-9));
            if (step <= 0 || !Double.isFinite(step)) {
                decimals = 3;
            }
            return String.format(Locale.ROOT, "%." + Math.min(decimals, 6) + "f", v);
        }
        int e = (int) Math.floor(Math.log10(a) + 1e-9);
        double m = v / Math.pow(10, e);
        String mant = Math.abs(m - Math.round(m)) < 1e-6 ? Long.toString(Math.round(m))
                : String.format(Locale.ROOT, "%.2g", m);
        return ("1".equals(mant) ? "" : "-1".equals(mant) ? "-" : mant + "×") + "10" + superscript(e);
    }

    static String superscript(int e) {
        String digits = "⁰¹²³⁴⁵⁶⁷⁸⁹";
        StringBuilder b = new StringBuilder();
        for (char c : Integer.toString(e).toCharArray()) {
            b.append(c == '-' ? '⁻' : digits.charAt(c - '0'));
        }
        return b.toString();
    }

    /** Position of {@code v} on the scale, 0 at {@code low} and 1 at {@code high}. */
    static double position(DisplayStyle s, double v) {
        return s.logarithmic() ? Math.log(v / s.low()) / Math.log(s.high() / s.low())
                : (v - s.low()) / (s.high() - s.low());
    }

    @Override
    protected void paintComponent(Graphics g0) {
        Graphics2D g = (Graphics2D) g0.create();
        try {
            if (isOpaque()) {
                g.setColor(getBackground());
                g.fillRect(0, 0, getWidth(), getHeight());
            }
            if (style == null && categories == null) {
                return;
            }
            g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
            g.setFont(barFont());
            FontMetrics fm = g.getFontMetrics();
            Color text = getForeground() != null ? getForeground() : UIManager.getColor("Label.foreground");
            text = text == null ? Color.BLACK : text;
            if (categories != null) {
                paintCategories(g, fm, text);
                return;
            }
            int pad = PAD;
            int top = pad + (label.isEmpty() ? 0 : fm.getHeight() + 4) + fm.getAscent() / 2 + 6;
            int bottom = getHeight() - pad - fm.getAscent() / 2 - 6;
            int x = pad;
            int h = bottom - top;
            if (h < 8) {
                return;
            }
            g.setColor(text);
            if (!label.isEmpty()) {
                g.drawString(label, x, pad + fm.getAscent());
            }
            for (int y = 0; y <= h; y++) {
                g.setColor(new Color(style.colours().rgbAt(1 - y / (double) h)));
                g.fillRect(x, top + y, BAR_WIDTH, 1);
            }
            g.setColor(text);
            g.drawRect(x - 1, top - 1, BAR_WIDTH + 1, h + 2);
            // end arrows: values beyond the range take the end colours
            int mid = x + BAR_WIDTH / 2;
            g.fillPolygon(new int[] {mid - 4, mid + 4, mid}, new int[] {top - 2, top - 2, top - 6}, 3);
            g.fillPolygon(new int[] {mid - 4, mid + 4, mid}, new int[] {bottom + 2, bottom + 2, bottom + 6}, 3);
            double[] ticks = ticks(style, MAX_TICKS);
            List<String> labels = tickLabels();
            int lastY = Integer.MAX_VALUE;
            for (int i = 0; i < ticks.length; i++) {
                int y = (int) Math.round(bottom - position(style, ticks[i]) * h);
                g.drawLine(x + BAR_WIDTH, y, x + BAR_WIDTH + 4, y);
                if (Math.abs(lastY - y) >= fm.getAscent()) {
                    g.drawString(labels.get(i), x + BAR_WIDTH + LABEL_GAP, y + fm.getAscent() / 2 - 1);
                    lastY = y;
                }
            }
        } finally {
            g.dispose();
        }
    }

    /** The label, then one row per category: a framed swatch of its colour and its name. */
    private void paintCategories(Graphics2D g, FontMetrics fm, Color text) {
        int x = PAD;
        int y = PAD;
        g.setColor(text);
        if (!label.isEmpty()) {
            g.drawString(label, x, y + fm.getAscent());
            y += fm.getHeight() + 4;
        }
        int row = fm.getHeight() + 2;
        List<Categories.Category> rows = new ArrayList<>(categories.entries());
        if (style != null) {
            rows.add(new Categories.Category(Integer.MIN_VALUE, NO_DATA, Colouring.noDataRgb(style.colours())));
        }
        for (Categories.Category c : rows) {
            g.setColor(new Color(c.rgb()));
            g.fillRect(x, y + 1, BAR_WIDTH, row - 3);
            g.setColor(text);
            g.drawRect(x, y + 1, BAR_WIDTH, row - 3);
            g.drawString(c.label(), x + BAR_WIDTH + LABEL_GAP, y + fm.getAscent());
            y += row;
        }
    }
}
