package trapmap.physics.recombination;

import trapmap.physics.defect.Defect;
import trapmap.physics.material.Carriers;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;

/**
 * Shockley–Read–Hall recombination through one level, for one wafer (doping, temperature) — Shockley &amp; Read,
 * Phys. Rev. 87, 835 (1952); Hall, Phys. Rev. 87, 387 (1952):
 * <pre>
 * τ_SRH = [τ_p0 (n0 + n1 + Δn) + τ_n0 (p0 + p1 + Δn)] / (n0 + p0 + Δn),
 * τ_n0 = 1/(σ_n v_th,n N_t),  τ_p0 = 1/(σ_p v_th,p N_t)
 * </pre>
 * All rates are linear in N_t, so the inversion N_t(τ_SRH, Δn) is exact and closed-form. Assumes Δn = Δp, i.e.
 * N_t ≪ Δn and N_t ≪ N_dop (Macdonald &amp; Cuevas, PRB 67, 075203 (2003)). Immutable and thread-safe.
 */
public final class SrhRecombination {
    private final double n0;
    private final double p0;
    private final double n1;
    private final double p1;
    /** Electron capture coefficient per trap c_n = σ_n v_th,n, cm³/s. */
    private final double cn;
    /** Hole capture coefficient per trap c_p = σ_p v_th,p, cm³/s. */
    private final double cp;

    /**
     * @param eq  equilibrium carriers n0, p0, cm^-3
     * @param n1  electron emission density, cm^-3
     * @param p1  hole emission density, cm^-3
     * @param cn  electron capture coefficient, cm³/s
     * @param cp  hole capture coefficient, cm³/s
     */
    public SrhRecombination(Carriers eq, double n1, double p1, double cn, double cp) {
        this.n0 = eq.electronsPerCm3();
        this.p0 = eq.holesPerCm3();
        this.n1 = n1;
        this.p1 = p1;
        this.cn = cn;
        this.cp = cp;
    }

    /** SRH through {@code defect} in a wafer with {@code doping} made of {@code silicon}. */
    public static SrhRecombination of(Defect defect, Doping doping, Silicon silicon) {
        defect.requireAbsoluteCrossSections();
        return new SrhRecombination(doping.equilibrium(silicon.intrinsicPerCm3()),
                defect.level().n1PerCm3(silicon), defect.level().p1PerCm3(silicon),
                defect.electronCrossSectionCm2() * silicon.electronVthCmPerS(),
                defect.holeCrossSectionCm2() * silicon.holeVthCmPerS());
    }

    /**
     * The density-independent factor K(Δn) = [(n0 + n1 + Δn)/c_p + (p0 + p1 + Δn)/c_n]/(n0 + p0 + Δn), in s·cm^-3,
     * so that τ_SRH = K/N_t and N_t = K/τ_SRH.
     */
    public double lifetimeDensityProductSCm3(double dn) {
        return ((n0 + n1 + dn) / cp + (p0 + p1 + dn) / cn) / (n0 + p0 + dn);
    }

    /** τ_SRH at excess carrier density {@code dn} and trap density {@code nt}, s. */
    public double lifetimeS(double dn, double ntPerCm3) {
        return lifetimeDensityProductSCm3(dn) / ntPerCm3;
    }

    /** The exact inverse: N_t from τ_SRH (s) at {@code dn}, cm^-3. */
    public double densityPerCm3(double tauSrhS, double dn) {
        return lifetimeDensityProductSCm3(dn) / tauSrhS;
    }

    /** Recombination rate per unit trap density and unit excess density, χ = 1/(τ_SRH N_t), cm³/s. */
    public double ratePerTrapCm3PerS(double dn) {
        return 1.0 / lifetimeDensityProductSCm3(dn);
    }

    /**
     * Steady-state fraction of traps occupied by electrons:
     * f_t = (c_n n + c_p p1)/[c_n (n + n1) + c_p (p + p1)] (detailed balance of the four SRH processes).
     */
    public double occupancy(double dn) {
        double n = n0 + dn;
        double p = p0 + dn;
        return (cn * n + cp * p1) / (cn * (n + n1) + cp * (p + p1));
    }

    public double n0PerCm3() {
        return n0;
    }

    public double p0PerCm3() {
        return p0;
    }

    public double n1PerCm3() {
        return n1;
    }

    public double p1PerCm3() {
        return p1;
    }

    public double electronCaptureCm3PerS() {
        return cn;
    }

    public double holeCaptureCm3PerS() {
        return cp;
    }
}
