package trapmap.maps.batch;

import java.util.Arrays;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.Map;
import trapmap.maps.geometry.OutlineDetection;
import trapmap.maps.geometry.OutlineFit;
import trapmap.maps.geometry.ReducedOutline;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;

/**
 * The wafer outline of a map's valid pixels as every face fits it ({@link ReducedOutline}: large maps on a
 * block-reduced validity mask), with the last few fits kept for maps that share their mask.
 */
public final class OutlineFits {
    private OutlineFits() {
    }

    /** Size, px, that block reduction brings a large map's validity mask down to for the outline fit. */
    static final int FIT_PX = ReducedOutline.FIT_PX;

    /**
     * The outline of the valid pixels, as {@link ReducedOutline#fit} gives it (a large map on its block-reduced
     * validity mask); the last few fits are kept for maps that share their reduced mask.
     */
    public static OutlineFit fit(float[] tau, PixelGrid grid) {
        int w = grid.width();
        int h = grid.height();
        int k = ReducedOutline.factor(grid);
        if (k <= 1) {
            return ReducedOutline.fit(FloatRaster.wrap(w, h, tau), grid);
        }
        return FIT_CACHE.fit(reducedValidity(tau, w, h, k), ReducedOutline.grid(grid, k));
    }

    /**
     * As {@link ReducedOutline#validity}, on the calling thread: the batch runs one map per worker, and the rows of
     * one map handed to the common pool would only add the hand-over to the work.
     */
    static boolean[] reducedValidity(float[] tau, int w, int h, int k) {
        return ReducedOutline.validity(tau, w, h, k, false);
    }

    /** Fitted outlines of the last few validity masks seen (see {@link FitCache}). */
    private static final FitCache FIT_CACHE = new FitCache(16);

    /**
     * The outline fit is a pure function of the validity mask and its grid, and the maps of one tool often share
     * their reduced mask exactly (same stage, same crop): the last {@code capacity} fits are kept, keyed by the mask's
     * bits and the grid, and a mask equal to one of them reuses its fit. Thread-safe.
     */
    static final class FitCache {
        private record Key(int hash, boolean[] valid, PixelGrid grid) {
            @Override
            public boolean equals(Object o) {
                return o instanceof Key k && k.hash == hash && k.grid.equals(grid)
                        && Arrays.equals(k.valid, valid);
            }

            @Override
            public int hashCode() {
                return hash;
            }
        }

        private final Map<Key, OutlineFit> fits;

        FitCache(int capacity) {
            fits = Collections.synchronizedMap(new LinkedHashMap<>(capacity, 0.75f, true) {
                @Override
                protected boolean removeEldestEntry(Map.Entry<Key, OutlineFit> eldest) {
                    return size() > capacity;
                }
            });
        }

        OutlineFit fit(boolean[] valid, PixelGrid grid) {
            Key key = new Key(31 * Arrays.hashCode(valid) + grid.hashCode(), valid, grid);
            OutlineFit fit = fits.get(key);
            if (fit == null) {
                fit = OutlineDetection.fit(Mask.of(grid.width(), grid.height(), i -> valid[i]), grid);
                fits.put(key, fit);
            }
            return fit;
        }
    }
}
