package trapmap.physics.conversion;

import java.math.BigDecimal;
import java.math.MathContext;
import trapmap.physics.material.Carriers;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.recombination.SrhRecombination;

/**
 * Straightforward transcriptions of the published formulas, written for readability rather than speed, against
 * which the optimised per-pixel kernel is checked.
 */
final class ReferenceFormulas {
    private ReferenceFormulas() {
    }

    /**
     * Richter et al., PRB 86, 165202 (2012), eq. (18) with Table II:
     * 1/τ_intr = (n p − n_i²)/Δn · [2.5e-31 g_eeh n0 + 8.5e-32 g_ehh p0 + 3.0e-29 Δn^0.92 + B_rel B_low],
     * in 1/s. The carrier factor (n p − n_i²)/Δn is evaluated literally but in 34-digit decimal arithmetic, with
     * the minority density n_i²/majority: in double precision it cancels catastrophically when n_i² ≫ Δn (n0 + p0)
     * (hot, lightly doped wafers at low injection).
     */
    static double intrinsicRatePerS(Doping doping, Silicon silicon, double bLow, double dn) {
        double ni = silicon.intrinsicPerCm3();
        Carriers eq = doping.equilibrium(ni);
        double n0 = eq.electronsPerCm3();
        double p0 = eq.holesPerCm3();
        double n = n0 + dn;
        double p = p0 + dn;
        double geeh = 1 + 13 * (1 - Math.tanh(Math.pow(n0 / 3.3e17, 0.66)));
        double gehh = 1 + 7.5 * (1 - Math.tanh(Math.pow(p0 / 7.0e17, 0.63)));
        double b = radiativeRelative(n + p, silicon.temperatureK()) * bLow;
        return carrierFactor(ni, eq, dn)
                * (2.5e-31 * geeh * n0 + 8.5e-32 * gehh * p0 + 3.0e-29 * Math.pow(dn, 0.92) + b);
    }

    /** (n p − n_i²)/Δn with n = n0 + Δn, p = p0 + Δn, n0 p0 = n_i², in 34-digit arithmetic. */
    static double carrierFactor(double ni, Carriers eq, double dn) {
        MathContext mc = MathContext.DECIMAL128;
        BigDecimal ni2 = new BigDecimal(ni).multiply(new BigDecimal(ni), mc);
        boolean pType = eq.holesPerCm3() >= eq.electronsPerCm3();
        BigDecimal majority = new BigDecimal(pType ? eq.holesPerCm3() : eq.electronsPerCm3());
        BigDecimal minority = ni2.divide(majority, mc);
        BigDecimal d = new BigDecimal(dn);
        BigDecimal np = minority.add(d, mc).multiply(majority.add(d, mc), mc);
        return np.subtract(ni2, mc).divide(d, mc).doubleValue();
    }

    /**
     * B_rel of Altermatt et al., NUSOD 2005 (factor 2 in b1 and b3 as corrected in Altermatt 2011):
     * B_rel = b_min + (b_max − b_min)/(1 + ((n+p)/b1)^b2 + ((n+p)/b3)^b4), with b_max = 1, b2 = 0.54, b4 = 1.25,
     * b_min = r_max + (r_min − r_max)/(1 + (T/r1)^r2), b1 = 2[s_max + (s_min − s_max)/(1 + (T/s1)^s2)],
     * b3 = 2[w_max + (w_min − w_max)/(1 + (T/w1)^w2)].
     */
    static double radiativeRelative(double np, double t) {
        double rMax = 0.2;
        double rMin = 0.0;
        double r1 = 320;
        double r2 = 2.5;
        double sMax = 1.5e18;
        double sMin = 1e7;
        double s1 = 550;
        double s2 = 3;
        double wMax = 4e18;
        double wMin = 1e9;
        double w1 = 365;
        double w2 = 3.54;
        double bMax = 1;
        double b2 = 0.54;
        double b4 = 1.25;
        double bMin = rMax + (rMin - rMax) / (1 + Math.pow(t / r1, r2));
        double b1 = 2 * (sMax + (sMin - sMax) / (1 + Math.pow(t / s1, s2)));
        double b3 = 2 * (wMax + (wMin - wMax) / (1 + Math.pow(t / w1, w2)));
        return bMin + (bMax - bMin) / (1 + Math.pow(np / b1, b2) + Math.pow(np / b3, b4));
    }

    /** K(Δn) = [(n0 + n1 + Δn)/c_p + (p0 + p1 + Δn)/c_n]/(n0 + p0 + Δn), s·cm^-3. */
    static double lifetimeDensityProduct(SrhRecombination s, double dn) {
        return ((s.n0PerCm3() + s.n1PerCm3() + dn) / s.holeCaptureCm3PerS()
                + (s.p0PerCm3() + s.p1PerCm3() + dn) / s.electronCaptureCm3PerS())
                / (s.n0PerCm3() + s.p0PerCm3() + dn);
    }

    /** f_t = (c_n n + c_p p1)/[c_n (n + n1) + c_p (p + p1)]. */
    static double occupancy(SrhRecombination s, double dn) {
        double n = s.n0PerCm3() + dn;
        double p = s.p0PerCm3() + dn;
        double cn = s.electronCaptureCm3PerS();
        double cp = s.holeCaptureCm3PerS();
        return (cn * n + cp * s.p1PerCm3()) / (cn * (n + s.n1PerCm3()) + cp * (p + s.p1PerCm3()));
    }
}
