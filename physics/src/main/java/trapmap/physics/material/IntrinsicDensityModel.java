package trapmap.physics.material;

import trapmap.physics.constants.PhysicalConstants;

/**
 * Models of the intrinsic carrier density n_i(T) of silicon, in cm^-3. Each has the temperature range its
 * temperature form was fitted over ({@link #validMinK()}, {@link #validMaxK()}); a conversion outside it carries
 * {@code ConversionWarning.TEMPERATURE_OUTSIDE_NI_FIT}.
 */
public enum IntrinsicDensityModel {
    /**
     * Default. 9.65e9 cm^-3 at 300 K (Altermatt et al., JAP 93, 1598 (2003)); other temperatures by the
     * temperature form of Sproul &amp; Green, JAP 70, 846 (1991): n_i(T) = 9.65e9 (T/300)^2 exp(6880/300 − 6880/T).
     */
    ALTERMATT_2003("Altermatt et al., JAP 93, 1598 (2003); T-dependence of Sproul & Green, JAP 70, 846 (1991)",
            275, 375) {
        @Override
        public double densityPerCm3(double t) {
            return 9.65e9 * (t / 300.0) * (t / 300.0) * Math.exp(6880.0 / 300.0 - 6880.0 / t);
        }
    },
    /** Sproul &amp; Green, JAP 70, 846 (1991): 1.016666667e15 T^2 exp(−6880/T), fitted over 275–375 K. */
    SPROUL_GREEN_1991("Sproul & Green, JAP 70, 846 (1991)", 275, 375) {
        @Override
        public double densityPerCm3(double t) {
            return 1.016666667e15 * t * t * Math.exp(-6880.0 / t);
        }
    },
    /** Misiakos &amp; Tsamakis, JAP 74, 3293 (1993): 5.29e19 (T/300)^2.54 exp(−6726/T), 78–340 K. */
    MISIAKOS_1993("Misiakos & Tsamakis, JAP 74, 3293 (1993)", 78, 340) {
        @Override
        public double densityPerCm3(double t) {
            return 5.29e19 * Math.pow(t / 300.0, 2.54) * Math.exp(-6726.0 / t);
        }
    },
    /**
     * Couderc, Amara &amp; Lemiti, JAP 115, 093705 (2014): 1.541e15 T^1.712 exp(−E_g(T)/2kT) with the Paessler
     * band gap, 77–375 K.
     */
    COUDERC_2014("Couderc, Amara & Lemiti, JAP 115, 093705 (2014)", 77, 375) {
        @Override
        public double densityPerCm3(double t) {
            return 1.541e15 * Math.pow(t, 1.712)
                    * Math.exp(-BandGap.paesslerEv(t) / (2 * PhysicalConstants.thermalEnergyEv(t)));
        }
    };

    private final String source;
    private final double validMinK;
    private final double validMaxK;

    IntrinsicDensityModel(String source, double validMinK, double validMaxK) {
        this.source = source;
        this.validMinK = validMinK;
        this.validMaxK = validMaxK;
    }

    /** Lowest temperature of the range the model's temperature form was fitted over, K. */
    public double validMinK() {
        return validMinK;
    }

    /** Highest temperature of the range the model's temperature form was fitted over, K. */
    public double validMaxK() {
        return validMaxK;
    }

    /** True when {@code temperatureK} lies in the fitted range. */
    public boolean covers(double temperatureK) {
        return temperatureK >= validMinK && temperatureK <= validMaxK;
    }

    /** n_i at temperature {@code temperatureK}, cm^-3. */
    public abstract double densityPerCm3(double temperatureK);

    public String source() {
        return source;
    }
}
