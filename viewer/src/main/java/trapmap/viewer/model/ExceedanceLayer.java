package trapmap.viewer.model;

import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.ExceedanceMaps;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.defect.Defect;

/**
 * The probability of exceeding N* for one wafer: the maps module's {@link ExceedanceMaps} (the batch's and
 * {@code convert}'s code) prepared once from the wafer's conditions, the defect, the physics settings and the
 * {@link ExceedanceSettings}, giving the probability map and the cursor readout's probability and quantiles. When it
 * cannot be prepared (a defect without absolute cross-sections, a generation rate under which a sample's exceedance is
 * not one lifetime threshold) it holds the reason instead, and every value is NaN. Under a fixed generation rate the
 * probability is drawn as by {@code convert}; the density quantiles, which need a fixed injection level, are NaN.
 */
public final class ExceedanceLayer {
    private final ExceedanceSettings settings;
    private final ExceedanceMaps maps;
    private final String unavailable;

    private ExceedanceLayer(ExceedanceSettings settings, ExceedanceMaps maps, String unavailable) {
        this.settings = settings;
        this.maps = maps;
        this.unavailable = unavailable;
    }

    /**
     * Prepares the layer of an effective-lifetime map (its conditions as applied) for {@code defect}.
     *
     * @param lifetime the effective-lifetime map, µs, with the conditions it is converted with
     * @param defect   the defect (with its published parameter spread)
     * @param physics  the physics settings of the conversion
     * @param settings uncertainty, N*, samples and seed
     */
    public static ExceedanceLayer prepare(WaferMap lifetime, Defect defect, PhysicsSettings physics,
                                          ExceedanceSettings settings) {
        try {
            ExceedanceMaps m = ExceedanceMaps.prepare(lifetime, defect, ConversionSettings.of(physics),
                    settings.uncertainty(), settings.thresholdPerCm3(), settings.samples(), settings.seed());
            return new ExceedanceLayer(settings, m, null);
        } catch (RuntimeException e) {
            return new ExceedanceLayer(settings, null, "probability of exceeding N* not available: "
                    + (e.getMessage() == null ? e.toString() : e.getMessage()));
        }
    }

    /**
     * The layer of a rules flag with a confidence, drawn by the batch's own code ({@link
     * trapmap.maps.batch.ConfidenceFlag#prepare}) with the flag's threshold and the rules' uncertainty block, so that
     * its probability is at least the confidence exactly on the pixels the verdict flags.
     *
     * @param flag     a trap-density flag with a confidence
     * @param lifetime the effective-lifetime map the rules judged, µs
     * @param defect   the defect that judged it
     * @param physics  the rules' physics settings
     */
    public static ExceedanceLayer ofFlag(trapmap.maps.batch.Rules.Flag flag, WaferMap lifetime, Defect defect,
                                         PhysicsSettings physics) {
        ExceedanceSettings s = ExceedanceSettings.DEFAULT.withDrawn(flag.uncertainty()).withThreshold(
                flag.threshold());
        try {
            return new ExceedanceLayer(s, trapmap.maps.batch.ConfidenceFlag.prepare(flag, lifetime.conditions(),
                    defect, ConversionSettings.of(physics)), null);
        } catch (RuntimeException e) {
            return new ExceedanceLayer(s, null, "probability of exceeding N* not available: "
                    + (e.getMessage() == null ? e.toString() : e.getMessage()));
        }
    }

    /** The settings it was prepared with. */
    public ExceedanceSettings settings() {
        return settings;
    }

    /** True when the model could be prepared. */
    public boolean available() {
        return maps != null;
    }

    /** Why the model could not be prepared, or null. */
    public String unavailableReason() {
        return unavailable;
    }

    /** P(N_t > N*) of a pixel measured at {@code tauUs} µs (0–1), NaN when unavailable or not convertible. */
    public double probabilityAt(double tauUs) {
        return maps == null ? Double.NaN : maps.probabilityAt(tauUs);
    }

    /**
     * The {@code q} quantile of N_t at {@code tauUs} µs, cm⁻³; NaN when unavailable, not convertible, or under a fixed
     * generation rate (the model draws probabilities only there, {@link #fixedGeneration}).
     */
    public double quantileAt(double tauUs, double q) {
        return maps == null || fixedGeneration() ? Double.NaN : maps.quantileAt(tauUs, q);
    }

    /** True when the layer was prepared under a fixed generation rate: probabilities, but no N_t quantiles. */
    public boolean fixedGeneration() {
        return maps != null && maps.model().fixedGeneration();
    }

    /**
     * The probability map of {@code lifetime} (0–1 per pixel, NaN where the lifetime is not converted), on all
     * processors (the same values as on one).
     *
     * @throws IllegalArgumentException with the reason when the model is not available
     */
    public WaferMap probabilityMap(WaferMap lifetime) {
        if (maps == null) {
            throw new IllegalArgumentException(unavailable);
        }
        return maps.probabilityMap(lifetime);
    }

    /**
     * The effective lifetime, µs, below which a pixel's probability of exceeding N* is at least {@code confidence}
     * (a rules flag's confidence as a lifetime threshold); NaN when not available.
     */
    public double confidentLifetimeUs(double confidence) {
        return maps == null ? Double.NaN : maps.confidentLifetimeUs(confidence);
    }

    /** The colour bar's label, e.g. {@code P(N_t > 3e11 cm⁻³)}. */
    public static String legend(ExceedanceSettings s) {
        return "P(N_t > " + Units.number(s.thresholdPerCm3()) + " cm⁻³)";
    }
}
