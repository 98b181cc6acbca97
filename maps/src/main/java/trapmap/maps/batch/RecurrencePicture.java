package trapmap.maps.batch;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.FontMetrics;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.geom.AffineTransform;
import java.awt.geom.Line2D;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Path;
import java.util.BitSet;
import trapmap.maps.io.AtomicFiles;
import trapmap.maps.io.ColourMap;
import trapmap.maps.io.PngFiles;

/**
 * The picture of a {@link Recurrence} ({@code recurrence-FAMILY.png}): the share of wafers flagged per cell on a
 * fixed 0–100 % colour scale (so that a map of only 0 and 1 still shows both ends, and pictures of different batches
 * compare), cells no wafer covers light grey, the hot spots outlined in magenta, and a colour bar labelled with the
 * quantity and its unit. Headless ({@code java.awt.image}).
 */
public final class RecurrencePicture {
    /** Colours of the share, from 0 % (first colour) to 100 % (last). */
    public static final ColourMap COLOURS = ColourMap.BLUE_YELLOW;
    /** The colour bar's label. */
    public static final String BAR_LABEL = "share of wafers flagged (%)";
    static final Color NO_DATA = new Color(0xE6E6E6);
    static final Color HOT = new Color(0xE0007A);
    /** Pixels of the map's longer side the cells are enlarged to (by a whole factor), at least one per cell. */
    private static final int TARGET_PX = 480;
    static final int BAR_WIDTH_PX = 18;

    private RecurrencePicture() {
    }

    /** Pixels per cell for a map of {@code w} × {@code h} cells. */
    static int cellPx(int w, int h) {
        return Math.max(1, TARGET_PX / Math.max(w, h));
    }

    /** Draws the picture. */
    public static BufferedImage render(Recurrence r, HotSpots.Result hot) {
        int w = r.fraction().width();
        int h = r.fraction().height();
        int k = cellPx(w, h);
        int margin = 12;
        int top = 34;
        int mapW = w * k;
        int mapH = h * k;
        int barX = margin + mapW + 16;
        int width = barX + BAR_WIDTH_PX + 70;
        int height = top + Math.max(mapH, 200) + margin + 8;
        BufferedImage img = new BufferedImage(width, height, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = img.createGraphics();
        try {
            g.setColor(Color.WHITE);
            g.fillRect(0, 0, width, height);
            cells(img, r.fraction().raster().samples(), w, h, k, margin, top);
            g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
            g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
            outline(g, hot == null ? new BitSet() : hot.cells(), w, h, k, margin, top);
            g.setColor(new Color(0x222222));
            g.setFont(new Font(Font.SANS_SERIF, Font.BOLD, 13));
            g.drawString("Recurrence " + r.family() + ": " + r.wafers() + " wafer" + (r.wafers() == 1 ? "" : "s")
                    + ", " + r.fraction().grid().pitchMm() + " mm cells", margin, 20);
            colourBar(g, barX, top, Math.max(mapH, 200));
        } finally {
            g.dispose();
        }
        return img;
    }

    /**
     * Paints the cells ({@code w} × {@code h} shares, row by row) as {@code k} × {@code k} squares from
     * ({@code ox}, {@code oy}): each cell its share's colour, a cell without one {@link #NO_DATA}. The pixels are
     * set row by row into the image's raster, as filling each square with its colour would set them (no
     * antialiasing is on yet), without one fill call per cell.
     */
    static void cells(BufferedImage img, float[] s, int w, int h, int k, int ox, int oy) {
        if (img.getType() != BufferedImage.TYPE_INT_RGB) {
            throw new IllegalArgumentException("cells are set into an opaque RGB image of one int per pixel");
        }
        int[] row = new int[w * k];
        java.awt.image.WritableRaster raster = img.getRaster();
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                float v = s[y * w + x];
                // the int a fill of this opaque colour stores (its alpha bits included)
                int pixel = Float.isFinite(v) ? 0xFF000000 | colourOf(v) : NO_DATA.getRGB();
                java.util.Arrays.fill(row, x * k, x * k + k, pixel);
            }
            for (int dy = 0; dy < k; dy++) {
                raster.setDataElements(ox, oy + y * k + dy, w * k, 1, row);
            }
        }
    }

    /** The colour of a share in [0, 1] (values outside take the end colours). */
    static int colourOf(double share) {
        return COLOURS.rgbAt(Math.max(0, Math.min(1, share)));
    }

    private static void outline(Graphics2D g, BitSet cells, int w, int h, int k, int ox, int oy) {
        g.setColor(HOT);
        g.setStroke(new BasicStroke(Math.max(1.5f, Math.min(3f, k * 0.6f))));
        for (int i = cells.nextSetBit(0); i >= 0 && i < w * h; i = cells.nextSetBit(i + 1)) {
            int x = i % w;
            int y = i / w;
            double x0 = ox + x * k;
            double y0 = oy + y * k;
            if (y == 0 || !cells.get(i - w)) {
                g.draw(new Line2D.Double(x0, y0, x0 + k, y0));
            }
            if (y == h - 1 || !cells.get(i + w)) {
                g.draw(new Line2D.Double(x0, y0 + k, x0 + k, y0 + k));
            }
            if (x == 0 || !cells.get(i - 1)) {
                g.draw(new Line2D.Double(x0, y0, x0, y0 + k));
            }
            if (x == w - 1 || !cells.get(i + 1)) {
                g.draw(new Line2D.Double(x0 + k, y0, x0 + k, y0 + k));
            }
        }
    }

    /** A vertical bar, 100 % at the top, ticks every 25 %, and the label turned along it. */
    private static void colourBar(Graphics2D g, int x, int y, int h) {
        for (int p = 0; p < h; p++) {
            g.setColor(new Color(colourOf(1 - (p + 0.5) / h)));
            g.fillRect(x, y + p, BAR_WIDTH_PX, 1);
        }
        g.setColor(new Color(0x222222));
        g.setStroke(new BasicStroke(1f));
        g.drawRect(x, y, BAR_WIDTH_PX, h);
        g.setFont(new Font(Font.SANS_SERIF, Font.PLAIN, 11));
        FontMetrics fm = g.getFontMetrics();
        for (int pct = 0; pct <= 100; pct += 25) {
            int ty = y + (int) Math.round(h * (1 - pct / 100.0));
            g.drawLine(x + BAR_WIDTH_PX, ty, x + BAR_WIDTH_PX + 4, ty);
            g.drawString(Integer.toString(pct), x + BAR_WIDTH_PX + 6, ty + fm.getAscent() / 2 - 1);
        }
        AffineTransform keep = g.getTransform();
        int lx = x + BAR_WIDTH_PX + 36 + fm.getAscent();
        g.translate(lx, y + h / 2.0 + fm.stringWidth(BAR_LABEL) / 2.0);
        g.rotate(-Math.PI / 2);
        g.drawString(BAR_LABEL, 0, 0);
        g.setTransform(keep);
    }

    /** Writes the picture as a PNG, atomically. */
    public static void write(Recurrence r, HotSpots.Result hot, Path png) throws IOException {
        BufferedImage img = render(r, hot);
        byte[] bytes = PngFiles.encode(img);
        AtomicFiles.write(png, bytes);
    }
}
