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
    /**
     * Up to this many values the callers that count the buckets themselves skip the bucket tables and call
     * {@link #ranks}.
     */
    static final int DIRECT = 1 << 12;
    /**
     * Up to this many values the ranks are selected in place ({@link #inPlace}) without bucket tables: a few passes
     * over the values cost less than the tables' 65 536 counts (a region's values, a small map).
     */
    static final int IN_PLACE = 1 << 16;
    /** Values per chunk of the parallel counting and gathering passes. */
    private static final int CHUNK = 1 << 20;

    private Selection() {
    }

    /**
     * The values of ranks {@code ranks} (0-based, ascending, each &lt; n) among values[0..n), NaN-free.
     *
     * <p>Up to {@link #IN_PLACE} values the ranks are selected in place (reordering {@code values}). Beyond, one
     * pass sorts the values into 65 536 buckets by the top 16 bits of their order-preserving integer key (sign,
     * exponent and seven mantissa bits), a second gathers only the buckets that hold a wanted rank, and the ranks are
     * selected within those few. When the wanted buckets hold a large share of the data (a nearly constant map) the
     * ranks are selected in place instead, which reorders {@code values}. Every way gives the values a sort
     * ({@link Arrays#sort(float[])}) would put at those ranks, bit for bit.
     */
    static double[] ranks(float[] values, int n, int[] ranks) {
        if (n <= IN_PLACE) {
            // up to tens of thousands of values: a selection costs less than a sort or the bucket tables
            return inPlace(values, n, ranks);
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
        Plan plan = Plan.of(chunks == 1 ? chunkCount[0] : sum(chunkCount), n, ranks);
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

    /**
     * The values of ranks {@code ranks} (ascending) selected among all of values[0..n) in place (reordering them). The
     * selection compares with &lt;, to which -0 and +0 are equal: a zero at a rank is given the sign a sort gives it
     * (the negative zeros come first) from a count of the negative values and zeros.
     */
    static double[] inPlace(float[] values, int n, int[] ranks) {
        double[] out = new double[ranks.length];
        int from = 0;
        int below = -1; // the values a sort puts before +0 (counted at the first zero rank)
        for (int r = 0; r < ranks.length; r++) {
            float v = select(values, from, n - 1, ranks[r]);
            if (v == 0) {
                if (below < 0) {
                    below = signedBelowZero(values, n);
                }
                v = ranks[r] < below ? -0f : 0f;
            }
            out[r] = v;
            from = ranks[r];
        }
        return out;
    }

    /** How many of values[0..n) a sort puts before +0: the negative ones and -0 (the zeros' signs by rank). */
    private static int signedBelowZero(float[] values, int n) {
        int below = 0;
        for (int i = 0; i < n; i++) {
            below += Float.floatToRawIntBits(values[i]) < 0 ? 1 : 0;
        }
        return below;
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
                // (the walk over the buckets is a small method of its own, compiled once for every sample)
                long at = walk(count, b, start, ranks[r]);
                b = (int) (at >>> 32);
                start = (int) at;
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

        /**
         * The bucket holding sorted index {@code rank}, walking on from bucket b that starts at sorted index
         * {@code start} (at most rank): that bucket in the upper 32 bits, its first sorted index in the lower.
         */
        private static long walk(int[] count, int b, int start, int rank) {
            while (start + count[b] <= rank) {
                start += count[b++];
            }
            return (long) b << 32 | start;
        }

        /**
         * The slot of each float's top 16 bits as they are ({@link #rawTop}), -1 for those of a bucket not gathered;
         * null when there are more slots than a byte holds.
         */
        byte[] slotOfRawTop() {
            if (bucketOfSlot.length > Byte.MAX_VALUE) {
                return null;
            }
            byte[] slots = new byte[BUCKETS];
            Arrays.fill(slots, (byte) -1);
            for (int slot = 0; slot < bucketOfSlot.length; slot++) {
                slots[rawTop(bucketOfSlot[slot])] = (byte) slot;
            }
            return slots;
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

    /**
     * The top 16 bits as they are (unsigned) of the floats of bucket {@code b}: every float with those top bits is in
     * that bucket ({@link #bucket} flips the lower 31 bits of a negative float, which maps its top 16 bits one to one).
     */
    static int rawTop(int b) {
        int top = b - (BUCKETS >> 1); // the key's top 16 bits, signed
        return (top >= 0 ? top : top ^ 0x7fff) & 0xffff;
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
        // (one way out of the loop for every case, and the rare case of k between the two parts without a branch of
        // its own: the compiled code then has no branch that a later sample might take for the first time, which
        // would stop it and have it compiled again)
        int rounds = 0;
        while (hi - lo >= SMALL) {
            if (++rounds > 64) {
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
            } else {
                // k ≥ i: the part from i on; j < k < i: a[k] already in place (equal to the pivot), lo = hi = k
                int between = (k - i) >> 31; // -1 when k < i, else 0
                lo = (k & between) | (i & ~between);
                hi = (k & between) | (hi & ~between);
            }
        }
        insertionSort(a, lo, hi);
        return a[k];
    }

    /**
     * Sorts a[lo..hi] (inclusive, a few values) by &lt; (equal values, such as -0 and +0, keep their order): the
     * small ranges of {@link #select}, without the library sort's set-up for NaN and zeros.
     */
    private static void insertionSort(float[] a, int lo, int hi) {
        for (int i = lo + 1; i <= hi; i++) {
            float v = a[i];
            int j = i - 1;
            while (j >= lo && v < a[j]) {
                a[j + 1] = a[j];
                j--;
            }
            a[j + 1] = v;
        }
    }

    private static float median(float a, float b, float c) {
        return Math.max(Math.min(a, b), Math.min(Math.max(a, b), c));
    }
}
