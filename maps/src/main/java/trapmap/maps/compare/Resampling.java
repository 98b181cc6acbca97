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

    /** The value of the w×h samples {@code s} at pixel coordinates (x, y), or NaN. */
    static float sample(float[] s, int w, int h, double x, double y) {
        if (!(x > -1 && y > -1 && x < w && y < h)) {
            return Float.NaN;
        }
        int ix = (int) Math.floor(x);
        int iy = (int) Math.floor(y);
        double fx = x - ix;
        double fy = y - iy;
        if (fx >= SNAP && fx <= 1 - SNAP && fy >= SNAP && fy <= 1 - SNAP && ix >= 0 && iy >= 0 && ix < w - 1
                && iy < h - 1) {
            // common case: four neighbours inside; bilinear unless one lacks data
            int i = iy * w + ix;
            float a = s[i];
            float b = s[i + 1];
            float c = s[i + w];
            float d = s[i + w + 1];
            if (Float.isFinite(a) && Float.isFinite(b) && Float.isFinite(c) && Float.isFinite(d)) {
                return (float) ((1 - fy) * ((1 - fx) * a + fx * b) + fy * ((1 - fx) * c + fx * d));
            }
        }
        if (fx < SNAP) {
            fx = 0;
        } else if (fx > 1 - SNAP) {
            fx = 0;
            ix++;
        }
        if (fy < SNAP) {
            fy = 0;
        } else if (fy > 1 - SNAP) {
            fy = 0;
            iy++;
        }
        double sum = 0;
        double weight = 0;
        double w00 = (1 - fx) * (1 - fy);
        double w10 = fx * (1 - fy);
        double w01 = (1 - fx) * fy;
        double w11 = fx * fy;
        if (w00 > 0 && ix >= 0 && iy >= 0 && ix < w && iy < h) {
            float v = s[iy * w + ix];
            if (Float.isFinite(v)) {
                sum += w00 * v;
                weight += w00;
            }
        }
        if (w10 > 0 && ix + 1 >= 0 && iy >= 0 && ix + 1 < w && iy < h) {
            float v = s[iy * w + ix + 1];
            if (Float.isFinite(v)) {
                sum += w10 * v;
                weight += w10;
            }
        }
        if (w01 > 0 && ix >= 0 && iy + 1 >= 0 && ix < w && iy + 1 < h) {
            float v = s[(iy + 1) * w + ix];
            if (Float.isFinite(v)) {
                sum += w01 * v;
                weight += w01;
            }
        }
        if (w11 > 0 && ix + 1 >= 0 && iy + 1 >= 0 && ix + 1 < w && iy + 1 < h) {
            float v = s[(iy + 1) * w + ix + 1];
            if (Float.isFinite(v)) {
                sum += w11 * v;
                weight += w11;
            }
        }
        if (weight < 0.5) {
            return Float.NaN;
        }
        return weight == 1 ? (float) sum : (float) (sum / weight);
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
