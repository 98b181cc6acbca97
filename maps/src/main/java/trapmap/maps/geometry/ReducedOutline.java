package trapmap.maps.geometry;

import trapmap.maps.raster.Blocks;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.check.Checks;

/**
 * The wafer outline of a map's data as every face fits it (stats, inspect, the viewer, the reports): a large map on
 * its validity mask reduced by k×k blocks, so that all of them give the same outline and the same format verdict.
 *
 * <p>A map of fewer than 2·{@link #FIT_PX} pixels along its longer side is fitted as it is. A larger one is fitted
 * on its validity mask reduced by k×k blocks, k = ⌊side / FIT_PX⌋ (a block is valid when at least half of its pixels
 * are not NaN), on a grid of k times the pitch with the same wafer coordinates. The outline then rests on edge
 * points k pixels apart, hundreds of them: the fitted centre and size stay within a fraction of the reduced pitch of
 * the full-resolution fit (checked by the tests) at a small fraction of the cost. The fit's pitch, and with it the
 * tolerance of the format match and the smallest resolvable notch, is the reduced grid's.
 */
public final class ReducedOutline {
    /** Size, px, that block reduction brings a large map's validity mask down to for the outline fit. */
    public static final int FIT_PX = 160;

    private ReducedOutline() {
    }

    /**
     * The outline of the valid (not NaN) pixels of {@code raster}.
     *
     * @throws IllegalArgumentException when the sizes differ or there is too little data to fit
     */
    public static OutlineFit fit(FloatRaster raster, PixelGrid grid) {
        Checks.notNull(raster, "raster");
        Checks.notNull(grid, "grid");
        if (raster.width() != grid.width() || raster.height() != grid.height()) {
            throw new IllegalArgumentException("raster " + raster.width() + "x" + raster.height()
                    + " does not match grid " + grid.width() + "x" + grid.height());
        }
        float[] s = raster.samples();
        int k = factor(grid);
        if (k <= 1) {
            return OutlineDetection.fit(Mask.valid(raster), grid);
        }
        boolean[] valid = validity(s, grid.width(), grid.height(), k);
        PixelGrid coarse = grid(grid, k);
        return OutlineDetection.fit(Mask.of(coarse.width(), coarse.height(), i -> valid[i]), coarse);
    }

    /** The block size k of the reduction for a map on {@code grid}; 1 or less: no reduction. */
    public static int factor(PixelGrid grid) {
        return Math.max(grid.width(), grid.height()) / FIT_PX;
    }

    /**
     * The grid of the k×k blocks of {@code grid}: ⌊w/k⌋ × ⌊h/k⌋ pixels of k times the pitch, each centred on its
     * block, in the same wafer coordinates.
     */
    public static PixelGrid grid(PixelGrid grid, int k) {
        return new PixelGrid(grid.width() / k, grid.height() / k, grid.pitchMm() * k,
                (grid.centreXPx() - (k - 1) / 2.0) / k, (grid.centreYPx() - (k - 1) / 2.0) / k);
    }

    /**
     * The validity of the k×k blocks of a w×h map, ⌊w/k⌋ × ⌊h/k⌋ of them in row-major order: a block is valid when
     * at least half of its pixels are not NaN. Rows of blocks run in parallel (each writes its own row).
     */
    public static boolean[] validity(float[] samples, int w, int h, int k) {
        return validity(samples, w, h, k, true);
    }

    /**
     * As {@link #validity(float[], int, int, int)}, on the calling thread alone unless {@code parallel} (the same
     * blocks either way): for callers that already run one map per core, where handing rows to the common pool only
     * adds the cost of the hand-over.
     */
    public static boolean[] validity(float[] samples, int w, int h, int k, boolean parallel) {
        int cw = w / k;
        int ch = h / k;
        boolean[] valid = new boolean[cw * ch];
        int half = (k * k + 1) / 2;
        Blocks.run(ch, parallel ? (long) ch * k * w : 0, by -> {
            int[] counts = new int[cw];
            for (int y = by * k; y < (by + 1) * k; y++) {
                // the row as runs of valid and of NaN pixels (a few per row: the wafer and the background), each
                // found by a tight scan, the valid ones added to the blocks they cover
                int rowStart = y * w;
                int end = rowStart + cw * k;
                int x = rowStart;
                while (x < end) {
                    boolean isValid = samples[x] == samples[x];
                    int j = x + 1;
                    if (isValid) {
                        while (j < end && samples[j] == samples[j]) {
                            j++;
                        }
                        addRun(counts, x - rowStart, j - rowStart, k);
                    } else {
                        while (j < end && samples[j] != samples[j]) {
                            j++;
                        }
                    }
                    x = j;
                }
            }
            for (int bx = 0; bx < cw; bx++) {
                valid[by * cw + bx] = counts[bx] >= half;
            }
        });
        return valid;
    }

    /** Adds the pixels [from, to) of a row to the counts of the k-pixel blocks they lie in. */
    private static void addRun(int[] counts, int from, int to, int k) {
        int first = from / k;
        int last = (to - 1) / k;
        if (first == last) {
            counts[first] += to - from;
            return;
        }
        counts[first] += (first + 1) * k - from;
        for (int b = first + 1; b < last; b++) {
            counts[b] += k;
        }
        counts[last] += to - last * k;
    }
}
