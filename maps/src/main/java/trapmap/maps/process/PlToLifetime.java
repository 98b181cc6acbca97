package trapmap.maps.process;

import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.ProcessingStep;
import trapmap.physics.pl.PlCalibration;
import trapmap.shared.error.InvalidValueException;

/**
 * PL counts to effective lifetime (µs) under a map's conditions: Δn = (−N_dop + sqrt(N_dop² + 4I/A))/2, τ = Δn/G
 * ({@link PlCalibration}); the step {@link MapConversion#lifetimeFromPl} records. Pixel by pixel, so that whole maps
 * and bands of rows give the same lifetimes.
 */
record PlToLifetime(PlCalibration calibration, double generationPerCm3PerS, ProcessingStep step) {

    /**
     * The conversion under {@code c}.
     *
     * @throws InvalidValueException when the calibration constant, the doping or the generation rate is missing
     */
    static PlToLifetime of(MeasurementConditions c) {
        if (c.plCalibration() == null) {
            throw new InvalidValueException("plCalibration", "counts*cm^6", "the PL calibration constant is unknown");
        }
        if (c.doping() == null) {
            throw new InvalidValueException("doping", "cm^-3", "doping is unknown");
        }
        if (c.generationPerCm3PerS() == null) {
            throw new InvalidValueException("generation", "cm^-3 s^-1", "a PL map needs its generation rate");
        }
        PlCalibration cal = new PlCalibration(c.plCalibration(), c.doping().densityPerCm3());
        double g = c.generationPerCm3PerS();
        return new PlToLifetime(cal, g, ProcessingStep.of("pl-to-lifetime", "calibration_counts_cm6",
                Double.toString(c.plCalibration()), "generation_cm3_s", Double.toString(g), "doping_cm3",
                Double.toString(c.doping().densityPerCm3())));
    }

    /** The lifetime (µs) of one pixel's counts; NaN (no data) stays NaN. */
    double lifetimeUs(double counts) {
        return counts != counts ? Double.NaN : calibration.lifetimeUs(counts, generationPerCm3PerS);
    }

    /** Converts {@code s[from, to)} in place, as {@link trapmap.maps.raster.FloatRaster#map} does. */
    void apply(float[] s, int from, int to) {
        for (int i = from; i < to; i++) {
            s[i] = (float) lifetimeUs(s[i]);
        }
    }
}
