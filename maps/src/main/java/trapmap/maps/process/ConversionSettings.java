package trapmap.maps.process;

import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.recombination.SurfaceModel;
import trapmap.shared.check.Checks;

/**
 * What a map conversion needs besides the measurement conditions and the defect: the physics settings (one
 * {@link PhysicsSettings} object shared by every face) and the reference injection of harmonised lifetimes.
 *
 * @param physics                  model choices
 * @param referenceInjectionPerCm3 Δn for harmonised lifetimes, cm^-3 (NaN: none)
 */
public record ConversionSettings(PhysicsSettings physics, double referenceInjectionPerCm3) {
    /** The normative defaults. */
    public static final ConversionSettings DEFAULTS = new ConversionSettings(PhysicsSettings.DEFAULTS, Double.NaN);

    public ConversionSettings {
        Checks.notNull(physics, "physics");
    }

    /** The given physics settings, no reference injection. */
    public static ConversionSettings of(PhysicsSettings physics) {
        return new ConversionSettings(physics, Double.NaN);
    }

    public ThermalVelocityModel velocities() {
        return physics.velocities();
    }

    public SurfaceModel surfaceModel() {
        return physics.surfaceModel();
    }

    public double detectionResolution() {
        return physics.detectionResolution();
    }

    public ConversionSettings withReferenceInjection(double perCm3) {
        return new ConversionSettings(physics, perCm3);
    }

    public ConversionSettings withPhysics(PhysicsSettings p) {
        return new ConversionSettings(p, referenceInjectionPerCm3);
    }

    public ConversionSettings withVelocities(ThermalVelocityModel v) {
        return withPhysics(physics.withVelocities(v));
    }

    public ConversionSettings withSurfaceModel(SurfaceModel m) {
        return withPhysics(physics.withSurfaceModel(m));
    }
}
