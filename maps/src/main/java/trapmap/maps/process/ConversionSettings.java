package trapmap.maps.process;

import trapmap.physics.conversion.Conditions;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.recombination.SurfaceModel;

/**
 * Model choices of a map conversion that are not measurement conditions.
 *
 * @param velocities               thermal-velocity model
 * @param surfaceModel             surface-lifetime model
 * @param referenceInjectionPerCm3 Δn for harmonised lifetimes, cm^-3 (NaN: none)
 * @param detectionResolution      relative lifetime resolution for the detection limit
 */
public record ConversionSettings(ThermalVelocityModel velocities, SurfaceModel surfaceModel,
                                 double referenceInjectionPerCm3, double detectionResolution) {
    /** The normative defaults. */
    public static final ConversionSettings DEFAULTS = new ConversionSettings(ThermalVelocityModel.FIXED,
            SurfaceModel.SPROUL, Double.NaN, Conditions.DEFAULT_RESOLUTION);

    public ConversionSettings withReferenceInjection(double perCm3) {
        return new ConversionSettings(velocities, surfaceModel, perCm3, detectionResolution);
    }

    public ConversionSettings withVelocities(ThermalVelocityModel v) {
        return new ConversionSettings(v, surfaceModel, referenceInjectionPerCm3, detectionResolution);
    }

    public ConversionSettings withSurfaceModel(SurfaceModel m) {
        return new ConversionSettings(velocities, m, referenceInjectionPerCm3, detectionResolution);
    }
}
