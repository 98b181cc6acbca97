package trapmap.physics.recombination;

import trapmap.physics.material.Carriers;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.shared.check.Checks;

/**
 * Intrinsic (Auger + radiative) lifetime of Richter et al., PRB 86, 165202 (2012), Table II coefficients, valid at
 * 300 K, with B_low of Trupke et al. (2003) and B_rel of Altermatt et al. (2005); n_i,eff = n_i (no band-gap
 * narrowing):
 * <pre>
 * 1/τ_intr = (n p − n_i²)/Δn · [2.5e-31 g_eeh n0 + 8.5e-32 g_ehh p0 + 3.0e-29 Δn^0.92 + B_rel B_low]
 * g_eeh = 1 + 13 [1 − tanh((n0/3.3e17)^0.66)],  g_ehh = 1 + 7.5 [1 − tanh((p0/7.0e17)^0.63)]
 * </pre>
 * One instance holds everything that depends only on the wafer (doping, temperature). Per injection level it uses
 * (n p − n_i²)/Δn = n0 + p0 + Δn (exact, since n0 p0 = n_i²) and evaluates the three powers from two logarithms,
 * ln Δn and ln(n + p):
 * <pre>
 * Δn^0.92 = exp(0.92 ln Δn),  ((n+p)/b1)^0.54 = exp(0.54 (ln(n+p) − ln b1)),
 * ((n+p)/b3)^1.25 = x·√√x with x = (n+p)/b3
 * </pre>
 * which agrees with the literal formula to about 1e-14 relative and costs a fraction of three {@code Math.pow}.
 * Thread-safe and immutable.
 */
public final class IntrinsicLifetime {
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
     * (n0 + p0 + Δn)·[2.5e-31 g_eeh n0 + 8.5e-32 g_ehh p0 + 3.0e-29 exp(0.92 ln Δn) + B_low B_rel(n0 + p0 + 2Δn)].
     */
    public double rateConstantPerS(double dn) {
        // (n p − n_i²)/Δn = n0 + p0 + Δn exactly, since n0 p0 = n_i².
        double sum = sumN0P0 + dn;
        double np = sum + dn;
        double b = bLowCm3PerS * screening.relative(np, Math.log(np));
        return sum * (augerDopingCm3PerS + 3.0e-29 * Math.exp(0.92 * Math.log(dn)) + b);
    }

    /** True when the temperature differs from the 300 K at which Richter 2012 was validated. */
    public boolean outsideValidatedTemperature() {
        return Math.abs(temperatureK - 300.0) > 0.5;
    }
}
