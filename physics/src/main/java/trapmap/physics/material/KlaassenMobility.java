package trapmap.physics.material;

/**
 * Klaassen's unified mobility model, Solid-State Electron. 35, 953 and 961 (1992), with the parameters and the two
 * deliberate deviations used by common device simulators (r5 = −0.8552, P_CW from N_sc). Mobilities in cm²/(V·s).
 */
public final class KlaassenMobility {
    private KlaassenMobility() {
    }

    private static final double FCW = 2.459;
    private static final double FBH = 3.828;
    private static final double[] R = {0.7643, 2.2999, 6.5502, 2.367, -0.8552, 0.6478};
    private static final double[] S = {0.89233, 0.41372, 0.19778, 0.28227, 0.005978, 1.80618, 0.72169};

    /** Per-carrier parameter set. */
    private record Carrier(double muMax, double muMin, double nRef, double alpha, double theta, double c,
                           double nRef2, double massRatio) {
    }

    private static final Carrier ELECTRON = new Carrier(1414, 68.5, 9.2e16, 0.711, 2.285, 0.21, 4e20, 1.0);
    private static final Carrier HOLE = new Carrier(470.5, 44.9, 2.23e17, 0.719, 2.247, 0.5, 7.2e20, 1.258);

    /** Electron mobility at the given acceptor and donor densities, injection and temperature. */
    public static double electronCm2PerVs(double acceptorsPerCm3, double donorsPerCm3, double injectionPerCm3,
                                          double temperatureK, double intrinsicPerCm3) {
        return mobility(true, acceptorsPerCm3, donorsPerCm3, injectionPerCm3, temperatureK, intrinsicPerCm3);
    }

    /** Hole mobility at the given acceptor and donor densities, injection and temperature. */
    public static double holeCm2PerVs(double acceptorsPerCm3, double donorsPerCm3, double injectionPerCm3,
                                      double temperatureK, double intrinsicPerCm3) {
        return mobility(false, acceptorsPerCm3, donorsPerCm3, injectionPerCm3, temperatureK, intrinsicPerCm3);
    }

    /**
     * Minority-carrier diffusivity at low injection, D = (kT/q)·μ_minority, cm²/s: electrons in p-type, holes in
     * n-type.
     */
    public static double minorityDiffusivityCm2PerS(Doping doping, Silicon silicon) {
        double na = doping.acceptorsPerCm3();
        double nd = doping.donorsPerCm3();
        double t = silicon.temperatureK();
        double mu = doping.type() == ConductivityType.P
                ? electronCm2PerVs(na, nd, 0, t, silicon.intrinsicPerCm3())
                : holeCm2PerVs(na, nd, 0, t, silicon.intrinsicPerCm3());
        return silicon.thermalEnergyEv() * mu;
    }

    private static double z(Carrier k, double n) {
        return n == 0 ? 1.0 : 1 + 1 / (k.c + Math.pow(k.nRef2 / n, 2));
    }

    private static double mobility(boolean electron, double na, double nd, double dn, double t, double ni) {
        Carrier k = electron ? ELECTRON : HOLE;
        Carrier other = electron ? HOLE : ELECTRON;
        double net = na - nd;
        double n0;
        double p0;
        if (net >= 0) {
            p0 = net / 2 + Math.sqrt(net * net / 4 + ni * ni);
            n0 = ni * ni / p0;
        } else {
            n0 = -net / 2 + Math.sqrt(net * net / 4 + ni * ni);
            p0 = ni * ni / n0;
        }
        double ne = n0 + dn;
        double nh = p0 + dn;
        double carOpp = electron ? nh : ne;
        double nsc = nd * z(ELECTRON, nd) + na * z(HOLE, na) + carOpp;
        double pcw = 3.97e13 * Math.pow(1 / nsc * Math.pow(t / 300, 3), 2.0 / 3.0);
        double pbh = 1.36e20 / (ne + nh) * (k.massRatio * (t / 300) * (t / 300));
        double p = 1 / (FCW / pcw + FBH / pbh);
        double g = 1 - S[0] / Math.pow(S[1] + Math.pow(t / 300 / k.massRatio, S[3]) * p, S[2])
                + S[4] / Math.pow(Math.pow(300 / t / k.massRatio, S[6]) * p, S[5]);
        double f = (R[0] * Math.pow(p, R[5]) + R[1] + R[2] * k.massRatio / other.massRatio)
                / (Math.pow(p, R[5]) + R[3] + R[4] * k.massRatio / other.massRatio);
        double nscEff = electron
                ? nd * z(ELECTRON, nd) + g * na * z(HOLE, na) + carOpp / f
                : na * z(HOLE, na) + g * nd * z(ELECTRON, nd) + carOpp / f;
        double muN = k.muMax * k.muMax / (k.muMax - k.muMin) * Math.pow(t / 300, 3 * k.alpha - 1.5);
        double muC = k.muMin * k.muMax / (k.muMax - k.muMin) * Math.pow(300 / t, 0.5);
        double muDcs = muN * nsc / nscEff * Math.pow(k.nRef / nsc, k.alpha) + muC * (ne + nh) / nscEff;
        double muL = k.muMax * Math.pow(300 / t, k.theta);
        return 1 / (1 / muDcs + 1 / muL);
    }
}
