package trapmap.maps.raster;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

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
}
