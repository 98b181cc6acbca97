package trapmap.maps.io;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.FontMetrics;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.geom.AffineTransform;
import java.awt.image.BufferedImage;
import trapmap.shared.check.Checks;

/**
 * An exported map picture with what makes it readable on its own: a colour bar with its value range and unit at the
 * right of the map, and a caption strip below (wafer id, quantity with unit, defect, date; see {@link Caption}). The
 * map keeps its pixels at the top left, so the map part of the picture is the map's own picture. Headless
 * ({@code java.awt.image}); shared by the command line's PNG output and the viewer's view export.
 */
public final class CaptionedPicture {
    /** Height of the caption strip below the map, px. */
    public static final int STRIP_PX = 24;
    /** Height of the small caption strip of a thumbnail, px. */
    public static final int SMALL_STRIP_PX = 16;
    /** Width of the colour bar area right of the map (bar, ticks, value labels and the turned unit label), px. */
    public static final int BAR_AREA_PX = 96;
    /** Width of the colour bar itself, px. */
    static final int BAR_PX = 14;
    /** Least width of a captioned picture, so that the caption of a small map can be read, px. */
    static final int MIN_WIDTH_PX = 360;
    /** Least height of the colour bar, px. */
    static final int MIN_BAR_PX = 120;
    /** Background of the strip and bar area (opaque white). */
    public static final int BACKGROUND_RGB = 0xFFFFFF;
    private static final Color INK = new Color(0x222222);

    /**
     * The colour scale of a picture.
     *
     * @param colours the colour map
     * @param min     the value of the first colour, in {@code unit}
     * @param max     the value of the last colour, in {@code unit}
     * @param log     whether the colours follow log10 of the value
     * @param label   what the bar shows, e.g. {@code trap-density (cm^-3)}
     * @param codes   whether the values are whole-number codes (a status map): labelled at each code in the range
     */
    public record ColourBar(ColourMap colours, double min, double max, boolean log, String label, boolean codes) {
        public ColourBar {
            Checks.notNull(colours, "colours");
            label = label == null ? "" : label;
        }

        /** A bar of measured values (not codes). */
        public ColourBar(ColourMap colours, double min, double max, boolean log, String label) {
            this(colours, min, max, log, label, false);
        }
    }

    /** Most whole-number codes a bar of codes labels one by one. */
    static final int MAX_CODES = 12;

    private CaptionedPicture() {
    }

    /**
     * {@code map} with {@code bar} at its right and the caption strip below: {@link #BAR_AREA_PX} wider and
     * {@link #STRIP_PX} taller than the map (wider or taller when the map is smaller than {@link #MIN_WIDTH_PX} or
     * {@link #MIN_BAR_PX}). No-data pixels of the map stay transparent.
     */
    public static BufferedImage compose(BufferedImage map, ColourBar bar, Caption caption) {
        int mw = map.getWidth();
        int mh = map.getHeight();
        int bodyH = Math.max(mh, MIN_BAR_PX);
        int width = Math.max(mw + BAR_AREA_PX, MIN_WIDTH_PX);
        int height = bodyH + STRIP_PX;
        BufferedImage img = new BufferedImage(width, height, BufferedImage.TYPE_INT_ARGB);
        Graphics2D g = img.createGraphics();
        try {
            g.setColor(new Color(BACKGROUND_RGB));
            g.fillRect(mw, 0, width - mw, bodyH);
            g.fillRect(0, bodyH, width, STRIP_PX);
            g.drawImage(map, 0, 0, null);
            hints(g);
            colourBar(g, bar, width - BAR_AREA_PX + 8, 6, bodyH - 12);
            strip(g, caption.text(), 0, bodyH, width, STRIP_PX, 12);
        } finally {
            g.dispose();
        }
        return img;
    }

    /**
     * {@code picture} (already with its colour bar, as the viewer's view) with the caption strip below:
     * {@link #STRIP_PX} taller, as wide.
     */
    public static BufferedImage withCaption(BufferedImage picture, Caption caption) {
        return withStrip(picture, caption.text(), STRIP_PX, 12);
    }

    /** {@code picture} with a small caption strip ({@link #SMALL_STRIP_PX}) of {@link Caption#shortText()}. */
    public static BufferedImage withSmallCaption(BufferedImage picture, Caption caption) {
        return withStrip(picture, caption.shortText(), SMALL_STRIP_PX, 10);
    }

    private static BufferedImage withStrip(BufferedImage picture, String text, int stripPx, int fontPx) {
        int w = picture.getWidth();
        int h = picture.getHeight();
        BufferedImage img = new BufferedImage(w, h + stripPx, BufferedImage.TYPE_INT_ARGB);
        Graphics2D g = img.createGraphics();
        try {
            g.drawImage(picture, 0, 0, null);
            g.setColor(new Color(BACKGROUND_RGB));
            g.fillRect(0, h, w, stripPx);
            hints(g);
            strip(g, text, 0, h, w, stripPx, fontPx);
        } finally {
            g.dispose();
        }
        return img;
    }

    private static void hints(Graphics2D g) {
        g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
        g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
        g.setRenderingHint(RenderingHints.KEY_FRACTIONALMETRICS, RenderingHints.VALUE_FRACTIONALMETRICS_OFF);
    }

    /** The text on one line, shortened with an ellipsis when it does not fit {@code w}. */
    private static void strip(Graphics2D g, String text, int x, int y, int w, int h, int fontPx) {
        g.setColor(INK);
        g.setFont(new Font(Font.SANS_SERIF, Font.PLAIN, fontPx));
        FontMetrics fm = g.getFontMetrics();
        String t = fit(text, fm, w - 8);
        g.drawString(t, x + 4, y + (h + fm.getAscent() - fm.getDescent()) / 2);
    }

    static String fit(String text, FontMetrics fm, int width) {
        if (fm.stringWidth(text) <= width) {
            return text;
        }
        String t = text;
        while (!t.isEmpty() && fm.stringWidth(t + "…") > width) {
            t = t.substring(0, t.length() - 1);
        }
        return t + "…";
    }

    /** A vertical bar, the last colour at the top, the range's ends and middle labelled, the label turned along it. */
    private static void colourBar(Graphics2D g, ColourBar bar, int x, int y, int h) {
        for (int p = 0; p < h; p++) {
            g.setColor(new Color(bar.colours().rgbAt(1 - (p + 0.5) / h)));
            g.fillRect(x, y + p, BAR_PX, 1);
        }
        g.setColor(INK);
        g.setStroke(new BasicStroke(1f));
        g.drawRect(x, y, BAR_PX, h);
        g.setFont(new Font(Font.SANS_SERIF, Font.PLAIN, 10));
        FontMetrics fm = g.getFontMetrics();
        // a range narrower than its labels tell apart (a uniform map) gets one label, in the middle: every pixel
        // then has the middle colour
        double[] at = number(bar.min()).equals(number(bar.max())) ? new double[] {0.5} : new double[] {0, 0.5, 1};
        if (bar.codes() && !bar.log() && bar.max() > bar.min()) {
            // codes have no values between them: each one in the range is labelled, none halfway
            long first = (long) Math.ceil(bar.min());
            long last = (long) Math.floor(bar.max());
            if (last >= first && last - first < MAX_CODES && h / (bar.max() - bar.min()) >= fm.getHeight()) {
                at = new double[(int) (last - first + 1)];
                for (int i = 0; i < at.length; i++) {
                    at[i] = (first + i - bar.min()) / (bar.max() - bar.min());
                }
            }
        }
        for (double t : at) {
            int ty = y + (int) Math.round(h * (1 - t));
            double v = bar.log() && bar.min() > 0 && bar.max() > 0
                    ? Math.pow(10, Math.log10(bar.min()) + t * (Math.log10(bar.max()) - Math.log10(bar.min())))
                    : bar.min() + t * (bar.max() - bar.min());
            g.drawLine(x + BAR_PX, ty, x + BAR_PX + 3, ty);
            int base = Math.max(y + fm.getAscent() - 1, Math.min(y + h, ty + fm.getAscent() / 2 - 1));
            g.drawString(fit(number(v), fm, BAR_AREA_PX - BAR_PX - 26), x + BAR_PX + 5, base);
        }
        String label = bar.label() + (bar.log() ? ", log" : "");
        AffineTransform keep = g.getTransform();
        String shown = fit(label, fm, h);
        int lx = x + BAR_AREA_PX - 14;
        g.translate(lx, y + h / 2.0 + fm.stringWidth(shown) / 2.0);
        g.rotate(-Math.PI / 2);
        g.drawString(shown, 0, 0);
        g.setTransform(keep);
    }

    /** A tick label: three significant digits, scientific outside 0.01–99 999 (49400, not 4.94e+04). */
    static String number(double v) {
        if (!Double.isFinite(v)) {
            return "–";
        }
        double a = Math.abs(v);
        if (a != 0 && (a < 0.01 || a >= 1e5)) {
            String s = String.format(java.util.Locale.ROOT, "%.2e", v);
            return s.replace("e+0", "e").replace("e-0", "e-").replace("e+", "e");
        }
        if (a >= 999.5) {
            return new java.math.BigDecimal(v).round(new java.math.MathContext(3)).toPlainString();
        }
        String s = String.format(java.util.Locale.ROOT, "%.3g", v);
        return s.contains(".") && !s.contains("e") ? s.replaceFirst("0+$", "").replaceFirst("\\.$", "") : s;
    }
}
