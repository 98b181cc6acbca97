package trapmap.maps.stats;

import java.util.Arrays;

/**
 * The radix bucket counts of {@link Selection} (65 536 buckets by the top 16 bits of a float's order-preserving key),
 * filled by a caller's own pass over the values it visits anyway, so that percentiles of those values need only the
 * pass that gathers the few buckets holding the wanted ranks, not a counting pass of their own. Reused from map to
 * map by one thread; not thread-safe.
 *
 * <p>Use: {@code int[] c = buckets.cleared();} then {@code c[RankBuckets.bucket(v)]++} for every value v of the
 * sample (no NaN), then {@link MapStatistics#percentiles(float[], int, double[], RankBuckets)}.
 */
public final class RankBuckets {
    private final int[] counts = new int[Selection.BUCKETS];

    /** The counts, all zero, for a pass to count the values of one sample into. */
    public int[] cleared() {
        Arrays.fill(counts, 0);
        return counts;
    }

    /** The bucket of a value (not NaN): its index into the array of {@link #cleared()}. */
    public static int bucket(float v) {
        return Selection.bucket(v);
    }

    /**
     * As {@link Selection#ranks(float[], int, int[])} for values[0..n) whose buckets are counted here (exactly those
     * values): the same order statistics, from one gathering pass on the calling thread. May reorder {@code values}.
     *
     * @throws IllegalStateException when the counts do not add up to n
     */
    double[] ranks(float[] values, int n, int[] ranks) {
        if (n <= Selection.SORTED) {
            return Selection.ranks(values, n, ranks);
        }
        long total = 0;
        for (int c : counts) {
            total += c;
        }
        if (total != n) {
            throw new IllegalStateException(total + " values counted in the buckets, " + n + " to rank");
        }
        // the bucket of every wanted rank, and the sorted index its bucket starts at, by one walk over the counts
        int[] bucketOfRank = new int[ranks.length];
        int[] startOfRank = new int[ranks.length];
        int b = 0;
        int start = 0;
        for (int r = 0; r < ranks.length; r++) {
            while (start + counts[b] <= ranks[r]) {
                start += counts[b++];
            }
            bucketOfRank[r] = b;
            startOfRank[r] = start;
        }
        // the distinct buckets, ascending, each in a slot of its own
        int lo = bucketOfRank[0];
        int span = bucketOfRank[ranks.length - 1] - lo + 1;
        int[] slotOf = new int[span];
        Arrays.fill(slotOf, -1);
        int slots = 0;
        long gathered = 0;
        for (int r = 0; r < ranks.length; r++) {
            int d = bucketOfRank[r] - lo;
            if (slotOf[d] < 0) {
                slotOf[d] = slots++;
                gathered += counts[bucketOfRank[r]];
            }
        }
        double[] out = new double[ranks.length];
        if (gathered > Math.max(1 << 16, n / 4)) {
            // a nearly constant sample: selecting in place costs less than copying most of it
            int from = 0;
            for (int r = 0; r < ranks.length; r++) {
                out[r] = Selection.select(values, from, n - 1, ranks[r]);
                from = ranks[r];
            }
            return out;
        }
        float[][] bins = new float[slots][];
        for (int r = 0; r < ranks.length; r++) {
            int slot = slotOf[bucketOfRank[r] - lo];
            if (bins[slot] == null) {
                bins[slot] = new float[counts[bucketOfRank[r]]];
            }
        }
        gather(values, n, lo, slotOf, bins);
        // each wanted rank selected within its bucket, as Selection does (ascending ranks: a later one starts where
        // the last one ended)
        int[] from = new int[slots];
        for (int r = 0; r < ranks.length; r++) {
            int slot = slotOf[bucketOfRank[r] - lo];
            float[] bin = bins[slot];
            int k = ranks[r] - startOfRank[r];
            out[r] = Selection.select(bin, from[slot], bin.length - 1, k);
            from[slot] = k;
        }
        return out;
    }

    /** The values of the buckets lo + d with a slot (slotOf[d] ≥ 0) into the bins of their slots, in index order. */
    private static void gather(float[] values, int n, int lo, int[] slotOf, float[][] bins) {
        int span = slotOf.length;
        int[] fill = new int[bins.length];
        for (int i = 0; i < n; i++) {
            float v = values[i];
            int d = Selection.bucket(v) - lo;
            if (d >= 0 && d < span) {
                int slot = slotOf[d];
                if (slot >= 0) {
                    bins[slot][fill[slot]++] = v;
                }
            }
        }
    }
}
