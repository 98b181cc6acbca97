package trapmap.maps.stats;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.Arrays;
import java.util.Random;
import java.util.concurrent.ForkJoinPool;
import java.util.function.Supplier;
import org.junit.jupiter.api.Test;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;

/**
 * The block-parallel statistics and invalid-area passes against straightforward one-loop references (a sorted copy
 * for the type-7 percentiles, two-pass moments), and the same figures on one thread as on several.
 */
class ParallelStatisticsTest {

    private static float[] randomMap(int n, long seed) {
        Random rnd = new Random(seed);
        float[] s = new float[n];
        for (int i = 0; i < n; i++) {
            int kind = rnd.nextInt(100);
            s[i] = kind == 0 ? Float.NaN : kind == 1 ? -rnd.nextFloat() : kind == 2 ? 0f
                    : (float) Math.exp(rnd.nextGaussian() * 3 + 20);
        }
        return s;
    }

    static <T> T onThreads(int threads, Supplier<T> work) throws Exception {
        ForkJoinPool pool = new ForkJoinPool(threads);
        try {
            return pool.submit(work::get).get();
        } finally {
            pool.shutdown();
        }
    }

    @Test
    void agreesWithAStraightforwardReferenceOnAMaskedMap() {
        int w = 1201;
        int h = 987; // more than one block, not a whole number of words per row
        float[] s = randomMap(w * h, 11);
        Random rnd = new Random(5);
        boolean[] in = new boolean[w * h];
        for (int i = 0; i < in.length; i++) {
            in[i] = rnd.nextInt(7) != 0;
        }
        Mask mask = Mask.of(w, h, i -> in[i]);
        PixelGrid grid = PixelGrid.centred(w, h, 0.1);
        double[] percents = {0, 1, 5, 25, 50, 75, 95, 99.9, 100};
        MapStatistics st = MapStatistics.of(FloatRaster.wrap(w, h, s), mask, grid,
                StatisticsRequest.of(percents, 1e9, 0));

        float[] kept = new float[w * h];
        int n = 0;
        for (int i = 0; i < s.length; i++) {
            if (in[i] && !Float.isNaN(s[i])) {
                kept[n++] = s[i];
            }
        }
        float[] sorted = Arrays.copyOf(kept, n);
        Arrays.sort(sorted);
        double sum = 0;
        double recip = 0;
        double logs = 0;
        int positive = 0;
        int below = 0;
        int above = 0;
        for (float f : sorted) {
            sum += f;
            if (f > 0) {
                recip += 1 / (double) f;
                logs += Math.log(f);
                positive++;
            }
            below += f < 1e9 ? 1 : 0;
            above += f > 1e9 ? 1 : 0;
        }
        double mean = sum / n;
        double ss = 0;
        for (float f : sorted) {
            ss += (f - mean) * (f - mean);
        }
        assertThat(st.count()).isEqualTo(n);
        assertThat(st.nonPositiveCount()).isEqualTo(n - positive);
        assertThat(st.mean()).isCloseTo(mean, within(1e-9 * Math.abs(mean)));
        assertThat(st.standardDeviation()).isCloseTo(Math.sqrt(ss / (n - 1)), within(1e-9 * Math.sqrt(ss / n)));
        assertThat(st.harmonicMean()).isCloseTo(positive / recip, within(1e-9 * positive / recip));
        double geo = Math.exp(logs / positive);
        assertThat(st.geometricMean()).isCloseTo(geo, within(1e-9 * geo));
        assertThat(st.min()).isEqualTo(sorted[0]);
        assertThat(st.max()).isEqualTo(sorted[n - 1]);
        assertThat(st.areaFraction(1e9).countBelow()).isEqualTo(below);
        assertThat(st.areaFraction(1e9).countAbove()).isEqualTo(above);
        for (double p : percents) {
            double hIdx = (n - 1) * p / 100.0;
            int lo = (int) Math.floor(hIdx);
            double frac = hIdx - lo;
            double expected = frac > 0 ? sorted[lo] + frac * ((double) sorted[Math.min(lo + 1, n - 1)] - sorted[lo])
                    : sorted[lo];
            assertThat(st.percentile(p)).as("P%s", p).isEqualTo(expected);
        }
    }

    @Test
    void percentilesOfSeveralChunksAgreeWithASortedCopy() {
        int n = 2_600_001; // three chunks of the parallel bucket count
        float[] v = randomMap(n, 3);
        int m = 0;
        for (float f : v) {
            if (!Float.isNaN(f)) {
                v[m++] = f;
            }
        }
        float[] sorted = Arrays.copyOf(v, m);
        Arrays.sort(sorted);
        int[] ranks = {0, 1, m / 3, m / 2, m / 2 + 1, m - 2, m - 1};
        double[] got = Selection.ranks(Arrays.copyOf(v, m), m, ranks);
        for (int r = 0; r < ranks.length; r++) {
            assertThat(got[r]).as("rank %d", ranks[r]).isEqualTo(sorted[ranks[r]]);
        }
    }

    @Test
    void oneThreadGivesTheSameFiguresAsSeveral() throws Exception {
        int w = 1500;
        int h = 1100;
        float[] s = randomMap(w * h, 23);
        FloatRaster raster = FloatRaster.wrap(w, h, s);
        PixelGrid grid = PixelGrid.centred(w, h, 0.05);
        Mask mask = Mask.of(w, h, i -> i % 13 != 0);
        StatisticsRequest request = StatisticsRequest.of(new double[] {5, 50, 95}, 1e8);
        MapStatistics one = onThreads(1, () -> MapStatistics.of(raster, mask, grid, request));
        MapStatistics four = onThreads(4, () -> MapStatistics.of(raster, mask, grid, request));
        MapStatistics common = MapStatistics.of(raster, mask, grid, request);
        assertThat(four).isEqualTo(one);
        assertThat(common).isEqualTo(one);
        InvalidArea a1 = onThreads(1, () -> InvalidArea.of(raster, mask, null, true, grid));
        InvalidArea a4 = onThreads(4, () -> InvalidArea.of(raster, mask, null, true, grid));
        assertThat(a4).isEqualTo(a1);
    }

    @Test
    void invalidAreaCountsEachCauseAsAPixelLoopDoes() {
        int w = 900;
        int h = 700;
        float[] s = randomMap(w * h, 41);
        Random rnd = new Random(2);
        for (int i = 0; i < s.length; i += 97) {
            s[i] = rnd.nextBoolean() ? Float.POSITIVE_INFINITY : 1e-4f; // infinite, and below the 1 ns floor
        }
        byte[] status = new byte[s.length];
        for (int i = 0; i < status.length; i++) {
            status[i] = (byte) rnd.nextInt(4);
        }
        Mask area = Mask.of(w, h, i -> (i / w + i % w) % 5 != 0);
        PixelGrid grid = PixelGrid.centred(w, h, 0.2);
        for (byte[] st : new byte[][] {null, status}) {
            int[] expected = new int[4];
            int evaluated = 0;
            for (int i = 0; i < s.length; i++) {
                if (area.containsIndex(i)) {
                    evaluated++;
                    expected[InvalidArea.cause(s[i], st == null ? -1 : st[i], true).ordinal()]++;
                }
            }
            InvalidArea a = InvalidArea.of(FloatRaster.wrap(w, h, s), area, st, true, grid);
            assertThat(a.evaluatedCount()).isEqualTo(evaluated);
            assertThat(a.nonFiniteCount()).isEqualTo(expected[InvalidArea.Cause.NON_FINITE.ordinal()]);
            assertThat(a.nonPositiveCount()).isEqualTo(expected[InvalidArea.Cause.NON_POSITIVE.ordinal()]);
            assertThat(a.invalidConversionCount())
                    .isEqualTo(expected[InvalidArea.Cause.INVALID_CONVERSION.ordinal()]);
        }
    }
}
