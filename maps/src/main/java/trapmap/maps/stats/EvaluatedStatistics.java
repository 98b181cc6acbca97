package trapmap.maps.stats;

import trapmap.maps.raster.Blocks;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.check.Checks;

/**
 * The {@link EvaluatedArea} of a map and the {@link MapStatistics} of its values over that area's mask, with fewer
 * passes over the map than the two computed one after the other, and the very same figures.
 *
 * <p>{@link #of} makes one parallel pass over fixed blocks of {@link Mask#BLOCK_PX} pixels: each block's words of the
 * mask and counts ({@link EvaluatedArea}), then, while the block is in the cache, its counted values' sums
 * (count, mean and squared deviations, extremes, Σ ln x, threshold counts: the blocks {@link MapStatistics#of} uses)
 * and their percentile bucket counts (the radix pre-pass of the selection), by chunks of 16 blocks. The mask is then
 * ready (the flagged regions may be searched) before the rest of the statistics: {@link #statistics()} makes one pass
 * in index order on one thread that adds Σ 1/x and gathers the values of the few buckets that hold the wanted ranks,
 * and selects the ranks among them. No array of all counted values is made (for a 16-megapixel map 64 MB and a pass
 * fewer), except where {@link MapStatistics#percentiles} would select among all values in place (a nearly constant
 * map) or sort them (a few thousand), which it is then given as it would be.
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
                int counted = gather(v, out, from, Math.min(n, from + Mask.BLOCK_PX), scratch, buckets);
                parts[b] = MapStatistics.Part.ofValues(scratch, 0, counted, thresholds);
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

    /**
     * Copies the values of the pixels [from, end) in the mask {@code words} (none NaN) to out[0..], in index order,
     * adds the percentile bucket of each to {@code buckets}, and returns their count.
     */
    private static int gather(float[] s, long[] words, int from, int end, float[] out, int[] buckets) {
        int n = 0;
        for (int wi = from >>> 6, we = (end + 63) >>> 6; wi < we; wi++) {
            long word = words[wi];
            int base = wi << 6;
            if (word == -1L) {
                for (int i = base; i < base + 64; i++) {
                    float f = s[i];
                    out[n++] = f;
                    buckets[Selection.bucket(f)]++;
                }
            } else {
                for (; word != 0; word &= word - 1) {
                    float f = s[base + Long.numberOfTrailingZeros(word)];
                    out[n++] = f;
                    buckets[Selection.bucket(f)]++;
                }
            }
        }
        return n;
    }

    /** The pixels the statistics use, with the counts beside them. */
    public EvaluatedArea area() {
        return area;
    }

    /**
     * The statistics of the map's values over {@link #area()}'s mask: {@link MapStatistics#of} of them. Computed at
     * the first call, on the calling thread.
     */
    public synchronized MapStatistics statistics() {
        if (statistics == null) {
            MapStatistics.Part sums = MapStatistics.Part.combined(parts, thresholds.length);
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
                    // one pass in index order: Σ 1/x, and the values of the wanted buckets into their bins
                    float[][] bins = plan.bins();
                    reciprocalSum = reciprocalSumAndGather(plan, bins);
                    estimates = ranks.estimates(plan.select(bins, ranks.ranks));
                }
            }
            statistics = MapStatistics.of(sums, reciprocalSum, estimates, request, thresholds, pixelAreaMm2);
        }
        return statistics;
    }

    /** Σ 1/x over the positive values of values[0..n), in index order. */
    private static double reciprocalSum(float[] values, int n) {
        double sum = 0;
        for (int i = 0; i < n; i++) {
            float f = values[i];
            if (f > 0) {
                sum += 1 / (double) f;
            }
        }
        return sum;
    }

    /**
     * Σ 1/x over the positive counted values, added in index order, while the counted values whose bucket holds a
     * wanted rank are appended to their bins (so each bin holds its values in index order).
     */
    private double reciprocalSumAndGather(Selection.Plan plan, float[][] bins) {
        // which buckets are gathered, one bit each (8 KB: the test of a value stays in the first-level cache)
        long[] wanted = new long[Selection.BUCKETS >>> 6];
        for (int bucket : plan.bucketOfSlot) {
            wanted[bucket >>> 6] |= 1L << bucket;
        }
        int[] slotOfBucket = plan.slotOfBucket;
        int[] fill = new int[bins.length];
        double sum = 0;
        for (int wi = 0; wi < words.length; wi++) {
            long word = words[wi];
            int base = wi << 6;
            if (word == -1L) {
                for (int i = base; i < base + 64; i++) {
                    float f = values[i];
                    if (f > 0) {
                        sum += 1 / (double) f;
                    }
                    int bucket = Selection.bucket(f);
                    if ((wanted[bucket >>> 6] & 1L << bucket) != 0) {
                        int slot = slotOfBucket[bucket];
                        bins[slot][fill[slot]++] = f;
                    }
                }
            } else {
                for (; word != 0; word &= word - 1) {
                    float f = values[base + Long.numberOfTrailingZeros(word)];
                    if (f > 0) {
                        sum += 1 / (double) f;
                    }
                    int bucket = Selection.bucket(f);
                    if ((wanted[bucket >>> 6] & 1L << bucket) != 0) {
                        int slot = slotOfBucket[bucket];
                        bins[slot][fill[slot]++] = f;
                    }
                }
            }
        }
        return sum;
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
