package trapmap.physics.recombination;

/**
 * Radiative recombination coefficient B = B_low·B_rel. B_low = 4.73e-15 cm³/s at 300 K (Trupke et al., JAP 94,
 * 4930 (2003)); B_rel, the reduction by Coulomb screening at high carrier density, by Altermatt et al., NUSOD 2005
 * (as corrected in Altermatt 2011, factor 2 in b1 and b3).
 */
public final class RadiativeCoefficient {
    /** B_low at 300 K, cm³/s (Trupke et al., JAP 94, 4930 (2003)). */
    public static final double TRUPKE_2003_CM3_PER_S = 4.73e-15;

    private RadiativeCoefficient() {
    }

    /** B_rel(n + p, T) of Altermatt et al. (2005), dimensionless, 1 at low carrier density. */
    public static double relative(double electronsPlusHolesPerCm3, double temperatureK) {
        Screening s = Screening.at(temperatureK);
        return s.relative(electronsPlusHolesPerCm3);
    }

    /**
     * Cubic log–log fit to Trupke's Table I, B_low(T) in cm³/s: 4.727e-15 at 300 K. Used only when the user asks for
     * a temperature-dependent B_low; the default is the constant {@link #TRUPKE_2003_CM3_PER_S}.
     */
    public static double trupkeFitCm3PerS(double temperatureK) {
        double x = Math.log10(temperatureK);
        return Math.pow(10, ((-2.28765176 * x + 17.94655444) * x - 47.53455728) * x + 28.07323491);
    }

    /**
     * Temperature-dependent constants of B_rel, computed once per map:
     * <pre>
     * B_rel(n+p) = b_min + (1 − b_min)/(1 + ((n+p)/b1)^0.54 + ((n+p)/b3)^1.25)
     * b_min = 0.2 − 0.2/(1 + (T/320)^2.5)
     * b1 = 2 [1.5e18 + (1e7 − 1.5e18)/(1 + (T/550)^3)]
     * b3 = 2 [4e18 + (1e9 − 4e18)/(1 + (T/365)^3.54)]
     * </pre>
     * Per carrier density the powers are evaluated without {@code Math.pow}: ((n+p)/b1)^0.54 =
     * (n+p)^0.54·b1^−0.54 with {@link IntrinsicLifetime.Power}, and x^1.25 = x·√√x with x = (n+p)/b3. Both agree
     * with the powers to a few units in the last place.
     */
    static final class Screening {
        private static final IntrinsicLifetime.Power B2_POWER = new IntrinsicLifetime.Power(0.54);

        private final double bMin;
        /** 1 − b_min. */
        private final double bSpan;
        /** b1^−0.54. */
        private final double b1Factor;
        private final double invB3;

        private Screening(double bMin, double b1, double b3) {
            this.bMin = bMin;
            this.bSpan = 1.0 - bMin;
            this.b1Factor = Math.pow(b1, -0.54);
            this.invB3 = 1.0 / b3;
        }

        static Screening at(double t) {
            double bMin = 0.2 + (0.0 - 0.2) / (1 + Math.pow(t / 320.0, 2.5));
            double b1 = 2 * (1.5e18 + (1e7 - 1.5e18) / (1 + Math.pow(t / 550.0, 3)));
            double b3 = 2 * (4e18 + (1e9 - 4e18) / (1 + Math.pow(t / 365.0, 3.54)));
            return new Screening(bMin, b1, b3);
        }

        /** B_rel at n + p = {@code np} (> 0). */
        double relative(double np) {
            double x3 = np * invB3;
            return bMin + bSpan / (1 + B2_POWER.of(np) * b1Factor + x3 * Math.sqrt(Math.sqrt(x3)));
        }
    }
}
