package trapmap.maps.stats;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.Random;
import org.junit.jupiter.api.Test;

/** The sums of one block ({@code MapStatistics.Part}) against a plain loop over the same values. */
class BlockSumsTest {

    /** Σ ln x as a running product rescaled with Math.getExponent and Math.scalb, as the block sums are defined. */
    private static double referenceLogSum(float[] v, int n) {
        double product = 1;
        long binaryExponent = 0;
        int positive = 0;
        for (int k = 0; k < n; k++) {
            double x = v[k];
            if (x > 0) {
                positive++;
                product *= x;
                if (product > 1e250 || product < 1e-250) {
                    int exponent = Math.getExponent(product);
                    product = Math.scalb(product, -exponent);
                    binaryExponent += exponent;
                }
            }
        }
        return positive == 0 ? 0 : Math.log(product) + binaryExponent * Math.log(2);
    }

    @Test
    void giveTheSumsOfAPlainLoopBitForBit() {
        Random r = new Random(3);
        for (int round = 0; round < 50; round++) {
            int n = 1 + r.nextInt(5000);
            float[] v = new float[n];
            // from the smallest subnormal float to the largest, with zeros, negative values and, in some rounds, +∞
            boolean infinite = round % 5 == 0;
            for (int k = 0; k < n; k++) {
                v[k] = switch (r.nextInt(7)) {
                    case 0 -> Float.MIN_VALUE * (1 + r.nextInt(100));
                    case 1 -> Float.MAX_VALUE * r.nextFloat();
                    case 2 -> r.nextBoolean() ? 0f : -r.nextFloat();
                    case 3 -> infinite && r.nextInt(50) == 0 ? Float.POSITIVE_INFINITY : 1f;
                    default -> (float) Math.pow(10, r.nextDouble() * 76 - 40);
                };
            }
            MapStatistics.Part p = MapStatistics.Part.ofValues(v, 0, n, new double[] {1e-3, 1e20});
            // boxed: Double.equals compares bits, NaN (with +∞ among the values) included
            assertThat(Double.valueOf(p.logSum)).isEqualTo(Double.valueOf(referenceLogSum(v, n)));
            double sum = 0;
            double min = Double.POSITIVE_INFINITY;
            double max = Double.NEGATIVE_INFINITY;
            int nonPositive = 0;
            int below = 0;
            int above = 0;
            for (int k = 0; k < n; k++) {
                sum += v[k];
                min = Math.min(min, v[k]);
                max = Math.max(max, v[k]);
                nonPositive += v[k] > 0 ? 0 : 1;
                below += v[k] < 1e20 ? 1 : 0;
                above += v[k] > 1e20 ? 1 : 0;
            }
            double mean = sum / n;
            double m2 = 0;
            for (int k = 0; k < n; k++) {
                m2 += (v[k] - mean) * (v[k] - mean);
            }
            assertThat(p.n).isEqualTo(n);
            assertThat(Double.valueOf(p.mean)).isEqualTo(Double.valueOf(mean));
            assertThat(Double.valueOf(p.m2)).isEqualTo(Double.valueOf(m2));
            assertThat(Double.valueOf(p.min)).isEqualTo(Double.valueOf(min));
            assertThat(Double.valueOf(p.max)).isEqualTo(Double.valueOf(max));
            assertThat(p.nonPositive).isEqualTo(nonPositive);
            assertThat(p.below[1]).isEqualTo(below);
            assertThat(p.above[1]).isEqualTo(above);
        }
    }
}
