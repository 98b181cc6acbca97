package trapmap.maps.raster;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.HashSet;
import java.util.Map;
import java.util.Set;
import java.util.SplittableRandom;
import java.util.TreeMap;
import java.util.concurrent.ForkJoinPool;
import org.junit.jupiter.api.Test;

/** The most-common-value pyramid of category codes, against a plain count over each whole block. */
class BlockModesTest {
    private static final float N = Float.NaN;

    private static BlockMeanPyramid modes(FloatRaster r) {
        return new BlockMeanPyramid(r, BlockMeanPyramid.Rule.MOST_COMMON, BlockMeanPyramid.levelsUntil(r.width(),
                r.height(), 1));
    }

    /**
     * The plain reference: level {@code k} pixel (x, y) is the value counted most often among the non-NaN raster
     * samples of [x·2^k, (x+1)·2^k) × [y·2^k, (y+1)·2^k) clipped to the raster, the lowest on a tie, NaN if none.
     */
    private static float reference(FloatRaster r, int k, int x, int y) {
        TreeMap<Float, Integer> counts = new TreeMap<>(); // Float order is Float.compare's
        for (int yy = y << k; yy < Math.min((y + 1) << k, r.height()); yy++) {
            for (int xx = x << k; xx < Math.min((x + 1) << k, r.width()); xx++) {
                float v = r.get(xx, yy);
                if (!Float.isNaN(v)) {
                    counts.merge(v, 1, Integer::sum);
                }
            }
        }
        float best = N;
        int bestCount = 0;
        for (Map.Entry<Float, Integer> e : counts.entrySet()) {
            if (e.getValue() > bestCount) {
                best = e.getKey();
                bestCount = e.getValue();
            }
        }
        return best;
    }

    /** A raster of a few codes (so that ties are common), a share of NaN and an all-NaN corner. */
    private static FloatRaster codes(int w, int h, float[] alphabet, double nanShare, long seed) {
        SplittableRandom rnd = new SplittableRandom(seed);
        float[] s = new float[w * h];
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                boolean corner = x < w / 3 && y < h / 3;
                s[y * w + x] = corner || rnd.nextDouble() < nanShare ? N : alphabet[rnd.nextInt(alphabet.length)];
            }
        }
        return FloatRaster.wrap(w, h, s);
    }

    @Test
    void everyLevelIsTheMostCommonCodeOfItsWholeBlockOnRandomRasters() {
        float[][] alphabets = {{1, 2}, {0, 1, 2, 3}, {-2, -1, 1, 2, 3, 4, 5, 6, 7}, {3.5f, -0.5f, 1e6f}};
        int[][] sizes = {{1, 1}, {2, 1}, {5, 3}, {7, 9}, {33, 17}, {64, 65}, {129, 1}, {1, 70}, {100, 101}};
        int compared = 0;
        int ties = 0;
        for (int a = 0; a < alphabets.length; a++) {
            for (int[] size : sizes) {
                FloatRaster r = codes(size[0], size[1], alphabets[a], 0.2, 31L * a + size[0] * 7L + size[1]);
                BlockMeanPyramid p = modes(r);
                for (int k = 1; k < p.levelCount(); k++) {
                    BlockMeanPyramid.Level lv = p.built(k);
                    assertThat(lv.width()).isEqualTo(ceilHalvings(r.width(), k));
                    assertThat(lv.height()).isEqualTo(ceilHalvings(r.height(), k));
                    for (int y = 0; y < lv.height(); y++) {
                        for (int x = 0; x < lv.width(); x++) {
                            float want = reference(r, k, x, y);
                            float got = lv.samples()[y * lv.width() + x];
                            assertThat(Float.floatToIntBits(got)).as("%dx%d level %d (%d, %d)", r.width(),
                                    r.height(), k, x, y).isEqualTo(Float.floatToIntBits(want));
                            compared++;
                            ties += isTie(r, k, x, y) ? 1 : 0;
                        }
                    }
                }
            }
        }
        assertThat(compared).isGreaterThan(5000);
        assertThat(ties).as("blocks with a tie for the most common code").isGreaterThan(200);
    }

    private static int ceilHalvings(int n, int k) {
        for (int i = 0; i < k; i++) {
            n = (n + 1) / 2;
        }
        return n;
    }

    /** Whether two codes share the largest count in the block. */
    private static boolean isTie(FloatRaster r, int k, int x, int y) {
        TreeMap<Float, Integer> counts = new TreeMap<>();
        for (int yy = y << k; yy < Math.min((y + 1) << k, r.height()); yy++) {
            for (int xx = x << k; xx < Math.min((x + 1) << k, r.width()); xx++) {
                if (!Float.isNaN(r.get(xx, yy))) {
                    counts.merge(r.get(xx, yy), 1, Integer::sum);
                }
            }
        }
        int max = counts.values().stream().mapToInt(Integer::intValue).max().orElse(0);
        return counts.values().stream().filter(c -> c == max).count() > 1;
    }

    @Test
    void tiesGoToTheLowestCodeAndNoDataOnlyWhereTheBlockHasNone() {
        float[] s = {
            3, 1, 2, N, N, N, 5,
            1, 3, N, 5, N, N, 4,
        };
        BlockMeanPyramid p = modes(FloatRaster.wrap(7, 2, s));
        // {3,1,1,3}: tie of 1 and 3; {2,5}: tie; all NaN; odd edge {5,4}: tie
        assertThat(p.built(1).samples()).containsExactly(1f, 2f, N, 4f);
        // the left half: 1 and 3 twice each, 2 and 5 once: 1; the right half: 4 and 5 once each: 4
        assertThat(p.built(2).samples()).containsExactly(1f, 4f);
        assertThat(p.built(3).samples()).containsExactly(1f);
    }

    @Test
    void countsTheWholeBlockNotTheMostCommonOfTheQuarters() {
        float[] s = {
            1, 1, 1, 1,
            2, 2, 2, 2,
            3, 3, 3, 2,
            2, 2, 3, 3,
        };
        BlockMeanPyramid p = modes(FloatRaster.wrap(4, 4, s));
        // quarters: {1,1,2,2} → 1, {1,1,2,2} → 1, {3,3,2,2} → 2, {3,2,3,3} → 3; most common of these would be 1
        assertThat(p.built(1).samples()).containsExactly(1f, 1f, 2f, 3f);
        // over the whole block: 1 four times, 2 seven times, 3 five times
        assertThat(p.built(2).samples()).containsExactly(2f);
    }

    @Test
    void aZoomedOutCodeMapHoldsOnlyItsCodesWhereTheMeanDoesNot() {
        float[] alphabet = {-2, -1, 1, 2, 3, 4};
        FloatRaster r = codes(301, 157, alphabet, 0.1, 5);
        Set<Float> allowed = new HashSet<>();
        for (float c : alphabet) {
            allowed.add(c);
        }
        BlockMeanPyramid modes = modes(r);
        BlockMeanPyramid means = new BlockMeanPyramid(r, BlockMeanPyramid.Rule.EXACT_MEAN, modes.levelCount());
        int foreign = 0;
        for (int k = 1; k < modes.levelCount(); k++) {
            for (float v : modes.built(k).samples()) {
                assertThat(Float.isNaN(v) || allowed.contains(v)).as("level %d value %s", k, v).isTrue();
            }
            for (float v : means.built(k).samples()) {
                foreign += Float.isNaN(v) || allowed.contains(v) ? 0 : 1;
            }
        }
        assertThat(foreign).as("the mean's values that are no code").isGreaterThan(100);
    }

    @Test
    void oneThreadAndSeveralGiveTheSameLevels() throws Exception {
        FloatRaster r = codes(517, 389, new float[] {0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10}, 0.3, 99);
        ForkJoinPool one = new ForkJoinPool(1);
        ForkJoinPool four = new ForkJoinPool(4);
        try {
            BlockMeanPyramid a = modes(r);
            BlockMeanPyramid b = modes(r);
            one.submit(() -> a.build(new java.util.concurrent.atomic.AtomicBoolean())).get();
            four.submit(() -> b.build(new java.util.concurrent.atomic.AtomicBoolean())).get();
            for (int k = 0; k < a.levelCount(); k++) {
                assertThat(a.level(k).samples()).isEqualTo(b.level(k).samples());
            }
        } finally {
            one.shutdown();
            four.shutdown();
        }
    }

    @Test
    void theMostCommonValueIsOnlyBuiltByThePyramid() {
        BlockMeanPyramid.Level l0 = new BlockMeanPyramid.Level(0, 2, 2, new float[] {1, 1, 2, 2});
        assertThatThrownBy(() -> BlockMeanPyramid.halve(l0, BlockMeanPyramid.Rule.MOST_COMMON, null, null))
                .isInstanceOf(IllegalArgumentException.class);
    }
}
