package trapmap.physics.spectroscopy;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.TrapLevel;
import trapmap.physics.material.Carriers;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.shared.check.Checks;

/**
 * The defect parameter solution surface (DPSS) of a τ_SRH(Δn) curve (Rein et al., JAP 91, 2059 (2002); Rein,
 * Lifetime Spectroscopy, Springer (2005), ch. 5), prepared once per wafer (doping, temperature, levels, grid).
 * Immutable and thread-safe.
 * <p>
 * For a trial level E_t the SRH lifetime is linear in the two capture time constants (Murphy et al., JAP 111,
 * 113709 (2012)):
 * <pre>
 * τ_SRH,i = τ_n0 A_i + τ_p0 B_i,  A_i = (p0 + p1 + Δn_i)/(n0 + p0 + Δn_i),  B_i = (n0 + n1 + Δn_i)/(n0 + p0 + Δn_i),
 * n1 = n_i exp((E_t − E_i)/kT),  p1 = n_i²/n1,  k = σ_n/σ_p = τ_p0 v_p/(τ_n0 v_n)
 * </pre>
 * At every E_t of the grid (E_i − (E_i − E_v) to E_i + (E_c − E_i), with E_c − E_i = kT ln(N_c/n_i) and
 * E_i − E_v = kT ln(N_v/n_i), so that the band edges agree with {@code TrapLevel}) the weighted least-squares
 * (τ_n0, τ_p0) ≥ 0 is found in closed form: the problem is convex, so its minimum is the feasible one with the least
 * χ² among the free 2×2 solution and the two one-variable solutions on the bounds (Lawson &amp; Hanson, Solving Least
 * Squares Problems (1974), ch. 23: the active set of a two-variable NNLS). Weights 1/(u_i τ_i)² as in
 * {@link LibraryRanking}. The minimum-residual band holds the levels with χ² ≤ χ²_min + Δχ² (Δχ² = 1 by default:
 * one standard deviation of one parameter, Press et al., Numerical Recipes, 3rd ed. (2007), §15.6).
 */
public final class DpssFit {
    /** Default grid step of E_t, eV (project choice, check-values R-LIM-10). */
    public static final double DEFAULT_STEP_EV = 0.005;
    /** Default Δχ² above the minimum that bounds the band (Press et al. 2007, §15.6: one parameter, 1 σ). */
    public static final double DEFAULT_DELTA_CHI_SQUARED = 1.0;
    /**
     * Default factor within which a library k must agree with the curve's k (project choice, check-values
     * R-LIM-10).
     */
    public static final double DEFAULT_RATIO_TOLERANCE = 2.0;

    private final double[] dn;
    private final double n0;
    private final double p0;
    private final double ni;
    private final double kt;
    private final double vn;
    private final double vp;
    private final Silicon silicon;
    private final double[] grid;
    private final double deltaChiSquared;
    private final double ratioTolerance;

    /** A DPSS with the default grid step, Δχ² and k tolerance. */
    public DpssFit(Doping doping, Silicon silicon, double[] injectionPerCm3) {
        this(doping, silicon, injectionPerCm3, DEFAULT_STEP_EV, DEFAULT_DELTA_CHI_SQUARED, DEFAULT_RATIO_TOLERANCE);
    }

    /**
     * @param doping          the wafer's doping
     * @param silicon         band parameters and thermal velocities
     * @param injectionPerCm3 Δn of every level, cm^-3
     * @param stepEv          grid step of E_t, eV (0.0001 to 0.1)
     * @param deltaChiSquared Δχ² above the minimum that bounds the band (&gt; 0)
     * @param ratioTolerance  factor (&gt; 1) within which a library k must agree with the curve's k
     */
    public DpssFit(Doping doping, Silicon silicon, double[] injectionPerCm3, double stepEv, double deltaChiSquared,
                   double ratioTolerance) {
        Checks.notNull(doping, "doping");
        this.silicon = Checks.notNull(silicon, "silicon");
        Checks.inRange(stepEv, 1e-4, 0.1, "energyStep", "eV");
        this.deltaChiSquared = Checks.positive(Checks.finite(deltaChiSquared, "deltaChiSquared", ""),
                "deltaChiSquared", "");
        this.ratioTolerance = Checks.inRange(ratioTolerance, 1.0 + 1e-9, 1e6, "ratioTolerance", "");
        this.dn = LifetimeCurve.checkedLevels(injectionPerCm3);
        this.ni = silicon.intrinsicPerCm3();
        Carriers eq = doping.equilibrium(ni);
        this.n0 = eq.electronsPerCm3();
        this.p0 = eq.holesPerCm3();
        this.kt = silicon.thermalEnergyEv();
        this.vn = silicon.electronVthCmPerS();
        this.vp = silicon.holeVthCmPerS();
        double upper = kt * Math.log(silicon.conductionDosPerCm3() / ni);
        double lower = kt * Math.log(silicon.valenceDosPerCm3() / ni);
        int lo = (int) Math.floor(lower / stepEv + 1e-9);
        int hi = (int) Math.floor(upper / stepEv + 1e-9);
        grid = new double[lo + hi + 1];
        for (int j = -lo; j <= hi; j++) {
            grid[j + lo] = j * stepEv;
        }
    }

    /** Fits a curve with the default 3 % relative uncertainty at every level. */
    public DpssResult fit(double[] tauSrhS, List<Defect> library) {
        return fit(LifetimeCurve.of(dn, tauSrhS), library);
    }

    /**
     * The DPSS of one curve at this fit's levels and the library defects compared with it.
     *
     * @param curve   the curve (its levels must be this fit's)
     * @param library defects to compare (any: only E_t and k are used, so defects without absolute σ count too)
     */
    public DpssResult fit(LifetimeCurve curve, List<Defect> library) {
        Checks.notNull(curve, "curve");
        Checks.notNull(library, "library");
        if (!java.util.Arrays.equals(curve.injectionPerCm3(), dn)) {
            throw new trapmap.shared.error.InvalidValueException("injection", "cm^-3", "the curve's injection"
                    + " levels (cm^-3) differ from the levels this DPSS was prepared for");
        }
        int n = curve.usableCount();
        if (n < 2) {
            return new DpssResult(n, List.of(), null, List.of(),
                    new double[] {Double.NaN, Double.NaN}, null, null, false, List.of(), "only " + n
                    + " of " + curve.size() + " levels have a finite positive tau_SRH (s); the DPSS needs at"
                    + " least 2");
        }
        double[] tau = new double[n];
        double[] u = new double[n];
        double[] d = new double[n];
        double[] allTau = curve.tauSrhS();
        double[] allU = curve.relativeUncertainty();
        for (int i = 0, m = 0; i < allTau.length; i++) {
            if (curve.usable(i)) {
                tau[m] = allTau[i];
                u[m] = allU[i];
                d[m++] = dn[i];
            }
        }
        List<DpssPoint> pts = new ArrayList<>(grid.length);
        DpssPoint best = null;
        DpssPoint bestLo = null;
        DpssPoint bestHi = null;
        for (double e : grid) {
            DpssPoint p = solve(e, d, tau, u);
            pts.add(p);
            if (best == null || p.chiSquared() < best.chiSquared()) {
                best = p;
            }
            if (e < 0 && (bestLo == null || p.chiSquared() < bestLo.chiSquared())) {
                bestLo = p;
            }
            if (e > 0 && (bestHi == null || p.chiSquared() < bestHi.chiSquared())) {
                bestHi = p;
            }
        }
        double limit = best.chiSquared() + deltaChiSquared;
        List<double[]> band = new ArrayList<>();
        double[] open = null;
        double kMin = Double.NaN;
        double kMax = Double.NaN;
        for (DpssPoint p : pts) {
            if (p.chiSquared() <= limit) {
                double k = p.captureRatio();
                if (k > 0 && Double.isFinite(k)) {
                    kMin = Double.isNaN(kMin) ? k : Math.min(kMin, k);
                    kMax = Double.isNaN(kMax) ? k : Math.max(kMax, k);
                }
                if (open == null) {
                    open = new double[] {p.energyFromIntrinsicEv(), p.energyFromIntrinsicEv()};
                    band.add(open);
                }
                open[1] = p.energyFromIntrinsicEv();
            } else {
                open = null;
            }
        }
        boolean ambiguous = bestLo != null && bestHi != null && bestLo.chiSquared() <= limit
                && bestHi.chiSquared() <= limit;
        List<DefectOnCurve> defects = new ArrayList<>();
        List<String> on = new ArrayList<>();
        for (Defect def : library) {
            Checks.notNull(def, "library");
            double e = kt * Math.log(def.level().n1PerCm3(silicon) / ni);
            DpssPoint p = solve(e, d, tau, u);
            double k = def.captureRatio();
            boolean ok = p.chiSquared() <= limit && p.captureRatio() > 0 && Double.isFinite(p.captureRatio())
                    && Math.abs(Math.log(p.captureRatio() / k)) <= Math.log(ratioTolerance);
            defects.add(new DefectOnCurve(def, e, p, ok));
            if (ok) {
                on.add(def.id());
            }
        }
        StringBuilder why = new StringBuilder(String.format(Locale.ROOT,
                "least chi2 %.3g at E_t - E_i = %+.3f eV (k = %.3g); band", best.chiSquared(),
                best.energyFromIntrinsicEv(), best.captureRatio()));
        for (double[] b : band) {
            why.append(String.format(Locale.ROOT, " [%+.3f, %+.3f]", b[0], b[1]));
        }
        why.append(String.format(Locale.ROOT, " eV with k %.3g to %.3g", kMin, kMax));
        if (ambiguous) {
            why.append("; ambiguous half: both halves of the gap fit within delta chi2 ")
                    .append(String.format(Locale.ROOT, "%.3g", deltaChiSquared));
        }
        why.append(on.isEmpty() ? "; no library defect on the curve" : "; on the curve: " + String.join(", ", on));
        return new DpssResult(n, pts, best, band, new double[] {kMin, kMax}, bestLo, bestHi, ambiguous, defects, why.toString());
    }

    /** The grid of E_t − E_i, eV. */
    public double[] gridEv() {
        return grid.clone();
    }

    /** The non-negative weighted least-squares (τ_n0, τ_p0) at one level E_t − E_i = {@code e} (eV). */
    DpssPoint solve(double e, double[] d, double[] tau, double[] u) {
        TrapLevel level = TrapLevel.fromIntrinsic(e);
        double n1 = level.n1PerCm3(silicon);
        double p1 = level.p1PerCm3(silicon);
        int n = tau.length;
        double[] a = new double[n];
        double[] b = new double[n];
        double saa = 0;
        double sab = 0;
        double sbb = 0;
        double sat = 0;
        double sbt = 0;
        for (int i = 0; i < n; i++) {
            double den = n0 + p0 + d[i];
            // scaled by the standard uncertainty u_i τ_i so that the target is 1/u_i
            double s = u[i] * tau[i];
            a[i] = (p0 + p1 + d[i]) / den / s;
            b[i] = (n0 + n1 + d[i]) / den / s;
            double t = 1.0 / u[i];
            saa += a[i] * a[i];
            sab += a[i] * b[i];
            sbb += b[i] * b[i];
            sat += a[i] * t;
            sbt += b[i] * t;
        }
        double bestTn = 0;
        double bestTp = 0;
        double bestChi = chi2(0, 0, a, b, u);
        double det = saa * sbb - sab * sab;
        if (det > 1e-12 * saa * sbb) {
            double tn = (sat * sbb - sbt * sab) / det;
            double tp = (sbt * saa - sat * sab) / det;
            if (tn >= 0 && tp >= 0) {
                double c = chi2(tn, tp, a, b, u);
                if (c < bestChi) {
                    bestChi = c;
                    bestTn = tn;
                    bestTp = tp;
                }
            }
        }
        double tnOnly = Math.max(0, sat / saa);
        double c1 = chi2(tnOnly, 0, a, b, u);
        if (c1 < bestChi) {
            bestChi = c1;
            bestTn = tnOnly;
            bestTp = 0;
        }
        double tpOnly = Math.max(0, sbt / sbb);
        double c2 = chi2(0, tpOnly, a, b, u);
        if (c2 < bestChi) {
            bestChi = c2;
            bestTn = 0;
            bestTp = tpOnly;
        }
        double k = bestTn == 0 ? (bestTp == 0 ? Double.NaN : Double.POSITIVE_INFINITY) : bestTp * vp / (bestTn * vn);
        return new DpssPoint(e, bestTn, bestTp, k, bestChi);
    }

    private static double chi2(double tn, double tp, double[] a, double[] b, double[] u) {
        double c = 0;
        for (int i = 0; i < a.length; i++) {
            double r = 1.0 / u[i] - tn * a[i] - tp * b[i];
            c += r * r;
        }
        return c;
    }
}
