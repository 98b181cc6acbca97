package trapmap.maps.stats;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.Arrays;
import java.util.Random;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * Percentiles from radix buckets a caller counted equal, bit for bit, those {@link MapStatistics#percentiles} gives
 * without them and those of a sort with the type-7 definition.
 */
class RankBucketsTest {
    private static final double[] PERCENTS = {0, 0.5, 1, 5, 25, 50, 75, 95, 99, 99.5, 100};

    /** Type-7 percentiles of the values by a full sort: h = (n − 1)·p/100, interpolated between its neighbours. */
    private static double[] sorted(float[] values, double[] percents) {
        float[] s = values.clone();
        Arrays.sort(s);
        double[] out = new double[percents.length];
        for (int k = 0; k < percents.length; k++) {
            double h = (s.length - 1) * percents[k] / 100.0;
            int lo = (int) Math.floor(h);
            double frac = h - lo;
            double a = s[lo];
            double b = s[Math.min(lo + 1, s.length - 1)];
            out[k] = frac > 0 ? a + frac * (b - a) : a;
        }
        return out;
    }

    private static double[] counted(RankBuckets buckets, float[] values, double[] percents) {
        int[] c = buckets.cleared();
        for (float v : values) {
            c[RankBuckets.bucket(v)]++;
        }
        return MapStatistics.percentiles(values.clone(), values.length, percents, buckets);
    }

    private static void assertSame(double[] got, double[] want, String what) {
        for (int k = 0; k < want.length; k++) {
            assertThat(Double.doubleToRawLongBits(got[k])).as("%s P%s: %s vs %s", what, PERCENTS[k], got[k], want[k])
                    .isEqualTo(Double.doubleToRawLongBits(want[k]));
        }
    }

    @ParameterizedTest
    @ValueSource(ints = {1, 2, 3, 17, Selection.DIRECT - 1, Selection.DIRECT, Selection.DIRECT + 1,
        3 * Selection.DIRECT, Selection.IN_PLACE, Selection.IN_PLACE + 1, 250_000})
    void equalASortOnSpreadValuesWithTiesAndNonPositives(int n) {
        Random rnd = new Random(n);
        float[] a = new float[n];
        for (int i = 0; i < n; i++) {
            int kind = rnd.nextInt(10);
            a[i] = kind == 0 ? rnd.nextInt(4) - 1.5f : kind == 1 ? (rnd.nextBoolean() ? 0f : -0f)
                    : kind == 2 ? 100f : (float) Math.exp(rnd.nextGaussian() * 3);
        }
        a[rnd.nextInt(n)] = Float.POSITIVE_INFINITY;
        RankBuckets buckets = new RankBuckets();
        double[] got = counted(buckets, a, PERCENTS);
        assertSame(got, sorted(a, PERCENTS), "n " + n);
        assertSame(got, MapStatistics.percentiles(a.clone(), n, PERCENTS), "uncounted, n " + n);
    }

    /**
     * The gathering pass looks the slots up by a float's top 16 bits as they are: every pattern of those bits, with
     * any lower bits (NaN patterns aside), is in the bucket whose {@link Selection#rawTop} they are.
     */
    @Test
    void theTopBitsAsTheyAreNameTheBucket() {
        for (int top = 0; top < Selection.BUCKETS; top++) {
            for (int low : new int[] {0, 1, 0x7fff, 0xffff}) {
                float v = Float.intBitsToFloat(top << 16 | low);
                if (v != v) {
                    continue;
                }
                assertThat(Selection.rawTop(Selection.bucket(v))).as("bits %x", top << 16 | low).isEqualTo(top);
            }
        }
    }

    /** More wanted ranks in distinct buckets than a byte's table of slots holds: gathered by the keys instead. */
    @Test
    void manyPercentilesEqualASort() {
        Random rnd = new Random(13);
        int n = 300_000;
        float[] a = new float[n];
        for (int i = 0; i < n; i++) {
            a[i] = (float) (rnd.nextBoolean() ? -1 : 1) * (float) Math.exp(rnd.nextGaussian() * 6);
        }
        double[] many = new double[301];
        for (int k = 0; k < many.length; k++) {
            many[k] = k / 3.0;
        }
        RankBuckets buckets = new RankBuckets();
        int[] c = buckets.cleared();
        for (float v : a) {
            c[RankBuckets.bucket(v)]++;
        }
        double[] got = MapStatistics.percentiles(a.clone(), n, many, buckets);
        double[] want = sorted(a, many);
        for (int k = 0; k < many.length; k++) {
            assertThat(Double.doubleToRawLongBits(got[k])).as("P%s", many[k])
                    .isEqualTo(Double.doubleToRawLongBits(want[k]));
        }
    }

    @Test
    void equalASortOnANarrowLifetimeMapAndANearlyConstantOne() {
        Random rnd = new Random(7);
        int n = 900_000;
        float[] life = new float[n];
        float[] flat = new float[n];
        for (int i = 0; i < n; i++) {
            life[i] = (float) (150 + 30 * Math.sin(i * 1e-3) + 3 * rnd.nextGaussian());
            flat[i] = rnd.nextInt(1000) == 0 ? 7.25f + rnd.nextInt(3) : 7.25f; // one bucket holds nearly all
        }
        RankBuckets buckets = new RankBuckets(); // the same buckets for one sample after another, as the batch does
        assertSame(counted(buckets, life, PERCENTS), sorted(life, PERCENTS), "lifetimes");
        assertSame(counted(buckets, flat, PERCENTS), sorted(flat, PERCENTS), "nearly constant");
        assertSame(counted(buckets, life, PERCENTS), sorted(life, PERCENTS), "lifetimes again");
    }

    /**
     * Values that are nearly all zeros of both signs: the ranks are selected among all of them in place (few values,
     * or wanted buckets that hold nearly every value), where -0 and +0 compare equal; each zero still has the sign a
     * sort puts at its rank, on both sides of where the negative zeros end.
     */
    @ParameterizedTest
    @ValueSource(ints = {40, Selection.IN_PLACE - 1, 300_000})
    void zerosOfBothSignsGetTheSignASortGivesThem(int n) {
        Random rnd = new Random(n + 1);
        float[] a = new float[n];
        for (int i = 0; i < n; i++) {
            int kind = rnd.nextInt(50);
            a[i] = kind == 0 ? -2.5f : kind == 1 ? 3.5f : kind < 20 ? -0f : 0f;
        }
        float[] sorted = a.clone();
        java.util.Arrays.sort(sorted);
        int negativeZerosEnd = 0; // the first rank of +0
        while (Float.floatToRawIntBits(sorted[negativeZerosEnd]) != 0) {
            negativeZerosEnd++;
        }
        int[] ranks = java.util.stream.IntStream.of(0, n / 10, negativeZerosEnd - 2, negativeZerosEnd - 1,
                negativeZerosEnd, negativeZerosEnd + 1, n / 2, n - 1)
                .filter(r -> r >= 0 && r < n).distinct().sorted().toArray();
        RankBuckets buckets = new RankBuckets();
        int[] c = buckets.cleared();
        for (float v : a) {
            c[RankBuckets.bucket(v)]++;
        }
        double[] counted = buckets.ranks(a.clone(), n, ranks);
        double[] uncounted = Selection.ranks(a.clone(), n, ranks);
        for (int k = 0; k < ranks.length; k++) {
            long want = Double.doubleToRawLongBits(sorted[ranks[k]]);
            assertThat(Double.doubleToRawLongBits(counted[k])).as("rank %d of %d", ranks[k], n).isEqualTo(want);
            assertThat(Double.doubleToRawLongBits(uncounted[k])).as("rank %d of %d", ranks[k], n).isEqualTo(want);
        }
        assertThat(sorted[negativeZerosEnd - 1]).as("a negative zero before the first +0").isZero();
        assertThat(Float.floatToRawIntBits(sorted[negativeZerosEnd - 1])).isNegative();
    }

    @Test
    void emptySampleGivesNaN() {
        double[] got = MapStatistics.percentiles(new float[0], 0, new double[] {50}, new RankBuckets());
        assertThat(got[0]).isNaN();
    }

    @Test
    void countsThatDoNotMatchTheValuesAreRefused() {
        float[] a = new float[10_000];
        Arrays.fill(a, 3f);
        RankBuckets buckets = new RankBuckets();
        int[] c = buckets.cleared();
        for (int i = 0; i < a.length - 1; i++) {
            c[RankBuckets.bucket(a[i])]++;
        }
        assertThatThrownBy(() -> MapStatistics.percentiles(a, a.length, new double[] {50}, buckets))
                .isInstanceOf(IllegalStateException.class).hasMessageContaining("9999");
    }
}
