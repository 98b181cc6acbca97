package trapmap.physics.recombination;

import trapmap.physics.material.Carriers;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.shared.check.Checks;

/**
 * Intrinsic (Auger + radiative) lifetime of Richter et al., PRB 86, 165202 (2012), Table II coefficients, valid at
 * 300 K, with B_low of Trupke et al. (2003) and B_rel of Altermatt et al. (2005); n_i,eff = n_i (no band-gap
 * narrowing). Validity range: 300 K (±{@link #TEMPERATURE_TOLERANCE_K} K is treated as 300 K); the fit covers
 * doping and injection from about 1e13 to 1e20 cm^-3 (from memory of the paper's data range).
 * <pre>
 * 1/τ_intr = (n p − n_i²)/Δn · [2.5e-31 g_eeh n0 + 8.5e-32 g_ehh p0 + 3.0e-29 Δn^0.92 + B_rel B_low]
 * g_eeh = 1 + 13 [1 − tanh((n0/3.3e17)^0.66)],  g_ehh = 1 + 7.5 [1 − tanh((p0/7.0e17)^0.63)]
 * </pre>
 * One instance holds everything that depends only on the wafer (doping, temperature). Per injection level it uses
 * (n p − n_i²)/Δn = n0 + p0 + Δn (exact, since n0 p0 = n_i²) and evaluates the powers without {@code Math.pow}:
 * Δn^0.92 and (n+p)^0.54 with {@link Power}, ((n+p)/b3)^1.25 as x·√√x (see
 * {@link RadiativeCoefficient.Screening}). Each agrees with {@code Math.pow} to a few units in the last place, so
 * the rate agrees with the literal formula to about 1e-15 relative, at a fraction of the cost. Thread-safe and
 * immutable.
 */
public final class IntrinsicLifetime {
    /** Δn^0.92 of the Auger term. */
    private static final Power AUGER_INJECTION_POWER = new Power(0.92);

    /** Source line shown in reports and help. */
    public static final String SOURCE = "Richter et al., PRB 86, 165202 (2012); B_low: Trupke et al., JAP 94, 4930"
            + " (2003); B_rel: Altermatt et al., NUSOD 2005";

    /** n0 + p0, cm^-3. */
    private final double sumN0P0;
    /** Doping-dependent Auger part 2.5e-31 g_eeh n0 + 8.5e-32 g_ehh p0, cm³/s. */
    private final double augerDopingCm3PerS;
    private final double bLowCm3PerS;
    private final RadiativeCoefficient.Screening screening;
    private final double temperatureK;

    private IntrinsicLifetime(Carriers eq, double bLowCm3PerS, double temperatureK) {
        double n0 = eq.electronsPerCm3();
        double p0 = eq.holesPerCm3();
        this.sumN0P0 = n0 + p0;
        double geeh = 1 + 13 * (1 - Math.tanh(Math.pow(n0 / 3.3e17, 0.66)));
        double gehh = 1 + 7.5 * (1 - Math.tanh(Math.pow(p0 / 7.0e17, 0.63)));
        this.augerDopingCm3PerS = 2.5e-31 * geeh * n0 + 8.5e-32 * gehh * p0;
        this.bLowCm3PerS = bLowCm3PerS;
        this.screening = RadiativeCoefficient.Screening.at(temperatureK);
        this.temperatureK = temperatureK;
    }

    /** The default model (Richter 2012, B_low = 4.73e-15 cm³/s) for a wafer. */
    public static IntrinsicLifetime richter2012(Doping doping, Silicon silicon) {
        return richter2012(doping, silicon, RadiativeCoefficient.TRUPKE_2003_CM3_PER_S);
    }

    /** Richter 2012 with a chosen low-injection radiative coefficient B_low, cm³/s. */
    public static IntrinsicLifetime richter2012(Doping doping, Silicon silicon, double bLowCm3PerS) {
        Checks.positive(bLowCm3PerS, "radiativeCoefficient", "cm^3/s");
        return new IntrinsicLifetime(doping.equilibrium(silicon.intrinsicPerCm3()), bLowCm3PerS,
                silicon.temperatureK());
    }

    /** Intrinsic lifetime at excess carrier density {@code injectionPerCm3} (> 0), in s. */
    public double lifetimeS(double injectionPerCm3) {
        return 1.0 / rateConstantPerS(injectionPerCm3);
    }

    /**
     * 1/τ_intr at excess carrier density {@code dn} (> 0), in 1/s:
     * (n0 + p0 + Δn)·[2.5e-31 g_eeh n0 + 8.5e-32 g_ehh p0 + 3.0e-29 Δn^0.92 + B_low B_rel(n0 + p0 + 2Δn)].
     */
    public double rateConstantPerS(double dn) {
        // (n p − n_i²)/Δn = n0 + p0 + Δn exactly, since n0 p0 = n_i².
        double sum = sumN0P0 + dn;
        double b = bLowCm3PerS * screening.relative(sum + dn);
        return sum * (augerDopingCm3PerS + 3.0e-29 * AUGER_INJECTION_POWER.of(dn) + b);
    }

    /** The temperature at which Richter 2012 was measured and validated, K. */
    public static final double VALIDATED_TEMPERATURE_K = 300;
    /**
     * Half-width of the band around 300 K that counts as 300 K for the validity warning, K. 297–303 K holds the usual
     * room temperatures (25 °C = 298.15 K, temperature-controlled chucks at 300 ± 1 K). Over 3 K the Auger and
     * radiative coefficients move by well under 1 % (the temperature dependence of B_rel in Altermatt 2005 and the
     * weak T-dependence of the Auger coefficients reported around room temperature, from memory), and a power-law
     * capture cross-section σ ∝ T^-2 by 2 % — below the 5 % detection resolution, so a warning inside the band
     * would change no conclusion (common practice).
     */
    public static final double TEMPERATURE_TOLERANCE_K = 3;

    /**
     * True when the temperature lies outside 300 ± {@link #TEMPERATURE_TOLERANCE_K} K, away from the 300 K at which
     * Richter 2012 was validated.
     */
    public boolean outsideValidatedTemperature() {
        return Math.abs(temperatureK - VALIDATED_TEMPERATURE_K) > TEMPERATURE_TOLERANCE_K;
    }

    /**
     * x^a for one fixed exponent 0 &lt; a &lt; 1, several times faster than {@code Math.pow} and within a few units in
     * the last place of it. With x = 2^e·m, m ∈ [1, 2), and c the midpoint of the one of 256 equal parts of [1, 2)
     * that holds m:
     * <pre>
     * x^a = (2^e)^a · c^a · (1 + d)^a,   d = (m − c)/c,  |d| &lt; 2^-9
     * (1 + d)^a = 1 + C(a,1) d + C(a,2) d² + … + C(a,5) d^5   (binomial series; the rest, below |C(a,6)| d^6, is
     *                                                           under 2e-18 for 0 &lt; a &lt; 1)
     * </pre>
     * (2^e)^a and c^a are computed once with {@code Math.pow} for every exponent e of a normal double and every
     * midpoint c. This is not an interpolation: the tables hold exact powers and the series is summed to below the
     * rounding error, so the result is x^a to about 4 ulp. Zero, subnormal, negative, infinite and NaN arguments
     * go to {@code Math.pow}. Immutable and thread-safe.
     */
    static final class Power {
        private static final int NODE_BITS = 8;
        private static final int NODES = 1 << NODE_BITS;
        private static final long MANTISSA = 0x000F_FFFF_FFFF_FFFFL;
        private static final long EXPONENT_OF_ONE = 0x3FF0_0000_0000_0000L;
        /** Midpoints c_j = 1 + (j + ½)/256 of the parts of [1, 2), and their reciprocals. */
        private static final double[] NODE = new double[NODES];
        private static final double[] INVERSE_NODE = new double[NODES];

        static {
            for (int j = 0; j < NODES; j++) {
                NODE[j] = 1 + (j + 0.5) / NODES;
                INVERSE_NODE[j] = 1 / NODE[j];
            }
        }

        private final double a;
        /** (2^(E − 1023))^a by biased exponent E = 1 … 2046 (index 0 unused). */
        private final double[] binaryPower = new double[2047];
        /** c_j^a. */
        private final double[] nodePower = new double[NODES];
        /** Binomial coefficients C(a, k), k = 1 … 5. */
        private final double c1;
        private final double c2;
        private final double c3;
        private final double c4;
        private final double c5;

        Power(double a) {
            if (!(a > 0 && a < 1)) {
                throw new IllegalArgumentException("exponent must lie in (0, 1): " + a);
            }
            this.a = a;
            for (int biased = 1; biased <= 2046; biased++) {
                binaryPower[biased] = Math.pow(Math.scalb(1.0, biased - 1023), a);
            }
            for (int j = 0; j < NODES; j++) {
                nodePower[j] = Math.pow(NODE[j], a);
            }
            c1 = a;
            c2 = c1 * (a - 1) / 2;
            c3 = c2 * (a - 2) / 3;
            c4 = c3 * (a - 3) / 4;
            c5 = c4 * (a - 4) / 5;
        }

        /** x^a. */
        double of(double x) {
            if (!(x >= Double.MIN_NORMAL && x <= Double.MAX_VALUE)) {
                return Math.pow(x, a);
            }
            long bits = Double.doubleToRawLongBits(x);
            int biased = (int) (bits >>> 52);
            int j = (int) (bits >>> (52 - NODE_BITS)) & (NODES - 1);
            double m = Double.longBitsToDouble((bits & MANTISSA) | EXPONENT_OF_ONE);
            double d = (m - NODE[j]) * INVERSE_NODE[j]; // m − c_j is exact
            double series = 1 + d * (c1 + d * (c2 + d * (c3 + d * (c4 + d * c5))));
            return binaryPower[biased] * nodePower[j] * series;
        }
    }
}
