package trapmap.maps.spectroscopy;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * The median that sets the default region threshold, taken from the middle order statistics, against the median of
 * the fully sorted values ({@link Arrays#sort(float[])}), bit for bit.
 */
class RegionMedianTest {
    /** The straightforward median: sort, then the middle value or the mean of the two middle ones. */
    private static double sortedMedian(float[] values, int n) {
        if (n == 0) {
            return Double.NaN;
        }
        float[] s = Arrays.copyOf(values, n);
        Arrays.sort(s);
        return n % 2 == 1 ? s[n / 2] : 0.5 * ((double) s[n / 2 - 1] + s[n / 2]);
    }

    @Test
    void equalsTheMedianOfASortBitForBit() {
        Random rnd = new Random(11);
        // small (selected in place), beyond 65 536 (radix buckets), odd and even counts
        int[] sizes = {1, 2, 3, 4, 7, 10, 101, 1000, 65_535, 65_536, 65_537, 200_000, 200_001};
        for (int n : sizes) {
            for (int kind = 0; kind < 5; kind++) {
                float[] v = new float[n];
                for (int i = 0; i < n; i++) {
                    v[i] = switch (kind) {
                        case 0 -> (float) Math.exp(rnd.nextGaussian() * 2 + 3);            // lifetimes, µs
                        case 1 -> (float) (rnd.nextGaussian() * 5);                       // negative τ_SRH too
                        case 2 -> rnd.nextInt(4) == 0 ? (rnd.nextBoolean() ? 0f : -0f) : rnd.nextInt(3) - 1;
                        case 3 -> 12.5f;                                                  // constant
                        default -> rnd.nextInt(10) == 0 ? Float.POSITIVE_INFINITY : 1f + rnd.nextFloat() * 1e-6f;
                    };
                }
                double expected = sortedMedian(v, n);
                double actual = DefectIdentification.median(v.clone(), n);
                assertThat(Double.doubleToRawLongBits(actual)).as("n " + n + ", kind " + kind)
                        .isEqualTo(Double.doubleToRawLongBits(expected));
            }
        }
        assertThat(DefectIdentification.median(new float[3], 0)).isNaN();
    }
}
