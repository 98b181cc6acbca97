package trapmap.maps.raster;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.Arrays;
import java.util.Random;
import java.util.concurrent.ForkJoinPool;
import java.util.concurrent.atomic.AtomicBoolean;
import org.junit.jupiter.api.Test;

class BlockMeanPyramidTest {
    private static final float N = Float.NaN;
    private static final float INF = Float.POSITIVE_INFINITY;

    @Test
    void exactMeanKeepsOddEdgesAndWeighsByValidSamples() {
        float[] s = {
            1, 3, N, N, 7,
            5, 7, N, N, 9,
            2, N, 4, 6, N,
        };
        BlockMeanPyramid p = new BlockMeanPyramid(FloatRaster.wrap(5, 3, s), BlockMeanPyramid.Rule.EXACT_MEAN, 3);

        BlockMeanPyramid.Level l1 = p.built(1);
        BlockMeanPyramid.Level l2 = p.built(2);

        assertThat(l1.samples()).containsExactly(4f, N, 8f, 2f, 5f, N);
        assertThat(l2.width()).isEqualTo(2);
        assertThat(l2.samples()).containsExactly((1 + 3 + 5 + 7 + 2 + 4 + 6) / 7f, 8f);
        assertThat(l2.scale()).isEqualTo(4);
        assertThat(p.complete()).isTrue();
    }

    @Test
    void twoOfFourNeedsTwoFiniteSamplesAndDropsOddEdges() {
        float[] s = {
            1, 3, N, 2, 7,
            5, 7, N, N, 9,
            2, INF, 4, 6, 1,
            N, N, 8, -INF, 1,
            9, 9, 9, 9, 9,
        };
        BlockMeanPyramid p = new BlockMeanPyramid(FloatRaster.wrap(5, 5, s), BlockMeanPyramid.Rule.TWO_OF_FOUR, 3);

        BlockMeanPyramid.Level l1 = p.built(1);

        assertThat(l1.width()).isEqualTo(2);
        assertThat(l1.height()).isEqualTo(2);
        // {1,3,5,7} → 4; {N,2,N,N} → one finite: no data; {2,∞,N,N} → one finite: no data; {4,6,8,−∞} → 6
        assertThat(l1.samples()).containsExactly(4f, N, N, 6f);
        // level 2 from level 1, not from the raster: two of {4, N, N, 6} are finite
        assertThat(p.built(2).samples()).containsExactly(5f);
    }

    @Test
    void exactMeanTreatsOnlyNanAsNoData() {
        BlockMeanPyramid.Level l0 = new BlockMeanPyramid.Level(0, 2, 1, new float[] {INF, 1});

        BlockMeanPyramid.Level l1 = BlockMeanPyramid.halve(l0, BlockMeanPyramid.Rule.EXACT_MEAN, null, null);

        assertThat(l1.samples()).containsExactly(INF);
    }

    @Test
    void levelsUntilCountsHalvingsUntilTheLongerSideFits() {
        assertThat(BlockMeanPyramid.levelsUntil(1000, 300, 64)).isEqualTo(5); // 1000 → 500 → 250 → 125 → 63
        assertThat(BlockMeanPyramid.levelsUntil(64, 10, 64)).isEqualTo(1);
        assertThat(BlockMeanPyramid.levelsUntil(65, 10, 64)).isEqualTo(2);
    }

    @Test
    void buildStopsWhenCancelledAndLevelsAreNullUntilBuilt() {
        BlockMeanPyramid p = new BlockMeanPyramid(FloatRaster.filled(256, 256, 2f), BlockMeanPyramid.Rule.EXACT_MEAN,
                4);
        p.build(new AtomicBoolean(true));
        assertThat(p.level(1)).isNull();
        assertThat(p.complete()).isFalse();

        p.build(new AtomicBoolean());
        assertThat(p.complete()).isTrue();
        assertThat(p.level(3).width()).isEqualTo(32);
        assertThat(p.level(3).samples()).containsOnly(2f);
        assertThatThrownBy(() -> p.built(4)).isInstanceOf(IndexOutOfBoundsException.class);
    }

    @Test
    void twoOfFourOnRandomDataIsThePlainMeanOfTheFiniteSamplesOnAnyNumberOfThreads() {
        Random r = new Random(11);
        int fw = 301;
        int fh = 198;
        float[] s = new float[fw * fh];
        for (int i = 0; i < s.length; i++) {
            double u = r.nextDouble();
            s[i] = u < 0.2 ? N : u < 0.25 ? INF : u < 0.27 ? -INF : (float) (100 * r.nextGaussian());
        }
        BlockMeanPyramid.Level l0 = new BlockMeanPyramid.Level(0, fw, fh, s);
        ForkJoinPool one = new ForkJoinPool(1);
        ForkJoinPool four = new ForkJoinPool(4);
        try {
            BlockMeanPyramid.Level a = one.submit(() -> BlockMeanPyramid.halve(l0, BlockMeanPyramid.Rule.TWO_OF_FOUR,
                    null, null)).join();
            BlockMeanPyramid.Level b = four.submit(() -> BlockMeanPyramid.halve(l0,
                    BlockMeanPyramid.Rule.TWO_OF_FOUR, null, null)).join();
            assertThat(Arrays.equals(a.samples(), b.samples())).isTrue();
            assertThat(a.width()).isEqualTo(150);
            assertThat(a.height()).isEqualTo(99);
            for (int y = 0; y < a.height(); y++) {
                for (int x = 0; x < a.width(); x++) {
                    double sum = 0;
                    int n = 0;
                    for (int yy = 2 * y; yy < 2 * y + 2; yy++) {
                        for (int xx = 2 * x; xx < 2 * x + 2; xx++) {
                            float v = s[yy * fw + xx];
                            if (Float.isFinite(v)) {
                                sum += v;
                                n++;
                            }
                        }
                    }
                    float expected = n < 2 ? N : (float) (sum / n);
                    assertThat(Float.compare(a.samples()[y * a.width() + x], expected)).as("(%d, %d)", x, y)
                            .isZero();
                }
            }
        } finally {
            one.shutdown();
            four.shutdown();
        }
    }
}
