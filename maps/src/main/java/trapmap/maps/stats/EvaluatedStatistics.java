package trapmap.maps.stats;

import java.util.concurrent.ForkJoinPool;
import java.util.concurrent.ForkJoinTask;
import trapmap.maps.raster.Blocks;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.PixelStatus;
import trapmap.shared.check.Checks;

/**
 * The {@link EvaluatedArea} of a map and the {@link MapStatistics} of its values over that area's mask, with fewer
 * passes over the map than the two computed one after the other, and the very same figures.
 *
 * <p>{@link #of} makes one parallel pass over fixed blocks of {@link Mask#BLOCK_PX} pixels: each block's words of the
 * mask and counts ({@link EvaluatedArea}), then, while the block is in the cache, its counted values' sums
 * (count, mean and squared deviations, extremes, Σ ln x, threshold counts: the blocks {@link MapStatistics#of} uses)
 * and their percentile bucket counts (the radix pre-pass of the selection), by chunks of 16 blocks. The mask is then
 * ready (the flagged regions may be searched) before the rest of the statistics: {@link #statistics()} adds Σ 1/x in
 * index order on one thread while the values of the few buckets that hold the wanted ranks are gathered, chunk by
 * chunk in index order, and selects the ranks among them. No array of all counted values is made (a 16-megapixel
 * map saved 64 MB and a pass), except where {@link MapStatistics#percentiles} would select among all values in place
 * (a nearly constant map) or sort them (a few thousand), which it is then given as it would be.
 *
 * <p>Every figure is the one {@link EvaluatedArea#of} and {@link MapStatistics#of} give for the same inputs: the
 * blocks' sums are the same sums combined in block order, the bucket counts are integers, the buckets are gathered in
 * index order and Σ 1/x is added in index order, so nothing depends on the number of threads.
 */
public final class EvaluatedStatistics {
    /** Blocks per chunk of the parallel pass (each chunk counts its own percentile buckets). */
    private static final int CHUNK_BLOCKS = 16;

    private final EvaluatedArea area;
    private final float[] values;
    private final long[] words;
    private final MapStatistics.Part[] parts;
    private final int[][] chunkCounts;
    private final StatisticsRequest request;
    private final double[] thresholds;
    private final double pixelAreaMm2;
    private MapStatistics statistics;

    private EvaluatedStatistics(EvaluatedArea area, float[] values, long[] words, MapStatistics.Part[] parts,
                                int[][] chunkCounts, StatisticsRequest request, double[] thresholds,
                                double pixelAreaMm2) {
        this.area = area;
        this.values = values;
        this.words = words;
        this.parts = parts;
        this.chunkCounts = chunkCounts;
        this.request = request;
        this.thresholds = thresholds;
        this.pixelAreaMm2 = pixelAreaMm2;
    }

    /**
     * The evaluated area of a map and the sums of its statistics; the arguments are those of {@link EvaluatedArea#of}
     * and the request of {@link MapStatistics#of}.
     *
     * @throws IllegalArgumentException when the sizes of the maps, area, status codes and grid differ
     */
    public static EvaluatedStatistics of(FloatRaster values, FloatRaster measured, Mask area, byte[] status,
                                         boolean lifetimeFloor, PixelGrid grid, StatisticsRequest request) {
        Checks.notNull(request, "request");
        EvaluatedArea.check(values, measured, area, status, grid);
        float[] v = values.samples();
        float[] m = measured.samples();
        int n = v.length;
        long[] areaWords = area == null ? null : area.words();
        long[] out = new long[Blocks.count(n, 64)];
        double[] thresholds = MapStatistics.thresholds(request);
        int blocks = Blocks.count(n, Mask.BLOCK_PX);
        int chunks = Blocks.count(blocks, CHUNK_BLOCKS);
        int[][] counts = new int[blocks][];
        MapStatistics.Part[] parts = new MapStatistics.Part[blocks];
        int[][] chunkCounts = new int[chunks][];
        Blocks.run(chunks, n, c -> {
            float[] scratch = new float[Mask.BLOCK_PX];
            int[] buckets = new int[Selection.BUCKETS];
            for (int b = c * CHUNK_BLOCKS, e = Math.min(blocks, (c + 1) * CHUNK_BLOCKS); b < e; b++) {
                counts[b] = EvaluatedArea.block(b, n, v, m, areaWords, status, lifetimeFloor, out);
                int from = b * Mask.BLOCK_PX;
                int counted = MapStatistics.Part.gather(v, out, from, Math.min(n, from + Mask.BLOCK_PX), scratch, 0);
                parts[b] = MapStatistics.Part.ofValues(scratch, 0, counted, thresholds);
                count(scratch, counted, buckets);
            }
            chunkCounts[c] = buckets;
        });
        int[] sum = new int[6];
        for (int[] c : counts) {
            for (int k = 0; k < sum.length; k++) {
                sum[k] += c[k];
            }
        }
        return new EvaluatedStatistics(EvaluatedArea.of(values, out, sum, grid), v, out, parts, chunkCounts,
                request, thresholds, grid.pixelAreaMm2());
    }

    /** Side of the made-up map of {@link #warmUp}: one block, so that it runs on the calling thread alone. */
    private static final int WARM_UP_SIDE = 256;
    /** Passes of {@link #warmUp} over its map: enough for the just-in-time compiler to compile every loop. */
    private static final int WARM_UP_ROUNDS = 12;

    /**
     * A head start for a large map's passes: runs {@link #of} and {@link #statistics()} a few times on a small
     * made-up map of one block (trap densities over three decades with pixels of every status, unusable measured
     * values of every cause, an evaluated area with words of no, some and all pixels), on the calling thread, so that
     * the just-in-time compiler has compiled their loops, with the branches a real map takes, before the real map
     * comes; a map that is read and converted meanwhile then starts on compiled code. Changes no result and keeps no
     * state; stops early when {@code stop} is set.
     */
    public static void warmUp(java.util.function.BooleanSupplier stop) {
        int side = WARM_UP_SIDE;
        int n = side * side;
        float[] density = new float[n];
        float[] lifetime = new float[n];
        byte[] status = new byte[n];
        for (int i = 0; i < n; i++) {
            double u = (i * 0.618034) % 1.0;
            int cause = i % 97;
            lifetime[i] = cause == 0 ? Float.NaN : cause == 1 ? Float.POSITIVE_INFINITY : cause == 2 ? -1f
                    : cause == 3 ? 5e-4f : (float) (1 + 999 * u);
            boolean below = i % 29 == 0;
            status[i] = cause == 0 ? PixelStatus.NO_DATA.code() : cause <= 3 ? PixelStatus.INVALID.code()
                    : below ? PixelStatus.BELOW_LIMIT.code() : PixelStatus.OK.code();
            density[i] = cause <= 3 ? Float.NaN : (float) Math.pow(10, 9 + 3 * u);
        }
        FloatRaster values = FloatRaster.wrap(side, side, density);
        FloatRaster measured = FloatRaster.wrap(side, side, lifetime);
        PixelGrid grid = PixelGrid.centred(side, side, 0.5);
        double radius = 0.45 * side;
        Mask area = Mask.of(side, side, i -> {
            double x = i % side - side / 2.0;
            double y = i / side - side / 2.0;
            return x * x + y * y <= radius * radius;
        });
        StatisticsRequest request = StatisticsRequest.of(new double[] {5, 95}, 1e11);
        for (int r = 0; r < WARM_UP_ROUNDS && !stop.getAsBoolean(); r++) {
            of(values, measured, area, status, true, grid, request).statistics();
        }
    }

    /** Adds the percentile bucket of each of values[0..n) to {@code buckets}. */
    private static void count(float[] values, int n, int[] buckets) {
        for (int k = 0; k < n; k++) {
            buckets[Selection.bucket(values[k])]++;
        }
    }

    /** The pixels the statistics use, with the counts beside them. */
    public EvaluatedArea area() {
        return area;
    }

    /**
     * The statistics of the map's values over {@link #area()}'s mask: {@link MapStatistics#of} of them. Computed at
     * the first call (which may run the gathering of the percentiles' values on the common pool).
     */
    public synchronized MapStatistics statistics() {
        if (statistics == null) {
            MapStatistics.Sums sums = MapStatistics.Sums.of(parts, thresholds.length);
            double[] wanted = MapStatistics.wantedPercents(request);
            double[] estimates;
            double reciprocalSum;
            if (sums.n == 0) {
                estimates = MapStatistics.Ranks.none(wanted);
                reciprocalSum = 0;
            } else {
                MapStatistics.Ranks ranks = MapStatistics.Ranks.of(sums.n, wanted);
                Selection.Plan plan = sums.n <= Selection.SORTED ? null
                        : Selection.Plan.of(Selection.sum(chunkCounts), sums.n, ranks.ranks);
                if (plan == null || plan.inPlace) {
                    // as MapStatistics.of: all counted values in index order, sorted or selected among in place
                    float[] all = gatherAll(sums.n);
                    reciprocalSum = reciprocalSum(all, sums.n);
                    estimates = ranks.estimates(Selection.ranks(all, sums.n, ranks.ranks));
                } else {
                    float[][] bins = plan.bins();
                    int[][] fill = plan.fills(chunkCounts);
                    ForkJoinTask<?> gathering = ForkJoinPool.commonPool().submit(() -> gather(plan, bins, fill));
                    reciprocalSum = reciprocalSum();
                    gathering.join();
                    estimates = ranks.estimates(plan.select(bins, ranks.ranks));
                }
            }
            statistics = MapStatistics.of(sums, reciprocalSum, estimates, request, thresholds, pixelAreaMm2);
        }
        return statistics;
    }

    /** Σ 1/x over the positive counted values, added in index order. */
    private double reciprocalSum() {
        double sum = 0;
        for (int wi = 0; wi < words.length; wi++) {
            long word = words[wi];
            int base = wi << 6;
            if (word == -1L) {
                sum = reciprocalSum(values, base, base + 64, sum);
            } else {
                for (; word != 0; word &= word - 1) {
                    float f = values[base + Long.numberOfTrailingZeros(word)];
                    if (f > 0) {
                        sum += 1 / (double) f;
                    }
                }
            }
        }
        return sum;
    }

    /** Σ 1/x over the positive values of values[0..n), in index order. */
    private static double reciprocalSum(float[] values, int n) {
        return reciprocalSum(values, 0, n, 0);
    }

    /** {@code sum} plus 1/x of the positive values of values[from..to), added in index order. */
    private static double reciprocalSum(float[] values, int from, int to, double sum) {
        for (int i = from; i < to; i++) {
            float f = values[i];
            if (f > 0) {
                sum += 1 / (double) f;
            }
        }
        return sum;
    }

    /** The counted values of the wanted buckets into their bins, chunk by chunk, each from its own fill positions. */
    private void gather(Selection.Plan plan, float[][] bins, int[][] fill) {
        // which buckets are gathered, one bit each (8 KB: the test of a value stays in the first-level cache)
        long[] wanted = new long[Selection.BUCKETS >>> 6];
        for (int bucket : plan.bucketOfSlot) {
            wanted[bucket >>> 6] |= 1L << bucket;
        }
        for (int c = 0; c < chunkCounts.length; c++) {
            int from = c * CHUNK_BLOCKS * Mask.BLOCK_PX;
            gather(wanted, plan.slotOfBucket, bins, fill[c], from,
                    Math.min(values.length, from + CHUNK_BLOCKS * Mask.BLOCK_PX));
        }
    }

    /**
     * The counted values of pixels [from, to) (a whole number of words) whose bucket is {@code wanted}, appended to
     * their bins at {@code fill}, in index order.
     */
    private void gather(long[] wanted, int[] slotOfBucket, float[][] bins, int[] fill, int from, int to) {
        for (int wi = from >>> 6, we = (to + 63) >>> 6; wi < we; wi++) {
            long word = words[wi];
            int base = wi << 6;
            if (word == -1L) {
                for (int i = base; i < base + 64; i++) {
                    float f = values[i];
                    int bucket = Selection.bucket(f);
                    if ((wanted[bucket >>> 6] & 1L << bucket) != 0) {
                        int slot = slotOfBucket[bucket];
                        bins[slot][fill[slot]++] = f;
                    }
                }
            } else {
                for (; word != 0; word &= word - 1) {
                    float f = values[base + Long.numberOfTrailingZeros(word)];
                    int bucket = Selection.bucket(f);
                    if ((wanted[bucket >>> 6] & 1L << bucket) != 0) {
                        int slot = slotOfBucket[bucket];
                        bins[slot][fill[slot]++] = f;
                    }
                }
            }
        }
    }

    /** All n counted values, in index order. */
    private float[] gatherAll(int n) {
        float[] all = new float[n];
        int k = 0;
        for (int wi = 0; wi < words.length; wi++) {
            int base = wi << 6;
            for (long word = words[wi]; word != 0; word &= word - 1) {
                all[k++] = values[base + Long.numberOfTrailingZeros(word)];
            }
        }
        return all;
    }
}
