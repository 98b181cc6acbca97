package trapmap.physics.material;

import trapmap.physics.constants.PhysicalConstants;

/** Effective densities of states N_c(T), N_v(T) of silicon, cm^-3. */
public enum DensityOfStatesModel {
    /** Default. Green, JAP 67, 2944 (1990): N_c = 2.86e19 (T/300)^1.58, N_v = 3.10e19 (T/300)^1.85. */
    GREEN_1990("Green, JAP 67, 2944 (1990)") {
        @Override
        public double conductionPerCm3(double t) {
            return 2.86e19 * Math.pow(t / 300.0, 1.58);
        }

        @Override
        public double valencePerCm3(double t) {
            return 3.10e19 * Math.pow(t / 300.0, 1.85);
        }
    },
    /** Couderc, Amara &amp; Lemiti, JAP 115, 093705 (2014): 2(2π m0 kT/h²)^(3/2) times a cubic in T. */
    COUDERC_2014("Couderc, Amara & Lemiti, JAP 115, 093705 (2014)") {
        @Override
        public double conductionPerCm3(double t) {
            return freeElectronPerCm3(t) * (((-4.609e-10 * t + 6.7523e-7) * t - 1.312e-5) * t + 1.094);
        }

        @Override
        public double valencePerCm3(double t) {
            return freeElectronPerCm3(t) * (((2.525e-9 * t - 4.689e-6) * t + 3.376e-3) * t + 0.3426);
        }
    };

    private final String source;

    DensityOfStatesModel(String source) {
        this.source = source;
    }

    public abstract double conductionPerCm3(double temperatureK);

    public abstract double valencePerCm3(double temperatureK);

    public String source() {
        return source;
    }

    static double freeElectronPerCm3(double t) {
        double base = 2 * Math.PI * PhysicalConstants.ELECTRON_MASS_KG * PhysicalConstants.BOLTZMANN_J_PER_K * t
                / (PhysicalConstants.PLANCK_J_S * PhysicalConstants.PLANCK_J_S);
        return 2 * Math.pow(base, 1.5) / 1e6;
    }
}
