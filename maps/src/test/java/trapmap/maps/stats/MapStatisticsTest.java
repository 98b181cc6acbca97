package trapmap.maps.stats;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.apache.commons.math3.stat.descriptive.DescriptiveStatistics;
import org.apache.commons.math3.stat.descriptive.rank.Percentile;
import org.apache.commons.math3.stat.descriptive.rank.Percentile.EstimationType;
import org.assertj.core.data.Offset;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.params.provider.ValueSource;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.error.InvalidValueException;

class MapStatisticsTest {
    private static final double[] PERCENTS = {1, 5, 10, 25, 50, 75, 90, 95, 99, 100};

    /** Log-uniform "lifetimes" 0.1 … 1000 with some NaN, seeded. */
    private static FloatRaster lifetimes(int w, int h, long seed, double nanFraction) {
        Random r = new Random(seed);
        float[] s = new float[w * h];
        for (int i = 0; i < s.length; i++) {
            s[i] = r.nextDouble() < nanFraction ? Float.NaN : (float) Math.pow(10, -1 + 4 * r.nextDouble());
        }
        return FloatRaster.wrap(w, h, s);
    }

    private static Mask randomMask(int w, int h, long seed, double keep) {
        Random r = new Random(seed);
        boolean[] in = new boolean[w * h];
        for (int i = 0; i < in.length; i++) {
            in[i] = r.nextDouble() < keep;
        }
        return Mask.of(w, h, i -> in[i]);
    }

    /** The counted values, as Commons Math sees them. */
    private static double[] counted(FloatRaster raster, Mask mask) {
        List<Double> v = new ArrayList<>();
        float[] s = raster.samples();
        for (int i = 0; i < s.length; i++) {
            if ((mask == null || mask.containsIndex(i)) && !Float.isNaN(s[i])) {
                v.add((double) s[i]);
            }
        }
        return v.stream().mapToDouble(Double::doubleValue).toArray();
    }

    private static Offset<Double> rel(double expected) {
        return within(1e-10 * Math.max(1, Math.abs(expected)));
    }

    @ParameterizedTest(name = "{0}x{1} seed {2} nan {3} mask {4}")
    @CsvSource({
            "1,   37,  1, 0.0, false",
            "37,  1,   2, 0.2, false",
            "7,   3,   3, 0.1, true",
            "7,   3,   4, 0.0, false",
            "64,  48,  5, 0.1, true",
            "301, 211, 6, 0.3, true",
    })
    void agreesWithCommonsMath(int w, int h, long seed, double nanFraction, boolean masked) {
        FloatRaster raster = lifetimes(w, h, seed, nanFraction);
        Mask mask = masked ? randomMask(w, h, seed + 100, 0.7) : null;
        PixelGrid grid = PixelGrid.centred(w, h, 0.5);
        MapStatistics st = MapStatistics.of(raster, mask, grid, StatisticsRequest.of(PERCENTS));

        double[] v = counted(raster, mask);
        DescriptiveStatistics ref = new DescriptiveStatistics(v);
        assertThat(st.count()).isEqualTo(v.length);
        assertThat(st.areaMm2()).isCloseTo(v.length * 0.25, within(1e-9));
        assertThat(st.mean()).isCloseTo(ref.getMean(), rel(ref.getMean()));
        assertThat(st.standardDeviation()).isCloseTo(ref.getStandardDeviation(), rel(ref.getStandardDeviation()));
        assertThat(st.min()).isEqualTo(ref.getMin());
        assertThat(st.max()).isEqualTo(ref.getMax());
        assertThat(st.geometricMean()).isCloseTo(ref.getGeometricMean(), rel(ref.getGeometricMean()));
        assertThat(st.nonPositiveCount()).isZero();

        Percentile r7 = new Percentile().withEstimationType(EstimationType.R_7);
        r7.setData(v);
        for (double p : PERCENTS) {
            assertThat(st.percentile(p)).as("P%s", p).isCloseTo(r7.evaluate(p), rel(r7.evaluate(p)));
        }
        assertThat(st.median()).isCloseTo(r7.evaluate(50), rel(r7.evaluate(50)));

        // harmonic mean, independently: n / Σ(1/x) with the reciprocals summed by Commons Math
        DescriptiveStatistics reciprocals = new DescriptiveStatistics();
        for (double x : v) {
            reciprocals.addValue(1 / x);
        }
        double harmonic = v.length / reciprocals.getSum();
        assertThat(st.harmonicMean()).isCloseTo(harmonic, rel(harmonic));
        assertThat(st.harmonicMean()).isLessThanOrEqualTo(st.geometricMean());
        assertThat(st.geometricMean()).isLessThanOrEqualTo(st.mean());
    }

    @Test
    void harmonicMeanOfAHandExample() {
        FloatRaster r = FloatRaster.wrap(3, 1, new float[] {1, 4, 4});
        MapStatistics st = MapStatistics.of(r, null, PixelGrid.centred(3, 1, 1), StatisticsRequest.DEFAULT);
        assertThat(st.harmonicMean()).isCloseTo(2.0, within(1e-15));
        assertThat(st.geometricMean()).isCloseTo(Math.cbrt(16), within(1e-15));
        assertThat(st.mean()).isCloseTo(3.0, within(1e-15));
    }

    @Test
    void nonPositiveValuesAreLeftOutOfHarmonicAndGeometricMeansOnly() {
        FloatRaster r = FloatRaster.wrap(7, 1, new float[] {2, 0, -3, 8, Float.NaN, 2, -0f});
        MapStatistics st = MapStatistics.of(r, null, PixelGrid.centred(7, 1, 1), StatisticsRequest.DEFAULT);
        assertThat(st.count()).isEqualTo(6);
        assertThat(st.nonPositiveCount()).isEqualTo(3);
        assertThat(st.positiveCount()).isEqualTo(3);
        assertThat(st.harmonicMean()).isCloseTo(3 / (0.5 + 0.125 + 0.5), within(1e-15));
        assertThat(st.geometricMean()).isCloseTo(Math.cbrt(32), within(1e-14));
        assertThat(st.mean()).isCloseTo(9.0 / 6, within(1e-15));
        assertThat(st.min()).isEqualTo(-3);
    }

    @Test
    void onlyNonPositiveValuesGiveNaNMeans() {
        FloatRaster r = FloatRaster.wrap(2, 1, new float[] {0, -1});
        MapStatistics st = MapStatistics.of(r, null, PixelGrid.centred(2, 1, 1), StatisticsRequest.DEFAULT);
        assertThat(st.harmonicMean()).isNaN();
        assertThat(st.geometricMean()).isNaN();
        assertThat(st.mean()).isEqualTo(-0.5);
    }

    @Test
    void areaFractionsAboveAndBelowThresholds() {
        FloatRaster raster = lifetimes(53, 41, 9, 0.1);
        Mask mask = randomMask(53, 41, 10, 0.8);
        PixelGrid grid = PixelGrid.centred(53, 41, 0.2);
        MapStatistics st = MapStatistics.of(raster, mask, grid, StatisticsRequest.withThresholds(1, 10, 100));
        double[] v = counted(raster, mask);
        for (double t : new double[] {1, 10, 100}) {
            long below = java.util.Arrays.stream(v).filter(x -> x < t).count();
            long above = java.util.Arrays.stream(v).filter(x -> x > t).count();
            MapStatistics.AreaFraction a = st.areaFraction(t);
            assertThat(a.countBelow()).isEqualTo(below);
            assertThat(a.countAbove()).isEqualTo(above);
            assertThat(a.fractionBelow()).isCloseTo((double) below / v.length, within(1e-15));
            assertThat(a.fractionAbove()).isCloseTo((double) above / v.length, within(1e-15));
            assertThat(a.areaBelowMm2()).isCloseTo(below * 0.04, within(1e-9));
            assertThat(a.areaAboveMm2()).isCloseTo(above * 0.04, within(1e-9));
        }
    }

    @Test
    void pixelsEqualToAThresholdAreNeitherAboveNorBelow() {
        FloatRaster r = FloatRaster.wrap(4, 1, new float[] {5, 10, 10, 20});
        MapStatistics st = MapStatistics.of(r, null, PixelGrid.centred(4, 1, 1), StatisticsRequest.withThresholds(10));
        assertThat(st.areaFraction(10).countBelow()).isEqualTo(1);
        assertThat(st.areaFraction(10).countAbove()).isEqualTo(1);
    }

    @Test
    void constantMapsAndTiesDoNotUpsetTheSelection() {
        // large enough (> 65 536 pixels in one radix bucket) to take the in-place selection path
        FloatRaster r = FloatRaster.filled(301, 299, 7f);
        MapStatistics st = MapStatistics.of(r, null, PixelGrid.centred(301, 299, 1), StatisticsRequest.of(PERCENTS));
        for (double p : PERCENTS) {
            assertThat(st.percentile(p)).isEqualTo(7);
        }
        assertThat(st.standardDeviation()).isZero();
        float[] s = new float[300 * 250];
        for (int i = 0; i < s.length; i++) {
            s[i] = i % 3; // many ties, sorted runs
        }
        FloatRaster tied = FloatRaster.wrap(300, 250, s);
        MapStatistics t = MapStatistics.of(tied, null, PixelGrid.centred(300, 250, 1), StatisticsRequest.of(PERCENTS));
        Percentile r7 = new Percentile().withEstimationType(EstimationType.R_7);
        r7.setData(counted(tied, null));
        for (double p : PERCENTS) {
            assertThat(t.percentile(p)).as("P%s", p).isEqualTo(r7.evaluate(p));
        }
    }

    @Test
    void emptySelectionGivesNaNAndZeroCounts() {
        FloatRaster r = lifetimes(7, 3, 1, 0);
        Mask none = Mask.of(7, 3, i -> false);
        MapStatistics st = MapStatistics.of(r, none, PixelGrid.centred(7, 3, 1), StatisticsRequest.withThresholds(1));
        assertThat(st.count()).isZero();
        assertThat(st.mean()).isNaN();
        assertThat(st.harmonicMean()).isNaN();
        assertThat(st.median()).isNaN();
        assertThat(st.percentile(5)).isNaN();
        assertThat(st.min()).isNaN();
        assertThat(st.areaFraction(1).fractionBelow()).isNaN();
    }

    @Test
    void onePixelHasNoSampleStandardDeviation() {
        FloatRaster r = FloatRaster.wrap(1, 1, new float[] {3});
        MapStatistics st = MapStatistics.of(r, null, PixelGrid.centred(1, 1, 1), StatisticsRequest.DEFAULT);
        assertThat(st.standardDeviation()).isNaN();
        assertThat(st.median()).isEqualTo(3);
        assertThat(st.percentile(95)).isEqualTo(3);
    }

    @Test
    void unrequestedPercentileAndBadArgumentsAreRefused() {
        FloatRaster r = lifetimes(7, 3, 1, 0);
        PixelGrid g = PixelGrid.centred(7, 3, 1);
        MapStatistics st = MapStatistics.of(r, null, g, StatisticsRequest.DEFAULT);
        assertThatThrownBy(() -> st.percentile(42)).isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("42");
        assertThatThrownBy(() -> StatisticsRequest.of(new double[] {101})).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("percentile").hasMessageContaining("%");
        assertThatThrownBy(() -> MapStatistics.of(r, Mask.all(3, 7), g, StatisticsRequest.DEFAULT))
                .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("mask 3x7");
        assertThatThrownBy(() -> MapStatistics.of(r, null, PixelGrid.centred(3, 7, 1), StatisticsRequest.DEFAULT))
                .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("grid 3x7");
    }

    @Test
    void radixRanksAgreeWithASortIncludingNegativesAndZeros() {
        Random rnd = new Random(8);
        float[] a = new float[200_001];
        for (int i = 0; i < a.length; i++) {
            a[i] = (float) (rnd.nextGaussian() * Math.pow(10, rnd.nextInt(9) - 4));
        }
        a[5] = 0f;
        a[6] = -0f;
        a[7] = Float.MAX_VALUE;
        a[8] = -Float.MIN_VALUE;
        float[] sorted = a.clone();
        java.util.Arrays.sort(sorted);
        int[] ranks = {0, 1, 777, 100_000, 100_001, 199_999, 200_000};
        double[] got = Selection.ranks(a.clone(), a.length, ranks);
        for (int k = 0; k < ranks.length; k++) {
            assertThat(got[k]).as("rank %d", ranks[k]).isEqualTo((double) sorted[ranks[k]]);
        }
    }

    @ParameterizedTest
    @ValueSource(ints = {1, 2, 3, Selection.DIRECT - 1, Selection.DIRECT, Selection.DIRECT + 1, 3 * Selection.DIRECT,
        Selection.IN_PLACE, Selection.IN_PLACE + 1})
    void ranksOnEitherSideOfTheSortedSizeAgreeWithASort(int n) {
        Random rnd = new Random(n);
        float[] a = new float[n];
        for (int i = 0; i < n; i++) {
            a[i] = rnd.nextInt(5) == 0 ? rnd.nextInt(4) - 1.5f : (float) Math.exp(rnd.nextGaussian() * 3);
        }
        float[] sorted = a.clone();
        java.util.Arrays.sort(sorted);
        int[] ranks = java.util.stream.IntStream.of(0, n / 100, n / 2, n / 2 + 1, n - 2, n - 1)
                .filter(r -> r >= 0 && r < n).distinct().sorted().toArray();
        double[] got = Selection.ranks(a.clone(), n, ranks);
        for (int k = 0; k < ranks.length; k++) {
            assertThat(got[k]).as("rank %d of %d", ranks[k], n).isEqualTo((double) sorted[ranks[k]]);
        }
    }

    @Test
    void ranksAmongManyTiesAndBothZerosAgreeWithASortBitForBit() {
        Random rnd = new Random(12);
        int n = 300_000;
        float[] a = new float[n];
        for (int i = 0; i < n; i++) {
            int k = rnd.nextInt(400);
            a[i] = k == 0 ? -0f : k == 1 ? 0f : (k - 200) * 0.37f * (1 + rnd.nextInt(3) * 1e-7f);
        }
        float[] sorted = a.clone();
        java.util.Arrays.sort(sorted);
        int zero = java.util.Arrays.binarySearch(sorted, 0f);
        int[] ranks = java.util.stream.IntStream.of(0, 3000, zero - 1, zero, zero + 1, n / 2, 297_000, n - 1)
                .distinct().sorted().toArray();
        double[] got = Selection.ranks(a.clone(), n, ranks);
        for (int k = 0; k < ranks.length; k++) {
            assertThat(Double.doubleToRawLongBits(got[k])).as("rank %d", ranks[k])
                    .isEqualTo(Double.doubleToRawLongBits(sorted[ranks[k]]));
        }
    }

    /**
     * Many values equal to the pivot: a rank that falls among them after a partition is found there. Every rank of
     * every sample agrees with a sort, and the array is left partitioned around it.
     */
    @ParameterizedTest
    @ValueSource(ints = {1, 2, 15, 16, 17, 40, 1000})
    void selectionAmongManyEqualValuesAgreesWithASort(int n) {
        Random rnd = new Random(n);
        float[] a = new float[n];
        for (int i = 0; i < n; i++) {
            a[i] = rnd.nextInt(10) == 0 ? rnd.nextInt(7) : 3f;
        }
        float[] sorted = a.clone();
        java.util.Arrays.sort(sorted);
        for (int k = 0; k < n; k++) {
            float[] b = a.clone();
            assertThat(Selection.select(b, 0, n - 1, k)).as("rank %d of %d", k, n).isEqualTo(sorted[k]);
            for (int i = 0; i < n; i++) {
                assertThat(i < k ? b[i] <= b[k] : b[i] >= b[k]).as("rank %d, index %d", k, i).isTrue();
            }
            // a later rank from where this one ended, as the ranks of one sample are selected
            if (k + 1 < n) {
                assertThat(Selection.select(b, k, n - 1, k + 1)).isEqualTo(sorted[k + 1]);
            }
        }
    }

    @Test
    void selectionLeavesTheArrayPartitioned() {
        Random rnd = new Random(3);
        float[] a = new float[1001];
        for (int i = 0; i < a.length; i++) {
            a[i] = rnd.nextInt(50);
        }
        float[] sorted = a.clone();
        java.util.Arrays.sort(sorted);
        for (int k : new int[] {0, 17, 500, 999, 1000}) {
            float[] b = a.clone();
            assertThat(Selection.select(b, 0, b.length - 1, k)).isEqualTo(sorted[k]);
            for (int i = 0; i < b.length; i++) {
                assertThat(i < k ? b[i] <= b[k] : b[i] >= b[k]).isTrue();
            }
        }
    }
}
