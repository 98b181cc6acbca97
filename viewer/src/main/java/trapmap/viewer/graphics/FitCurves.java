package trapmap.viewer.graphics;

import java.util.ArrayList;
import java.util.List;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.recombination.SrhRecombination;
import trapmap.physics.spectroscopy.CandidateFit;
import trapmap.physics.spectroscopy.LifetimeCurve;
import trapmap.physics.spectroscopy.Ranking;

/**
 * What the τ_SRH(Δn) identification chart draws, assembled from the physics module: the measured τ_SRH per
 * injection level with its ±1 standard-uncertainty bar (relative uncertainty u: τ(1 − u) to τ(1 + u)), and for the
 * best fitted candidates of a {@link Ranking} the curve τ_SRH(Δn) = K(Δn)/N_t at their fitted N_t, computed by
 * {@link SrhRecombination#lifetimeS} (Shockley &amp; Read 1952; Hall 1952) over the levels' range widened by a factor
 * {@value #WIDEN} each way. Times in µs, densities in cm⁻³. No Swing.
 *
 * @param points      the measured levels (usable ones: finite positive τ_SRH)
 * @param unusable    Δn of the levels whose τ_SRH is not finite and positive (not drawn), cm⁻³
 * @param candidates  the drawn candidates, best first
 * @param minInjectionPerCm3 lower end of the drawn Δn range, cm⁻³
 * @param maxInjectionPerCm3 upper end of the drawn Δn range, cm⁻³
 * @param ranking     the ranking the candidates come from
 */
public record FitCurves(List<Point> points, List<Double> unusable, List<Candidate> candidates,
                        double minInjectionPerCm3, double maxInjectionPerCm3, Ranking ranking) {
    /** Candidates drawn by default: the best three. */
    public static final int DEFAULT_CANDIDATES = 3;
    /** Factor the drawn Δn range extends beyond the lowest and highest level. */
    public static final double WIDEN = 3.0;
    /** Samples per drawn curve (log-spaced in Δn). */
    public static final int SAMPLES = 61;

    public FitCurves {
        points = List.copyOf(points);
        unusable = List.copyOf(unusable);
        candidates = List.copyOf(candidates);
    }

    /**
     * One measured level.
     *
     * @param injectionPerCm3 Δn, cm⁻³
     * @param tauUs           τ_SRH, µs
     * @param lowUs           τ_SRH (1 − u), µs (at least a thousandth of τ, so that a log axis can draw it)
     * @param highUs          τ_SRH (1 + u), µs
     */
    public record Point(double injectionPerCm3, double tauUs, double lowUs, double highUs) {
    }

    /**
     * One fitted candidate and its curve.
     *
     * @param fit             the physics fit (defect, N_t, bounds, χ², ν, p)
     * @param injectionPerCm3 Δn of the curve's samples, cm⁻³
     * @param tauUs           τ_SRH at the fitted N_t at each sample, µs
     */
    public record Candidate(CandidateFit fit, double[] injectionPerCm3, double[] tauUs) {
        public Candidate {
            injectionPerCm3 = injectionPerCm3.clone();
            tauUs = tauUs.clone();
        }

        @Override
        public double[] injectionPerCm3() {
            return injectionPerCm3.clone();
        }

        @Override
        public double[] tauUs() {
            return tauUs.clone();
        }

        /** The legend line: defect id and name, N_t with unit, χ² with ν, p. */
        public String label() {
            return fit.id() + " (" + fit.defect().name() + "): N_t = " + Labels.number(fit.ntPerCm3()) + " cm⁻³, χ² = "
                    + Labels.compact(fit.chiSquared()) + " (ν = " + fit.degreesOfFreedom() + "), p = "
                    + Labels.compact(fit.pValue());
        }
    }

    /** The curves of the best {@value #DEFAULT_CANDIDATES} candidates. */
    public static FitCurves of(LifetimeCurve curve, Ranking ranking, Doping doping, Silicon silicon) {
        return of(curve, ranking, doping, silicon, DEFAULT_CANDIDATES);
    }

    /**
     * @param curve   the measured τ_SRH(Δn) (s, cm⁻³) and relative uncertainties the ranking was made of
     * @param ranking its ranking ({@code LibraryRanking.rank})
     * @param doping  the wafer's doping (as given to the ranking)
     * @param silicon the silicon the ranking used
     * @param top     how many fitted candidates to draw (best first)
     */
    public static FitCurves of(LifetimeCurve curve, Ranking ranking, Doping doping, Silicon silicon, int top) {
        if (curve == null || ranking == null || doping == null || silicon == null) {
            throw new IllegalArgumentException("curve, ranking, doping and silicon are needed");
        }
        if (top < 0) {
            throw new IllegalArgumentException("the number of candidates drawn must be at least 0 but was " + top);
        }
        double[] dn = curve.injectionPerCm3();
        double[] tau = curve.tauSrhS();
        double[] u = curve.relativeUncertainty();
        List<Point> pts = new ArrayList<>();
        List<Double> bad = new ArrayList<>();
        double lo = Double.POSITIVE_INFINITY;
        double hi = 0;
        for (int i = 0; i < dn.length; i++) {
            lo = Math.min(lo, dn[i]);
            hi = Math.max(hi, dn[i]);
            if (!curve.usable(i)) {
                bad.add(dn[i]);
                continue;
            }
            double t = tau[i] * 1e6;
            pts.add(new Point(dn[i], t, t * Math.max(1e-3, 1 - u[i]), t * (1 + u[i])));
        }
        double from = lo / WIDEN;
        double to = hi * WIDEN;
        List<Candidate> cands = new ArrayList<>();
        for (CandidateFit f : ranking.candidates()) {
            if (cands.size() >= top) {
                break;
            }
            if (!f.fitted() || !(f.ntPerCm3() > 0)) {
                continue;
            }
            SrhRecombination srh = SrhRecombination.of(f.defect(), doping, silicon);
            double[] x = new double[SAMPLES];
            double[] y = new double[SAMPLES];
            for (int s = 0; s < SAMPLES; s++) {
                x[s] = from * Math.pow(to / from, s / (double) (SAMPLES - 1));
                y[s] = srh.lifetimeS(x[s], f.ntPerCm3()) * 1e6;
            }
            cands.add(new Candidate(f, x, y));
        }
        return new FitCurves(pts, bad, cands, from, to, ranking);
    }
}
