package trapmap.maps.compare;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.Random;
import java.util.concurrent.ForkJoinPool;
import org.junit.jupiter.api.Test;
import trapmap.maps.model.Quantity;
import trapmap.maps.raster.Mask;

/** {@link PairedPass} against the straightforward way: one loop over the pixels, medians by copy and selection. */
class PairedPassTest {
    private static final int W = 700;

    /** The statistics one pixel after the other, medians of copied values ({@link MapComparison#median}). */
    private static PairedStatistics reference(Quantity q, float[] b, float[] a, Mask region, double tolerance,
                                              Improvement improvement, boolean density) {
        int n = 0;
        int np = 0;
        double sumDifference = 0;
        double sumRatio = 0;
        double sumInverseBefore = 0;
        double sumInverseAfter = 0;
        int improved = 0;
        int unchanged = 0;
        double[] differences = new double[b.length];
        double[] ratios = new double[b.length];
        double[] reductions = new double[b.length];
        for (int i = 0; i < b.length; i++) {
            double vb = b[i];
            double va = a[i];
            if (!Double.isFinite(vb) || !Double.isFinite(va) || (region != null && !region.containsIndex(i))) {
                continue;
            }
            double d = va - vb;
            differences[n++] = d;
            sumDifference += d;
            if (vb > 0 && va > 0) {
                double r = va / vb;
                reductions[np] = 1 - va / vb;
                ratios[np++] = r;
                sumRatio += r;
                sumInverseBefore += 1 / vb;
                sumInverseAfter += 1 / va;
                double change = d / vb;
                if (Math.abs(change) <= tolerance) {
                    unchanged++;
                } else if ((change > 0) == (improvement == Improvement.HIGHER_IS_BETTER)) {
                    improved++;
                }
            }
        }
        double nan = Double.NaN;
        return new PairedStatistics(q, q.unit(), improvement, tolerance, n, n == 0 ? nan : sumDifference / n,
                MapComparison.median(differences, n), np, np == 0 ? nan : sumRatio / np,
                MapComparison.median(ratios, np), np == 0 ? nan : np / sumInverseBefore,
                np == 0 ? nan : np / sumInverseAfter, np == 0 ? nan : improved / (double) np,
                np == 0 ? nan : unchanged / (double) np, np == 0 ? nan : (np - improved - unchanged) / (double) np,
                density ? MapComparison.median(reductions, np) : nan);
    }

    private static void assertSame(PairedStatistics got, PairedStatistics want) {
        assertThat(got.count()).isEqualTo(want.count());
        assertThat(got.positiveCount()).isEqualTo(want.positiveCount());
        // order statistics and shares of whole counts: exactly; sums added per block: to rounding
        exact(got.medianDifference(), want.medianDifference());
        exact(got.medianRatio(), want.medianRatio());
        exact(got.medianReduction(), want.medianReduction());
        exact(got.improvedFraction(), want.improvedFraction());
        exact(got.unchangedFraction(), want.unchangedFraction());
        exact(got.degradedFraction(), want.degradedFraction());
        close(got.meanDifference(), want.meanDifference());
        close(got.meanRatio(), want.meanRatio());
        close(got.harmonicMeanBefore(), want.harmonicMeanBefore());
        close(got.harmonicMeanAfter(), want.harmonicMeanAfter());
    }

    /** The same number (a zero of either sign counts as zero). */
    private static void exact(double got, double want) {
        assertThat(Double.compare(got + 0.0, want + 0.0)).as("%s against %s", got, want).isZero();
    }

    private static void close(double got, double want) {
        if (Double.isNaN(want)) {
            assertThat(got).isNaN();
        } else {
            assertThat(Math.abs(got - want)).isLessThanOrEqualTo(1e-12 * Math.abs(want) + 1e-300);
        }
    }

    private static void check(float[] b, float[] a, Mask region, boolean density) {
        Quantity q = density ? Quantity.TRAP_DENSITY : Quantity.EFFECTIVE_LIFETIME;
        Improvement better = Improvement.of(q);
        PairedStatistics want = reference(q, b, a, region, 0.05, better, density);
        PairedPass.Result got = PairedPass.run(q, b, a, region, 0.05, better, density);
        assertSame(got.statistics(), want);
        // narrowed from the whole key range, without a bracket from a sample: the same figures
        assertThat(PairedPass.run(q, b, a, region, 0.05, better, density, false)).isEqualTo(got);
        int overlap = 0;
        for (int i = 0; i < b.length; i++) {
            if (Float.isFinite(b[i]) && !Float.isNaN(a[i]) && (region == null || region.containsIndex(i))) {
                overlap++;
            }
        }
        assertThat(got.overlap()).isEqualTo(overlap);
        // one thread gives the very same figures
        ForkJoinPool pool = new ForkJoinPool(1);
        try {
            PairedStatistics one = pool.submit(() -> PairedPass.run(q, b, a, region, 0.05, better, density)
                    .statistics()).join();
            assertThat(one).isEqualTo(got.statistics());
        } finally {
            pool.shutdown();
        }
    }

    @Test
    void noisyMapsWithHolesAndSignsMatchTheStraightforwardWay() {
        Random r = new Random(11);
        for (int rows : new int[] {1, 2, 3, 190, 191}) {
            float[] b = new float[W * rows];
            float[] a = new float[W * rows];
            for (int i = 0; i < b.length; i++) {
                b[i] = (float) (100 + 30 * r.nextGaussian());
                a[i] = b[i] * (float) (1 + 0.1 * r.nextGaussian());
                if (r.nextInt(20) == 0) {
                    a[i] = Float.NaN;
                }
                if (r.nextInt(50) == 0) {
                    b[i] = -b[i];
                }
                if (r.nextInt(70) == 0) {
                    a[i] = r.nextBoolean() ? 0f : Float.POSITIVE_INFINITY;
                }
            }
            check(b, a, null, false);
            check(b, a, null, true);
            check(b, a, Mask.of(W, rows, i -> i % 3 != 0), true);
        }
    }

    @Test
    void narrowRatiosNeedSeveralPassesAndStayExact() {
        // ratios within a few float steps of 1 share the top bits of their keys: narrowed three times
        Random r = new Random(5);
        float[] b = new float[W * 400];
        float[] a = new float[b.length];
        for (int i = 0; i < b.length; i++) {
            b[i] = 50 + r.nextFloat();
            a[i] = b[i] + (r.nextInt(7) - 3) * Math.ulp(b[i]);
        }
        check(b, a, null, true);
        a[0] = Float.NaN; // an odd count
        check(b, a, null, true);
    }

    @Test
    void tiesAndTwoClustersGiveTheMiddleOfTheSortedValues() {
        float[] b = new float[W * 10];
        float[] a = new float[b.length];
        for (int i = 0; i < b.length; i++) {
            b[i] = 10;
            a[i] = i < b.length / 2 ? 10 : 20; // half unchanged, half doubled: even count, middle between
        }
        check(b, a, null, true);
        float[] same = b.clone();
        check(b, same, null, true); // every difference 0, every ratio 1
        same[3] = -0.0f;
        b[3] = 0.0f;
        check(b, same, null, false);
    }

    @Test
    void aBracketOfOneValueCountsItsTies() {
        // enough pixels for a bracket from the sample; the middle of the sample is one value (a tie), so the bracket
        // holds a single key: every difference 0 and every ratio 1 (a map and its copy), most values tied with
        // some spread on both sides (odd and even counts), and a sample that sees only the tie while the middle lies
        // elsewhere (the bracket is dropped)
        Random r = new Random(9);
        float[] b = new float[W * 400];
        for (int i = 0; i < b.length; i++) {
            b[i] = (float) (100 + 20 * r.nextGaussian());
        }
        check(b, b.clone(), null, true);
        check(b, b.clone(), null, false);
        float[] a = b.clone();
        for (int i = 0; i < a.length; i++) {
            int k = r.nextInt(10);
            a[i] = k < 7 ? b[i] : b[i] * (k < 9 ? 1.5f : 0.5f);
        }
        check(b, a, null, true);
        a[1] = Float.NaN; // an odd count
        check(b, a, null, false);
        float[] skewed = b.clone();
        for (int i = 0; i < skewed.length; i++) {
            skewed[i] = i % 251 == 0 ? b[i] : b[i] * (2 + r.nextFloat());
        }
        check(b, skewed, null, true);
    }

    @Test
    void aBracketThatMissesTheMiddleIsDropped() {
        // the sampled pixels (every 61st) see only small values, the others only large ones: the sample's bracket
        // lies wholly below the middle
        float[] b = new float[W * 50];
        float[] a = new float[b.length];
        Random r = new Random(2);
        for (int i = 0; i < b.length; i++) {
            b[i] = 10;
            a[i] = i % 61 == 0 ? 5 + r.nextFloat() : 20 + r.nextFloat();
        }
        check(b, a, null, true);
    }

    @Test
    void noPairedPixelsGiveNoFigures() {
        float[] b = {Float.NaN, 1, Float.NaN};
        float[] a = {1, Float.NaN, -2};
        PairedStatistics s = PairedPass.run(Quantity.EFFECTIVE_LIFETIME, b, a, null, 0.05,
                Improvement.HIGHER_IS_BETTER, false).statistics();
        assertThat(s.count()).isZero();
        assertThat(s.medianDifference()).isNaN();
        assertThat(s.medianRatio()).isNaN();
        check(new float[] {1, -1}, new float[] {2, 3}, null, true);
    }

    @Test
    void largerIsTheMaximumAlsoWhereTheDifferenceOverflows() {
        long[] v = {Long.MIN_VALUE, Long.MIN_VALUE + 1, -5, -1, 0, 1, 7, Long.MAX_VALUE - 1, Long.MAX_VALUE};
        Random r = new Random(3);
        for (int k = 0; k < 2000; k++) {
            long a = k < 81 ? v[k % 9] : r.nextLong();
            long b = k < 81 ? v[k / 9] : r.nextLong();
            assertThat(PairedPass.larger(a, b)).as("%d, %d", a, b).isEqualTo(Math.max(a, b));
        }
    }

    @Test
    void keysSortAsTheValues() {
        double[] v = {Double.NEGATIVE_INFINITY, -1e300, -1, -Double.MIN_VALUE, 0, Double.MIN_VALUE, 1e-300, 1,
            1 + Math.ulp(1.0), 1e300, Double.POSITIVE_INFINITY};
        for (int i = 0; i + 1 < v.length; i++) {
            assertThat(PairedPass.key(v[i])).isLessThan(PairedPass.key(v[i + 1]));
            assertThat(PairedPass.value(PairedPass.key(v[i]))).isEqualTo(v[i]);
        }
        assertThat(PairedPass.key(-0.0)).isEqualTo(PairedPass.key(0.0));
    }
}
