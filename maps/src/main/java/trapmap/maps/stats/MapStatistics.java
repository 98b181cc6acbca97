package trapmap.maps.stats;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.Blocks;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.check.Checks;

/**
 * Summary statistics of the samples of a map inside a mask. NaN pixels ("no data") are never counted.
 *
 * <p><b>Which average answers which question.</b> The arithmetic mean is what a photoconductance measurement of the
 * whole wafer reports under uniform generation with no lateral coupling (each region holds Δn_i = G·τ_i). A
 * finished cell is close to equipotential instead: Δn is about the same everywhere, the local recombination rate is
 * Δn/τ_i, and the cell behaves as if its lifetime were 1/⟨1/τ⟩, the <b>harmonic mean</b>. The harmonic mean is
 * dominated by the bad regions: a poor area cannot be compensated by a good one, which is why it ranks wafers by
 * device performance better than the arithmetic or geometric mean and is the default "device-relevant" average for
 * lifetime maps. The geometric mean (the mean of the logarithm) suits quantities that span decades, such as trap
 * densities, for which it is the centre of a log-scale histogram.
 *
 * <p><b>Non-positive values.</b> The harmonic and geometric means are defined for positive values only. Pixels ≤ 0
 * are left out of those two means and counted in {@link #nonPositiveCount()}; they still count everywhere else
 * (arithmetic mean, percentiles, extremes, area fractions). With no positive pixel both means are NaN.
 *
 * <p><b>Percentiles</b> are estimated by linear interpolation between order statistics, Hyndman and Fan's type 7
 * (the default of R, NumPy and spreadsheet PERCENTILE.INC; Commons Math {@code Percentile.EstimationType.R_7}):
 * with the n counted values sorted as x₀ ≤ … ≤ x_{n−1}, h = (n − 1)·p/100 and
 * P(p) = x_⌊h⌋ + (h − ⌊h⌋)·(x_⌊h⌋+1 − x_⌊h⌋). The median is P(50).
 *
 * <p><b>Cost.</b> One pass over the pixels gives count, mean and variance, extremes, the sums for
 * the harmonic and geometric means (Σ ln x as the logarithm of a rescaled running product) and the threshold counts,
 * while copying the counted values into one float array. The pass runs on all cores in fixed blocks of
 * {@link Mask#BLOCK_PX} pixels, each with a two-pass mean and sum of squared deviations, combined in block order
 * (the moments by the pairwise update of Chan, Golub and LeVeque), so the figures do not depend on the number of threads; Σ 1/x is added on one thread in index
 * order, as every face adds it; the percentiles then come from two more passes over that
 * array (a radix count, then gathering the few buckets that hold the wanted ranks), with no full sort. No boxing;
 * a 16-megapixel map needs one extra 64 MB float array.
 *
 * @param count             counted pixels (in the mask and not NaN)
 * @param areaMm2           their area, mm²
 * @param mean              arithmetic mean
 * @param harmonicMean      n₊ / Σ(1/x) over the n₊ positive values
 * @param geometricMean     exp(Σ ln x / n₊) over the positive values
 * @param nonPositiveCount  pixels ≤ 0, left out of the harmonic and geometric means
 * @param median            P(50)
 * @param min               smallest value
 * @param max               largest value
 * @param standardDeviation sample standard deviation (divisor n − 1); NaN for fewer than two pixels
 * @param percentiles       the requested percentiles, in the order asked
 * @param areaFractions     the requested thresholds with the fractions above and below, in the order asked
 */
public record MapStatistics(int count, double areaMm2, double mean, double harmonicMean, double geometricMean,
                            int nonPositiveCount, double median, double min, double max, double standardDeviation,
                            List<PercentileValue> percentiles, List<AreaFraction> areaFractions) {

    /**
     * A percentile.
     *
     * @param percent p in [0, 100]
     * @param value   P(p), type-7 estimate
     */
    public record PercentileValue(double percent, double value) {
    }

    /**
     * How much of the counted area lies strictly below and strictly above a threshold (pixels equal to it are in
     * neither).
     *
     * @param threshold     the threshold, in the unit of the map
     * @param countBelow    pixels with value &lt; threshold
     * @param countAbove    pixels with value &gt; threshold
     * @param fractionBelow countBelow / count
     * @param fractionAbove countAbove / count
     * @param areaBelowMm2  area below, mm²
     * @param areaAboveMm2  area above, mm²
     */
    public record AreaFraction(double threshold, int countBelow, int countAbove, double fractionBelow,
                               double fractionAbove, double areaBelowMm2, double areaAboveMm2) {
    }

    public MapStatistics {
        percentiles = List.copyOf(percentiles);
        areaFractions = List.copyOf(areaFractions);
    }

    /** Statistics of a map over {@code mask} (null: the whole map). */
    public static MapStatistics of(WaferMap map, Mask mask, StatisticsRequest request) {
        Checks.notNull(map, "map");
        return of(map.raster(), mask, map.grid(), request);
    }

    /**
     * Statistics of {@code raster} over {@code mask} (null: every pixel); {@code grid} gives the pixel area.
     *
     * @throws IllegalArgumentException when the sizes of raster, mask and grid differ
     */
    public static MapStatistics of(FloatRaster raster, Mask mask, PixelGrid grid, StatisticsRequest request) {
        Checks.notNull(raster, "raster");
        Checks.notNull(grid, "grid");
        Checks.notNull(request, "request");
        checkSizes(raster, mask, grid);
        float[] s = raster.samples();
        double[] thresholds = thresholds(request);
        int size = s.length;
        long[] words = mask == null ? null : mask.words();
        int blocks = Blocks.count(size, Mask.BLOCK_PX);
        // each block writes its counted values from the first slot it may need (the mask pixels before it), so the
        // values stay in index order; blocks with NaN pixels in the mask leave gaps, closed afterwards
        int[] offset = new int[blocks + 1];
        for (int b = 0; b < blocks; b++) {
            offset[b + 1] = offset[b] + (words == null ? Math.min(Mask.BLOCK_PX, size - b * Mask.BLOCK_PX)
                    : maskCount(words, b, size));
        }
        float[] values = new float[offset[blocks]];
        Part[] parts = new Part[blocks];
        Blocks.run(blocks, size, b -> parts[b] = Part.of(s, words, b, size, thresholds, values, offset[b]));
        // the blocks' values closed up, in index order
        int n = 0;
        for (int b = 0; b < blocks; b++) {
            if (parts[b].n > 0 && n != offset[b]) {
                System.arraycopy(values, offset[b], values, n, parts[b].n);
            }
            n += parts[b].n;
        }
        // Σ 1/x in index order on one thread: the harmonic mean, a verdict figure, is then the very number every
        // other face computes from the same values (the batch adds the reciprocals of its packed values in order)
        double reciprocalSum = 0;
        for (int k = 0; k < n; k++) {
            float f = values[k];
            if (f > 0) {
                reciprocalSum += 1 / (double) f;
            }
        }
        double[] wanted = wantedPercents(request);
        return of(Part.combined(parts, thresholds.length), reciprocalSum, percentiles(values, n, wanted), request,
                thresholds, grid.pixelAreaMm2());
    }

    /** The requested percents, then 50 (the median). */
    static double[] wantedPercents(StatisticsRequest request) {
        double[] wanted = new double[request.percents().size() + 1];
        for (int k = 0; k < wanted.length - 1; k++) {
            wanted[k] = request.percents().get(k);
        }
        wanted[wanted.length - 1] = 50;
        return wanted;
    }

    /** The requested thresholds. */
    static double[] thresholds(StatisticsRequest request) {
        return request.thresholds().stream().mapToDouble(Double::doubleValue).toArray();
    }

    /**
     * The statistics from the blocks' sums, Σ 1/x over the positive values and the estimates of the
     * {@link #wantedPercents} of {@code request}.
     */
    static MapStatistics of(Part sums, double reciprocalSum, double[] estimates, StatisticsRequest request,
                            double[] thresholds, double pixelArea) {
        int n = sums.n;
        int positive = n - sums.nonPositive;
        List<AreaFraction> fractions = new ArrayList<>();
        for (int k = 0; k < thresholds.length; k++) {
            int below = sums.below[k];
            int above = sums.above[k];
            fractions.add(new AreaFraction(thresholds[k], below, above, n == 0 ? Double.NaN : (double) below / n,
                    n == 0 ? Double.NaN : (double) above / n, below * pixelArea, above * pixelArea));
        }
        int asked = request.percents().size();
        List<PercentileValue> pv = new ArrayList<>();
        for (int k = 0; k < asked; k++) {
            pv.add(new PercentileValue(request.percents().get(k), estimates[k]));
        }
        return new MapStatistics(n, n * pixelArea, n == 0 ? Double.NaN : sums.mean,
                positive == 0 ? Double.NaN : positive / reciprocalSum,
                positive == 0 ? Double.NaN : Math.exp(sums.logSum / positive), sums.nonPositive,
                estimates[asked], n == 0 ? Double.NaN : sums.min, n == 0 ? Double.NaN : sums.max,
                n < 2 ? Double.NaN : Math.sqrt(sums.m2 / (n - 1)), pv, fractions);
    }

    /** Pixels of block {@code b} in the mask. */
    private static int maskCount(long[] words, int b, int size) {
        int c = 0;
        for (int wi = b * (Mask.BLOCK_PX >>> 6), we = (Math.min(size, (b + 1) * Mask.BLOCK_PX) + 63) >>> 6; wi < we;
                wi++) {
            c += Long.bitCount(words[wi]);
        }
        return c;
    }

    /** The sums of one block of pixels, in index order, or of several blocks ({@link #combined}). */
    static final class Part {
        /** The significand bits of a double. */
        private static final long SIGNIFICAND_BITS = (1L << 52) - 1;
        /** The exponent bits of 1.0. */
        private static final long ONE_EXPONENT_BITS = (long) Double.MAX_EXPONENT << 52;

        int n;
        int nonPositive;
        double mean;
        double m2;
        double min = Double.POSITIVE_INFINITY;
        double max = Double.NEGATIVE_INFINITY;
        double logSum;
        int[] below;
        int[] above;

        /**
         * The blocks' sums combined in block order (Chan, Golub and LeVeque's pairwise update of Welford's sums): the
         * same figures on any number of threads.
         */
        static Part combined(Part[] parts, int thresholds) {
            Part sums = new Part();
            sums.below = new int[thresholds];
            sums.above = new int[thresholds];
            for (Part p : parts) {
                sums.add(p);
            }
            return sums;
        }

        private void add(Part p) {
            if (p.n == 0) {
                return;
            }
            int total = n + p.n;
            double delta = p.mean - mean;
            mean += delta * p.n / total;
            m2 += p.m2 + delta * delta * ((double) n * p.n / total);
            n = total;
            nonPositive += p.nonPositive;
            min = Math.min(min, p.min);
            max = Math.max(max, p.max);
            logSum += p.logSum;
            for (int k = 0; k < below.length; k++) {
                below[k] += p.below[k];
                above[k] += p.above[k];
            }
        }

        /** Block {@code b} of {@code s} over the mask {@code words} (null: all), its values copied to out[at..]. */
        static Part of(float[] s, long[] words, int b, int size, double[] thresholds, float[] out, int at) {
            int from = b * Mask.BLOCK_PX;
            int end = Math.min(size, from + Mask.BLOCK_PX);
            return ofValues(out, at, gather(s, words, from, end, out, at), thresholds);
        }

        /**
         * Copies the values of pixels [from, end) in the mask {@code words} (null: all) that are not NaN to
         * out[at..], in index order, and returns their count. (Each loop of a block is a small method of its own: the
         * just-in-time compiler then compiles each quickly instead of the whole block's work on the stack.)
         */
        static int gather(float[] s, long[] words, int from, int end, float[] out, int at) {
            int n = 0;
            if (words == null) {
                for (int i = from; i < end; i++) {
                    float f = s[i];
                    if (f == f) {
                        out[at + n++] = f;
                    }
                }
                return n;
            }
            for (int wi = from >>> 6, we = (end + 63) >>> 6; wi < we; wi++) {
                long word = words[wi];
                int base = wi << 6;
                if (word == -1L) {
                    for (int i = base; i < base + 64; i++) {
                        float f = s[i];
                        if (f == f) {
                            out[at + n++] = f;
                        }
                    }
                } else {
                    for (; word != 0; word &= word - 1) {
                        float f = s[base + Long.numberOfTrailingZeros(word)];
                        if (f == f) {
                            out[at + n++] = f;
                        }
                    }
                }
            }
            return n;
        }

        /**
         * The sums of the n values side by side at out[at..]: sums in index order, then the squared deviations from
         * their mean (two passes: no division per value, and more accurate than a running update).
         */
        static Part ofValues(float[] out, int at, int n, double[] thresholds) {
            Part p = new Part();
            p.below = new int[thresholds.length];
            p.above = new int[thresholds.length];
            double sum = p.sums(out, at, at + n, thresholds);
            p.mean = n == 0 ? 0 : sum / n;
            p.m2 = squaredDeviations(out, at, at + n, p.mean);
            p.n = n;
            return p;
        }

        /**
         * Σ x of out[from..to) in index order; sets the extremes, the count of values ≤ 0, the threshold counts and
         * Σ ln x of the positive values.
         */
        private double sums(float[] out, int from, int to, double[] thresholds) {
            // Σ ln x kept as ln(product) + binaryExponent·ln 2: one multiplication per value instead of a logarithm
            double product = 1;
            long binaryExponent = 0;
            double sum = 0;
            double lo = Double.POSITIVE_INFINITY;
            double hi = Double.NEGATIVE_INFINITY;
            int nonPositiveCount = 0;
            for (int k = from; k < to; k++) {
                double v = out[k];
                sum += v;
                if (v < lo) {
                    lo = v;
                }
                if (v > hi) {
                    hi = v;
                }
                if (v > 0) {
                    product *= v;
                    if (product > 1e250 || product < 1e-250) {
                        int exponent;
                        if (product < Double.POSITIVE_INFINITY) {
                            // a normal number (a finite value ≥ 1.4e-45 times one in [1e-250, 1e250]): Math.getExponent
                            // and Math.scalb(product, -exponent), exactly, on its bits
                            long bits = Double.doubleToRawLongBits(product);
                            exponent = (int) (bits >>> 52) - Double.MAX_EXPONENT;
                            product = Double.longBitsToDouble(bits & SIGNIFICAND_BITS | ONE_EXPONENT_BITS);
                        } else {
                            exponent = Math.getExponent(product);
                            product = Math.scalb(product, -exponent);
                        }
                        binaryExponent += exponent;
                    }
                } else {
                    nonPositiveCount++;
                }
                for (int t = 0; t < thresholds.length; t++) {
                    if (v < thresholds[t]) {
                        below[t]++;
                    } else if (v > thresholds[t]) {
                        above[t]++;
                    }
                }
            }
            min = lo;
            max = hi;
            nonPositive = nonPositiveCount;
            logSum = to - from - nonPositiveCount == 0 ? 0 : Math.log(product) + binaryExponent * Math.log(2);
            return sum;
        }

        /** Σ (x − mean)² over out[from..to), in index order. */
        private static double squaredDeviations(float[] out, int from, int to, double mean) {
            double m2 = 0;
            for (int k = from; k < to; k++) {
                double d = out[k] - mean;
                m2 += d * d;
            }
            return m2;
        }
    }

    /**
     * Type-7 percentiles of values[0..n) (NaN-free; possibly reordered), in the order of {@code percents}: the
     * estimates {@link #of} gives for the same values.
     */
    public static double[] percentiles(float[] values, int n, double[] percents) {
        return percentiles(values, n, percents, null);
    }

    /**
     * As {@link #percentiles(float[], int, double[])} (the same estimates) with the radix buckets of values[0..n)
     * already counted by the caller into {@code counted} (null: not counted), so that only the gathering pass runs.
     */
    public static double[] percentiles(float[] values, int n, double[] percents, RankBuckets counted) {
        if (n == 0) {
            return Ranks.none(percents);
        }
        Ranks r = Ranks.of(n, percents);
        return r.estimates(counted == null ? Selection.ranks(values, n, r.ranks)
                : counted.ranks(values, n, r.ranks));
    }

    /**
     * The values at {@code ranks} (0-based, ascending, distinct, each &lt; n) among values[0..n) (NaN-free; possibly
     * reordered): those {@link Arrays#sort(float[])} would put there, bit for bit, without a full sort.
     */
    public static double[] orderStatistics(float[] values, int n, int[] ranks) {
        return Selection.ranks(values, n, ranks.clone());
    }

    /**
     * The order statistics the type-7 estimates of some percents need: the two around each h = (n − 1)·p/100, as one
     * ascending list of distinct ranks.
     */
    static final class Ranks {
        final int[] ranks;
        private final int n;
        private final int[] lower;
        private final double[] frac;

        private Ranks(int n, int[] ranks, int[] lower, double[] frac) {
            this.n = n;
            this.ranks = ranks;
            this.lower = lower;
            this.frac = frac;
        }

        /** NaN for every percent (no values). */
        static double[] none(double[] percents) {
            double[] out = new double[percents.length];
            Arrays.fill(out, Double.NaN);
            return out;
        }

        /** The ranks for {@code percents} among n &gt; 0 values. */
        static Ranks of(int n, double[] percents) {
            int[] lower = new int[percents.length];
            double[] frac = new double[percents.length];
            int[] wanted = new int[2 * percents.length];
            for (int k = 0; k < percents.length; k++) {
                double h = (n - 1) * percents[k] / 100.0;
                lower[k] = (int) Math.floor(h);
                frac[k] = h - lower[k];
                wanted[2 * k] = lower[k];
                wanted[2 * k + 1] = Math.min(lower[k] + 1, n - 1);
            }
            return new Ranks(n, Arrays.stream(wanted).sorted().distinct().toArray(), lower, frac);
        }

        /** The estimates, in the order of the percents, from the values at {@link #ranks}. */
        double[] estimates(double[] at) {
            double[] out = new double[lower.length];
            for (int k = 0; k < lower.length; k++) {
                double lo = at[Arrays.binarySearch(ranks, lower[k])];
                double hi = at[Arrays.binarySearch(ranks, Math.min(lower[k] + 1, n - 1))];
                out[k] = frac[k] > 0 ? lo + frac[k] * (hi - lo) : lo;
            }
            return out;
        }
    }

    /**
     * The estimate of {@code percent} if it was requested (or 50).
     *
     * @throws IllegalArgumentException when it was not
     */
    public double percentile(double percent) {
        if (percent == 50) {
            return median;
        }
        for (PercentileValue p : percentiles) {
            if (p.percent() == percent) {
                return p.value();
            }
        }
        throw new IllegalArgumentException("percentile " + percent + " % was not requested (have: "
                + percentiles.stream().map(p -> String.valueOf(p.percent())).toList() + ")");
    }

    /**
     * The area fractions of {@code threshold} if it was requested.
     *
     * @throws IllegalArgumentException when it was not
     */
    public AreaFraction areaFraction(double threshold) {
        for (AreaFraction a : areaFractions) {
            if (a.threshold() == threshold) {
                return a;
            }
        }
        throw new IllegalArgumentException("threshold " + threshold + " was not requested");
    }

    /** Pixels that entered the harmonic and geometric means. */
    public int positiveCount() {
        return count - nonPositiveCount;
    }

    /** Standard deviation over the mean (NaN when the mean is 0 or unknown). */
    public double coefficientOfVariation() {
        return mean == 0 ? Double.NaN : standardDeviation / mean;
    }

    static void checkSizes(FloatRaster raster, Mask mask, PixelGrid grid) {
        if (grid.width() != raster.width() || grid.height() != raster.height()) {
            throw new IllegalArgumentException("grid " + grid.width() + "x" + grid.height() + " does not match raster "
                    + raster.width() + "x" + raster.height());
        }
        if (mask != null && (mask.width() != raster.width() || mask.height() != raster.height())) {
            throw new IllegalArgumentException("mask " + mask.width() + "x" + mask.height() + " does not match raster "
                    + raster.width() + "x" + raster.height());
        }
    }
}
