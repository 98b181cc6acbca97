package trapmap.maps.compare;

import java.util.stream.IntStream;
import trapmap.maps.raster.FloatRaster;

/**
 * NaN-aware bilinear sampling. The four neighbours of a point are weighted as usual; neighbours without data
 * (NaN, infinite or outside the raster) drop out and the rest are renormalised. The point has data when the
 * neighbours with data carry at least half of the weight, so a point keeps data up to half a pixel beyond the last
 * valid pixel centre and a point on a valid pixel centre returns that pixel's value exactly.
 */
final class Resampling {
    /** Fractional parts closer than this to a whole pixel are snapped, so whole-pixel placements copy exactly. */
    private static final double SNAP = 1e-7;

    private Resampling() {
    }

    /** The largest fractional part that is not snapped to the next whole pixel. */
    private static final double UPPER = 1 - SNAP;
    private static final int NAN_BITS = Float.floatToRawIntBits(Float.NaN);

    /**
     * The value of the w×h samples {@code s} at pixel coordinates (x, y), or NaN.
     * <p>
     * Written for the just-in-time compiler: which of its paths a point takes depends on where it falls (inside, on
     * a whole pixel, next to missing data), and a compiled path whose branch its profile had not seen yet is a trap
     * that throws the code away when first taken, to be compiled again. So the common case is one test (the sign bit
     * of an OR of the differences it compares, see {@link #fourInside}) and one test of the four values, and the
     * general case ({@link #weighted}) takes its decisions as bit masks. The results are those of the plain
     * comparisons, bit for bit.
     */
    static float sample(float[] s, int w, int h, double x, double y) {
        if (!(x > -1 && y > -1 && x < w && y < h)) {
            return Float.NaN;
        }
        int ix = (int) Math.floor(x);
        int iy = (int) Math.floor(y);
        double fx = x - ix;
        double fy = y - iy;
        if (fourInside(w, h, ix, iy, fx, fy)) {
            // common case: four neighbours inside; bilinear unless one lacks data
            int i = iy * w + ix;
            float a = s[i];
            float b = s[i + 1];
            float c = s[i + w];
            float d = s[i + w + 1];
            // finite * 0 is ±0, infinite or NaN * 0 is NaN: the sum is 0 exactly when all four are finite
            if (a * 0f + b * 0f + c * 0f + d * 0f == 0f) {
                return (float) ((1 - fy) * ((1 - fx) * a + fx * b) + fy * ((1 - fx) * c + fx * d));
            }
        }
        return weighted(s, w, h, ix, iy, fx, fy);
    }

    /**
     * fx and fy in [SNAP, 1 − SNAP] and the four neighbours (ix, iy) … (ix + 1, iy + 1) inside the raster: each
     * comparison a ≥ b is the sign bit of a − b being clear (a difference of two finite doubles is negative exactly
     * when a &lt; b, and +0 when they are equal), and of the integers ix ≥ 0, iy ≥ 0, ix ≤ w − 2, iy ≤ h − 2 likewise
     * (no overflow: −1 ≤ ix ≤ w − 1).
     */
    private static boolean fourInside(int w, int h, int ix, int iy, double fx, double fy) {
        long negative = (long) (ix | iy | (w - 2 - ix) | (h - 2 - iy))
                | Double.doubleToRawLongBits(fx - SNAP) | Double.doubleToRawLongBits(UPPER - fx)
                | Double.doubleToRawLongBits(fy - SNAP) | Double.doubleToRawLongBits(UPPER - fy);
        return negative >= 0;
    }

    /**
     * The general case: fractions within {@link #SNAP} of a whole pixel snapped to it, each of the four neighbours
     * weighted when its weight is positive, it lies inside the raster and its value is finite, the rest
     * renormalised; NaN when the neighbours with data carry less than half of the weight. Every decision is a mask
     * (see {@link #fourInside}); a neighbour left out adds +0 to the sums, which changes neither (they start at +0
     * and never become −0), and sum / 1 is sum exactly.
     */
    private static float weighted(float[] s, int w, int h, int ix, int iy, double fx, double fy) {
        long xLow = Double.doubleToRawLongBits(fx - SNAP) >> 63; // −1 when fx < SNAP
        long xHigh = Double.doubleToRawLongBits(UPPER - fx) >> 63; // −1 when fx > 1 − SNAP
        fx = Double.longBitsToDouble(Double.doubleToRawLongBits(fx) & ~(xLow | xHigh));
        ix -= (int) xHigh;
        long yLow = Double.doubleToRawLongBits(fy - SNAP) >> 63;
        long yHigh = Double.doubleToRawLongBits(UPPER - fy) >> 63;
        fy = Double.longBitsToDouble(Double.doubleToRawLongBits(fy) & ~(yLow | yHigh));
        iy -= (int) yHigh;
        double w00 = (1 - fx) * (1 - fy);
        double w10 = fx * (1 - fy);
        double w01 = (1 - fx) * fy;
        double w11 = fx * fy;
        double sum = 0;
        double weight = 0;
        long m = use(s, w, h, ix, iy, w00);
        sum += masked(w00 * value(s, w, ix, iy, m), m);
        weight += masked(w00, m);
        m = use(s, w, h, ix + 1, iy, w10);
        sum += masked(w10 * value(s, w, ix + 1, iy, m), m);
        weight += masked(w10, m);
        m = use(s, w, h, ix, iy + 1, w01);
        sum += masked(w01 * value(s, w, ix, iy + 1, m), m);
        weight += masked(w01, m);
        m = use(s, w, h, ix + 1, iy + 1, w11);
        sum += masked(w11 * value(s, w, ix + 1, iy + 1, m), m);
        weight += masked(w11, m);
        int v = Float.floatToRawIntBits((float) (sum / weight));
        int missing = (int) (Double.doubleToRawLongBits(weight - 0.5) >> 63); // −1 when weight < 0.5
        return Float.intBitsToFloat((v & ~missing) | (NAN_BITS & missing));
    }

    /**
     * −1 (all bits) when the neighbour (jx, jy) counts: weight {@code wt} > 0 (weights are never −0), inside the
     * raster, and a finite value (exponent bits not all set); else 0.
     */
    private static long use(float[] s, int w, int h, int jx, int jy, double wt) {
        long positive = ~((Double.doubleToRawLongBits(wt) - 1) >> 63);
        long inside = ~((long) (jx | jy | (w - 1 - jx) | (h - 1 - jy)) >> 63);
        int bits = Float.floatToRawIntBits(s[index(w, jx, jy, inside)]);
        long finite = (((bits >>> 23) & 0xff) - 0xff) >> 31; // −1 unless the exponent is 255 (infinite or NaN)
        return positive & inside & finite;
    }

    /** The neighbour's value when {@code m} says it counts, else 0. */
    private static double value(float[] s, int w, int jx, int jy, long m) {
        return s[index(w, jx, jy, m)];
    }

    /** The index of (jx, jy), or 0 when {@code inside} is 0 (the raster has at least one sample). */
    private static int index(int w, int jx, int jy, long inside) {
        return (jy * w + jx) & (int) inside;
    }

    /** {@code v} when {@code m} is −1, +0 when it is 0. */
    private static double masked(double v, long m) {
        return Double.longBitsToDouble(Double.doubleToRawLongBits(v) & m);
    }

    /**
     * Side of the square tiles in which targets are walked: with a quarter turn, a row of the target runs down a
     * column of the source, and tiles keep those reads within a small, cached part of the source.
     */
    private static final int TILE = 64;

    /**
     * {@code source} sampled at every pixel of a {@code width}×{@code height} target through {@code m}. Bands of
     * tiles are resampled in parallel; every pixel is computed alone, so the result does not depend on the threads.
     */
    static FloatRaster resample(FloatRaster source, PixelMapping m, int width, int height) {
        float[] out = new float[Math.multiplyExact(width, height)];
        float[] s = source.samples();
        int w = source.width();
        int h = source.height();
        IntStream.range(0, bands(height)).parallel().forEach(band -> {
            int ty = band * TILE;
            for (int tx = 0; tx < width; tx += TILE) {
                for (int y = ty, ye = Math.min(height, ty + TILE); y < ye; y++) {
                    int row = y * width;
                    for (int x = tx, xe = Math.min(width, tx + TILE); x < xe; x++) {
                        out[row + x] = sample(s, w, h, m.bx(x, y), m.by(x, y));
                    }
                }
            }
        });
        return FloatRaster.wrap(width, height, out);
    }

    /** Bands of {@link #TILE} rows covering {@code height} rows. */
    private static int bands(int height) {
        return (height + TILE - 1) / TILE;
    }

    /** Pixels of {@code target} with data whose counterpart in {@code source} (through {@code m}) has data too. */
    static int overlap(FloatRaster target, FloatRaster source, PixelMapping m) {
        float[] t = target.samples();
        float[] s = source.samples();
        int tw = target.width();
        int th = target.height();
        int w = source.width();
        int h = source.height();
        // whole counts per band of tiles, summed: exact in any order
        return IntStream.range(0, bands(th)).parallel().map(band -> {
            int ty = band * TILE;
            int n = 0;
            for (int tx = 0; tx < tw; tx += TILE) {
                for (int y = ty, ye = Math.min(th, ty + TILE); y < ye; y++) {
                    int row = y * tw;
                    for (int x = tx, xe = Math.min(tw, tx + TILE); x < xe; x++) {
                        if (!Float.isFinite(t[row + x])) {
                            continue;
                        }
                        double bx = m.bx(x, y);
                        double by = m.by(x, y);
                        if (bx >= 0 && by >= 0 && bx < w - 1 && by < h - 1) {
                            // common case: all four neighbours inside and with data
                            int i = (int) by * w + (int) bx;
                            if (Float.isFinite(s[i]) && Float.isFinite(s[i + 1]) && Float.isFinite(s[i + w])
                                    && Float.isFinite(s[i + w + 1])) {
                                n++;
                                continue;
                            }
                        }
                        if (!Float.isNaN(sample(s, w, h, bx, by))) {
                            n++;
                        }
                    }
                }
            }
            return n;
        }).sum();
    }
}
