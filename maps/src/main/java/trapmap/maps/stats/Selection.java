package trapmap.maps.stats;

import java.util.Arrays;
import trapmap.maps.raster.Blocks;

/**
 * Order statistics of float arrays without a full sort, for percentiles: a radix pre-pass and in-place selection
 * (Hoare partitioning with a median-of-three pivot).
 */
final class Selection {
    private static final int SMALL = 16;
    static final int BUCKETS = 1 << 16;
    /** Up to this many values are sorted outright. */
    static final int SORTED = 1 << 12;
    /** Values per chunk of the parallel counting and gathering passes. */
    private static final int CHUNK = 1 << 20;

    private Selection() {
    }

    /**
     * The values of ranks {@code ranks} (0-based, ascending, each &lt; n) among values[0..n), NaN-free.
     *
     * <p>Up to {@link #SORTED} values are sorted (reordering {@code values}). Beyond, one pass sorts the values into 65 536 buckets by the top 16 bits of their order-preserving integer key (sign,
     * exponent and seven mantissa bits), a second gathers only the buckets that hold a wanted rank, and the ranks are
     * selected within those few. When the wanted buckets hold a large share of the data (a nearly constant map) the ranks are selected in
     * place instead, which reorders {@code values}.
     */
    static double[] ranks(float[] values, int n, int[] ranks) {
        double[] out = new double[ranks.length];
        if (n <= SORTED) {
            // a few thousand values: a sort costs less than the bucket tables, and gives the same order
            Arrays.sort(values, 0, n);
            for (int r = 0; r < ranks.length; r++) {
                out[r] = values[ranks[r]];
            }
            return out;
        }
        // the bucket counts of fixed chunks on all cores, added up (integers: the same on any number of threads)
        int chunks = Blocks.count(n, CHUNK);
        int[][] chunkCount = new int[chunks][];
        Blocks.run(chunks, n, c -> {
            int[] cc = new int[BUCKETS];
            for (int i = c * CHUNK, end = Math.min(n, (c + 1) * CHUNK); i < end; i++) {
                cc[bucket(values[i])]++;
            }
            chunkCount[c] = cc;
        });
        // (the loops over the buckets are small methods of their own: this method runs once, and the just-in-time
        // compiler then compiles them quickly instead of compiling all of it on the stack)
        Plan plan = Plan.of(sum(chunkCount), n, ranks);
        if (plan.inPlace) {
            return inPlace(values, n, ranks);
        }
        float[][] bins = plan.bins();
        // each chunk gathers into its own stretch of every bin (the chunks before it fill the stretches before),
        // so the bins hold their values in index order however the chunks are run
        int[][] fillOfChunk = plan.fills(chunkCount);
        int[] slotOfBucket = plan.slotOfBucket;
        Blocks.run(chunks, n, c -> {
            int[] fill = fillOfChunk[c];
            for (int i = c * CHUNK, end = Math.min(n, (c + 1) * CHUNK); i < end; i++) {
                int slot = slotOfBucket[bucket(values[i])];
                if (slot >= 0) {
                    bins[slot][fill[slot]++] = values[i];
                }
            }
        });
        return plan.select(bins, ranks);
    }

    /** The values of ranks {@code ranks} (ascending) selected among all of values[0..n) in place (reordering them). */
    static double[] inPlace(float[] values, int n, int[] ranks) {
        double[] out = new double[ranks.length];
        int from = 0;
        for (int r = 0; r < ranks.length; r++) {
            out[r] = select(values, from, n - 1, ranks[r]);
            from = ranks[r];
        }
        return out;
    }

    /**
     * Which buckets hold the wanted ranks, and where: made from the bucket counts of all n values. When those buckets
     * hold a large share of the values ({@link #inPlace}), the ranks are better selected among all values in place.
     */
    static final class Plan {
        /** The first sorted index of the bucket of each wanted rank. */
        final int[] startOfRank;
        /** The slot (index among the gathered buckets) of each bucket, -1 for a bucket not gathered. */
        final int[] slotOfBucket;
        /** The bucket of each wanted rank. */
        final int[] bucketOfRank;
        /** The bucket of each slot. */
        final int[] bucketOfSlot;
        /** The count of each bucket. */
        final int[] count;
        /** True when the wanted buckets hold so many values that selecting among all of them in place is cheaper. */
        final boolean inPlace;

        private Plan(int[] count, int[] startOfRank, int[] slotOfBucket, int[] bucketOfRank, int[] bucketOfSlot,
                     boolean inPlace) {
            this.count = count;
            this.startOfRank = startOfRank;
            this.slotOfBucket = slotOfBucket;
            this.bucketOfRank = bucketOfRank;
            this.bucketOfSlot = bucketOfSlot;
            this.inPlace = inPlace;
        }

        /**
         * The plan for {@code ranks} (ascending, each &lt; n) from the count of every bucket ({@link #bucket}): one
         * walk over the counts up to the highest wanted rank.
         */
        static Plan of(int[] count, int n, int[] ranks) {
            int[] slotOfBucket = new int[BUCKETS];
            java.util.Arrays.fill(slotOfBucket, -1);
            int[] bucketOfRank = new int[ranks.length];
            int[] startOfRank = new int[ranks.length];
            int[] bucketOfSlot = new int[ranks.length];
            int slots = 0;
            long gathered = 0;
            int b = 0;
            int start = 0;
            for (int r = 0; r < ranks.length; r++) {
                while (start + count[b] <= ranks[r]) {
                    start += count[b++];
                }
                bucketOfRank[r] = b;
                startOfRank[r] = start;
                if (slotOfBucket[b] < 0) { // ascending ranks: the slots follow the buckets' order
                    bucketOfSlot[slots] = b;
                    slotOfBucket[b] = slots++;
                    gathered += count[b];
                }
            }
            return new Plan(count, startOfRank, slotOfBucket, bucketOfRank, Arrays.copyOf(bucketOfSlot, slots),
                    gathered > Math.max(1 << 16, n / 4));
        }

        /** An empty array for the values of every gathered bucket, by slot. */
        float[][] bins() {
            float[][] bins = new float[bucketOfSlot.length][];
            for (int slot = 0; slot < bins.length; slot++) {
                bins[slot] = new float[count[bucketOfSlot[slot]]];
            }
            return bins;
        }

        /**
         * Where each chunk of values starts writing into every bin, from the bucket counts of the chunks (in index
         * order): the chunks before it fill the stretches before.
         */
        int[][] fills(int[][] chunkCount) {
            int slots = bucketOfSlot.length;
            int[][] fillOfChunk = new int[chunkCount.length][slots];
            for (int c = 1; c < chunkCount.length; c++) {
                for (int slot = 0; slot < slots; slot++) {
                    fillOfChunk[c][slot] = fillOfChunk[c - 1][slot] + chunkCount[c - 1][bucketOfSlot[slot]];
                }
            }
            return fillOfChunk;
        }

        /**
         * The values of the wanted ranks from the gathered bins (reordered): each rank selected within its bucket
         * (ascending ranks, so a later one starts where the last ended). A bucket never holds both zeros (-0 and +0
         * have keys on either side of a bucket boundary), so comparing with &lt; orders it exactly as Arrays.sort
         * would.
         */
        double[] select(float[][] bins, int[] ranks) {
            double[] out = new double[ranks.length];
            int[] from = new int[bins.length];
            for (int r = 0; r < ranks.length; r++) {
                int slot = slotOfBucket[bucketOfRank[r]];
                float[] bin = bins[slot];
                int k = ranks[r] - startOfRank[r];
                out[r] = Selection.select(bin, from[slot], bin.length - 1, k);
                from[slot] = k;
            }
            return out;
        }
    }

    /** The bucket counts of all chunks added up. */
    static int[] sum(int[][] chunkCount) {
        int[] count = new int[BUCKETS];
        for (int[] cc : chunkCount) {
            for (int bb = 0; bb < BUCKETS; bb++) {
                count[bb] += cc[bb];
            }
        }
        return count;
    }

    /** Bucket of a float: the top 16 bits of its order-preserving key (negative values reversed, then offset). */
    static int bucket(float f) {
        int bits = Float.floatToRawIntBits(f);
        int key = bits ^ ((bits >> 31) & 0x7fffffff);
        return (key >> 16) + (BUCKETS >> 1);
    }

    /**
     * The k-th smallest value (0-based) of {@code a[lo..hi]} (inclusive). Afterwards a[lo..k) ≤ a[k] ≤ a(k..hi], so
     * a later call for a larger k may start at this k. Expected O(hi − lo); falls back to sorting the remaining range
     * if partitioning keeps going badly.
     */
    static float select(float[] a, int lo, int hi, int k) {
        int rounds = 0;
        while (hi > lo) {
            if (hi - lo < SMALL || ++rounds > 64) {
                Arrays.sort(a, lo, hi + 1);
                return a[k];
            }
            int mid = (lo + hi) >>> 1;
            float x = median(a[lo], a[mid], a[hi]);
            int i = lo;
            int j = hi;
            do {
                while (a[i] < x) {
                    i++;
                }
                while (x < a[j]) {
                    j--;
                }
                if (i <= j) {
                    float t = a[i];
                    a[i] = a[j];
                    a[j] = t;
                    i++;
                    j--;
                }
            } while (i <= j);
            if (k <= j) {
                hi = j;
            } else if (k >= i) {
                lo = i;
            } else {
                return a[k];
            }
        }
        return a[k];
    }

    private static float median(float a, float b, float c) {
        return Math.max(Math.min(a, b), Math.min(Math.max(a, b), c));
    }
}
