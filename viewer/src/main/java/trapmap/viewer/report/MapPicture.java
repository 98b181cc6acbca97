package trapmap.viewer.report;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Graphics2D;
import java.awt.Paint;
import java.awt.RenderingHints;
import java.awt.geom.Rectangle2D;
import java.awt.image.BufferedImage;
import java.util.BitSet;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.renderer.PaintScale;
import org.jfree.chart.title.PaintScaleLegend;
import org.jfree.chart.ui.RectangleEdge;
import org.jfree.chart.ui.RectangleInsets;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.io.ColourMap;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.PngStyle;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.PixelGrid;
import trapmap.viewer.graphics.DisplayStyle;
import trapmap.viewer.graphics.AutoStyle;
import trapmap.viewer.graphics.ChartStyle;
import trapmap.viewer.graphics.Labels;

/**
 * Off-screen pictures of a map for reports: the colours of {@link MapFiles#picture} (the same colour maps and scales
 * as the viewer's {@link DisplayStyle}), pixels without data light grey, flagged pixels outlined along their outer
 * edges in magenta, the wafer edge and the edge-exclusion line, and a colour bar with the quantity's unit.
 */
final class MapPicture {
    static final Color NO_DATA = new Color(0xE6E6E6);
    static final Color FLAG = new Color(0xE0007A);
    static final Color EDGE = new Color(0x333333);

    private MapPicture() {
    }

    /**
     * The style of a map: as given, or the colour map BLUE_YELLOW over the 1st to 99th percentile of the pixels with
     * data (positive ones on the log scale of quantities that span decades).
     */
    static DisplayStyle styleOf(WaferMap map, DisplayStyle given) {
        return given != null ? given : AutoStyle.of(map);
    }

    /**
     * The map drawn to fit {@code sizePx} × {@code sizePx} (aspect kept, centred), with outlines.
     *
     * @param flagged         flagged pixels (bit y·width + x), null for none
     * @param outline         wafer outline, null for none
     * @param edgeExclusionMm width of the excluded rim drawn inside the outline, mm (0: no line)
     */
    static BufferedImage render(WaferMap map, DisplayStyle style, BitSet flagged, WaferShape outline,
                                double edgeExclusionMm, int sizePx) {
        PngStyle ps = new PngStyle(style.colours(), style.logarithmic() ? PngStyle.Scale.LOG : PngStyle.Scale.LINEAR,
                style.low(), style.high());
        BufferedImage pic = MapFiles.picture(map, ps);
        int w = map.width();
        int h = map.height();
        double scale = Math.min((double) sizePx / w, (double) sizePx / h);
        int dw = (int) Math.round(w * scale);
        int dh = (int) Math.round(h * scale);
        int ox = (sizePx - dw) / 2;
        int oy = (sizePx - dh) / 2;
        BufferedImage out = new BufferedImage(sizePx, sizePx, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = out.createGraphics();
        try {
            g.setColor(Color.WHITE);
            g.fillRect(0, 0, sizePx, sizePx);
            g.setColor(NO_DATA);
            g.fillRect(ox, oy, dw, dh);
            g.setRenderingHint(RenderingHints.KEY_INTERPOLATION, scale >= 1
                    ? RenderingHints.VALUE_INTERPOLATION_NEAREST_NEIGHBOR
                    : RenderingHints.VALUE_INTERPOLATION_BILINEAR);
            g.drawImage(pic, ox, oy, dw, dh, null);
            if (outline != null) {
                contours(out, map.grid(), outline, edgeExclusionMm, ox, oy, scale);
            }
            if (flagged != null && !flagged.isEmpty()) {
                g.setColor(FLAG);
                g.setStroke(new BasicStroke((float) Math.max(1.5, Math.min(3, scale * 0.6))));
                g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
                for (int i = flagged.nextSetBit(0); i >= 0 && i < w * h; i = flagged.nextSetBit(i + 1)) {
                    int x = i % w;
                    int y = i / w;
                    double x0 = ox + x * scale;
                    double y0 = oy + y * scale;
                    double x1 = x0 + scale;
                    double y1 = y0 + scale;
                    if (y == 0 || !flagged.get(i - w)) {
                        g.draw(new java.awt.geom.Line2D.Double(x0, y0, x1, y0));
                    }
                    if (y == h - 1 || !flagged.get(i + w)) {
                        g.draw(new java.awt.geom.Line2D.Double(x0, y1, x1, y1));
                    }
                    if (x == 0 || !flagged.get(i - 1)) {
                        g.draw(new java.awt.geom.Line2D.Double(x0, y0, x0, y1));
                    }
                    if (x == w - 1 || !flagged.get(i + 1)) {
                        g.draw(new java.awt.geom.Line2D.Double(x1, y0, x1, y1));
                    }
                }
            }
        } finally {
            g.dispose();
        }
        return out;
    }

    /** Marks the output pixels where the distance to the edge crosses 0 (edge) or the exclusion width. */
    private static void contours(BufferedImage out, PixelGrid grid, WaferShape shape, double exclusionMm, int ox,
                                 int oy, double scale) {
        WaferShape.Prepared p = shape.prepared();
        int size = out.getWidth();
        double[] prev = new double[size];
        double[] row = new double[size];
        int edge = EDGE.getRGB();
        int excl = new Color(0x777777).getRGB();
        for (int y = 0; y < size; y++) {
            double yMm = grid.yMm((y + 0.5 - oy) / scale - 0.5);
            for (int x = 0; x < size; x++) {
                double xMm = grid.xMm((x + 0.5 - ox) / scale - 0.5);
                row[x] = p.distanceToEdgeMm(xMm, yMm);
                if (x > 0 && y > 0) {
                    if (crosses(row[x], row[x - 1], 0) || crosses(row[x], prev[x], 0)) {
                        out.setRGB(x, y, edge);
                    } else if (exclusionMm > 0 && (crosses(row[x], row[x - 1], exclusionMm)
                            || crosses(row[x], prev[x], exclusionMm)) && (x + y) % 6 < 4) {
                        out.setRGB(x, y, excl);
                    }
                }
            }
            double[] t = prev;
            prev = row;
            row = t;
        }
    }

    private static boolean crosses(double a, double b, double level) {
        return (a - level) * (b - level) < 0;
    }

    /** A vertical colour bar of {@code style} labelled with the quantity and unit, for a report. */
    static PaintScaleLegend colourBar(DisplayStyle style, String label) {
        ColourMap cm = style.colours();
        double lo = style.low();
        double hi = style.high();
        boolean log = style.logarithmic();
        PaintScale scale = new PaintScale() {
            @Override
            public double getLowerBound() {
                return lo;
            }

            @Override
            public double getUpperBound() {
                return hi;
            }

            @Override
            public Paint getPaint(double v) {
                double t = log ? Math.log(v / lo) / Math.log(hi / lo) : (v - lo) / (hi - lo);
                return new Color(cm.rgbAt(t));
            }
        };
        ValueAxis axis;
        if (log) {
            axis = ChartStyle.logAxis(label);
        } else {
            axis = new NumberAxis(label);
        }
        axis.setRange(lo, hi);
        axis.setLabelFont(new java.awt.Font(java.awt.Font.SANS_SERIF, java.awt.Font.PLAIN, 11));
        axis.setTickLabelFont(new java.awt.Font(java.awt.Font.SANS_SERIF, java.awt.Font.PLAIN, 10));
        PaintScaleLegend legend = new PaintScaleLegend(scale, axis);
        legend.setPosition(RectangleEdge.RIGHT);
        legend.setStripWidth(14);
        legend.setSubdivisionCount(256);
        legend.setAxisOffset(2);
        legend.setPadding(new RectangleInsets(9, 2, 9, 2)); // room for the end labels
        legend.setBackgroundPaint(Color.WHITE);
        return legend;
    }

    /** The colour bar drawn into a picture of {@code wPt} × {@code hPt} at {@code scale} pixels per point. */
    static BufferedImage colourBarImage(DisplayStyle style, String label, int wPt, int hPt, double scale) {
        return colourBarImage(style, label, wPt, hPt, scale, false);
    }

    /** As above; {@code codes}: the values are whole-number codes (a status map), ticked at whole numbers only. */
    static BufferedImage colourBarImage(DisplayStyle style, String label, int wPt, int hPt, double scale,
                                        boolean codes) {
        PaintScaleLegend legend = colourBar(style, label);
        if (codes && legend.getAxis() instanceof NumberAxis n) {
            n.setStandardTickUnits(NumberAxis.createIntegerTickUnits());
        }
        BufferedImage img = new BufferedImage((int) Math.round(wPt * scale), (int) Math.round(hPt * scale),
                BufferedImage.TYPE_INT_RGB);
        Graphics2D g = img.createGraphics();
        try {
            g.setColor(Color.WHITE);
            g.fillRect(0, 0, img.getWidth(), img.getHeight());
            g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
            g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
            g.scale(scale, scale);
            legend.draw(g, new Rectangle2D.Double(0, 0, wPt, hPt));
        } finally {
            g.dispose();
        }
        return img;
    }

    /** "quantity (unit)" of a map, for the colour bar. */
    static String label(WaferMap map) {
        return Labels.axis(map.quantity());
    }
}
