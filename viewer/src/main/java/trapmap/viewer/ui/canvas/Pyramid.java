package trapmap.viewer.ui.canvas;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.stream.IntStream;
import trapmap.maps.raster.FloatRaster;

/**
 * Samples of one map at halving resolutions: level 0 is the map itself, each pixel of level k holds the mean of the
 * valid (non-NaN) map samples in its 2^k × 2^k block (NaN when the block has none; blocks on an odd edge are
 * smaller). Level k pixel (x, y) covers map pixels [x·2^k, (x+1)·2^k) × [y·2^k, (y+1)·2^k). Levels are added as they
 * are built, so a reader on another thread sees a growing, never changing, list.
 */
final class Pyramid {
    /** One resolution: {@code width}×{@code height} samples, row-major. */
    record Level(int index, int width, int height, float[] samples) {
        /** Map pixels per level pixel along one axis. */
        int scale() {
            return 1 << index;
        }
    }

    /** Levels stop when the coarser side would fall below this many pixels. */
    static final int MIN_SIDE = 64;

    private volatile List<Level> levels;
    private final int levelCount;

    Pyramid(FloatRaster raster) {
        levels = List.of(new Level(0, raster.width(), raster.height(), raster.samples()));
        int n = 1;
        for (int w = raster.width(), h = raster.height(); Math.max(w, h) > MIN_SIDE; n++) {
            w = (w + 1) / 2;
            h = (h + 1) / 2;
        }
        levelCount = n;
    }

    /** Number of levels once built. */
    int levelCount() {
        return levelCount;
    }

    /** Level {@code k}, or null while it is not yet built. */
    Level level(int k) {
        List<Level> l = levels;
        return k < l.size() ? l.get(k) : null;
    }

    boolean complete() {
        return levels.size() == levelCount;
    }

    /** Builds the missing levels (rows in parallel), stopping early when {@code cancelled} becomes true. */
    void build(AtomicBoolean cancelled) {
        int[] counts = null; // valid map pixels behind each pixel of the last level (null: level 0, one each)
        while (!complete() && !cancelled.get()) {
            Level fine = levels.get(levels.size() - 1);
            int[] coarseCounts = new int[((fine.width() + 1) / 2) * ((fine.height() + 1) / 2)];
            Level next = downsample(fine, counts, coarseCounts);
            counts = coarseCounts;
            List<Level> grown = new ArrayList<>(levels);
            grown.add(next);
            levels = List.copyOf(grown);
        }
    }

    /**
     * The next coarser level: in each 2×2 block, the mean of the valid map pixels behind it (each fine pixel's mean
     * weighted by its count of valid map pixels), so every level holds exact means of the map's valid samples.
     *
     * @param counts    valid map pixels behind each fine pixel; null for level 0 (one for each valid sample)
     * @param outCounts receives the counts of the coarse pixels
     */
    static Level downsample(Level fine, int[] counts, int[] outCounts) {
        int fw = fine.width();
        int fh = fine.height();
        int w = (fw + 1) / 2;
        int h = (fh + 1) / 2;
        float[] src = fine.samples();
        float[] out = new float[w * h];
        IntStream.range(0, h).parallel().forEach(y -> {
            int y0 = 2 * y;
            int y1 = Math.min(y0 + 1, fh - 1);
            for (int x = 0; x < w; x++) {
                int x0 = 2 * x;
                int x1 = Math.min(x0 + 1, fw - 1);
                double sum = 0;
                int n = 0;
                for (int yy = y0; yy <= y1; yy++) {
                    for (int xx = x0; xx <= x1; xx++) {
                        int i = yy * fw + xx;
                        float v = src[i];
                        if (v == v) {
                            int c = counts == null ? 1 : counts[i];
                            sum += (double) v * c;
                            n += c;
                        }
                    }
                }
                out[y * w + x] = n == 0 ? Float.NaN : (float) (sum / n);
                outCounts[y * w + x] = n;
            }
        });
        return new Level(fine.index() + 1, w, h, out);
    }
}
