package trapmap.physics.uncertainty;

import java.util.Arrays;
import org.apache.commons.math3.util.KthSelector;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.Defect;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.units.Units;

/**
 * The probability that a pixel's equivalent trap density exceeds a threshold N*, and confidence quantiles of that
 * density, by Monte Carlo over the uncertainty of the defect parameters, the measurement conditions and the measured
 * lifetime ({@link UncertaintySampler}, {@link ConditionUncertainty}). Prepared once per wafer (conditions, defect,
 * threshold, seed); reproducible for a seed; immutable and thread-safe once built.
 * <p>
 * Each sample s is one wafer: conditions c_s, defect parameters d_s and a lifetime noise factor m_s =
 * τ_measured/τ_true. With the fixed excess density Δn_s the conversion ({@link TrapDensityConverter}) gives, for a
 * true effective lifetime τ,
 * <pre>
 * R(τ) = 1/τ − r0_s,  r0_s = 1/τ_intr(Δn_s) + 1/τ_surf           (SRH rate, 1/s)
 * N_s(τ) = K_s·R      when R ≥ δ·r0_s (status OK),  K_s = K(Δn_s) of d_s under c_s, s·cm⁻³
 * N_s(τ) = K_s·δ·r0_s otherwise (BELOW_LIMIT: the detection limit the conversion reports)
 * </pre>
 * The density "exceeds N*" when the conversion would report an OK density above N*: R > max(N* / K_s, δ·r0_s). R
 * decreases with τ, so this holds exactly for τ below one lifetime per sample,
 * <pre>
 * τ*_s = m_s / (r0_s + max(N* / K_s, δ·r0_s))   (s, in measured lifetime; kept in µs)
 * </pre>
 * and the probability of a pixel measured at τ is the share of samples with τ &lt; τ*_s: the τ*_s are sorted once and
 * each pixel costs one binary search. The lifetime noise is folded in per sample: a pixel's probability is a
 * marginal over all uncertain inputs, so one noise draw per sample gives the same per-pixel probability as a fresh
 * draw per pixel (the noise of different pixels is not correlated by this: only each pixel's own probability is
 * computed). The quantile of N_t at τ is the empirical quantile (inverse of the empirical distribution function,
 * Hyndman &amp; Fan, Am. Stat. 50, 361 (1996), definition 1, as Commons Math's {@code Percentile} with
 * {@code R_1}: the ⌈qS⌉-th smallest) of the reported N_s(τ/m_s) over the samples, picked with Commons Math's
 * {@link KthSelector}; the samples' densities cross one another as τ changes, so this costs one pass over the samples
 * per pixel (O(S)). A {@link QuantileTable} for one q and a lifetime range gives the same values from a few per cent
 * of the samples per pixel.
 * <p>
 * For N* at or above every sample's detection limit K_s·δ·r0_s the two agree exactly: probability(τ) > 1 − q
 * exactly when quantile(τ, q) > N* (up to rounding at ties).
 * <p>
 * Under a fixed generation rate G (Δn = G·τ per pixel) each sample's threshold lifetime τ*_s is the root of
 * N_s(τ, G_s·τ) = N*, solved and checked for monotony by {@link GenerationThreshold} (the injection uncertainty then
 * applies to G); probabilities are then the same one binary search per pixel, and density quantiles are refused.
 * Measured lifetimes that the conversion does not convert (not finite, or below
 * {@link TrapDensityConverter#LIFETIME_FLOOR_US}) give NaN.
 */
public final class ExceedanceModel {
    /** Fewest samples accepted. */
    public static final int MIN_SAMPLES = 16;
    /** Most samples accepted. */
    public static final int MAX_SAMPLES = 1 << 22;

    private final double thresholdPerCm3;
    /** τ*_s in measured µs, ascending. */
    private final double[] sortedThresholdsUs;
    // Per sample, in drawing order: K_s (s·cm⁻³), r0_s (1/s), δ·r0_s (1/s), m_s.
    private final double[] k;
    private final double[] baseRate;
    private final double[] detectableRate;
    private final double[] lifetimeFactor;
    /** True under a fixed generation rate: thresholds only, no quantiles. */
    private final boolean generation;

    private ExceedanceModel(double thresholdPerCm3, int samples, boolean generation) {
        this.thresholdPerCm3 = thresholdPerCm3;
        this.generation = generation;
        this.sortedThresholdsUs = new double[samples];
        this.k = new double[samples];
        this.baseRate = new double[samples];
        this.detectableRate = new double[samples];
        this.lifetimeFactor = new double[samples];
    }

    /**
     * Draws {@code samples} wafers from {@code seed} and prepares the sorted threshold lifetimes.
     *
     * @param nominal         the nominal conditions (a fixed injection or a fixed generation rate)
     * @param defect          the defect, with its parameter spread (none: nominal parameters)
     * @param settings        the models for band parameters at a drawn temperature
     * @param uncertainty     condition and lifetime uncertainties
     * @param thresholdPerCm3 the threshold N*, cm⁻³ (> 0)
     * @param samples         number of Monte Carlo samples S ({@value #MIN_SAMPLES} – 4194304)
     * @param seed            seed of the draws
     * @throws trapmap.shared.error.InvalidValueException for a defect without absolute cross-sections, a value out
     *                                                    of range, or a generation rate under which a sample's
     *                                                    exceedance is not one lifetime threshold
     */
    public static ExceedanceModel prepare(Conditions nominal, Defect defect, PhysicsSettings settings,
                                          ConditionUncertainty uncertainty, double thresholdPerCm3, int samples,
                                          long seed) {
        Checks.positive(thresholdPerCm3, "threshold", "cm^-3");
        Checks.finite(thresholdPerCm3, "threshold", "cm^-3");
        Checks.inRange(samples, MIN_SAMPLES, MAX_SAMPLES, "samples", "");
        UncertaintySampler sampler = new UncertaintySampler(nominal, defect, settings, uncertainty, seed);
        boolean generation = nominal.injection() instanceof Injection.Generation;
        ExceedanceModel m = new ExceedanceModel(thresholdPerCm3, samples, generation);
        for (int s = 0; s < samples; s++) {
            UncertaintySampler.Sample draw = sampler.next();
            TrapDensityConverter conv = new TrapDensityConverter(draw.conditions(), draw.defect());
            if (generation) {
                m.k[s] = Double.NaN;
                m.baseRate[s] = Double.NaN;
                m.detectableRate[s] = Double.NaN;
                m.lifetimeFactor[s] = draw.lifetimeFactor();
                m.sortedThresholdsUs[s] = GenerationThreshold.lifetimeUs(conv,
                        ((Injection.Generation) draw.conditions().injection()).ratePerCm3PerS(),
                        Units.US_PER_S / conv.surfaceLifetimeUs(), draw.conditions().detectionResolution(),
                        thresholdPerCm3, draw.lifetimeFactor());
                continue;
            }
            double dn = ((Injection.Fixed) draw.conditions().injection()).excessPerCm3();
            double ks = conv.srh().lifetimeDensityProductSCm3(dn);
            double r0 = conv.intrinsic().rateConstantPerS(dn) + Units.US_PER_S / conv.surfaceLifetimeUs();
            double detectable = draw.conditions().detectionResolution() * r0;
            m.k[s] = ks;
            m.baseRate[s] = r0;
            m.detectableRate[s] = detectable;
            m.lifetimeFactor[s] = draw.lifetimeFactor();
            m.sortedThresholdsUs[s] = draw.lifetimeFactor() * Units.US_PER_S
                    / (r0 + Math.max(thresholdPerCm3 / ks, detectable));
        }
        Arrays.sort(m.sortedThresholdsUs);
        return m;
    }

    /**
     * The probability that the equivalent density of a pixel measured at {@code tauEffUs} µs exceeds N*: the share
     * of samples with τ &lt; τ*_s. NaN for a lifetime the conversion does not convert.
     */
    public double probability(float tauEffUs) {
        double tau = tauEffUs;
        if (!convertible(tau)) {
            return Double.NaN;
        }
        return (double) countAbove(tau) / sortedThresholdsUs.length;
    }

    /** {@link #probability(float)} of each pixel of {@code tauEffUs} into {@code out} (same length), as float. */
    public void probabilities(float[] tauEffUs, float[] out) {
        checkLengths(tauEffUs, out);
        for (int i = 0; i < tauEffUs.length; i++) {
            out[i] = (float) probability(tauEffUs[i]);
        }
    }

    /**
     * The {@code q} quantile (0 &lt; q &lt; 1) of the equivalent density, cm⁻³, of a pixel measured at
     * {@code tauEffUs} µs over the samples (BELOW_LIMIT samples count with their detection limit). NaN for a
     * lifetime the conversion does not convert.
     */
    public double quantile(float tauEffUs, double q) {
        return quantileAtRank(tauEffUs, rankIndex(q));
    }

    /** The density of 0-based rank {@code rank} among the samples' at {@code tauEffUs} µs, cm⁻³ (one pass). */
    double quantileAtRank(float tauEffUs, int rank) {
        double tau = tauEffUs;
        if (!convertible(tau)) {
            return Double.NaN;
        }
        return exactQuantile(tau, rank, new double[k.length]);
    }

    /**
     * {@link #quantile(float, double)} of each pixel of {@code tauEffUs} into {@code out} (same length), cm⁻³, as
     * float.
     */
    public void quantiles(float[] tauEffUs, double q, float[] out) {
        checkLengths(tauEffUs, out);
        int rank = rankIndex(q);
        double[] work = new double[k.length];
        for (int i = 0; i < tauEffUs.length; i++) {
            double tau = tauEffUs[i];
            out[i] = convertible(tau) ? (float) exactQuantile(tau, rank, work) : Float.NaN;
        }
    }

    /**
     * A table that gives {@link #quantile(float, double)} for level {@code q} faster for lifetimes in
     * [{@code minTauUs}, {@code maxTauUs}] µs, with identical values (outside the range it takes the one-pass path).
     */
    public QuantileTable quantileTable(double q, double minTauUs, double maxTauUs) {
        return new QuantileTable(this, q, minTauUs, maxTauUs);
    }

    /** The 0-based index of the q quantile among the S ascending densities: ⌈qS⌉ − 1 (definition 1). */
    int rankIndex(double q) {
        checkQuantile(q);
        if (generation) {
            throw new InvalidValueException("generation", "cm^-3 s^-1", "density quantiles under a fixed generation"
                    + " rate are not supported (each sample's density would need its own conversion per pixel);"
                    + " the exceedance probability is: give an injection level (cm^-3) for quantiles");
        }
        return Math.max(0, Math.min(k.length - 1, (int) Math.ceil(q * k.length) - 1));
    }

    private double exactQuantile(double tauUs, int rank, double[] work) {
        for (int s = 0; s < k.length; s++) {
            work[s] = densityPerCm3(s, tauUs);
        }
        return new KthSelector().select(work, null, rank);
    }

    /**
     * The density sample {@code s} reports for a pixel measured at {@code tauUs} µs, cm⁻³. Every operation is
     * monotone, so the value never increases as {@code tauUs} increases (as rounded, too).
     */
    double densityPerCm3(int s, double tauUs) {
        double trueTauS = tauUs / lifetimeFactor[s] * Units.S_PER_US;
        double rate = 1.0 / trueTauS - baseRate[s];
        return k[s] * Math.max(rate, detectableRate[s]);
    }

    /** Number of τ*_s strictly above {@code tau}: binary search for the first one above it. */
    private int countAbove(double tau) {
        int lo = 0;
        int hi = sortedThresholdsUs.length;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (sortedThresholdsUs[mid] > tau) {
                hi = mid;
            } else {
                lo = mid + 1;
            }
        }
        return sortedThresholdsUs.length - lo;
    }

    static boolean convertible(double tauUs) {
        return tauUs >= TrapDensityConverter.LIFETIME_FLOOR_US && tauUs != Double.POSITIVE_INFINITY;
    }

    private static void checkQuantile(double q) {
        if (!(q > 0 && q < 1)) {
            throw new IllegalArgumentException("quantile level q must lie in (0, 1) but got " + q);
        }
    }

    static void checkLengths(float[] in, float[] out) {
        Checks.notNull(in, "lifetimes");
        Checks.notNull(out, "out");
        if (in.length != out.length) {
            throw new IllegalArgumentException("output has " + out.length + " values for " + in.length
                    + " lifetimes");
        }
    }

    /** The threshold N*, cm⁻³. */
    public double thresholdPerCm3() {
        return thresholdPerCm3;
    }

    /** True when the model was prepared under a fixed generation rate (probabilities only, no quantiles). */
    public boolean fixedGeneration() {
        return generation;
    }

    /** Number of samples S. */
    public int samples() {
        return k.length;
    }

    /** A copy of the threshold lifetimes τ*_s in measured µs, ascending. */
    public double[] thresholdLifetimesUs() {
        return sortedThresholdsUs.clone();
    }
}
