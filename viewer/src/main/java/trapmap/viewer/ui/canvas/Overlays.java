package trapmap.viewer.ui.canvas;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.FontMetrics;
import java.awt.Graphics2D;
import java.awt.Rectangle;
import java.awt.RenderingHints;
import java.awt.Shape;
import java.awt.geom.AffineTransform;
import java.awt.geom.Line2D;
import java.awt.geom.Path2D;
import java.awt.image.BufferedImage;
import java.util.BitSet;
import java.util.Locale;

/**
 * What a canvas draws over the map: the pixel grid, flagged-pixel outlines, the wafer edge and edge-exclusion line,
 * profile lines and the scale bar. Holds only the wafer outline (and its drawing cached per zoom).
 */
final class Overlays {
    static final Color FLAG_COLOUR = new Color(0xFF2E9A);
    /** Flag colour on the heat map, whose reds and magentas would hide the usual one. */
    static final Color FLAG_COLOUR_ON_HEAT = new Color(0x00E5FF);
    static final Color OUTLINE_COLOUR = new Color(0xF0F0F0);
    static final Color SHADOW = new Color(0x202020);
    static final Color LINE_COLOUR = new Color(0xFFFFFF);
    static final Color GRID_COLOUR = new Color(0x8A8A8A);
    /** Target length of the scale bar, component pixels. */
    static final int SCALE_BAR_PX = 100;

    private Path2D.Double edgeMm;
    private Path2D.Double exclusionMm;
    private OutlineImage outlineImage;
    /** Scale of the last frame that stroked the outline directly. */
    private double lastScale = Double.NaN;

    private record OutlineImage(BufferedImage image, double scale, double ox, double oy, int x, int y) {
    }

    /** Sets the wafer edge and the edge-exclusion line in wafer mm (either may be null). */
    void setOutline(Path2D.Double edge, Path2D.Double exclusion) {
        edgeMm = edge;
        exclusionMm = exclusion;
        outlineImage = null;
    }

    /** Opaque one-pixel lines along the edges of the visible map pixels. */
    static void drawPixelGrid(Graphics2D g, ViewTransform v, int mapWidth, int mapHeight) {
        int[] p = v.visiblePixels(mapWidth, mapHeight);
        g.setColor(GRID_COLOUR);
        int top = v.edgeY(p[1]);
        int bottom = v.edgeY(p[3]);
        int left = v.edgeX(p[0]);
        int right = v.edgeX(p[2]);
        for (int x = p[0]; x <= p[2]; x++) {
            g.fillRect(v.edgeX(x), top, 1, bottom - top);
        }
        for (int y = p[1]; y <= p[3]; y++) {
            g.fillRect(left, v.edgeY(y), right - left, 1);
        }
    }

    /** Pixel-edge outlines of the flagged regions: an edge wherever a flagged pixel meets an unflagged one. */
    static void drawFlagOutlines(Graphics2D g, ViewTransform v, BitSet b, int w, int h, Color colour) {
        int[] p = v.visiblePixels(w, h);
        int t = v.zoom() >= 12 ? 2 : 1;
        g.setColor(colour);
        for (int y = p[1]; y < p[3]; y++) {
            int row = y * w;
            int sy0 = v.edgeY(y);
            int sy1 = v.edgeY(y + 1);
            for (int i = b.nextSetBit(row + p[0]); i >= 0 && i < row + p[2]; i = b.nextSetBit(i + 1)) {
                int x = i - row;
                int sx0 = v.edgeX(x);
                int sx1 = v.edgeX(x + 1);
                if (x == 0 || !b.get(i - 1)) {
                    g.fillRect(sx0, sy0, t, sy1 - sy0);
                }
                if (x == w - 1 || !b.get(i + 1)) {
                    g.fillRect(sx1 - t, sy0, t, sy1 - sy0);
                }
                if (y == 0 || !b.get(i - w)) {
                    g.fillRect(sx0, sy0, sx1 - sx0, t);
                }
                if (y == h - 1 || !b.get(i + w)) {
                    g.fillRect(sx0, sy1 - t, sx1 - sx0, t);
                }
            }
        }
    }

    /**
     * Wafer edge and edge-exclusion line through {@code mmToScreen}. Stroking the 1440-point polygons with
     * antialiasing costs several ms, so while the whole outline fits in about one view and the zoom stays (panning,
     * repaints) it is drawn once into an image that panning only moves (by whole pixels); while zooming, and zoomed
     * in, it is stroked directly (clipped to the view).
     */
    void drawOutline(Graphics2D g, AffineTransform mmToScreen, int viewWidth, int viewHeight) {
        if (edgeMm == null) {
            return;
        }
        Rectangle b = mmToScreen.createTransformedShape(edgeMm).getBounds();
        b.grow(4, 4);
        if ((long) b.width * b.height > (long) viewWidth * viewHeight) {
            strokeOutline(g, mmToScreen);
            return;
        }
        double ox = mmToScreen.getTranslateX();
        double oy = mmToScreen.getTranslateY();
        OutlineImage c = outlineImage;
        if (c == null || c.scale() != mmToScreen.getScaleX()) {
            if (mmToScreen.getScaleX() != lastScale) {
                // zooming: each frame has its own scale, so an image would be used once; stroke directly
                lastScale = mmToScreen.getScaleX();
                strokeOutline(g, mmToScreen);
                return;
            }
            BufferedImage img = new BufferedImage(b.width, b.height, BufferedImage.TYPE_INT_ARGB);
            Graphics2D ig = img.createGraphics();
            ig.setRenderingHints(g.getRenderingHints());
            AffineTransform local = new AffineTransform(mmToScreen);
            local.preConcatenate(AffineTransform.getTranslateInstance(-b.x, -b.y));
            strokeOutline(ig, local);
            ig.dispose();
            c = new OutlineImage(img, mmToScreen.getScaleX(), ox, oy, b.x, b.y);
            outlineImage = c;
        }
        g.drawImage(c.image(), c.x() + (int) Math.round(ox - c.ox()), c.y() + (int) Math.round(oy - c.oy()), null);
    }

    private void strokeOutline(Graphics2D g, AffineTransform t) {
        drawHaloed(g, t.createTransformedShape(edgeMm), new BasicStroke(1.5f));
        if (exclusionMm != null) {
            drawHaloed(g, t.createTransformedShape(exclusionMm), new BasicStroke(1.2f, BasicStroke.CAP_BUTT,
                    BasicStroke.JOIN_ROUND, 10, new float[] {6, 4}, 0));
        }
    }

    /** A light line over a wider dark one, visible on every colour of every map. */
    private static void drawHaloed(Graphics2D g, Shape s, BasicStroke stroke) {
        g.setStroke(new BasicStroke(stroke.getLineWidth() + 2, stroke.getEndCap(), stroke.getLineJoin(),
                stroke.getMiterLimit(), stroke.getDashArray(), stroke.getDashPhase()));
        g.setColor(new Color(SHADOW.getRGB() & 0xFFFFFF | 0x90000000, true));
        g.draw(s);
        g.setStroke(stroke);
        g.setColor(OUTLINE_COLOUR);
        g.draw(s);
    }

    /** A profile line in wafer mm with round end marks (filled at the start). */
    static void drawProfileLine(Graphics2D g, AffineTransform mmToScreen, Line2D mm) {
        drawHaloed(g, mmToScreen.createTransformedShape(mm), new BasicStroke(2f, BasicStroke.CAP_ROUND,
                BasicStroke.JOIN_ROUND));
        double[] p = {mm.getX1(), mm.getY1(), mm.getX2(), mm.getY2()};
        mmToScreen.transform(p, 0, p, 0, 2);
        int x1 = (int) Math.round(p[0]);
        int y1 = (int) Math.round(p[1]);
        g.setColor(LINE_COLOUR);
        g.fillOval(x1 - 4, y1 - 4, 8, 8);
        g.setColor(SHADOW);
        g.drawOval(x1 - 4, y1 - 4, 8, 8);
        g.drawOval((int) Math.round(p[2]) - 4, (int) Math.round(p[3]) - 4, 8, 8);
    }

    /** A bar of a round length in mm, about {@value #SCALE_BAR_PX} pixels long, in the lower left corner. */
    static void drawScaleBar(Graphics2D g, double pxPerMm, int viewWidth, int viewHeight, Font font) {
        double mm = niceLength(SCALE_BAR_PX / pxPerMm);
        int len = (int) Math.round(mm * pxPerMm);
        if (len < 10 || len > viewWidth - 30) {
            return;
        }
        String label = formatMm(mm);
        g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
        g.setFont(font != null ? font.deriveFont(Font.PLAIN, 12f) : new Font(Font.SANS_SERIF, Font.PLAIN, 12));
        FontMetrics fm = g.getFontMetrics();
        int x = 12;
        int y = viewHeight - 14;
        g.setColor(new Color(255, 255, 255, 200));
        g.fillRoundRect(x - 6, y - fm.getAscent() - 12, Math.max(len, fm.stringWidth(label)) + 12,
                fm.getAscent() + 20, 6, 6);
        g.setColor(Color.BLACK);
        g.fillRect(x, y - 4, len, 4);
        g.fillRect(x, y - 8, 1, 8);
        g.fillRect(x + len - 1, y - 8, 1, 8);
        g.drawString(label, x, y - 10);
    }

    /** The largest 1, 2 or 5 × 10^k not above {@code v}. */
    static double niceLength(double v) {
        double p = Math.pow(10, Math.floor(Math.log10(v)));
        double m = v / p;
        return (m >= 5 ? 5 : m >= 2 ? 2 : 1) * p;
    }

    /** A scale-bar length: whole mm, or µm below 1 mm. */
    static String formatMm(double mm) {
        if (mm >= 1) {
            return String.format(Locale.ROOT, "%.0f mm", mm);
        }
        if (mm >= 0.001) {
            return String.format(Locale.ROOT, "%.0f µm", mm * 1000);
        }
        return String.format(Locale.ROOT, "%.2g mm", mm);
    }
}
