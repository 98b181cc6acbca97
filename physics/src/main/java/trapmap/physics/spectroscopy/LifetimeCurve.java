package trapmap.physics.spectroscopy;

import java.util.Arrays;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;

/**
 * One τ_SRH(Δn) curve: the SRH lifetime measured at several injection levels, each with its relative standard
 * uncertainty. A level whose τ_SRH is not finite and positive (SRH not resolvable there, e.g. after subtracting
 * intrinsic recombination) is kept and reported as below the limit by the fits.
 *
 * @param injectionPerCm3     Δn of each level, cm^-3 (finite, positive)
 * @param tauSrhS             τ_SRH at each level, s (any value; only finite positive ones are used)
 * @param relativeUncertainty relative standard uncertainty of each τ_SRH (finite, positive; 0.03 is 3 %)
 */
public record LifetimeCurve(double[] injectionPerCm3, double[] tauSrhS, double[] relativeUncertainty) {

    /** Relative standard uncertainty of τ_SRH used when none is given: 3 % (project choice, check-values R-LIM-9). */
    public static final double DEFAULT_RELATIVE_UNCERTAINTY = 0.03;

    public LifetimeCurve {
        Checks.notNull(injectionPerCm3, "injection");
        Checks.notNull(tauSrhS, "tauSrh");
        Checks.notNull(relativeUncertainty, "relativeUncertainty");
        if (injectionPerCm3.length == 0) {
            throw new InvalidValueException("injection", "cm^-3", "a lifetime curve needs at least one injection"
                    + " level (cm^-3)");
        }
        if (tauSrhS.length != injectionPerCm3.length || relativeUncertainty.length != injectionPerCm3.length) {
            throw new InvalidValueException("tauSrh", "s", "a lifetime curve needs one tau_SRH (s) and one relative"
                    + " uncertainty per injection level: " + injectionPerCm3.length + " levels, "
                    + tauSrhS.length + " lifetimes, " + relativeUncertainty.length + " uncertainties");
        }
        for (int i = 0; i < injectionPerCm3.length; i++) {
            Checks.positive(Checks.finite(injectionPerCm3[i], "injection", "cm^-3"), "injection", "cm^-3");
            Checks.positive(Checks.finite(relativeUncertainty[i], "relativeUncertainty", ""),
                    "relativeUncertainty", "");
        }
        injectionPerCm3 = injectionPerCm3.clone();
        tauSrhS = tauSrhS.clone();
        relativeUncertainty = relativeUncertainty.clone();
    }

    /** A curve with the default 3 % relative uncertainty at every level. */
    public static LifetimeCurve of(double[] injectionPerCm3, double[] tauSrhS) {
        double[] u = new double[injectionPerCm3 == null ? 0 : injectionPerCm3.length];
        Arrays.fill(u, DEFAULT_RELATIVE_UNCERTAINTY);
        return new LifetimeCurve(injectionPerCm3, tauSrhS, u);
    }

    /**
     * A copy of {@code injectionPerCm3} checked as the levels of a curve (at least one, each finite and positive,
     * cm^-3), for fits prepared before their curves are known.
     */
    static double[] checkedLevels(double[] injectionPerCm3) {
        return of(injectionPerCm3, new double[injectionPerCm3 == null ? 0 : injectionPerCm3.length])
                .injectionPerCm3();
    }

    /** Number of levels. */
    public int size() {
        return injectionPerCm3.length;
    }

    /** True when level {@code i} can be fitted: its τ_SRH is finite and positive. */
    public boolean usable(int i) {
        return usable(tauSrhS[i]);
    }

    /** True when a τ_SRH (s) can be fitted: finite and positive. */
    static boolean usable(double tauSrhS) {
        return Double.isFinite(tauSrhS) && tauSrhS > 0;
    }

    /** Number of usable levels. */
    public int usableCount() {
        int n = 0;
        for (int i = 0; i < size(); i++) {
            if (usable(i)) {
                n++;
            }
        }
        return n;
    }

    @Override
    public double[] injectionPerCm3() {
        return injectionPerCm3.clone();
    }

    @Override
    public double[] tauSrhS() {
        return tauSrhS.clone();
    }

    @Override
    public double[] relativeUncertainty() {
        return relativeUncertainty.clone();
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof LifetimeCurve c && Arrays.equals(injectionPerCm3, c.injectionPerCm3)
                && Arrays.equals(tauSrhS, c.tauSrhS) && Arrays.equals(relativeUncertainty, c.relativeUncertainty);
    }

    @Override
    public int hashCode() {
        return 31 * (31 * Arrays.hashCode(injectionPerCm3) + Arrays.hashCode(tauSrhS))
                + Arrays.hashCode(relativeUncertainty);
    }

    @Override
    public String toString() {
        return "LifetimeCurve[injectionPerCm3=" + Arrays.toString(injectionPerCm3) + ", tauSrhS="
                + Arrays.toString(tauSrhS) + ", relativeUncertainty=" + Arrays.toString(relativeUncertainty) + "]";
    }
}
