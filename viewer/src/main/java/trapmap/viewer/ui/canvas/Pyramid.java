package trapmap.viewer.ui.canvas;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.stream.IntStream;
import trapmap.maps.raster.FloatRaster;

/**
 * Samples of one map at halving resolutions: level 0 is the map itself, level k+1 holds the mean of the valid
 * (non-NaN) samples of each 2×2 block of level k (NaN when the block has none; a block on an odd edge has fewer
 * samples). Level k pixel (x, y) covers map pixels [x·2^k, (x+1)·2^k) × [y·2^k, (y+1)·2^k). Levels are added as they
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
        while (!complete() && !cancelled.get()) {
            Level next = downsample(levels.get(levels.size() - 1));
            List<Level> grown = new ArrayList<>(levels);
            grown.add(next);
            levels = List.copyOf(grown);
        }
    }

    /** The next coarser level: mean of the valid samples of each 2×2 block. */
    static Level downsample(Level fine) {
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
                float v;
                if ((v = src[y0 * fw + x0]) == v) {
                    sum += v;
                    n++;
                }
                if (x1 != x0 && (v = src[y0 * fw + x1]) == v) {
                    sum += v;
                    n++;
                }
                if (y1 != y0) {
                    if ((v = src[y1 * fw + x0]) == v) {
                        sum += v;
                        n++;
                    }
                    if (x1 != x0 && (v = src[y1 * fw + x1]) == v) {
                        sum += v;
                        n++;
                    }
                }
                out[y * w + x] = n == 0 ? Float.NaN : (float) (sum / n);
            }
        });
        return new Level(fine.index() + 1, w, h, out);
    }
}
