package trapmap.maps.compare;

/**
 * Normalised cross-correlation of a before level A and an after level B placed on it by a registration, summed
 * over A's pixels. B is sampled bilinearly at the mapped position.
 */
final class Correlation {
    private Correlation() {
    }

    /** Correlation coefficient and the number of pixels it was taken over. */
    record Result(double ncc, int pixels) {
    }

    /** A's pixels used per evaluation in {@link #weighted}: larger levels are walked with a stride. */
    private static final int SAMPLES = 65536;

    /**
     * Weighted by the product of both edge tapers: smooth in the registration parameters, so it can be optimised.
     * On levels with more than about 65 000 pixels with data, every k-th pixel of every k-th row of A is used (B
     * is still sampled at full resolution). NaN when fewer than 16 pixels overlap or one side is flat there;
     * {@link Result#pixels()} is then scaled back to all of A's pixels.
     */
    static Result weighted(Pyramid.Level a, Pyramid.Level b, Registration r) {
        int stride = (int) Math.ceil(Math.sqrt(a.validCount / (double) SAMPLES));
        Result c = correlate(a, a.value, b, b.valueWeight, PixelMapping.of(a.grid, b.grid, r), 1.0,
                Math.max(1, stride));
        return stride <= 1 ? c : new Result(c.ncc(), c.pixels() * stride * stride);
    }

    /**
     * Unweighted, of the fine structure ({@link Pyramid.Level#detail()}) over the pixels with data in both (away
     * from the outermost border pixels): the score. Wafer-scale trends are left out because they correlate by
     * chance between unrelated wafers and carry little information about the placement.
     */
    static Result plain(Pyramid.Level a, Pyramid.Level b, Registration r) {
        return correlate(a, a.detail(), b, b.detailWeight(), PixelMapping.of(a.grid, b.grid, r), 0.0, 1);
    }

    /**
     * @param va values of A
     * @param vwb values and weights of B, interleaved
     * @param weighted 1 to weight each pixel by the product of the tapers, 0 for equal weights: a number that
     *                 enters the sums' weight as w_A·w_B·weighted + (1 − weighted), exactly w_A·w_B or 1 (both
     *                 tapers are positive there), instead of a test in the loop, which the compiler, having seen one
     *                 kind of call, would hoist out of the loop as a check that fails at the first call of the other
     * @param stride every stride-th pixel of every stride-th row of A is used
     */
    private static Result correlate(Pyramid.Level a, float[] va, Pyramid.Level b, float[] vwb, PixelMapping m,
                                    double weighted, int stride) {
        float[] wa = a.weight;
        int bw = b.width;
        int bh = b.height;
        double xx = m.xx();
        double yx = m.yx();
        double sw = 0;
        double sa = 0;
        double sb = 0;
        double saa = 0;
        double sbb = 0;
        double sab = 0;
        int n = 0;
        for (int y = stride / 2; y < a.height; y += stride) {
            double rowX = m.xy() * y + m.x0();
            double rowY = m.yy() * y + m.y0();
            int row = y * a.width;
            for (int x = stride / 2; x < a.width; x += stride) {
                float wA = wa[row + x];
                if (wA <= 0) {
                    continue;
                }
                double bx = rowX + xx * x;
                double by = rowY + yx * x;
                if (!(bx >= 0 && by >= 0 && bx < bw - 1 && by < bh - 1)) {
                    continue;
                }
                int ix = (int) bx;
                int iy = (int) by;
                double fx = bx - ix;
                double fy = by - iy;
                int i = 2 * (iy * bw + ix);
                int j = i + 2 * bw;
                double gx = 1 - fx;
                double wB = (1 - fy) * (gx * vwb[i + 1] + fx * vwb[i + 3]) + fy * (gx * vwb[j + 1] + fx * vwb[j + 3]);
                if (wB <= 0) {
                    continue;
                }
                double vB = (1 - fy) * (gx * vwb[i] + fx * vwb[i + 2]) + fy * (gx * vwb[j] + fx * vwb[j + 2]);
                double vA = va[row + x];
                double w = wA * wB * weighted + (1 - weighted);
                double wa1 = w * vA;
                sw += w;
                sa += wa1;
                sb += w * vB;
                saa += wa1 * vA;
                sbb += w * vB * vB;
                sab += wa1 * vB;
                n++;
            }
        }
        if (n < 16 || sw <= 0) {
            return new Result(Double.NaN, n);
        }
        double ma = sa / sw;
        double mb = sb / sw;
        double cov = sab / sw - ma * mb;
        double varA = saa / sw - ma * ma;
        double varB = sbb / sw - mb * mb;
        if (!(varA > 0 && varB > 0)) {
            return new Result(Double.NaN, n);
        }
        return new Result(cov / Math.sqrt(varA * varB), n);
    }
}
