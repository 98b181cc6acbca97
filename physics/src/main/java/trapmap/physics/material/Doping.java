package trapmap.physics.material;

import trapmap.shared.check.Checks;

/**
 * Net doping of a wafer: type and net dopant density (boron for p-type, phosphorus for n-type), full ionisation.
 *
 * @param type          conductivity type
 * @param densityPerCm3 net dopant density |N_A − N_D|, cm^-3
 */
public record Doping(ConductivityType type, double densityPerCm3) {

    /** Lowest net doping accepted, cm^-3. */
    public static final double MIN_DENSITY_PER_CM3 = 1e10;
    /** Highest net doping accepted, cm^-3 (non-degenerate silicon). */
    public static final double MAX_DENSITY_PER_CM3 = 1e19;

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
