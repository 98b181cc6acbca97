package trapmap.physics.pl;

import trapmap.shared.check.Checks;
import trapmap.shared.units.Units;

/**
 * Photoluminescence signal model I = A·Δn·(Δn + N_dop) (Trupke et al., APL 89, 044107 (2006), from memory), with
 * A absorbing optics, camera response and the radiative coefficient. Inverted in closed form:
 * Δn = (−N_dop + sqrt(N_dop² + 4I/A))/2, evaluated as 2(I/A)/(N_dop + sqrt(N_dop² + 4I/A)) to avoid
 * cancellation at low injection. Steady state: τ_eff = Δn/G.
 *
 * @param constant       A, counts·cm^6
 * @param dopingPerCm3   net doping N_dop, cm^-3
 */
public record PlCalibration(double constant, double dopingPerCm3) {

    public PlCalibration {
        Checks.positive(constant, "calibrationConstant", "counts*cm^6");
        Checks.positive(dopingPerCm3, "doping", "cm^-3");
    }

    /**
     * Calibrates A from a reference of known effective lifetime at generation rate G: Δn_ref = G·τ_ref,
     * A = I_ref/(Δn_ref (Δn_ref + N_dop)).
     */
    public static PlCalibration fromReference(double referenceCounts, double referenceLifetimeUs,
                                              double generationPerCm3PerS, double dopingPerCm3) {
        Checks.positive(referenceCounts, "referenceCounts", "counts");
        Checks.positive(referenceLifetimeUs, "referenceLifetime", "us");
        Checks.positive(generationPerCm3PerS, "generation", "cm^-3 s^-1");
        Checks.positive(dopingPerCm3, "doping", "cm^-3");
        double dn = generationPerCm3PerS * referenceLifetimeUs * Units.S_PER_US;
        return new PlCalibration(referenceCounts / (dn * (dn + dopingPerCm3)), dopingPerCm3);
    }

    /** Δn from PL counts, cm^-3 (NaN for negative or non-finite counts, 0 for zero counts). */
    public double injectionPerCm3(double counts) {
        if (!(counts >= 0) || Double.isInfinite(counts)) {
            return Double.NaN;
        }
        double r = counts / constant;
        return 2 * r / (dopingPerCm3 + Math.sqrt(dopingPerCm3 * dopingPerCm3 + 4 * r));
    }

    /** Steady-state effective lifetime τ_eff = Δn/G from PL counts, µs. */
    public double lifetimeUs(double counts, double generationPerCm3PerS) {
        Checks.positive(generationPerCm3PerS, "generation", "cm^-3 s^-1");
        return injectionPerCm3(counts) / generationPerCm3PerS * Units.US_PER_S;
    }

    /** The counts expected for excess density {@code dn}. */
    public double counts(double dn) {
        return constant * dn * (dn + dopingPerCm3);
    }
}
