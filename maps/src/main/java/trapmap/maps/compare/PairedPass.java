package trapmap.maps.compare;

import java.util.Arrays;
import java.util.stream.IntStream;
import org.apache.commons.math3.util.KthSelector;
import trapmap.maps.model.Quantity;
import trapmap.maps.raster.Mask;

/**
 * The paired statistics of a before and an after raster on one grid, taken in parallel over fixed blocks of pixels,
 * without a copy of the paired values. Sums are taken per block and added in block order, so the figures do not
 * depend on the number of threads. The medians are exact order statistics. A sample of every
 * {@link #SAMPLE_STRIDE}-th pixel brackets each middle; the pass that adds the sums gathers the values inside the
 * brackets and counts those below, and the middle values are selected among the gathered ones (Commons Math
 * {@link KthSelector}). Where a bracket misses the middle or holds too many values, each value is mapped to a
 * 64-bit key that sorts as the value does, and a histogram of 2^16 bins (whole counts, exact in any order) narrows
 * the key range that holds the middle by 16 bits per further pass until few values are left to gather. The values
 * are those the straightforward way (copy, {@link KthSelector}) selects; a median of zeros is always +0.0.
 */
final class PairedPass {
    /** Pixels per block: the unit of work of a thread and of the ordered sums. */
    private static final int BLOCK = 1 << 16;
    private static final int BITS = 16;
    private static final int BINS = 1 << BITS;
    /** Values left in range below which they are gathered and selected rather than narrowed further. */
    private static final int GATHER = 1 << 15;
    /** Pixels between two of the sample that brackets the medians. */
    private static final int SAMPLE_STRIDE = 251;
    /** Least sample that brackets a median; smaller ones are not tried. */
    private static final int MIN_SAMPLE = 400;
    /** Half-width of a bracket in standard deviations of the sample's middle rank (√m / 2 for m values). */
    private static final double MARGIN_SIGMAS = 5;
    /** Most values one thread gathers for a bracket before the bracket is dropped. */
    private static final int MAX_GATHERED = 1 << 20;
    /** Size of the pivot cache of {@link KthSelector} (as Commons Math's {@code Percentile} uses). */
    private static final int PIVOTS_HEAP = 0x1FF;

    /** The paired statistics and the overlap (pixels with data before whose after sample is not NaN). */
    record Result(PairedStatistics statistics, int overlap) {
    }

    private PairedPass() {
    }

    /**
     * The statistics of {@link MapComparison#statistics(trapmap.maps.model.WaferMap, trapmap.maps.model.WaferMap,
     * Mask, double, Improvement)} for the samples {@code b} (before) and {@code a} (after) of one grid; the arguments
     * are checked by the caller.
     */
    static Result run(Quantity quantity, float[] b, float[] a, Mask region, double relativeTolerance,
                      Improvement improvement, boolean density) {
        return run(quantity, b, a, region, relativeTolerance, improvement, density, true);
    }

    /**
     * As {@link #run(Quantity, float[], float[], Mask, double, Improvement, boolean)}; with {@code bracket} false
     * the medians are narrowed from the whole key range without first trying a bracket from a sample.
     */
    static Result run(Quantity quantity, float[] b, float[] a, Mask region, double relativeTolerance,
                      Improvement improvement, boolean density, boolean bracket) {
        int blocks = (b.length + BLOCK - 1) / BLOCK;
        double[] sums = new double[4 * blocks];
        int[] counts = new int[5 * blocks];
        boolean higherIsBetter = improvement == Improvement.HIGHER_IS_BETTER;
        Target difference = new Target();
        Target ratio = new Target();
        if (bracket) {
            sample(b, a, region, difference, ratio);
        }
        Work first = IntStream.range(0, blocks).parallel().collect(() -> new Work(difference, ratio),
                (w, block) -> w.sums(b, a, region, block, relativeTolerance, higherIsBetter, sums, counts),
                Work::add);
        double sumDifference = 0;
        double sumRatio = 0;
        double sumInverseBefore = 0;
        double sumInverseAfter = 0;
        int n = 0;
        int np = 0;
        int improved = 0;
        int unchanged = 0;
        int overlap = 0;
        for (int k = 0; k < blocks; k++) {
            sumDifference += sums[4 * k];
            sumRatio += sums[4 * k + 1];
            sumInverseBefore += sums[4 * k + 2];
            sumInverseAfter += sums[4 * k + 3];
            n += counts[5 * k];
            np += counts[5 * k + 1];
            improved += counts[5 * k + 2];
            unchanged += counts[5 * k + 3];
            overlap += counts[5 * k + 4];
        }
        difference.start(n);
        ratio.start(np);
        first.differences.handTo(difference);
        first.ratios.handTo(ratio);
        while (!difference.done() || !ratio.done()) {
            Work w = IntStream.range(0, blocks).parallel().collect(() -> new Work(difference, ratio),
                    (x, block) -> x.values(b, a, region, block), Work::add);
            w.differences.handTo(difference);
            w.ratios.handTo(ratio);
        }
        double medianReduction = Double.NaN;
        if (density && np > 0) {
            // 1 − r falls as r rises: the middle reductions are 1 − the middle ratios, in turned order
            medianReduction = np % 2 == 1 ? 1 - ratio.upper : 0.5 * ((1 - ratio.upper) + (1 - ratio.lower));
        }
        double nan = Double.NaN;
        PairedStatistics s = new PairedStatistics(quantity, quantity.unit(), improvement, relativeTolerance, n,
                n == 0 ? nan : sumDifference / n, difference.median(), np,
                np == 0 ? nan : sumRatio / np, ratio.median(),
                np == 0 ? nan : np / sumInverseBefore, np == 0 ? nan : np / sumInverseAfter,
                np == 0 ? nan : improved / (double) np, np == 0 ? nan : unchanged / (double) np,
                np == 0 ? nan : (np - improved - unchanged) / (double) np,
                medianReduction);
        return new Result(s, overlap);
    }

    /**
     * Brackets the middle of the differences and of the ratios by the values of a sample of every
     * {@link #SAMPLE_STRIDE}-th pixel: the sample's middle ± {@link #MARGIN_SIGMAS} standard deviations of a
     * sample's middle rank. The first pass then gathers the values in the brackets (a bracket that misses the middle
     * or holds too many values is dropped and the middle narrowed from the whole range).
     */
    private static void sample(float[] b, float[] a, Mask region, Target difference, Target ratio) {
        int m = (b.length + SAMPLE_STRIDE - 1) / SAMPLE_STRIDE;
        double[] d = new double[m];
        double[] r = new double[m];
        int nd = 0;
        int nr = 0;
        for (int i = 0; i < b.length; i += SAMPLE_STRIDE) {
            double vb = b[i];
            double va = a[i];
            if (paired(vb, va, region, i)) {
                d[nd++] = va - vb;
                if (vb > 0 && va > 0) {
                    r[nr++] = va / vb;
                }
            }
        }
        difference.bracket(d, nd);
        ratio.bracket(r, nr);
    }

    /** Commons Math's selection (expected linear time), as {@code Percentile} uses it. */
    private static KthSelector selector() {
        return new KthSelector();
    }

    /** A fresh pivot cache for {@link #selector()}. */
    private static int[] pivots() {
        int[] p = new int[PIVOTS_HEAP];
        Arrays.fill(p, -1);
        return p;
    }

    private static double[] trimmed(double[] v, int n) {
        return v == null ? null : Arrays.copyOf(v, n);
    }

    /** A key that sorts as {@code v} does (signed), with −0.0 taken as +0.0; not for NaN. */
    static long key(double v) {
        long bits = Double.doubleToRawLongBits(v + 0.0);
        return bits ^ ((bits >> 63) >>> 1);
    }

    /** The value of a {@link #key}. */
    static double value(long key) {
        return Double.longBitsToDouble(key ^ ((key >> 63) >>> 1));
    }

    /** What the passes do for one kind of value (differences or ratios): narrow, gather, or nothing more. */
    private static final class Target {
        private enum State { HISTOGRAM, GATHER, DONE }

        State state = State.HISTOGRAM;
        int count;
        /** Rank of the upper middle value, count / 2. */
        int rank;
        /** Lowest key of the range. */
        long lo = Long.MIN_VALUE;
        /** Highest key of the range. */
        long hi = Long.MAX_VALUE;
        /** Bins of a histogram are 2^shift keys wide; the range lies within 2^(shift + BITS) keys from lo. */
        int shift = 64 - BITS;
        /** True while the range is a bracket from a sample, whose values below are counted in the pass. */
        boolean bracketed;
        /** Values with keys below the range. */
        int below;
        /** Values in the range. */
        int inRange;
        double upper = Double.NaN;
        double lower = Double.NaN;
        /** The only key of the range, once it is down to one; else unused. */
        boolean single;

        void start(int n) {
            count = n;
            rank = n / 2;
            if (!bracketed) {
                inRange = n;
            }
            if (n == 0) {
                state = State.DONE;
            }
        }

        /** Makes the range a bracket around the middle of the first {@code m} values of {@code sample}. */
        void bracket(double[] sample, int m) {
            if (m < MIN_SAMPLE) {
                return;
            }
            int margin = (int) Math.ceil(MARGIN_SIGMAS * Math.sqrt(m) / 2) + 1;
            double[] w = Arrays.copyOf(sample, m);
            KthSelector selector = selector();
            int[] pivots = pivots();
            lo = key(selector.select(w, pivots, Math.max(0, m / 2 - margin)));
            hi = key(selector.select(w, pivots, Math.min(m - 1, m / 2 + margin)));
            bracketed = true;
            state = State.GATHER;
            // A bracket of one value (ties, e.g. every difference 0): its values are counted, not gathered (they
            // would overflow the gathering and cost a pass over the pixels for each 16 bits of the key).
            single = lo == hi;
            if (single) {
                upper = value(lo);
            }
        }

        /** Back to narrowing from the whole key range (a bracket that missed or overflowed). */
        private void whole() {
            lo = Long.MIN_VALUE;
            hi = Long.MAX_VALUE;
            shift = 64 - BITS;
            below = 0;
            inRange = count;
            bracketed = false;
            single = false;
            state = count == 0 ? State.DONE : State.HISTOGRAM;
        }

        boolean done() {
            return state == State.DONE;
        }

        /** The bin of {@code key} in the current range, or −1. */
        int bin(long key) {
            return key >= lo && key <= hi ? (int) ((key - lo) >>> shift) : -1;
        }

        /** True when {@code key} lies in the current range. */
        boolean inRange(long key) {
            return key >= lo && key <= hi;
        }

        double median() {
            return count == 0 ? Double.NaN : count % 2 == 1 ? upper : 0.5 * (lower + upper);
        }

        /** Narrows the range to the bin of {@code hist} that holds the upper middle rank. */
        void narrow(int[] hist) {
            if (state != State.HISTOGRAM) {
                return;
            }
            int r = rank - below;
            int cum = 0;
            int bin = 0;
            while (cum + hist[bin] <= r) {
                cum += hist[bin];
                bin++;
            }
            below += cum;
            lo += (long) bin << shift;
            hi = lo + ((1L << shift) - 1);
            inRange = hist[bin];
            if (shift == 0) {
                single = true;
                upper = value(lo);
                boolean needLower = count % 2 == 0 && rank - 1 < below;
                if (count % 2 == 0 && !needLower) {
                    lower = upper;
                }
                state = needLower ? State.GATHER : State.DONE;
                return;
            }
            shift -= BITS;
            if (inRange <= GATHER) {
                state = State.GATHER;
            }
        }

        /**
         * Takes in a pass's histogram, or its gathered values (for a range of one key, the count of that key) and
         * the largest key below the range.
         */
        void after(int[] hist, double[] gathered, int counted, long largestBelow, int countedBelow,
                   boolean overflow) {
            if (state == State.HISTOGRAM) {
                narrow(hist);
            } else if (state == State.GATHER) {
                if (bracketed) {
                    below = countedBelow;
                    int inBracket = single ? counted : gathered.length;
                    if (overflow || rank < below || rank >= below + inBracket) {
                        whole();
                        return;
                    }
                }
                KthSelector selector = selector();
                int[] pivots = pivots();
                if (!single) {
                    upper = selector.select(gathered, pivots, rank - below);
                }
                if (count % 2 == 0) {
                    lower = rank - 1 >= below ? (single ? upper : selector.select(gathered, pivots, rank - 1 - below))
                            : value(largestBelow);
                }
                state = State.DONE;
            }
        }
    }

    /**
     * One thread's share of a pass for one target: its histogram, or the values gathered in its range with the
     * largest key below the range and the count below it.
     */
    private static final class Share {
        final Target target;
        int[] hist;
        double[] gathered;
        int n;
        /** Values with the key of a range of one key. */
        int atKey;
        long below = Long.MIN_VALUE;
        int countBelow;
        boolean overflow;

        Share(Target target) {
            this.target = target;
            if (target.state == Target.State.HISTOGRAM) {
                hist = new int[BINS];
            }
            if (target.state == Target.State.GATHER && !target.single) {
                gathered = new double[64];
            }
        }

        void take(Target.State s, long key) {
            if (s == Target.State.HISTOGRAM) {
                int bin = target.bin(key);
                if (bin >= 0) {
                    hist[bin]++;
                }
                return;
            }
            if (key < target.lo) {
                below = larger(below, key);
                countBelow++;
            } else if (target.single) {
                if (key == target.lo) {
                    atKey++;
                }
            } else if (target.inRange(key) && !overflow) {
                if (n == MAX_GATHERED) {
                    overflow = true;
                    return;
                }
                if (n == gathered.length) {
                    gathered = Arrays.copyOf(gathered, 2 * n);
                }
                gathered[n++] = value(key);
            }
        }

        /** Adds another thread's share (whole counts and a set of values: the same in any order). */
        void add(Share o) {
            if (hist != null) {
                for (int i = 0; i < BINS; i++) {
                    hist[i] += o.hist[i];
                }
            }
            if (gathered != null) {
                double[] all = Arrays.copyOf(gathered, Math.max(n + o.n, 1));
                System.arraycopy(o.gathered, 0, all, n, o.n);
                gathered = all;
                n += o.n;
            }
            atKey += o.atKey;
            below = Math.max(below, o.below);
            countBelow += o.countBelow;
            overflow |= o.overflow;
        }

        /** Gives the pass's findings to the target, which narrows its range or picks its middle values. */
        void handTo(Target t) {
            t.after(hist, trimmed(gathered, n), atKey, below, countBelow, overflow);
        }
    }

    /** One thread's share of a pass: one {@link Share} for the differences, one for the ratios. */
    private static final class Work {
        final Target difference;
        final Target ratio;
        final Share differences;
        final Share ratios;

        Work(Target difference, Target ratio) {
            this.difference = difference;
            this.ratio = ratio;
            this.differences = new Share(difference);
            this.ratios = new Share(ratio);
        }

    /** The sums of one block (into the shared arrays at the block's place) and the first histograms. */
        void sums(float[] b, float[] a, Mask region, int block, double relativeTolerance, boolean higherIsBetter,
                  double[] sums, int[] counts) {
            int from = block * BLOCK;
            int to = Math.min(b.length, from + BLOCK);
            double sumDifference = 0;
            double sumRatio = 0;
            double sumInverseBefore = 0;
            double sumInverseAfter = 0;
            int n = 0;
            int np = 0;
            int improved = 0;
            int unchanged = 0;
            int overlap = 0;
            Target.State sd = difference.state;
            Target.State sr = ratio.state;
            int better = higherIsBetter ? 1 : 0;
            for (int i = from; i < to; i++) {
                double vb = b[i];
                double va = a[i];
                if (Double.isFinite(vb) && !Double.isNaN(va) && (region == null || region.containsIndex(i))) {
                    overlap++;
                }
                if (!paired(vb, va, region, i)) {
                    continue;
                }
                double d = va - vb;
                n++;
                sumDifference += d;
                differences.take(sd, key(d));
                if (vb > 0 && va > 0) {
                    double r = va / vb;
                    np++;
                    sumRatio += r;
                    sumInverseBefore += 1 / vb;
                    sumInverseAfter += 1 / va;
                    ratios.take(sr, key(r));
                    double change = d / vb;
                    // Counted without branches (whether a pixel changed depends on the data, and a branch the
                    // compiled loop had not seen taken would be a trap that has it compiled again): change is not
                    // NaN (finite values, vb > 0), so |change| <= tolerance exactly when tolerance - |change| has its
                    // sign bit clear, and change > 0 exactly when 0 - change has it set.
                    int same = 1 - signBit(relativeTolerance - Math.abs(change));
                    int up = signBit(0.0 - change);
                    unchanged += same;
                    improved += (1 - same) & (1 - (up ^ better));
                }
            }
            sums[4 * block] = sumDifference;
            sums[4 * block + 1] = sumRatio;
            sums[4 * block + 2] = sumInverseBefore;
            sums[4 * block + 3] = sumInverseAfter;
            counts[5 * block] = n;
            counts[5 * block + 1] = np;
            counts[5 * block + 2] = improved;
            counts[5 * block + 3] = unchanged;
            counts[5 * block + 4] = overlap;
        }

        /** The histograms, or the gathered values, of one block for the targets not done. */
        void values(float[] b, float[] a, Mask region, int block) {
            int from = block * BLOCK;
            int to = Math.min(b.length, from + BLOCK);
            Target.State sd = difference.state;
            Target.State sr = ratio.state;
            for (int i = from; i < to; i++) {
                double vb = b[i];
                double va = a[i];
                if (!paired(vb, va, region, i)) {
                    continue;
                }
                if (sd != Target.State.DONE) {
                    differences.take(sd, key(va - vb));
                }
                if (sr != Target.State.DONE && vb > 0 && va > 0) {
                    ratios.take(sr, key(va / vb));
                }
            }
        }

        /** Adds another thread's share. */
        void add(Work o) {
            differences.add(o.differences);
            ratios.add(o.ratios);
        }
    }

    /**
     * max(a, b) without a branch (which of the two is larger depends on the data, and a side the compiled pass
     * had not seen would be a trap): a &lt; b is the sign bit of (a − b) ⊕ ((a ⊕ b) &amp; ((a − b) ⊕ a)), the
     * difference's sign corrected for overflow (Warren, Hacker's Delight, 2nd ed., section 2-12).
     */
    static long larger(long a, long b) {
        long d = a - b;
        long aSmaller = (d ^ ((a ^ b) & (d ^ a))) >> 63; // all ones when a < b
        return a ^ ((a ^ b) & aSmaller);
    }

    /** 1 when {@code x} is negative or −0, else 0: its sign bit. */
    private static int signBit(double x) {
        return (int) (Double.doubleToRawLongBits(x) >>> 63);
    }

    /** True when pixel i has data in both maps and lies in the region (null: everywhere). */
    private static boolean paired(double vb, double va, Mask region, int i) {
        return Double.isFinite(vb) && Double.isFinite(va) && (region == null || region.containsIndex(i));
    }
}
