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
        if (n <= Selection.DIRECT) {
            return Selection.ranks(values, n, ranks);
        }
        long total = 0;
        for (int c : counts) {
            total += c;
        }
        if (total != n) {
            throw new IllegalStateException(total + " values counted in the buckets, " + n + " to rank");
        }
        Selection.Plan plan = Selection.Plan.of(counts, n, ranks);
        if (plan.inPlace) {
            return Selection.inPlace(values, n, ranks);
        }
        float[][] bins = plan.bins();
        gather(values, n, plan, bins);
        return plan.select(bins, ranks);
    }

    /**
     * The values of the buckets with a slot into the bins of their slots, in index order. A bucket is a function of
     * the float's top 16 bits as they are ({@link Selection#rawTop}): the slots are looked up by those in a byte table
     * (64 KiB), without the order-preserving key of every value, which made up a third of this pass.
     */
    private static void gather(float[] values, int n, Selection.Plan plan, float[][] bins) {
        byte[] slotOfTop = plan.slotOfRawTop();
        if (slotOfTop == null) { // more slots than a byte holds: by the keys
            int[] slotOfBucket = plan.slotOfBucket;
            int[] fill = new int[bins.length];
            for (int i = 0; i < n; i++) {
                float v = values[i];
                int slot = slotOfBucket[Selection.bucket(v)];
                if (slot >= 0) {
                    bins[slot][fill[slot]++] = v;
                }
            }
            return;
        }
        int[] fill = new int[bins.length];
        for (int i = 0; i < n; i++) {
            float v = values[i];
            int slot = slotOfTop[Float.floatToRawIntBits(v) >>> 16];
            if (slot >= 0) {
                bins[slot][fill[slot]++] = v;
            }
        }
    }
}
