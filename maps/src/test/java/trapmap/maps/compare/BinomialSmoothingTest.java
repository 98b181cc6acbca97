package trapmap.maps.compare;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * {@link Pyramid.Level#binomial}, whose edge pixels and edge rows have code of their own, against the plain rule
 * (each pixel with data: 2·itself plus the neighbours with data, divided by their count; in x, then in y): the same
 * floats bit for bit, on rasters with missing pixels, including one pixel wide, one row high and a single pixel.
 */
class BinomialSmoothingTest {
    @Test
    void edgesAndInteriorFollowThePlainRule() {
        SplittableRandom rnd = new SplittableRandom(5);
        for (int[] size : new int[][] {{9, 7}, {1, 8}, {8, 1}, {1, 1}, {2, 2}, {40, 3}}) {
            int w = size[0];
            int h = size[1];
            float[] s = new float[w * h];
            for (int i = 0; i < s.length; i++) {
                s[i] = rnd.nextInt(5) == 0 ? Float.NaN : (float) (rnd.nextGaussian() * 3);
            }
            float[] got = Pyramid.Level.binomial(s, w, h);
            float[] want = reference(s, w, h);
            for (int i = 0; i < s.length; i++) {
                assertThat(Float.floatToRawIntBits(got[i])).as("pixel %d of %dx%d", i, w, h)
                        .isEqualTo(Float.floatToRawIntBits(want[i]));
            }
        }
    }

    private static float[] reference(float[] s, int w, int h) {
        float[] t = new float[s.length];
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                int i = y * w + x;
                t[i] = s[i] == s[i] ? smooth(s, i, x > 0 ? i - 1 : -1, x < w - 1 ? i + 1 : -1) : Float.NaN;
            }
        }
        float[] u = new float[s.length];
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                int i = y * w + x;
                u[i] = t[i] == t[i] ? smooth(t, i, y > 0 ? i - w : -1, y < h - 1 ? i + w : -1) : Float.NaN;
            }
        }
        return u;
    }

    private static float smooth(float[] s, int i, int before, int after) {
        double sum = 2.0 * s[i];
        double n = 2;
        if (before >= 0 && s[before] == s[before]) {
            sum += s[before];
            n++;
        }
        if (after >= 0 && s[after] == s[after]) {
            sum += s[after];
            n++;
        }
        return (float) (sum / n);
    }
}
