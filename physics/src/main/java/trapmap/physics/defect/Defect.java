package trapmap.physics.defect;

import trapmap.physics.material.ThermalVelocityModel;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;

/**
 * A recombination-active defect with a single effective SRH level.
 *
 * @param id                       short identifier, e.g. {@code fe-i}
 * @param name                     descriptive name
 * @param level                    energy level and degeneracy
 * @param electronCrossSectionCm2  σ_n, cm² (NaN when no absolute value is published)
 * @param holeCrossSectionCm2      σ_p, cm² (NaN when no absolute value is published)
 * @param captureRatio             k = σ_n/σ_p (for defects with absolute cross-sections it must equal their ratio)
 * @param velocityConvention       the thermal-velocity convention the cross-sections were published with
 * @param source                   literature source of the parameters
 * @param spread                   published spread of each parameter (null when none is known)
 */
public record Defect(String id, String name, TrapLevel level, double electronCrossSectionCm2,
                     double holeCrossSectionCm2, double captureRatio, ThermalVelocityModel velocityConvention,
                     String source, ParameterSpread spread) {

    /** Smallest capture cross-section accepted, cm². */
    public static final double MIN_CROSS_SECTION_CM2 = 1e-25;
    /** Largest capture cross-section accepted, cm². */
    public static final double MAX_CROSS_SECTION_CM2 = 1e-10;

    public Defect {
        Checks.notNull(id, "id");
        if (!id.matches("[a-z0-9][a-z0-9_.-]{0,39}")) {
            throw new InvalidValueException("id", "", "defect id '" + id
                    + "' must be 1-40 lower-case letters, digits, '-', '_' or '.'");
        }
        Checks.notNull(level, "level");
        Checks.notNull(velocityConvention, "velocityConvention");
        boolean hasSigmaN = !Double.isNaN(electronCrossSectionCm2);
        boolean hasSigmaP = !Double.isNaN(holeCrossSectionCm2);
        if (hasSigmaN != hasSigmaP) {
            throw new InvalidValueException(hasSigmaN ? "sigma_p" : "sigma_n", "cm^2", "defect '" + id
                    + "' needs both capture cross-sections sigma_n and sigma_p (cm^2) or neither");
        }
        if (hasSigmaN) {
            Checks.inRange(electronCrossSectionCm2, MIN_CROSS_SECTION_CM2, MAX_CROSS_SECTION_CM2, "sigma_n", "cm^2");
            Checks.inRange(holeCrossSectionCm2, MIN_CROSS_SECTION_CM2, MAX_CROSS_SECTION_CM2, "sigma_p", "cm^2");
            Checks.positive(captureRatio, "captureRatio", "");
            double k = electronCrossSectionCm2 / holeCrossSectionCm2;
            if (Math.abs(k - captureRatio) > 1e-9 * k) {
                throw new InvalidValueException("captureRatio", "", "defect '" + id + "': captureRatio " + captureRatio
                        + " differs from sigma_n/sigma_p = " + k);
            }
        } else {
            Checks.positive(captureRatio, "captureRatio", "");
        }
        source = source == null ? "" : source;
    }

    /** A defect with absolute cross-sections; k is their ratio. */
    public static Defect of(String id, String name, TrapLevel level, double sigmaNCm2, double sigmaPCm2,
                            ThermalVelocityModel convention, String source, ParameterSpread spread) {
        return new Defect(id, name, level, sigmaNCm2, sigmaPCm2, sigmaNCm2 / sigmaPCm2, convention, source,
                spread);
    }

    /** True when absolute cross-sections are published, so that a trap density can be computed. */
    public boolean hasAbsoluteCrossSections() {
        return !Double.isNaN(electronCrossSectionCm2);
    }

    /**
     * Throws when no absolute density can be computed for this defect, with the reason.
     *
     * @throws InvalidValueException naming the defect and what to use instead
     */
    public void requireAbsoluteCrossSections() {
        if (!hasAbsoluteCrossSections()) {
            throw new InvalidValueException("defect", "", "defect '" + id + "' has no published absolute capture"
                    + " cross-section, so a single lifetime map cannot give its density; use a degraded/annealed"
                    + " pair and the normalised density N_t* = 1/tau_degraded - 1/tau_annealed (1/us)");
        }
    }

    /** The same defect with other level energy and cross-sections (for bounds over the spread). */
    public Defect withParameters(double energyEv, double sigmaNCm2, double sigmaPCm2) {
        return of(id, name, level.withEnergy(energyEv), sigmaNCm2, sigmaPCm2, velocityConvention, source, spread);
    }
}
