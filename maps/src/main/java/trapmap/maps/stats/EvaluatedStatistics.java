package trapmap.maps.stats;

import java.util.concurrent.CountDownLatch;
import java.util.concurrent.ForkJoinPool;
import java.util.concurrent.ForkJoinTask;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicIntegerArray;
import trapmap.maps.raster.Blocks;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.PixelStatus;
import trapmap.shared.check.Checks;
import trapmap.shared.progress.HeadStart;

/**
 * The {@link EvaluatedArea} of a map and the {@link MapStatistics} of its values over that area's mask, with fewer
 * passes over the map than the two computed one after the other, and the very same figures.
 *
 * <p>{@link #of} makes one parallel pass over fixed blocks of {@link Mask#BLOCK_PX} pixels, handed out in index order
 * by chunks of 16 blocks: each block's words of the mask and counts ({@link EvaluatedArea}), then, while the block is
 * in the cache, its counted values' sums (count, mean and squared deviations, extremes, Σ ln x, threshold counts: the
 * blocks {@link MapStatistics#of} uses) and their percentile bucket counts (the radix pre-pass of the selection). As
 * the chunks are done, whichever thread finds the next chunk in index order done adds its Σ 1/x to the sum of the
 * chunks before it, so that sum, added in index order as every face adds it, is ready with the pass. The mask is then
 * ready (the flagged regions may be searched) before the rest of the statistics: {@link #statistics()} gathers the
 * values of the few buckets that hold the wanted ranks (in parallel, each chunk into its own stretch of every bin) and
 * selects the ranks among them. No array of all counted values is made (for a 16-megapixel map 64 MB and a pass
 * fewer), except where {@link MapStatistics#percentiles} would select among all values in place (a nearly constant
 * map) or sort them (a few thousand), which it is then given as it would be.
 *
 * <p>Every figure is the one {@link EvaluatedArea#of} and {@link MapStatistics#of} give for the same inputs: the
 * blocks' sums are the same sums combined in block order, the bucket counts are integers, the buckets are gathered in
 * index order and Σ 1/x is added in index order, so nothing depends on the number of threads. {@link #warmUp} has the
 * pass's loops compiled while a command reads its map.
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
    /** Σ 1/x over the positive counted values, added in index order. */
    private final double reciprocalSum;
    private MapStatistics statistics;

    private EvaluatedStatistics(EvaluatedArea area, float[] values, long[] words, MapStatistics.Part[] parts,
                                int[][] chunkCounts, StatisticsRequest request, double[] thresholds,
                                double pixelAreaMm2, double reciprocalSum) {
        this.area = area;
        this.values = values;
        this.words = words;
        this.parts = parts;
        this.chunkCounts = chunkCounts;
        this.request = request;
        this.thresholds = thresholds;
        this.pixelAreaMm2 = pixelAreaMm2;
        this.reciprocalSum = reciprocalSum;
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
        OrderedSum reciprocal = new OrderedSum(chunks);
        ChunkBody body = (c, scratch) -> {
            int[] buckets = new int[Selection.BUCKETS];
            for (int b = c * CHUNK_BLOCKS, e = Math.min(blocks, (c + 1) * CHUNK_BLOCKS); b < e; b++) {
                int from = b * Mask.BLOCK_PX;
                int end = Math.min(n, from + Mask.BLOCK_PX);
                counts[b] = EvaluatedArea.block(from, end, v, m, areaWords, status, lifetimeFloor, out);
                int counted = gather(v, out, from, end, scratch, buckets);
                parts[b] = MapStatistics.Part.ofValues(scratch, 0, counted, thresholds);
            }
            chunkCounts[c] = buckets;
        };
        // Σ 1/x in index order, chunk after chunk as the chunks are done (chunks are handed out in index order)
        Summand summand = (c, sum) -> {
            int from = c * CHUNK_BLOCKS * Mask.BLOCK_PX;
            int end = (int) Math.min(n, (long) (c + 1) * CHUNK_BLOCKS * Mask.BLOCK_PX);
            return reciprocalSum(sum, v, out, from >>> 6, (end + 63) >>> 6);
        };
        runInOrder(chunks, n, body, reciprocal, summand);
        int[] sum = new int[6];
        for (int[] c : counts) {
            for (int k = 0; k < sum.length; k++) {
                sum[k] += c[k];
            }
        }
        return new EvaluatedStatistics(EvaluatedArea.of(values, out, sum, grid), v, out, parts, chunkCounts,
                request, thresholds, grid.pixelAreaMm2(), reciprocal.sum);
    }

    /** Rounds of a {@link #warmUp}. */
    static final int WARM_UP_ROUNDS = 2000;

    /**
     * Starts running the per-block loops of {@link #of} and {@link #statistics()} over a small made-up map, over
     * and over, on a background (daemon) thread, so that the just-in-time compiler has them compiled as whole
     * methods before the real map's pass: in a fresh process that pass otherwise runs its first blocks in the
     * interpreter and the lower tiers, and has its loops compiled twice (on the stack, then as methods). The inputs
     * take the paths the real map will take (with or without conversion statuses, the lifetime floor, the number of
     * thresholds), so that the compiled code needs no recompilation. Changes no result, keeps no state the statistics
     * read, and stops when the returned handle is closed or after {@value #WARM_UP_ROUNDS} rounds.
     *
     * @param converted     whether the real map comes with conversion statuses
     * @param lifetimeFloor as for {@link #of}
     * @param thresholds    the number of thresholds of the request
     */
    public static HeadStart warmUp(boolean converted, boolean lifetimeFloor, int thresholds) {
        return HeadStart.start("statistics-warm-up",
                stopped -> warmUp(converted, lifetimeFloor, thresholds, WARM_UP_ROUNDS, stopped));
    }

    /**
     * The rounds of {@link #warmUp}, each over a map of five words of 64 pixels, one of each kind a real map has:
     * outside the wafer, on its edge, inside with every pixel counted (most of a map), inside with pixels of every
     * kind (no data, <= 0, below the lifetime floor, each conversion status), and a last, short word. Each loop is
     * run on one word at a time: a call of a method then takes a few dozen turns of its loops, so that HotSpot's
     * tiered policy compiles the method whole for its top tier (after some hundreds of calls) before its loop
     * counters ask for an on-stack compilation of a loop (which the real map's long calls would not use). Returns a
     * figure of the last round (so that no loop is left out).
     */
    static double warmUp(boolean converted, boolean lifetimeFloor, int thresholdCount, int rounds,
                         java.util.function.BooleanSupplier stopped) {
        int n = 4 * 64 + 41;
        float[] v = new float[n];
        float[] m = new float[n];
        byte[] status = converted ? new byte[n] : null;
        long[] area = {0, 0x00ffff00ff00fff0L, -1L, -1L, -1L};
        java.util.Random r = new java.util.Random(7);
        for (int i = 0; i < n; i++) {
            boolean mixed = i >>> 6 == 3;
            m[i] = !mixed ? (float) Math.pow(10, 3 * r.nextDouble()) : i % 5 == 0 ? Float.NaN
                    : i % 5 == 1 ? -1f : i % 5 == 2 ? 5e-4f : (float) Math.pow(10, 3 * r.nextDouble());
            v[i] = !converted ? m[i] : mixed && i % 3 == 0 ? Float.NaN : (float) Math.pow(10, 10 + 3 * r.nextDouble());
            if (converted) {
                status[i] = mixed ? (byte) (i % PixelStatus.values().length) : PixelStatus.OK.code();
            }
        }
        double[] thresholds = new double[thresholdCount];
        java.util.Arrays.fill(thresholds, converted ? 1e12 : 50);
        long[] out = new long[area.length];
        float[] scratch = new float[n];
        int[] buckets = new int[Selection.BUCKETS];
        // the buckets of every fourth value gathered, as the percentiles' bins are
        int[] slotOfBucket = new int[Selection.BUCKETS];
        long[] wanted = new long[Selection.BUCKETS >>> 6];
        int slots = 16;
        float[][] bins = new float[slots][n];
        for (int i = 64, slot = 0; i < n && slot < slots; i += 4) {
            if (v[i] == v[i]) {
                int bucket = Selection.bucket(v[i]);
                slotOfBucket[bucket] = slot++;
                wanted[bucket >>> 6] |= 1L << bucket;
            }
        }
        double last = 0;
        for (int round = 0; round < rounds && !stopped.getAsBoolean(); round++) {
            int[] fill = new int[slots];
            for (int w = 0; w < area.length; w++) {
                int from = w << 6;
                int end = Math.min(n, from + 64);
                int[] c = EvaluatedArea.block(from, end, v, m, area, status, lifetimeFloor, out);
                int counted = gather(v, out, from, end, scratch, buckets);
                MapStatistics.Part p = MapStatistics.Part.ofValues(scratch, 0, counted, thresholds);
                double reciprocal = reciprocalSum(0, v, out, w, w + 1);
                gatherBins(v, out, w, w + 1, wanted, slotOfBucket, fill, bins);
                last = c[0] + p.mean + reciprocal + bins[0][0];
            }
        }
        return last;
    }

    /** The work of one chunk, with a scratch array of {@link Mask#BLOCK_PX} values of the thread running it. */
    private interface ChunkBody {
        void run(int chunk, float[] scratch);
    }

    /** Adds the terms of one chunk, in index order, to the sum of the chunks before it. */
    private interface Summand {
        double add(int chunk, double sum);
    }

    /**
     * A sum over chunks added in chunk order by whichever thread finds the next chunk done: the very sum one thread
     * would add in index order, made while the other chunks are worked on.
     */
    private static final class OrderedSum {
        private final AtomicIntegerArray done;
        private final java.util.concurrent.atomic.AtomicBoolean adding =
                new java.util.concurrent.atomic.AtomicBoolean();
        /** Chunks added so far and their sum (read and written by the thread holding {@link #adding} only). */
        private int added;
        private double sum;

        OrderedSum(int chunks) {
            done = new AtomicIntegerArray(chunks);
        }

        /** Marks {@code chunk} done, then adds every done chunk that is next in order, unless another thread does. */
        void done(int chunk, Summand summand) {
            done.set(chunk, 1);
            while (adding.compareAndSet(false, true)) {
                try {
                    while (added < done.length() && done.get(added) == 1) {
                        sum = summand.add(added, sum);
                        added++;
                    }
                } finally {
                    adding.set(false);
                }
                // a chunk marked done after the check above by a thread that found the flag taken is added now
                if (added >= done.length() || done.get(added) == 0) {
                    return;
                }
            }
        }
    }

    /**
     * Runs {@code body} for every chunk, handed out in index order to the calling thread and the workers of its
     * fork-join pool (the common pool outside one), each chunk then marked done in {@code ordered}; returns when
     * every chunk is done and added. Small work runs on the calling thread only.
     */
    private static void runInOrder(int chunks, long items, ChunkBody body, OrderedSum ordered, Summand summand) {
        AtomicInteger next = new AtomicInteger();
        CountDownLatch left = new CountDownLatch(chunks);
        java.util.concurrent.atomic.AtomicReference<Throwable> failure =
                new java.util.concurrent.atomic.AtomicReference<>();
        Runnable worker = () -> {
            float[] scratch = null;
            for (int c; (c = next.getAndIncrement()) < chunks; ) {
                try {
                    if (failure.get() == null) {
                        if (scratch == null) {
                            scratch = new float[Mask.BLOCK_PX];
                        }
                        body.run(c, scratch);
                        ordered.done(c, summand);
                    }
                } catch (RuntimeException | Error e) {
                    failure.compareAndSet(null, e);
                } finally {
                    left.countDown();
                }
            }
        };
        if (chunks > 1 && items >= Blocks.PARALLEL_FROM) {
            ForkJoinPool pool = ForkJoinTask.inForkJoinPool() ? ForkJoinTask.getPool() : ForkJoinPool.commonPool();
            for (int k = Math.min(pool.getParallelism(), chunks - 1); k > 0; k--) {
                pool.execute(worker);
            }
        }
        worker.run();
        try {
            left.await();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("interrupted while the statistics were summed", e);
        }
        Throwable t = failure.get();
        if (t instanceof RuntimeException r) {
            throw r;
        }
        if (t instanceof Error r) {
            throw r;
        }
    }

    /**
     * Adds 1/x of the positive values of the mask words [wordFrom, wordTo) to {@code sum}, in index order (one chunk
     * of the sum of {@link MapStatistics#of}).
     */
    static double reciprocalSum(double sum, float[] s, long[] words, int wordFrom, int wordTo) {
        for (int wi = wordFrom; wi < wordTo; wi++) {
            long word = words[wi];
            int base = wi << 6;
            if (word == -1L) {
                for (int i = base; i < base + 64; i++) {
                    float f = s[i];
                    if (f > 0) {
                        sum += 1 / (double) f;
                    }
                }
            } else {
                for (; word != 0; word &= word - 1) {
                    float f = s[base + Long.numberOfTrailingZeros(word)];
                    if (f > 0) {
                        sum += 1 / (double) f;
                    }
                }
            }
        }
        return sum;
    }

    /**
     * Copies the values of the pixels [from, end) in the mask {@code words} (none NaN) to out[0..], in index order,
     * adds the percentile bucket of each to {@code buckets}, and returns their count.
     */
    static int gather(float[] s, long[] words, int from, int end, float[] out, int[] buckets) {
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
            if (sums.n == 0) {
                estimates = MapStatistics.Ranks.none(wanted);
            } else {
                MapStatistics.Ranks ranks = MapStatistics.Ranks.of(sums.n, wanted);
                Selection.Plan plan = sums.n <= Selection.DIRECT ? null
                        : Selection.Plan.of(Selection.sum(chunkCounts), sums.n, ranks.ranks);
                if (plan == null || plan.inPlace) {
                    // as MapStatistics.of: all counted values in index order, sorted or selected among in place
                    estimates = ranks.estimates(Selection.ranks(gatherAll(sums.n), sums.n, ranks.ranks));
                } else {
                    // the values of the wanted buckets into their bins, each chunk into its own stretch of every bin
                    // (the chunks before it fill the stretches before): index order on any number of threads
                    float[][] bins = plan.bins();
                    int[][] fillOfChunk = plan.fills(chunkCounts);
                    long[] gathered = gatheredBuckets(plan);
                    int chunkWords = CHUNK_BLOCKS * Mask.BLOCK_PX >>> 6;
                    Blocks.run(chunkCounts.length, values.length, c -> gatherBins(values, words, c * chunkWords,
                            Math.min(words.length, (c + 1) * chunkWords), gathered, plan.slotOfBucket,
                            fillOfChunk[c], bins));
                    estimates = ranks.estimates(plan.select(bins, ranks.ranks));
                }
            }
            statistics = MapStatistics.of(sums, reciprocalSum, estimates, request, thresholds, pixelAreaMm2);
        }
        return statistics;
    }

    /** Which buckets {@code plan} gathers, one bit each (8 KB: the test of a value stays in the first-level cache). */
    static long[] gatheredBuckets(Selection.Plan plan) {
        long[] wanted = new long[Selection.BUCKETS >>> 6];
        for (int bucket : plan.bucketOfSlot) {
            wanted[bucket >>> 6] |= 1L << bucket;
        }
        return wanted;
    }

    /**
     * Appends the values of the mask words [wordFrom, wordTo) whose bucket is in {@code wanted} to the bins of their
     * slots, from {@code fill} on (advanced), in index order.
     */
    static void gatherBins(float[] values, long[] words, int wordFrom, int wordTo, long[] wanted,
                           int[] slotOfBucket, int[] fill, float[][] bins) {
        for (int wi = wordFrom; wi < wordTo; wi++) {
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
