package trapmap.physics.material;

import trapmap.physics.constants.PhysicalConstants;

/**
 * Thermal velocities of electrons and holes, cm/s. Capture cross-sections are only meaningful together with the
 * thermal velocity under which they were published, because only the product σ·v_th (the capture coefficient) is
 * measured.
 */
public enum ThermalVelocityModel {
    /**
     * Default. 1.1e7 cm/s for both carriers at 300 K, scaled by sqrt(T/300): the convention under which the default
     * defect cross-sections were published (Macdonald et al.; attributed to Bullis 1996).
     */
    FIXED("1.1e7 cm/s at 300 K for electrons and holes, scaled by sqrt(T/300) (Macdonald et al. convention)") {
        @Override
        public double electronCmPerS(double t) {
            return 1.1e7 * Math.sqrt(t / 300.0);
        }

        @Override
        public double holeCmPerS(double t) {
            return 1.1e7 * Math.sqrt(t / 300.0);
        }
    },
    /**
     * Green, JAP 67, 2944 (1990): thermal effective masses; 2.0457e7 (electrons) and 1.6879e7 cm/s (holes) at 300 K.
     */
    GREEN_1990("Green, JAP 67, 2944 (1990), thermal effective masses") {
        @Override
        public double electronCmPerS(double t) {
            double m0 = PhysicalConstants.ELECTRON_MASS_KG;
            double ml = 0.9163 * m0;
            double mt = 0.1905 * m0 * BandGap.green1990Ev(0.0) / BandGap.green1990Ev(t);
            double d = Math.sqrt((ml - mt) / ml);
            double sq = 1 + Math.sqrt(ml / mt) * Math.asin(d) / d;
            double mthc = 4 * ml / (sq * sq);
            return speedCmPerS(t, mthc);
        }

        @Override
        public double holeCmPerS(double t) {
            double[] c = {0.3676, 0, 1.98738e-5, -2.588144e-7, 1.415372e-9, -3.919169e-12, 5.410849e-15,
                -2.959797e-18};
            double m = 0;
            for (int i = c.length - 1; i >= 0; i--) {
                m = m * t + c[i];
            }
            return speedCmPerS(t, m * PhysicalConstants.ELECTRON_MASS_KG);
        }
    };

    private final String description;

    ThermalVelocityModel(String description) {
        this.description = description;
    }

    public abstract double electronCmPerS(double temperatureK);

    public abstract double holeCmPerS(double temperatureK);

    public String description() {
        return description;
    }

    private static double speedCmPerS(double t, double massKg) {
        return 100 * Math.sqrt(8 * PhysicalConstants.BOLTZMANN_J_PER_K * t / (Math.PI * massKg));
    }
}
