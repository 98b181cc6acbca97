package trapmap.physics.material;

import trapmap.shared.check.Checks;

/**
 * Net doping of a wafer: type and net dopant density (boron for p-type, phosphorus for n-type), full ionisation.
 * <p>
 * Validity range of the equilibrium model ({@link #equilibrium}: Boltzmann statistics, full ionisation, no
 * band-gap narrowing): doping up to {@link #BOLTZMANN_LIMIT_PER_CM3} and temperatures from
 * {@link #FULL_IONISATION_MIN_TEMPERATURE_K}. Above 1e18 cm^-3 the Fermi level comes within about 3.4 kT of the
 * band edge (E_F − E_v = kT ln(N_v/p0) = 89 meV at 300 K), where the Fermi–Dirac occupation starts to depart
 * from the Boltzmann form, band-gap narrowing reaches about one kT (Schenk, JAP 84, 3684 (1998); Yan &amp; Cuevas,
 * JAP 114, 044508 (2013); magnitude from memory) so that n_i,eff² exceeds n_i² by about e, and boron is no longer
 * fully ionised at 300 K (Altermatt et al., JAP 100, 113714 (2006), from memory). Below about 200 K dopants
 * freeze out (the ionised fraction falls with 1/T); the model assumes them all ionised. Outside these ranges a
 * conversion carries {@code ConversionWarning.DOPING_ABOVE_BOLTZMANN} or
 * {@code ConversionWarning.DOPANT_FREEZE_OUT}.
 *
 * @param type          conductivity type
 * @param densityPerCm3 net dopant density |N_A − N_D|, cm^-3
 */
public record Doping(ConductivityType type, double densityPerCm3) {

    /** Lowest net doping accepted, cm^-3. */
    public static final double MIN_DENSITY_PER_CM3 = 1e10;
    /** Highest net doping accepted, cm^-3 (non-degenerate silicon). */
    public static final double MAX_DENSITY_PER_CM3 = 1e19;

    /**
     * Highest net doping for which Boltzmann statistics without band-gap narrowing and full ionisation are used
     * without a warning, cm^-3 (see the class comment for why 1e18).
     */
    public static final double BOLTZMANN_LIMIT_PER_CM3 = 1e18;
    /** Lowest temperature at which full ionisation of the dopants is assumed without a warning, K (freeze-out). */
    public static final double FULL_IONISATION_MIN_TEMPERATURE_K = 200;

    public Doping {
        Checks.notNull(type, "doping type");
        Checks.inRange(densityPerCm3, MIN_DENSITY_PER_CM3, MAX_DENSITY_PER_CM3, "doping", "cm^-3");
    }

    /** p-type (boron) with the given acceptor density, cm^-3. */
    public static Doping pType(double acceptorsPerCm3) {
        return new Doping(ConductivityType.P, acceptorsPerCm3);
    }

    /** n-type (phosphorus) with the given donor density, cm^-3. */
    public static Doping nType(double donorsPerCm3) {
        return new Doping(ConductivityType.N, donorsPerCm3);
    }

    /** Doping from a resistivity measured at 23 °C, by ASTM F723 (boron for p-type, phosphorus for n-type). */
    public static Doping fromResistivity(ConductivityType type, double resistivityOhmCm) {
        double n = type == ConductivityType.P ? AstmF723.boronPerCm3(resistivityOhmCm)
                : AstmF723.phosphorusPerCm3(resistivityOhmCm);
        return new Doping(type, n);
    }

    /**
     * Parses a doping text such as {@code p:1e16} (cm^-3) or {@code n:2ohmcm} (Ω·cm, ASTM F723); see
     * {@link DopingText} for the notation.
     *
     * @throws trapmap.shared.error.InvalidValueException with field {@code doping}, the unit, and the rule broken
     */
    public static Doping parse(String text) {
        return DopingText.parse(text).doping();
    }

    /** Resistivity at 23 °C by ASTM F723, Ω·cm. */
    public double resistivityOhmCm() {
        return type == ConductivityType.P ? AstmF723.boronResistivityOhmCm(densityPerCm3)
                : AstmF723.phosphorusResistivityOhmCm(densityPerCm3);
    }

    /** Acceptor density N_A, cm^-3 (zero for n-type). */
    public double acceptorsPerCm3() {
        return type == ConductivityType.P ? densityPerCm3 : 0;
    }

    /** Donor density N_D, cm^-3 (zero for p-type). */
    public double donorsPerCm3() {
        return type == ConductivityType.N ? densityPerCm3 : 0;
    }

    /**
     * Equilibrium carrier densities with full ionisation: majority = N/2 + sqrt(N²/4 + n_i²),
     * minority = n_i²/majority.
     */
    public Carriers equilibrium(double intrinsicPerCm3) {
        double half = densityPerCm3 / 2;
        double majority = half + Math.sqrt(half * half + intrinsicPerCm3 * intrinsicPerCm3);
        double minority = intrinsicPerCm3 * intrinsicPerCm3 / majority;
        return type == ConductivityType.P ? new Carriers(minority, majority) : new Carriers(majority, minority);
    }

    @Override
    public String toString() {
        return (type == ConductivityType.P ? "p:" : "n:") + densityPerCm3;
    }
}
