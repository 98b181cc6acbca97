package trapmap.maps.compare;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * {@link Resampling#sample} against a plain reference written with ordinary comparisons and branches (the rule of the
 * class comment, step by step): the same float, bit for bit, at random points inside and around rasters with missing
 * and infinite samples, on whole pixels, within the snap distance of them and exactly at it, and on rasters one
 * pixel wide or high.
 */
class ResamplingTest {
    private static final double SNAP = 1e-7;

    @Test
    void sampleEqualsThePlainRule() {
        SplittableRandom rnd = new SplittableRandom(42);
        int checked = 0;
        int nan = 0;
        for (int[] size : new int[][] {{7, 5}, {1, 6}, {6, 1}, {1, 1}, {33, 17}}) {
            int w = size[0];
            int h = size[1];
            float[] s = new float[w * h];
            for (int i = 0; i < s.length; i++) {
                int k = rnd.nextInt(12);
                s[i] = k == 0 ? Float.NaN : k == 1 ? Float.POSITIVE_INFINITY : k == 2 ? -0f
                        : (float) (rnd.nextDouble() * 200 - 50);
            }
            for (int t = 0; t < 20_000; t++) {
                double x = point(rnd, w);
                double y = point(rnd, h);
                float got = Resampling.sample(s, w, h, x, y);
                float want = reference(s, w, h, x, y);
                assertThat(Float.floatToRawIntBits(got)).as("(%s, %s) in %dx%d", x, y, w, h)
                        .isEqualTo(Float.floatToRawIntBits(want));
                checked++;
                nan += Float.isNaN(want) ? 1 : 0;
            }
        }
        assertThat(nan).isBetween(checked / 20, checked - checked / 20); // both outcomes well represented
    }

    /** A coordinate around [−1.5, n + 0.5]: random, whole, near-whole (inside and outside the snap) or at the snap. */
    private static double point(SplittableRandom rnd, int n) {
        double whole = rnd.nextInt(n + 3) - 1.5 + 0.5;
        return switch (rnd.nextInt(6)) {
            case 0 -> whole;
            case 1 -> whole + (rnd.nextBoolean() ? 1 : -1) * rnd.nextDouble() * 2 * SNAP;
            case 2 -> whole + SNAP;
            case 3 -> whole + (1 - SNAP);
            default -> rnd.nextDouble() * (n + 2) - 1.5;
        };
    }

    /** The rule with plain comparisons. */
    private static float reference(float[] s, int w, int h, double x, double y) {
        if (!(x > -1 && y > -1 && x < w && y < h)) {
            return Float.NaN;
        }
        int ix = (int) Math.floor(x);
        int iy = (int) Math.floor(y);
        double fx = x - ix;
        double fy = y - iy;
        if (fx >= SNAP && fx <= 1 - SNAP && fy >= SNAP && fy <= 1 - SNAP && ix >= 0 && iy >= 0 && ix < w - 1
                && iy < h - 1) {
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
        double[] wt = {(1 - fx) * (1 - fy), fx * (1 - fy), (1 - fx) * fy, fx * fy};
        int[][] at = {{ix, iy}, {ix + 1, iy}, {ix, iy + 1}, {ix + 1, iy + 1}};
        for (int k = 0; k < 4; k++) {
            int jx = at[k][0];
            int jy = at[k][1];
            if (wt[k] > 0 && jx >= 0 && jy >= 0 && jx < w && jy < h && Float.isFinite(s[jy * w + jx])) {
                sum += wt[k] * s[jy * w + jx];
                weight += wt[k];
            }
        }
        if (weight < 0.5) {
            return Float.NaN;
        }
        return weight == 1 ? (float) sum : (float) (sum / weight);
    }
}
