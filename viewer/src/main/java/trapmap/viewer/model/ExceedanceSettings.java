package trapmap.viewer.model;

import trapmap.maps.io.UncertaintySettings;
import trapmap.physics.uncertainty.ConditionUncertainty;
import trapmap.physics.uncertainty.ExceedanceModel;
import trapmap.shared.check.Checks;

/**
 * What the viewer's "probability of exceeding N*" and its cursor readout are computed with: the uncertainty of the
 * conditions and of the measured lifetime ({@link ConditionUncertainty}, whose defaults are documented there), the
 * threshold density N*, the number of Monte Carlo samples and the seed of the draws
 * ({@link ExceedanceModel#prepare}). Part of the {@link Analysis}, so it is undone and saved with it.
 *
 * @param uncertainty     standard uncertainties of the conditions (relative, K for the temperature) and lifetime
 * @param thresholdPerCm3 the threshold N*, cm⁻³ (&gt; 0)
 * @param samples         Monte Carlo samples ({@value ExceedanceModel#MIN_SAMPLES} to {@value #MAX_SAMPLES})
 * @param seed            seed of the draws (the same seed gives the same map)
 */
public record ExceedanceSettings(ConditionUncertainty uncertainty, double thresholdPerCm3, int samples, long seed) {
    /**
     * Most samples accepted, the physics model's; each wafer draws them when it is analysed, and the readout's two
     * quantiles cost one pass over them per pixel under the cursor (about 0.1 ms per 10⁴).
     */
    public static final int MAX_SAMPLES = ExceedanceModel.MAX_SAMPLES;
    /** Default N*: the viewer's default trap-density threshold, cm⁻³. */
    public static final double DEFAULT_THRESHOLD_CM3 = 3e11;
    /** Default number of samples, as for {@code convert} and rules: a probability's Monte Carlo standard error is at most 0.5/√10⁴ = 0.005. */
    public static final int DEFAULT_SAMPLES = UncertaintySettings.DEFAULT_SAMPLES;
    /** Default seed, as for {@code convert} and rules. */
    public static final long DEFAULT_SEED = UncertaintySettings.DEFAULT_SEED;
    /** Lower quantile level shown in the readout. */
    public static final double LOW_QUANTILE = 0.05;
    /** Upper quantile level shown in the readout. */
    public static final double HIGH_QUANTILE = 0.95;

    /** The documented uncertainty defaults, N* = 3e11 cm⁻³, 10000 samples, seed 1. */
    public static final ExceedanceSettings DEFAULT = new ExceedanceSettings(ConditionUncertainty.DEFAULTS,
            DEFAULT_THRESHOLD_CM3, DEFAULT_SAMPLES, DEFAULT_SEED);

    public ExceedanceSettings {
        Checks.notNull(uncertainty, "uncertainty");
        Checks.positive(thresholdPerCm3, "threshold N*", "cm^-3");
        Checks.finite(thresholdPerCm3, "threshold N*", "cm^-3");
        Checks.inRange(samples, ExceedanceModel.MIN_SAMPLES, MAX_SAMPLES, "samples", "");
    }

    public ExceedanceSettings withUncertainty(ConditionUncertainty u) {
        return new ExceedanceSettings(u, thresholdPerCm3, samples, seed);
    }

    public ExceedanceSettings withThreshold(double perCm3) {
        return new ExceedanceSettings(uncertainty, perCm3, samples, seed);
    }

    public ExceedanceSettings withSamples(int n) {
        return new ExceedanceSettings(uncertainty, thresholdPerCm3, n, seed);
    }

    public ExceedanceSettings withSeed(long s) {
        return new ExceedanceSettings(uncertainty, thresholdPerCm3, samples, s);
    }

    /** The same N* with the uncertainties, samples and seed of a physics settings file's {@code uncertainty} block. */
    public ExceedanceSettings withDrawn(UncertaintySettings u) {
        return new ExceedanceSettings(u.uncertainty(), thresholdPerCm3, u.samples(), u.seed());
    }

    /** The uncertainties, samples and seed as the {@code uncertainty} block of physics settings and rules. */
    public UncertaintySettings drawn() {
        return new UncertaintySettings(uncertainty, samples, seed);
    }

    /** One line for the panel and the legend, e.g. {@code N* 3e11 cm⁻³, 10000 samples, seed 1}. */
    public String describe() {
        return "N* " + Units.number(thresholdPerCm3) + " cm⁻³, " + samples + " samples, seed " + seed;
    }
}
