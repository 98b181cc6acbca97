package trapmap.maps.geometry;

import trapmap.maps.raster.Mask;

/**
 * Exact Euclidean distance transform (Felzenszwalb and Huttenlocher, "Distance transforms of sampled functions",
 * Theory of Computing 8 (2012) 415–428): two passes of the lower envelope of parabolas, O(pixels), no recursion.
 */
public final class DistanceTransform {
    private static final double FAR = 1e20;

    private DistanceTransform() {
    }

    /**
     * For every pixel of {@code inside}, the distance (in pixels) from its centre to the nearest pixel centre that
     * is not in {@code inside}; the raster is taken as surrounded by outside pixels. 0 for pixels outside.
     */
    public static float[] distanceToOutsidePx(Mask inside) {
        int w = inside.width();
        int h = inside.height();
        double[] sq = new double[w * h];
        for (int i = 0; i < sq.length; i++) {
            sq[i] = inside.containsIndex(i) ? FAR : 0;
        }
        int n = Math.max(w, h);
        double[] f = new double[n];
        double[] out = new double[n];
        int[] v = new int[n];
        double[] z = new double[n + 1];
        // columns in blocks, so that each pass over the rows reads whole cache lines
        int block = 16;
        double[][] cols = new double[block][h];
        for (int x0 = 0; x0 < w; x0 += block) {
            int bw = Math.min(block, w - x0);
            for (int y = 0; y < h; y++) {
                int row = y * w + x0;
                for (int b = 0; b < bw; b++) {
                    cols[b][y] = sq[row + b];
                }
            }
            for (int b = 0; b < bw; b++) {
                transform1d(cols[b], h, out, v, z);
                System.arraycopy(out, 0, cols[b], 0, h);
            }
            for (int y = 0; y < h; y++) {
                int row = y * w + x0;
                for (int b = 0; b < bw; b++) {
                    sq[row + b] = cols[b][y];
                }
            }
        }
        float[] result = new float[w * h];
        for (int y = 0; y < h; y++) {
            System.arraycopy(sq, y * w, f, 0, w);
            transform1d(f, w, out, v, z);
            for (int x = 0; x < w; x++) {
                int i = y * w + x;
                if (!inside.containsIndex(i)) {
                    continue;
                }
                // the frame of outside pixels just beyond the raster
                int border = Math.min(Math.min(x + 1, w - x), Math.min(y + 1, h - y));
                result[i] = (float) Math.min(Math.sqrt(out[x]), border);
            }
        }
        return result;
    }

    /** Squared distance transform of the sampled function f[0..n) into d. */
    private static void transform1d(double[] f, int n, double[] d, int[] v, double[] z) {
        int k = -1;
        for (int q = 0; q < n; q++) {
            if (f[q] >= FAR) {
                continue;
            }
            if (k < 0) {
                k = 0;
                v[0] = q;
                z[0] = Double.NEGATIVE_INFINITY;
                z[1] = Double.POSITIVE_INFINITY;
                continue;
            }
            double s;
            while (true) {
                int p = v[k];
                s = ((f[q] + (double) q * q) - (f[p] + (double) p * p)) / (2.0 * (q - p));
                if (s <= z[k] && k > 0) {
                    k--;
                } else {
                    break;
                }
            }
            if (s <= z[k]) {
                // k == 0 and the new parabola dominates everywhere
                v[0] = q;
                z[0] = Double.NEGATIVE_INFINITY;
                z[1] = Double.POSITIVE_INFINITY;
                continue;
            }
            k++;
            v[k] = q;
            z[k] = s;
            z[k + 1] = Double.POSITIVE_INFINITY;
        }
        if (k < 0) {
            for (int q = 0; q < n; q++) {
                d[q] = FAR;
            }
            return;
        }
        int j = 0;
        for (int q = 0; q < n; q++) {
            while (z[j + 1] < q) {
                j++;
            }
            double dq = q - v[j];
            d[q] = dq * dq + f[v[j]];
        }
    }
}
