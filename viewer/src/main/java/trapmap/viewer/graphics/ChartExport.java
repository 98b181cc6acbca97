package trapmap.viewer.graphics;

import java.awt.Color;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.geom.Rectangle2D;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Path;
import javax.imageio.ImageIO;
import org.jfree.chart.JFreeChart;
import trapmap.maps.io.AtomicFiles;

/**
 * Pictures of charts: off-screen images at any size and scale (no display needed) and PNG files written atomically
 * (a temporary file in the target's folder, renamed over the target when complete).
 */
public final class ChartExport {
    /** Largest side of an exported picture, px. */
    public static final int MAX_SIDE_PX = 16384;

    /** Writes a file's content at a given (temporary) path. */
    @FunctionalInterface
    public interface Content {
        void writeTo(Path file) throws IOException;
    }

    private ChartExport() {
    }

    /**
     * The chart drawn at {@code widthPt} × {@code heightPt} layout units and {@code scale} image pixels per unit (2 for
     * print-sharp pictures whose fonts and lines keep the layout of the 1× picture).
     */
    public static BufferedImage image(JFreeChart chart, int widthPt, int heightPt, double scale) {
        if (widthPt < 1 || heightPt < 1 || !(scale > 0) || widthPt * scale > MAX_SIDE_PX
                || heightPt * scale > MAX_SIDE_PX) {
            throw new IllegalArgumentException("picture size must be 1.." + MAX_SIDE_PX + " px a side but was "
                    + widthPt + "x" + heightPt + " at scale " + scale);
        }
        int w = (int) Math.round(widthPt * scale);
        int h = (int) Math.round(heightPt * scale);
        BufferedImage img = new BufferedImage(w, h, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = img.createGraphics();
        try {
            g.setColor(Color.WHITE);
            g.fillRect(0, 0, w, h);
            g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
            g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
            g.scale(scale, scale);
            chart.draw(g, new Rectangle2D.Double(0, 0, widthPt, heightPt));
        } finally {
            g.dispose();
        }
        return img;
    }

    /** Writes the chart as a PNG of {@code widthPx} × {@code heightPx} pixels. */
    public static void writePng(JFreeChart chart, Path file, int widthPx, int heightPx) throws IOException {
        BufferedImage img = image(chart, widthPx, heightPx, 1);
        atomically(file, tmp -> {
            if (!ImageIO.write(img, "png", tmp.toFile())) {
                throw new IOException("no PNG writer available for " + file);
            }
        });
    }

    /**
     * Writes {@code target} so that readers see either its old content or the complete new one
     * ({@link AtomicFiles#write(Path, AtomicFiles.Content)}).
     *
     * @throws IOException from the content or the move; the target is then unchanged
     */
    public static void atomically(Path target, Content content) throws IOException {
        AtomicFiles.write(target, content::writeTo);
    }
}
