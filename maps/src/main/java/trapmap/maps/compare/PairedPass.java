package trapmap.maps.compare;

import java.util.Arrays;
import java.util.stream.IntStream;
import trapmap.maps.model.Quantity;
import trapmap.maps.raster.Mask;

/**
 * The paired statistics of a before and an after raster on one grid, taken in parallel over fixed blocks of pixels,
 * without a copy of the paired values. Sums are taken per block and added in block order, so the figures do not
 * depend on the number of threads. The medians are exact order statistics: each value is mapped to a 64-bit key
 * that sorts as the value does, a histogram of 2^16 bins over the key range (whole counts, exact in any order)
 * narrows the range that holds the middle rank by 16 bits per pass over the maps, and the few values left in it are
 * gathered and sorted. The first histogram is taken in the pass that adds the sums. The values are those the
 * straightforward way (copy, {@link org.apache.commons.math3.util.KthSelector}) selects; a median of zeros is
 * always +0.0.
 */
final class PairedPass {
    /** Pixels per block: the unit of work of a thread and of the ordered sums. */
    private static final int BLOCK = 1 << 16;
    private static final int BITS = 16;
    private static final int BINS = 1 << BITS;
    /** Values left in range below which they are gathered and sorted rather than narrowed further. */
    private static final int GATHER = 1 << 15;

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
        int blocks = (b.length + BLOCK - 1) / BLOCK;
        double[] sums = new double[4 * blocks];
        int[] counts = new int[5 * blocks];
        boolean higherIsBetter = improvement == Improvement.HIGHER_IS_BETTER;
        Target difference = new Target();
        Target ratio = new Target();
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
        difference.narrow(first.histDifference);
        ratio.narrow(first.histRatio);
        while (!difference.done() || !ratio.done()) {
            Work w = IntStream.range(0, blocks).parallel().collect(() -> new Work(difference, ratio),
                    (x, block) -> x.values(b, a, region, block), Work::add);
            difference.after(w.histDifference, trimmed(w.gatheredDifference, w.nDifference), w.belowDifference);
            ratio.after(w.histRatio, trimmed(w.gatheredRatio, w.nRatio), w.belowRatio);
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
        /** Lowest key of the range; the range is [lo, lo + 2^(shift + BITS)). */
        long lo = Long.MIN_VALUE;
        int shift = 64 - BITS;
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
            inRange = n;
            if (n == 0) {
                state = State.DONE;
            }
        }

        boolean done() {
            return state == State.DONE;
        }

        /** The bin of {@code key} in the current range, or −1. */
        int bin(long key) {
            long k = (key - lo) >>> shift;
            return k >= 0 && k < BINS ? (int) k : -1;
        }

        /** True when {@code key} lies in the current range. */
        boolean inRange(long key) {
            return bin(key) >= 0;
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

        /** Takes in a pass's histogram, or its gathered values and the largest key below the range. */
        void after(int[] hist, double[] gathered, long largestBelow) {
            if (state == State.HISTOGRAM) {
                narrow(hist);
            } else if (state == State.GATHER) {
                if (!single) {
                    Arrays.sort(gathered);
                    upper = gathered[rank - below];
                }
                if (count % 2 == 0) {
                    lower = rank - 1 >= below ? (single ? upper : gathered[rank - 1 - below]) : value(largestBelow);
                }
                state = State.DONE;
            }
        }
    }

    /** One thread's share of a pass: histograms, gathered values, largest keys below the ranges. */
    private static final class Work {
        final Target difference;
        final Target ratio;
        int[] histDifference;
        int[] histRatio;
        double[] gatheredDifference;
        int nDifference;
        double[] gatheredRatio;
        int nRatio;
        long belowDifference = Long.MIN_VALUE;
        long belowRatio = Long.MIN_VALUE;

        Work(Target difference, Target ratio) {
            this.difference = difference;
            this.ratio = ratio;
            if (difference.state == Target.State.HISTOGRAM) {
                histDifference = new int[BINS];
            }
            if (ratio.state == Target.State.HISTOGRAM) {
                histRatio = new int[BINS];
            }
            if (difference.state == Target.State.GATHER && !difference.single) {
                gatheredDifference = new double[64];
            }
            if (ratio.state == Target.State.GATHER && !ratio.single) {
                gatheredRatio = new double[64];
            }
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
            int[] hd = histDifference;
            int[] hr = histRatio;
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
                hd[(int) ((key(d) - Long.MIN_VALUE) >>> (64 - BITS))]++;
                if (vb > 0 && va > 0) {
                    double r = va / vb;
                    np++;
                    sumRatio += r;
                    sumInverseBefore += 1 / vb;
                    sumInverseAfter += 1 / va;
                    hr[(int) ((key(r) - Long.MIN_VALUE) >>> (64 - BITS))]++;
                    double change = d / vb;
                    if (Math.abs(change) <= relativeTolerance) {
                        unchanged++;
                    } else if ((change > 0) == higherIsBetter) {
                        improved++;
                    }
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
                    take(difference, sd, key(va - vb), true);
                }
                if (sr != Target.State.DONE && vb > 0 && va > 0) {
                    take(ratio, sr, key(va / vb), false);
                }
            }
        }

        private void take(Target t, Target.State s, long key, boolean isDifference) {
            if (s == Target.State.HISTOGRAM) {
                int bin = t.bin(key);
                if (bin >= 0) {
                    (isDifference ? histDifference : histRatio)[bin]++;
                }
                return;
            }
            if (key < t.lo) {
                if (isDifference) {
                    belowDifference = Math.max(belowDifference, key);
                } else {
                    belowRatio = Math.max(belowRatio, key);
                }
            } else if (!t.single && t.inRange(key)) {
                if (isDifference) {
                    if (nDifference == gatheredDifference.length) {
                        gatheredDifference = Arrays.copyOf(gatheredDifference, 2 * nDifference);
                    }
                    gatheredDifference[nDifference++] = value(key);
                } else {
                    if (nRatio == gatheredRatio.length) {
                        gatheredRatio = Arrays.copyOf(gatheredRatio, 2 * nRatio);
                    }
                    gatheredRatio[nRatio++] = value(key);
                }
            }
        }

        /** Adds another thread's share (whole counts and a set of values: the same in any order). */
        void add(Work o) {
            if (histDifference != null) {
                for (int i = 0; i < BINS; i++) {
                    histDifference[i] += o.histDifference[i];
                }
            }
            if (histRatio != null) {
                for (int i = 0; i < BINS; i++) {
                    histRatio[i] += o.histRatio[i];
                }
            }
            if (gatheredDifference != null) {
                gatheredDifference = concat(gatheredDifference, nDifference, o.gatheredDifference, o.nDifference);
                nDifference += o.nDifference;
            }
            if (gatheredRatio != null) {
                gatheredRatio = concat(gatheredRatio, nRatio, o.gatheredRatio, o.nRatio);
                nRatio += o.nRatio;
            }
            belowDifference = Math.max(belowDifference, o.belowDifference);
            belowRatio = Math.max(belowRatio, o.belowRatio);
        }

        private static double[] concat(double[] x, int nx, double[] y, int ny) {
            double[] out = Arrays.copyOf(x, Math.max(nx + ny, 1));
            System.arraycopy(y, 0, out, nx, ny);
            return out;
        }
    }

    /** True when pixel i has data in both maps and lies in the region (null: everywhere). */
    private static boolean paired(double vb, double va, Mask region, int i) {
        return Double.isFinite(vb) && Double.isFinite(va) && (region == null || region.containsIndex(i));
    }
}
