package trapmap.physics.spectroscopy;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.function.Supplier;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import trapmap.physics.defect.Defect;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.recombination.SrhRecombination;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;

/**
 * Ranks library defects against one τ_SRH(Δn) curve, prepared once per wafer (doping, temperature, injection
 * levels) and then called per pixel or per region. Immutable and thread-safe.
 * <p>
 * For a library defect (E_t, σ_n, σ_p known) τ_SRH,i = K_i/N_t with K_i = K(Δn_i) of {@link SrhRecombination}
 * (Shockley &amp; Read 1952; Hall 1952), so N_t is the only free parameter (Rein, Lifetime Spectroscopy, Springer
 * (2005), ch. 5). The fit is made on the rates y_i = 1/τ_i = N_t c_i with c_i = 1/K_i, which are linear in N_t; the
 * standard uncertainty of y_i is u_i y_i (u_i the relative uncertainty of τ_i, first order). Weighted least squares
 * through the origin (Bevington &amp; Robinson, Data Reduction and Error Analysis, 3rd ed. (2003), ch. 6):
 * <pre>
 * N_t = Σ w_i c_i y_i / Σ w_i c_i²,  w_i = 1/(u_i y_i)²,  σ(N_t) = 1/sqrt(Σ w_i c_i²),
 * χ² = Σ [(y_i − N_t c_i)/(u_i y_i)]² = Σ [(1 − N_t c_i τ_i)/u_i]²,  ν = n − 1,
 * p = 1 − F_χ²(χ²; ν)
 * </pre>
 * with n the usable levels (finite positive τ_SRH). Bounds are N_t ± 1.96 σ(N_t) (95 %, normal), the lower one at
 * least 0. Candidates are ranked by χ² (all share ν, so this is also the order of p). Defects without absolute
 * cross-sections (bo-lid) are listed unfitted with the reason.
 */
public final class LibraryRanking {
    /**
     * Below this p-value of the best candidate no single defect explains the curve (the 1 % significance level of a
     * χ² goodness-of-fit test, Bevington &amp; Robinson 2003, ch. 11; check-values R-LIM-8).
     */
    public static final double NO_SINGLE_DEFECT_P = 0.01;
    /** Two-sided 95 % quantile of the standard normal distribution. */
    public static final double BOUNDS_Z = 1.959963984540054;

    private final double[] injectionPerCm3;
    private final List<Defect> fitted = new ArrayList<>();
    /** Per fitted defect and level: c_i = 1/K(Δn_i), cm³/s. */
    private final double[][] ratePerTrap;
    private final List<CandidateFit> skipped = new ArrayList<>();
    /** Per fitted defect: the caution of its fit, or empty. */
    private final List<String> cautions = new ArrayList<>();
    /** χ² distributions by degrees of freedom (index ν), made once (they are immutable). */
    private final ChiSquaredDistribution[] chiSquared;
    /**
     * By ν: a χ² below which the p-value is surely at least {@link #NO_SINGLE_DEFECT_P}, and one above which it is
     * surely below ({@link #STATUS_BRACKET} around the critical value), so the status needs no p-value outside.
     */
    private final double[] surelyFits;
    private final double[] surelyFails;

    /**
     * The status decides p &lt; {@link #NO_SINGLE_DEFECT_P} from χ² alone when χ² is more than this factor away from
     * the critical value χ²_0.99(ν): there the p-value differs from 0.01 by far more than the error of its
     * computation (about 1e-14) and than the error of χ²_0.99 (1e-9 absolute): at ν = 1 it is 0.01038 at
     * 0.99 χ²_0.99 and 0.00963 at 1.01 χ²_0.99, and the gap grows with ν; in between the p-value is computed, so
     * the status is the one of p &lt; 0.01 everywhere.
     */
    static final double STATUS_BRACKET = 0.01;
    /**
     * Above this χ² the p-value is computed even so (Commons Math's χ² distribution function fails to converge at
     * an infinite χ², and the status follows it there as everywhere).
     */
    static final double SURELY_FAILS_UP_TO = 1e300;
    /**
     * χ²_0.99(ν) for ν below its length, made once (a ranking is also prepared per curve, under a generation rate;
     * larger ν are worked out by the ranking that needs them).
     */
    private static final double[] CRITICAL = new double[32];

    static {
        for (int nu = 1; nu < CRITICAL.length; nu++) {
            CRITICAL[nu] = critical(nu);
        }
    }

    /**
     * @param candidates      the defects to rank, in the order used for ties
     * @param doping          the wafer's doping
     * @param silicon         band parameters and thermal velocities (the convention of the defects' σ)
     * @param injectionPerCm3 the Δn of every level, cm^-3
     */
    public LibraryRanking(List<Defect> candidates, Doping doping, Silicon silicon, double[] injectionPerCm3) {
        Checks.notNull(candidates, "candidates");
        Checks.notNull(doping, "doping");
        Checks.notNull(silicon, "silicon");
        this.injectionPerCm3 = LifetimeCurve.checkedLevels(injectionPerCm3);
        List<double[]> rates = new ArrayList<>();
        for (Defect d : candidates) {
            Checks.notNull(d, "candidates");
            if (!d.hasAbsoluteCrossSections()) {
                skipped.add(CandidateFit.notFitted(d, "defect '" + d.id() + "' has no published absolute capture"
                        + " cross-section, so tau_SRH gives no N_t for it (skipped)"));
                continue;
            }
            SrhRecombination srh = SrhRecombination.of(d, doping, silicon);
            double[] c = new double[this.injectionPerCm3.length];
            for (int i = 0; i < c.length; i++) {
                c[i] = srh.ratePerTrapCm3PerS(this.injectionPerCm3[i]);
            }
            fitted.add(d);
            rates.add(c);
            cautions.add(silicon.velocityModel() == d.velocityConvention() ? ""
                    : "cross-sections of '" + d.id() + "' belong to the " + d.velocityConvention() + " thermal-velocity"
                    + " convention, fitted with the silicon's " + silicon.velocityModel() + " velocities");
        }
        if (fitted.isEmpty()) {
            throw new InvalidValueException("candidates", "", "none of the " + candidates.size() + " candidate"
                    + " defects has absolute capture cross-sections (cm^2), so none can be ranked");
        }
        ratePerTrap = rates.toArray(new double[0][]);
        chiSquared = new ChiSquaredDistribution[Math.max(2, this.injectionPerCm3.length)];
        surelyFits = new double[chiSquared.length];
        surelyFails = new double[chiSquared.length];
        for (int nu = 1; nu < chiSquared.length; nu++) {
            chiSquared[nu] = new ChiSquaredDistribution(null, nu);
            double critical = nu < CRITICAL.length ? CRITICAL[nu] : critical(nu);
            surelyFits[nu] = (1 - STATUS_BRACKET) * critical;
            surelyFails[nu] = (1 + STATUS_BRACKET) * critical;
        }
    }

    /** The χ² whose p-value at ν degrees of freedom is {@link #NO_SINGLE_DEFECT_P}. */
    private static double critical(int nu) {
        return new ChiSquaredDistribution(null, nu).inverseCumulativeProbability(1 - NO_SINGLE_DEFECT_P);
    }

    /** Ranks {@code curve} against {@code candidates} in one call (prepares and ranks). */
    public static Ranking rank(LifetimeCurve curve, List<Defect> candidates, Doping doping, Silicon silicon) {
        Checks.notNull(curve, "curve");
        return new LibraryRanking(candidates, doping, silicon, curve.injectionPerCm3())
                .rank(curve.tauSrhS(), curve.relativeUncertainty());
    }

    /** The injection levels, cm^-3. */
    public double[] injectionPerCm3() {
        return injectionPerCm3.clone();
    }

    /** Ranks a curve with the default 3 % relative uncertainty at every level ({@code tauSrhS} in s). */
    public Ranking rank(double[] tauSrhS) {
        double[] u = new double[injectionPerCm3.length];
        Arrays.fill(u, LifetimeCurve.DEFAULT_RELATIVE_UNCERTAINTY);
        return rank(tauSrhS, u);
    }

    /**
     * Ranks one curve measured at this ranking's levels.
     *
     * @param tauSrhS             τ_SRH per level, s (levels that are not finite and positive are left out)
     * @param relativeUncertainty relative standard uncertainty per level
     */
    public Ranking rank(double[] tauSrhS, double[] relativeUncertainty) {
        LifetimeCurve curve = new LifetimeCurve(injectionPerCm3, tauSrhS, relativeUncertainty);
        double[] tau = curve.tauSrhS();
        double[] u = curve.relativeUncertainty();
        int n = curve.usableCount();
        if (n < 2) {
            List<CandidateFit> out = new ArrayList<>();
            String why = "only " + n + " of " + tau.length + " levels " + (n == 1 ? "has" : "have")
                    + " a finite positive tau_SRH (s); at least 2 are needed to see the injection dependence";
            for (Defect d : fitted) {
                out.add(CandidateFit.notFitted(d, why));
            }
            out.addAll(skipped);
            return new Ranking(RankingStatus.TOO_FEW_LEVELS, why, n, out, null);
        }
        int nu = n - 1;
        CandidateFit[] fits = new CandidateFit[fitted.size()];
        for (int k = 0; k < fits.length; k++) {
            fits[k] = fit(fitted.get(k), cautions.get(k), ratePerTrap[k], tau, u, nu);
        }
        // best and runner-up as the first two of the candidates sorted by rising χ², ties in library order (a stable
        // sort by Double.compare, which candidates() makes only when it is read)
        int b = 0;
        for (int k = 1; k < fits.length; k++) {
            if (Double.compare(fits[k].chiSquared(), fits[b].chiSquared()) < 0) {
                b = k;
            }
        }
        int ru = -1;
        for (int k = 0; k < fits.length; k++) {
            if (k != b && (ru < 0 || Double.compare(fits[k].chiSquared(), fits[ru].chiSquared()) < 0)) {
                ru = k;
            }
        }
        CandidateFit best = fits[b];
        CandidateFit runner = ru < 0 ? null : fits[ru];
        double ratio = runner == null ? Double.NaN
                : best.chiSquared() == 0 ? Double.POSITIVE_INFINITY : runner.chiSquared() / best.chiSquared();
        DefectHint hint = new DefectHint(best, runner, ratio);
        Supplier<List<CandidateFit>> candidates = () -> {
            List<CandidateFit> out = new ArrayList<>(fits.length + skipped.size());
            out.addAll(Arrays.asList(fits));
            out.sort(Comparator.comparingDouble(CandidateFit::chiSquared));
            out.addAll(skipped);
            return out;
        };
        RankingStatus status;
        Supplier<String> reason;
        if (noSingleDefect(best, nu)) {
            status = RankingStatus.NO_SINGLE_DEFECT;
            reason = () -> noSingleDefect(best, nu, curve);
        } else if (n < tau.length) {
            status = RankingStatus.BELOW_LIMIT;
            reason = () -> belowLimit(hint, curve);
        } else {
            status = RankingStatus.OK;
            reason = () -> verdict(hint);
        }
        return new Ranking(status, n, candidates, hint, reason);
    }

    /**
     * True when the best candidate's p-value is below {@link #NO_SINGLE_DEFECT_P}: from its χ² alone away from the
     * critical value, else from the p-value ({@link #STATUS_BRACKET}; a NaN or huge χ² takes the p-value).
     */
    boolean noSingleDefect(CandidateFit best, int nu) {
        double c = best.chiSquared();
        if (c < surelyFits[nu]) {
            return false;
        }
        if (c > surelyFails[nu] && c < SURELY_FAILS_UP_TO) {
            return true;
        }
        return best.pValue() < NO_SINGLE_DEFECT_P;
    }

    /** The reason of {@link RankingStatus#NO_SINGLE_DEFECT}; {@code nu} the degrees of freedom. */
    private static String noSingleDefect(CandidateFit best, int nu, LifetimeCurve curve) {
        String reason = String.format(Locale.ROOT, "the best candidate %s has chi2 %.4g with %d degrees of freedom,"
                + " p = %.3g < %.2g: no single library defect explains the curve", best.id(), best.chiSquared(),
                nu, best.pValue(), NO_SINGLE_DEFECT_P);
        if (curve.usableCount() < curve.size()) {
            reason += "; tau_SRH is not finite and positive at " + unusable(curve) + " cm^-3 (left out)";
        }
        return reason;
    }

    /** The reason of {@link RankingStatus#BELOW_LIMIT}. */
    private static String belowLimit(DefectHint hint, LifetimeCurve curve) {
        return String.format(Locale.ROOT, "tau_SRH is not finite and positive at %s cm^-3 (SRH not"
                + " resolvable there); ranked on the other %d levels: %s", unusable(curve), curve.usableCount(),
                verdict(hint));
    }

    private CandidateFit fit(Defect d, String caution, double[] c, double[] tau, double[] u, int nu) {
        double scc = 0;
        double scy = 0;
        for (int i = 0; i < tau.length; i++) {
            if (!LifetimeCurve.usable(tau[i])) {
                continue;
            }
            double y = 1.0 / tau[i];
            double w = 1.0 / (u[i] * y * u[i] * y);
            scc += w * c[i] * c[i];
            scy += w * c[i] * y;
        }
        double nt = scy / scc;
        double chi2 = 0;
        for (int i = 0; i < tau.length; i++) {
            if (!LifetimeCurve.usable(tau[i])) {
                continue;
            }
            double r = (1.0 - nt * c[i] * tau[i]) / u[i];
            chi2 += r * r;
        }
        double se = 1.0 / Math.sqrt(scc);
        return new CandidateFit(d, true, caution, nt, se, Math.max(0, nt - BOUNDS_Z * se), nt + BOUNDS_Z * se, chi2, nu,
                chiSquared[nu]);
    }

    private static String unusable(LifetimeCurve curve) {
        double[] dn = curve.injectionPerCm3();
        List<String> s = new ArrayList<>();
        for (int i = 0; i < dn.length; i++) {
            if (!curve.usable(i)) {
                s.add(String.format(Locale.ROOT, "%.3g", dn[i]));
            }
        }
        return String.join(", ", s);
    }

    private static String verdict(DefectHint h) {
        CandidateFit b = h.best();
        String s = String.format(Locale.ROOT, "%s fits best (N_t %.3g cm^-3, chi2 %.3g, p = %.3g)", b.id(),
                b.ntPerCm3(), b.chiSquared(), b.pValue());
        if (h.runnerUp() != null) {
            s += String.format(Locale.ROOT, "; runner-up %s (chi2 ratio %.3g)", h.runnerUp().id(),
                    h.chiSquaredRatio());
        }
        return s;
    }
}
