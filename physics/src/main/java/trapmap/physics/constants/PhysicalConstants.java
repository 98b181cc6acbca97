package trapmap.physics.constants;

/** Physical constants, CODATA 2018 exact or recommended values, with units in their names. */
public final class PhysicalConstants {
    /** Boltzmann constant, eV/K (CODATA 2018, exact). */
    public static final double BOLTZMANN_EV_PER_K = 8.617333262e-5;
    /** Boltzmann constant, J/K (CODATA 2018, exact). */
    public static final double BOLTZMANN_J_PER_K = 1.380649e-23;
    /** Elementary charge, C (CODATA 2018, exact). */
    public static final double ELEMENTARY_CHARGE_C = 1.602176634e-19;
    /** Planck constant, J s (CODATA 2018, exact). */
    public static final double PLANCK_J_S = 6.62607015e-34;
    /** Electron rest mass, kg (CODATA 2018). */
    public static final double ELECTRON_MASS_KG = 9.1093837015e-31;
    /** Speed of light in vacuum, m/s (exact). */
    public static final double SPEED_OF_LIGHT_M_PER_S = 2.99792458e8;
    /** Reference temperature of the default models, K. */
    public static final double REFERENCE_TEMPERATURE_K = 300.0;

    private PhysicalConstants() {
    }

    /** Thermal energy kT in eV at temperature {@code temperatureK}. */
    public static double thermalEnergyEv(double temperatureK) {
        return BOLTZMANN_EV_PER_K * temperatureK;
    }
}
