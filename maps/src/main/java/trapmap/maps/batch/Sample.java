package trapmap.maps.batch;

import java.util.Arrays;
import trapmap.maps.raster.PixelGrid;
import trapmap.maps.stats.MapStatistics;
import trapmap.maps.stats.RankBuckets;

/**
 * The figures of one map over the evaluated pixels, equal to those of {@link MapStatistics#of} over the same
 * pixels: the count of valid (not NaN) values, their area, the harmonic mean of the positive values (reciprocals
 * summed in index order) and type-7 percentiles from the same exact order statistics
 * ({@link MapStatistics#percentiles}), in one pass without the figures the batch does not use.
 */
record Sample(int count, double areaMm2, double harmonicMean, double median, double[] percents,
              double[] values) {
    static Sample of(float[] s, Masks masks, PixelGrid grid, double[] percents) {
        return of(s, masks, grid, percents, true);
    }

    /** As {@link #of(float[], Masks, PixelGrid, double[])}; without the harmonic mean (NaN) unless asked for. */
    static Sample of(float[] s, Masks masks, PixelGrid grid, double[] percents, boolean harmonic) {
        return ofPacked(gather(s, masks), masks.count(), grid, percents, harmonic);
    }

    /** The samples of the evaluated pixels, in index order. */
    static float[] gather(float[] s, Masks masks) {
        int[] idx = masks.indices();
        float[] v = new float[masks.count()];
        for (int k = 0; k < v.length; k++) {
            v[k] = s[idx[k]];
        }
        return v;
    }

    /**
     * As {@link #of(float[], Masks, PixelGrid, double[], boolean)} from the evaluated pixels' samples packed in
     * index order, {@code v[0..n)}, which it reorders.
     */
    static Sample ofPacked(float[] v, int n, PixelGrid grid, double[] percents, boolean harmonic) {
        int m = 0;
        int positive = 0;
        double reciprocalSum = 0;
        for (int k = 0; k < n; k++) {
            float f = v[k];
            if (f == f) {
                v[m++] = f;
                if (harmonic && f > 0) {
                    reciprocalSum += 1 / (double) f;
                    positive++;
                }
            }
        }
        return ranked(v, m, grid, percents, positive, reciprocalSum);
    }

    /**
     * As {@link #ofPacked} without the harmonic mean (NaN), from values without NaN, {@code v[0..n)} (reordered): the
     * same figures as {@link #ofPacked} gives for them, without its pass over them.
     */
    static Sample ofValid(float[] v, int n, PixelGrid grid, double[] percents) {
        return ranked(v, n, grid, percents, 0, 0);
    }

    /**
     * As {@link #ofPacked} from values without NaN, {@code v[0..n)} (reordered), whose radix buckets are counted in
     * {@code counted}, with the count and reciprocal sum of the positive ones already added up in index order (0 and
     * 0: no harmonic mean): the same figures, from one gathering pass.
     */
    static Sample ofCounted(float[] v, int n, PixelGrid grid, double[] percents, int positive, double reciprocalSum,
                            RankBuckets counted) {
        return ranked(v, n, grid, percents, positive, reciprocalSum, counted);
    }

    private static Sample ranked(float[] v, int m, PixelGrid grid, double[] percents, int positive,
                                 double reciprocalSum) {
        return ranked(v, m, grid, percents, positive, reciprocalSum, null);
    }

    private static Sample ranked(float[] v, int m, PixelGrid grid, double[] percents, int positive,
                                 double reciprocalSum, RankBuckets counted) {
        double[] wanted = Arrays.copyOf(percents, percents.length + 1);
        wanted[percents.length] = 50;
        double[] est = MapStatistics.percentiles(v, m, wanted, counted);
        return new Sample(m, m * grid.pixelAreaMm2(), positive == 0 ? Double.NaN : positive / reciprocalSum,
                est[percents.length], percents.clone(), Arrays.copyOf(est, percents.length));
    }

    /** The estimate of a requested percentile (or 50). */
    double percentile(double percent) {
        if (percent == 50) {
            return median;
        }
        for (int k = 0; k < percents.length; k++) {
            if (percents[k] == percent) {
                return values[k];
            }
        }
        throw new IllegalArgumentException("percentile " + percent + " was not requested");
    }
}
