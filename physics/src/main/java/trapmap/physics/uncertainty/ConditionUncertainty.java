package trapmap.physics.uncertainty;

import trapmap.shared.check.Checks;

/**
 * Standard uncertainties of a wafer's measurement conditions and of its measured lifetimes, for the Monte Carlo of
 * {@link ExceedanceModel}. Every positive quantity is drawn log-normally around its nominal value (median = nominal,
 * standard deviation of the natural logarithm = the relative uncertainty given here; for small values this is the
 * relative standard uncertainty to first order, and the draw never turns a density, thickness or velocity
 * negative). The temperature is drawn normally with an absolute standard uncertainty. All draws are independent.
 * <p>
 * The defaults ({@link #DEFAULTS}) are engineering judgements of what a routine measurement knows, not published
 * constants: doping 5 % (resistivity by four-point probe with a mobility model), thickness 2 % (about ±4 µm on a
 * 180 µm wafer), surface recombination velocity 50 % (passivated surfaces are rarely known better than a factor of
 * about 1.5), injection 10 % (Δn from a photoconductance or photoluminescence calibration), temperature 1 K, and a
 * 3 % relative noise of each measured lifetime. A value of 0 fixes the quantity at its nominal value.
 *
 * @param dopingRelative    relative standard uncertainty of the net doping density (log-normal), dimensionless
 * @param thicknessRelative relative standard uncertainty of the wafer thickness (log-normal), dimensionless
 * @param srvRelative       relative standard uncertainty of the surface recombination velocity (log-normal)
 * @param injectionRelative relative standard uncertainty of the fixed excess carrier density Δn (log-normal)
 * @param temperatureK      absolute standard uncertainty of the temperature (normal), K
 * @param lifetimeRelative  relative noise of a measured effective lifetime (log-normal), dimensionless
 */
public record ConditionUncertainty(double dopingRelative, double thicknessRelative, double srvRelative,
                                   double injectionRelative, double temperatureK, double lifetimeRelative) {

    /** Largest relative uncertainty accepted (the log-normal draw spans a factor e per unit). */
    public static final double MAX_RELATIVE = 2;
    /** Largest temperature uncertainty accepted, K. */
    public static final double MAX_TEMPERATURE_K = 50;

    /** The documented defaults (see the class comment). */
    public static final ConditionUncertainty DEFAULTS = new ConditionUncertainty(0.05, 0.02, 0.5, 0.1, 1, 0.03);
    /** No condition or lifetime uncertainty: only the defect's parameter spread is sampled. */
    public static final ConditionUncertainty NONE = new ConditionUncertainty(0, 0, 0, 0, 0, 0);

    public ConditionUncertainty {
        Checks.inRange(dopingRelative, 0, MAX_RELATIVE, "doping_uncertainty", "relative");
        Checks.inRange(thicknessRelative, 0, MAX_RELATIVE, "thickness_uncertainty", "relative");
        Checks.inRange(srvRelative, 0, MAX_RELATIVE, "srv_uncertainty", "relative");
        Checks.inRange(injectionRelative, 0, MAX_RELATIVE, "injection_uncertainty", "relative");
        Checks.inRange(temperatureK, 0, MAX_TEMPERATURE_K, "temperature_uncertainty", "K");
        Checks.inRange(lifetimeRelative, 0, MAX_RELATIVE, "lifetime_uncertainty", "relative");
    }

    public ConditionUncertainty withLifetimeRelative(double relative) {
        return new ConditionUncertainty(dopingRelative, thicknessRelative, srvRelative, injectionRelative,
                temperatureK, relative);
    }
}
