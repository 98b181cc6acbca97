package trapmap.physics.uncertainty;

import java.util.Arrays;
import org.apache.commons.math3.util.KthSelector;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.shared.check.Checks;

/**
 * The q quantile of {@link ExceedanceModel#quantile(float, double)} for lifetimes in a range, with the same values
 * from a few per cent of the samples per pixel. Immutable and thread-safe.
 * <p>
 * Each sample's reported density N_s(τ) never increases with τ, so neither does the quantile Q(τ). The range is cut
 * into cells [τ_j, τ_j+1] (1 % wide in τ) and the quantile is computed exactly at the cell edges, Q_j ≥ Q_j+1. For
 * τ in a cell, a sample with N_s(τ_j+1) &gt; Q_j lies above Q(τ), and one with N_s(τ_j) &lt; Q_j+1 below it; only the
 * rest, the cell's candidates, can hold the quantile. With A_j samples above and the quantile the k-th largest of
 * all S, it is the (k − A_j)-th largest of the candidates at τ: exact, with no interpolation.
 */
public final class QuantileTable {
    /** Relative width of a cell in τ. */
    static final double CELL_RATIO = 1.01;
    /** Most cells of one table. */
    public static final int MAX_CELLS = 100_000;

    private final ExceedanceModel model;
    private final int rank;
    /** Cell edges τ_j, µs, ascending. */
    private final double[] edgesUs;
    /** Samples above Q(τ) in each cell. */
    private final int[] above;
    /** Candidates of cell j: {@code candidates[start[j]] … candidates[start[j + 1] − 1]}. */
    private final int[] start;
    private final int[] candidates;

    QuantileTable(ExceedanceModel model, double q, double minTauUs, double maxTauUs) {
        this.model = model;
        this.rank = model.rankIndex(q);
        Checks.inRange(minTauUs, TrapDensityConverter.LIFETIME_FLOOR_US, 1e12, "minimum lifetime", "us");
        Checks.inRange(maxTauUs, minTauUs, 1e12, "maximum lifetime", "us");
        int samples = model.samples();
        int cells = (int) Math.max(1, Math.min(MAX_CELLS,
                Math.ceil(Math.log(maxTauUs / minTauUs) / Math.log(CELL_RATIO))));
        edgesUs = new double[cells + 1];
        double step = Math.log(maxTauUs / minTauUs) / cells;
        for (int j = 0; j < cells; j++) {
            edgesUs[j] = minTauUs * Math.exp(step * j);
        }
        edgesUs[0] = minTauUs;
        edgesUs[cells] = maxTauUs;
        above = new int[cells];
        start = new int[cells + 1];
        int[] list = new int[Math.max(16, samples)];
        int used = 0;
        double[] low = densities(edgesUs[0], samples);
        double lowQuantile = select(low.clone(), rank);
        for (int j = 0; j < cells; j++) {
            double[] high = densities(edgesUs[j + 1], samples);
            double highQuantile = select(high.clone(), rank);
            int a = 0;
            start[j] = used;
            for (int s = 0; s < samples; s++) {
                if (high[s] > lowQuantile) {
                    a++;
                } else if (low[s] >= highQuantile) {
                    if (used == list.length) {
                        list = Arrays.copyOf(list, list.length * 2);
                    }
                    list[used++] = s;
                }
            }
            above[j] = a;
            low = high;
            lowQuantile = highQuantile;
        }
        start[cells] = used;
        candidates = Arrays.copyOf(list, used);
    }

    private double[] densities(double tauUs, int samples) {
        double[] d = new double[samples];
        for (int s = 0; s < samples; s++) {
            d[s] = model.densityPerCm3(s, tauUs);
        }
        return d;
    }

    private static double select(double[] values, int index) {
        return new KthSelector().select(values, null, index);
    }

    /** The quantile, cm⁻³, of a pixel measured at {@code tauEffUs} µs; equal to the model's. */
    public double quantile(float tauEffUs) {
        double tau = tauEffUs;
        if (!ExceedanceModel.convertible(tau)) {
            return Double.NaN;
        }
        if (tau < edgesUs[0] || tau > edgesUs[edgesUs.length - 1]) {
            return model.quantileAtRank(tauEffUs, rank);
        }
        int j = Arrays.binarySearch(edgesUs, tau);
        j = j >= 0 ? Math.min(j, above.length - 1) : -j - 2;
        int from = start[j];
        int m = start[j + 1] - from;
        int largest = model.samples() - rank;  // the quantile is the largest-th largest of all samples
        int within = largest - above[j];
        if (within < 1 || within > m) {
            throw new IllegalStateException("quantile table cell " + j + " does not hold the quantile");
        }
        double[] work = new double[m];
        for (int i = 0; i < m; i++) {
            work[i] = model.densityPerCm3(candidates[from + i], tau);
        }
        return select(work, m - within);
    }

    /** {@link #quantile(float)} of each pixel of {@code tauEffUs} into {@code out} (same length), cm⁻³. */
    public void quantiles(float[] tauEffUs, float[] out) {
        ExceedanceModel.checkLengths(tauEffUs, out);
        for (int i = 0; i < tauEffUs.length; i++) {
            out[i] = (float) quantile(tauEffUs[i]);
        }
    }

    /** Mean number of candidates per cell (what one pixel costs, against S for the one-pass path). */
    public double meanCandidates() {
        return (double) candidates.length / above.length;
    }

    /** Number of cells. */
    public int cells() {
        return above.length;
    }
}
