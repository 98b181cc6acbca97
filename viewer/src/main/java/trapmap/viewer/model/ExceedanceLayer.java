package trapmap.viewer.model;

import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.FloatRaster;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.defect.Defect;
import trapmap.physics.uncertainty.ExceedanceModel;

/**
 * The probability of exceeding N* for one wafer: the Monte Carlo model prepared once from the wafer's conditions,
 * the defect, the physics settings and the {@link ExceedanceSettings}, giving the probability map and the cursor
 * readout's probability and quantiles. When the model cannot be prepared (a fixed generation rate, a defect without
 * absolute cross-sections) it holds the reason instead, and every value is NaN.
 */
public final class ExceedanceLayer {
    private final ExceedanceSettings settings;
    private final ExceedanceModel model;
    private final String unavailable;

    private ExceedanceLayer(ExceedanceSettings settings, ExceedanceModel model, String unavailable) {
        this.settings = settings;
        this.model = model;
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
            ExceedanceModel m = ExceedanceModel.prepare(MapConversion.physicsConditions(lifetime.conditions(),
                    ConversionSettings.of(physics)), defect, physics, settings.uncertainty(),
                    settings.thresholdPerCm3(), settings.samples(), settings.seed());
            return new ExceedanceLayer(settings, m, null);
        } catch (RuntimeException e) {
            return new ExceedanceLayer(settings, null, "probability of exceeding N* not available: "
                    + (e.getMessage() == null ? e.toString() : e.getMessage()));
        }
    }

    /** The settings it was prepared with. */
    public ExceedanceSettings settings() {
        return settings;
    }

    /** True when the model could be prepared. */
    public boolean available() {
        return model != null;
    }

    /** Why the model could not be prepared, or null. */
    public String unavailableReason() {
        return unavailable;
    }

    /** P(N_t > N*) of a pixel measured at {@code tauUs} µs (0–1), NaN when unavailable or not convertible. */
    public double probabilityAt(double tauUs) {
        return model == null ? Double.NaN : model.probability((float) tauUs);
    }

    /** The {@code q} quantile of N_t at {@code tauUs} µs, cm⁻³; NaN when unavailable or not convertible. */
    public double quantileAt(double tauUs, double q) {
        return model == null ? Double.NaN : model.quantile((float) tauUs, q);
    }

    /**
     * The probability map of {@code lifetime} (0–1 per pixel, NaN where the lifetime is not converted).
     *
     * @throws IllegalArgumentException with the reason when the model is not available
     */
    public WaferMap probabilityMap(WaferMap lifetime) {
        if (model == null) {
            throw new IllegalArgumentException(unavailable);
        }
        float[] out = new float[lifetime.width() * lifetime.height()];
        model.probabilities(lifetime.raster().samples(), out);
        return lifetime.derive(FloatRaster.wrap(lifetime.width(), lifetime.height(), out), Quantity.FRACTION,
                ProcessingStep.of("exceedance-probability", "threshold_cm3", Double.toString(
                        settings.thresholdPerCm3()), "samples", Integer.toString(settings.samples()), "seed",
                        Long.toString(settings.seed())));
    }

    /** The colour bar's label, e.g. {@code P(N_t > 3e11 cm⁻³)}. */
    public static String legend(ExceedanceSettings s) {
        return "P(N_t > " + Units.number(s.thresholdPerCm3()) + " cm⁻³)";
    }
}
