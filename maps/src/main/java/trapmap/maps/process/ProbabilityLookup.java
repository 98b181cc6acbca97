package trapmap.maps.process;

import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.uncertainty.ExceedanceModel;

/**
 * {@link ExceedanceModel#probability(float)} for every float lifetime, with the same values, from a bucket table
 * instead of a binary search over all S threshold lifetimes. Immutable and thread-safe.
 * <p>
 * The probability of a pixel measured at τ is #{s : τ*_s &gt; τ}/S, i.e. (S − u(τ))/S with u(τ) the first index of
 * the ascending τ*_s above τ. The bit patterns of positive floats are ordered as their values, so the floats between
 * the smallest and the largest τ*_s are cut into at most {@value #MAX_BUCKETS} buckets of 2^shift consecutive bit
 * patterns; for each bucket u is stored at its first float. A pixel's u then lies between its bucket's entry and the
 * next bucket's (u never decreases as τ rises), and the
 * search runs over only the thresholds inside its bucket (none for most buckets: S = 10⁴ thresholds fall into about
 * 32 000 buckets). A table of the S + 1 possible shares spares the division per pixel. Every comparison is the model's own (double τ against double τ*_s), so the count is exact.
 */
final class ProbabilityLookup {
    /** Most buckets of a table (one int array of this length: 256 KiB). */
    static final int MAX_BUCKETS = 1 << 16;

    private final double[] sorted;
    private final int base;
    private final int shift;
    /** u at the first float of each bucket, and one more: u of the bucket's last float is at most the next entry. */
    private final int[] from;
    private final double first;
    private final double last;
    /** (float) ((S − u)/S) for each u = 0 … S: the map's value without a division per pixel. */
    private final float[] share;

    ProbabilityLookup(double[] sortedThresholdsUs) {
        int s = sortedThresholdsUs.length;
        // one +∞ after the thresholds: the last step of a search reads the entry at u, which may be S
        this.sorted = java.util.Arrays.copyOf(sortedThresholdsUs, s + 1);
        sorted[s] = Double.POSITIVE_INFINITY;
        first = sorted[0];
        last = sorted[s - 1];
        float lo = (float) first;
        if (lo > first) {
            lo = Math.nextDown(lo);
        }
        float hi = (float) last;
        if (hi < last) {
            hi = Math.nextUp(hi);
        }
        base = Float.floatToRawIntBits(Math.max(lo, Float.MIN_VALUE));
        int top = Float.floatToRawIntBits(hi);
        long span = (long) top - base + 1;
        int sh = 0;
        while ((span >> sh) >= MAX_BUCKETS) {
            sh++;
        }
        shift = sh;
        int buckets = (int) ((span - 1) >> sh) + 1;
        share = new float[s + 1];
        for (int u = 0; u <= s; u++) {
            share[u] = (float) ((double) (s - u) / s);
        }
        from = new int[buckets + 1];
        for (int k = 0; k < buckets; k++) {
            from[k] = upper(Float.intBitsToFloat((int) (base + ((long) k << sh))), 0, s);
        }
        from[buckets] = s;
    }

    /** The first index in [lo, hi) of the sorted thresholds above {@code tau} (hi when none). */
    private int upper(double tau, int lo, int hi) {
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (sorted[mid] > tau) {
                hi = mid;
            } else {
                lo = mid + 1;
            }
        }
        return lo;
    }

    /** The model's probability of a pixel measured at {@code tauUs} µs; NaN where the conversion does not convert. */
    double probability(float tauUs) {
        double t = tauUs;
        if (!(t >= TrapDensityConverter.LIFETIME_FLOOR_US) || t == Double.POSITIVE_INFINITY) {
            return Double.NaN;
        }
        int s = sorted.length - 1;
        int u;
        if (t < first) {
            u = 0;
        } else if (t >= last) {
            u = s;
        } else {
            int k = (Float.floatToRawIntBits(tauUs) - base) >>> shift;
            u = upper(t, from[k], from[k + 1]);
        }
        return (double) (s - u) / s;
    }

    /** {@link #probability(float)} as a float, from the table of shares (the same value as the double cast). */
    float probabilityAsFloat(float tauUs) {
        double t = tauUs;
        if (!(t >= TrapDensityConverter.LIFETIME_FLOOR_US) || t == Double.POSITIVE_INFINITY) {
            return Float.NaN;
        }
        if (t < first) {
            return share[0];
        }
        if (t >= last) {
            return share[sorted.length - 1];
        }
        int k = (Float.floatToRawIntBits(tauUs) - base) >>> shift;
        int lo = from[k];
        int hi = from[k + 1];
        // u lies in [lo, hi]; most buckets hold at most one threshold, so the loop is mostly skipped
        while (hi - lo > 1) {
            int mid = (lo + hi) >>> 1;
            if (sorted[mid] > t) {
                hi = mid;
            } else {
                lo = mid + 1;
            }
        }
        // hi − lo ≤ 1: u = lo exactly when the threshold at lo (+∞ at S) lies above τ
        return share[sorted[lo] > t ? lo : lo + 1];
    }
}
