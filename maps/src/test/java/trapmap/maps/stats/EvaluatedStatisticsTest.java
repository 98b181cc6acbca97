package trapmap.maps.stats;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.Random;
import java.util.concurrent.ForkJoinPool;
import org.junit.jupiter.api.Test;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.PixelStatus;

/**
 * {@link EvaluatedStatistics} against the two passes it replaces, {@link EvaluatedArea#of} then
 * {@link MapStatistics#of} over its mask: the same mask and counts and the same statistics, bit for bit, on every
 * path of the percentiles (sorted, gathered buckets, selection in place, no values) and on one thread as on several.
 */
class EvaluatedStatisticsTest {
    private static final StatisticsRequest REQUEST = StatisticsRequest.of(new double[] {0, 5, 37.5, 95, 100}, 1.5,
            250);

    /** Values of every kind: NaN, ±∞, ±0, negative, tiny, spread over decades. */
    private static float value(Random r) {
        return switch (r.nextInt(12)) {
            case 0 -> Float.NaN;
            case 1 -> r.nextBoolean() ? Float.POSITIVE_INFINITY : Float.NEGATIVE_INFINITY;
            case 2 -> r.nextBoolean() ? 0f : -0f;
            case 3 -> -r.nextFloat() * 5;
            case 4 -> r.nextFloat() * 2e-3f;
            default -> (float) Math.pow(10, r.nextDouble() * 6);
        };
    }

    private static FloatRaster raster(Random r, int w, int h) {
        float[] v = new float[w * h];
        for (int i = 0; i < v.length; i++) {
            v[i] = value(r);
        }
        return FloatRaster.wrap(w, h, v);
    }

    private static byte[] status(Random r, int n) {
        byte[] status = new byte[n];
        for (int i = 0; i < n; i++) {
            // mostly OK, so that the statistics have many values
            status[i] = r.nextInt(4) == 0 ? (byte) r.nextInt(PixelStatus.values().length) : PixelStatus.OK.code();
        }
        return status;
    }

    /** The figures of both ways for the same inputs, with the figures themselves checked to be the same. */
    private static MapStatistics assertSameAsSeparatePasses(FloatRaster values, FloatRaster measured, Mask area,
                                                            byte[] status, boolean lifetimeFloor) {
        PixelGrid grid = PixelGrid.centred(values.width(), values.height(), 0.05);
        EvaluatedArea separate = EvaluatedArea.of(values, measured, area, status, lifetimeFloor, grid);
        MapStatistics expected = MapStatistics.of(values, separate.mask(), grid, REQUEST);

        EvaluatedStatistics fused = EvaluatedStatistics.of(values, measured, area, status, lifetimeFloor, grid,
                REQUEST);
        assertThat(fused.area().mask().words()).isEqualTo(separate.mask().words());
        assertThat(fused.area().evaluatedCount()).isEqualTo(separate.evaluatedCount());
        assertThat(fused.area().belowLimitCount()).isEqualTo(separate.belowLimitCount());
        assertThat(fused.area().invalid()).isEqualTo(separate.invalid());
        MapStatistics got = fused.statistics();
        // records compare their doubles bit for bit (Double.equals): NaN equals NaN, 0.0 differs from -0.0
        assertThat(got).isEqualTo(expected);
        assertThat(fused.statistics()).isSameAs(got);
        return got;
    }

    @Test
    void givesTheFiguresOfTheSeparatePassesOnRandomMaps() {
        Random r = new Random(20261205L);
        // a few values (sorted), one block, many blocks and more than one chunk of 16 blocks (gathered buckets),
        // sizes that end inside a 64-bit word and inside a block
        int[][] sizes = {{1, 1}, {7, 9}, {64, 3}, {333, 211}, {1031, 1029}};
        for (int[] s : sizes) {
            int w = s[0];
            int h = s[1];
            FloatRaster measured = raster(r, w, h);
            FloatRaster density = raster(r, w, h);
            byte[] status = status(r, w * h);
            boolean[] inside = new boolean[w * h];
            for (int i = 0; i < inside.length; i++) {
                inside[i] = r.nextInt(5) != 0;
            }
            Mask area = Mask.of(w, h, i -> inside[i]);
            for (boolean floor : new boolean[] {true, false}) {
                assertSameAsSeparatePasses(density, measured, area, status, floor);
                assertSameAsSeparatePasses(density, measured, null, status, floor);
                assertSameAsSeparatePasses(measured, measured, area, null, floor);
                assertSameAsSeparatePasses(measured, measured, null, null, floor);
            }
        }
    }

    @Test
    void selectsInPlaceOnANearlyConstantMapAsTheSeparatePassesDo() {
        // most values in one percentile bucket: the ranks are selected among all values in place, zeros of both
        // signs included
        int w = 700;
        int h = 600;
        Random r = new Random(5);
        float[] v = new float[w * h];
        for (int i = 0; i < v.length; i++) {
            v[i] = switch (r.nextInt(8)) {
                case 0 -> 0f;
                case 1 -> -0f;
                case 2 -> Float.NaN;
                default -> 3f;
            };
        }
        FloatRaster map = FloatRaster.wrap(w, h, v);
        MapStatistics s = assertSameAsSeparatePasses(map, map, null, null, false);
        assertThat(s.median()).isEqualTo(3);
        assertThat(Math.abs(s.percentile(5))).isEqualTo(0.0);
    }

    @Test
    void givesNaNFiguresWithoutAnyCountedPixel() {
        float[] v = new float[300 * 300];
        java.util.Arrays.fill(v, Float.NaN);
        FloatRaster map = FloatRaster.wrap(300, 300, v);
        MapStatistics s = assertSameAsSeparatePasses(map, map, null, null, false);
        assertThat(s.count()).isZero();
        assertThat(s.median()).isNaN();
        assertThat(s.harmonicMean()).isNaN();
    }

    @Test
    void oneThreadGivesTheSameFiguresAsSeveral() throws Exception {
        Random r = new Random(11);
        int w = 1500;
        int h = 900;
        FloatRaster measured = raster(r, w, h);
        FloatRaster density = raster(r, w, h);
        byte[] status = status(r, w * h);
        PixelGrid grid = PixelGrid.centred(w, h, 0.1);
        ForkJoinPool one = new ForkJoinPool(1);
        ForkJoinPool four = new ForkJoinPool(4);
        try {
            EvaluatedStatistics a = one.submit(() -> EvaluatedStatistics.of(density, measured, null, status, true,
                    grid, REQUEST)).get();
            MapStatistics sa = one.submit(a::statistics).get();
            EvaluatedStatistics b = four.submit(() -> EvaluatedStatistics.of(density, measured, null, status, true,
                    grid, REQUEST)).get();
            MapStatistics sb = four.submit(b::statistics).get();
            assertThat(sb).isEqualTo(sa);
            assertThat(b.area().mask().words()).isEqualTo(a.area().mask().words());
            assertThat(b.area().invalid()).isEqualTo(a.area().invalid());
            assertThat(sa.count()).isGreaterThan(500_000);
        } finally {
            one.shutdown();
            four.shutdown();
        }
    }

    @Test
    void addsTheReciprocalsOfManyChunksInIndexOrderOnAnyNumberOfThreads() throws Exception {
        // 4.3 million pixels: 66 blocks in 5 chunks, done by threads in any order; the harmonic mean (Σ 1/x added
        // in index order) and every other figure as the separate passes give them on one thread
        Random r = new Random(17);
        int w = 4096;
        int h = 1050;
        FloatRaster measured = raster(r, w, h);
        FloatRaster density = raster(r, w, h);
        byte[] status = status(r, w * h);
        Mask area = Mask.of(w, h, i -> (i / w - h / 2) * (i / w - h / 2) + (i % w - w / 2) * (i % w - w / 2) / 16
                < h * h / 4);
        MapStatistics one = assertSameAsSeparatePasses(density, measured, area, status, false);
        ForkJoinPool three = new ForkJoinPool(3);
        try {
            PixelGrid grid = PixelGrid.centred(w, h, 0.05);
            for (int k = 0; k < 3; k++) {
                EvaluatedStatistics e = three.submit(() -> EvaluatedStatistics.of(density, measured, area, status,
                        false, grid, REQUEST)).get();
                assertThat(three.submit(e::statistics).get()).isEqualTo(one);
            }
        } finally {
            three.shutdown();
        }
        assertThat(one.harmonicMean()).isFinite().isPositive();
    }

    @Test
    void theWarmUpRunsEveryLoopOnEveryKindOfMapAndChangesNoFigure() throws Exception {
        Random r = new Random(23);
        FloatRaster measured = raster(r, 300, 200);
        MapStatistics before = assertSameAsSeparatePasses(measured, measured, null, null, true);
        for (boolean converted : new boolean[] {true, false}) {
            for (int thresholds = 0; thresholds <= 2; thresholds++) {
                assertThat(EvaluatedStatistics.warmUp(converted, !converted, thresholds, 50, () -> false))
                        .isFinite();
            }
        }
        // a stopped warm-up does no round; a started one ends by itself
        assertThat(EvaluatedStatistics.warmUp(true, false, 1, 50, () -> true))
                .isZero();
        EvaluatedStatistics.warmUp(false, true, 1).close();
        assertThat(assertSameAsSeparatePasses(measured, measured, null, null, true)).isEqualTo(before);
    }

    @Test
    void refusesMapsOfOtherSizes() {
        FloatRaster a = FloatRaster.wrap(4, 2, new float[8]);
        FloatRaster b = FloatRaster.wrap(2, 4, new float[8]);
        PixelGrid grid = PixelGrid.centred(4, 2, 1);
        assertThatThrownBy(() -> EvaluatedStatistics.of(a, b, null, null, false, grid, REQUEST))
                .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("does not match");
        assertThatThrownBy(() -> EvaluatedStatistics.of(a, a, null, new byte[7], false, grid, REQUEST))
                .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("status codes");
    }
}
