package trapmap.physics.conversion;

import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.recombination.RadiativeCoefficient;
import trapmap.shared.check.Checks;

/**
 * Measurement conditions of a lifetime map: everything besides the defect that the conversion needs.
 *
 * @param doping                 net doping and type
 * @param silicon                band parameters at the measurement temperature (with the thermal-velocity model)
 * @param injection              fixed Δn or steady-state generation rate
 * @param surface                surface passivation ({@link Surface#IDEAL} for none)
 * @param radiativeCm3PerS       low-injection radiative coefficient B_low, cm³/s
 * @param detectionResolution    relative lifetime change that counts as detectable, for the detection limit of
 *                               {@link PixelStatus#BELOW_LIMIT} pixels (default 0.05)
 * @param referenceInjectionPerCm3 Δn at which harmonised lifetimes are reported, cm^-3 (NaN: none)
 */
public record Conditions(Doping doping, Silicon silicon, Injection injection, Surface surface,
                         double radiativeCm3PerS, double detectionResolution, double referenceInjectionPerCm3) {

    /**
     * Default relative lifetime resolution: lifetimes that differ by less than 5 % are treated as equal (common
     * practice, e.g. τ ratios within ±5 % of unity read as "no detectable iron").
     */
    public static final double DEFAULT_RESOLUTION = 0.05;

    public Conditions {
        Checks.notNull(doping, "doping");
        Checks.notNull(silicon, "silicon");
        Checks.notNull(injection, "injection");
        Checks.notNull(surface, "surface");
        Checks.positive(radiativeCm3PerS, "radiativeCoefficient", "cm^3/s");
        Checks.inRange(detectionResolution, 1e-6, 1, "detectionResolution", "");
        if (!Double.isNaN(referenceInjectionPerCm3)) {
            Checks.inRange(referenceInjectionPerCm3, 1e6, 1e19, "referenceInjection", "cm^-3");
        }
    }

    /** Default conditions at 300 K, ideal surfaces. */
    public static Conditions of(Doping doping, Injection injection) {
        return new Conditions(doping, Silicon.at(300), injection, Surface.IDEAL,
                RadiativeCoefficient.TRUPKE_2003_CM3_PER_S, DEFAULT_RESOLUTION, Double.NaN);
    }

    public Conditions withSilicon(Silicon s) {
        return new Conditions(doping, s, injection, surface, radiativeCm3PerS, detectionResolution,
                referenceInjectionPerCm3);
    }

    public Conditions withSurface(Surface s) {
        return new Conditions(doping, silicon, injection, s, radiativeCm3PerS, detectionResolution,
                referenceInjectionPerCm3);
    }

    public Conditions withInjection(Injection i) {
        return new Conditions(doping, silicon, i, surface, radiativeCm3PerS, detectionResolution,
                referenceInjectionPerCm3);
    }

    public Conditions withReferenceInjection(double perCm3) {
        return new Conditions(doping, silicon, injection, surface, radiativeCm3PerS, detectionResolution, perCm3);
    }

    public Conditions withDetectionResolution(double relative) {
        return new Conditions(doping, silicon, injection, surface, radiativeCm3PerS, relative,
                referenceInjectionPerCm3);
    }
}
