package trapmap.maps.batch;

import java.util.Arrays;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.Map;
import trapmap.maps.geometry.OutlineDetection;
import trapmap.maps.geometry.OutlineFit;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;

/**
 * The wafer outline of a map's valid pixels as every face fits it (batch, viewer, reports): large maps on a
 * block-reduced validity mask, and the last few fits kept for maps that share their mask.
 */
public final class OutlineFits {
    private OutlineFits() {
    }

    /** Size, px, that block reduction brings a large map's validity mask down to for the outline fit. */
    static final int FIT_PX = 160;

    /**
     * The outline of the valid pixels. A map of fewer than 2·{@link #FIT_PX} pixels along its longer side is fitted as
     * it is; a larger one on its validity mask reduced by k×k blocks, k = ⌊side / FIT_PX⌋ (a block is valid when at
     * least half of its pixels are), on a grid of k times the pitch with the same wafer coordinates. The outline then
     * rests on edge points k pixels apart, hundreds of them: at 1024² (k = 6) the fitted centre and size stay within
     * a small fraction of a pixel of the full-resolution fit (checked by the tests) at a thirtieth of the cost.
     */
    public static OutlineFit fit(float[] tau, PixelGrid grid) {
        int w = grid.width();
        int h = grid.height();
        int k = Math.max(w, h) / FIT_PX;
        if (k <= 1) {
            return OutlineDetection.fit(Mask.of(w, h, i -> tau[i] == tau[i]), grid);
        }
        int cw = w / k;
        int ch = h / k;
        PixelGrid coarse = new PixelGrid(cw, ch, grid.pitchMm() * k, (grid.centreXPx() - (k - 1) / 2.0) / k,
                (grid.centreYPx() - (k - 1) / 2.0) / k);
        return FIT_CACHE.fit(reducedValidity(tau, w, h, k), coarse);
    }

    /**
     * The validity of the k×k blocks of a w×h map, ⌊w/k⌋ × ⌊h/k⌋ of them in row-major order: a block is valid when
     * at least half of its pixels are not NaN.
     */
    static boolean[] reducedValidity(float[] tau, int w, int h, int k) {
        int cw = w / k;
        int ch = h / k;
        int[] counts = new int[cw * ch];
        for (int y = 0; y < ch * k; y++) {
            int row = (y / k) * cw;
            int x = y * w;
            for (int bx = 0; bx < cw; bx++) {
                int c = 0;
                for (int end = x + k; x < end; x++) {
                    float v = tau[x];
                    c += v == v ? 1 : 0;
                }
                counts[row + bx] += c;
            }
        }
        int half = (k * k + 1) / 2;
        boolean[] valid = new boolean[cw * ch];
        for (int i = 0; i < valid.length; i++) {
            valid[i] = counts[i] >= half;
        }
        return valid;
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
