package trapmap.physics.uncertainty;

import org.apache.commons.math3.analysis.UnivariateFunction;
import org.apache.commons.math3.analysis.solvers.AllowedSolution;
import org.apache.commons.math3.analysis.solvers.BracketingNthOrderBrentSolver;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.units.Units;

/**
 * One sample's threshold lifetime under a fixed generation rate G, where each pixel's excess density is Δn = G·τ
 * (τ the sample's true effective lifetime, τ_measured/m_s). With r0(Δn) = 1/τ_intr(Δn) + 1/τ_surf, the SRH rate
 * R(τ) = 1/τ − r0(G·τ), the detectable rate δ·r0(G·τ) and the SRH factor K(G·τ) (the conversion's,
 * {@link TrapDensityConverter}), the conversion reports an OK density above N* when
 * <pre>
 * φ(τ) = min(K(G·τ)·R(τ)/N* − 1, R(τ)/(δ·r0(G·τ)) − 1) &gt; 0
 * </pre>
 * φ is continuous; Δn now grows with τ, so φ need not fall monotonically with τ as it does at a fixed Δn. The
 * threshold τ*_s is its root: φ is evaluated upwards from the conversion's floor (1 ns) on a grid of
 * {@value #PER_DECADE} points per decade to its first sign change, the root is solved in that bracket with Commons
 * Math's {@link BracketingNthOrderBrentSolver} (Brent's bracketed root finding: R. P. Brent, Algorithms for
 * Minimization without Derivatives, Prentice-Hall 1973, ch. 4; to a relative 1e-14), and φ is checked to stay ≤ 0
 * on the same grid for {@value #CHECKED_DECADES} decades above it: exceedance must hold exactly below τ*_s, else the
 * sample is refused with the reason (the probability would not be one binary search per pixel). Cost: about 60–100
 * evaluations of φ per sample (each one intrinsic rate and one SRH factor), some 0.1 s for 10⁴ samples, once per
 * wafer.
 */
final class GenerationThreshold {
    /** Grid points per decade of the bracketing scan and the monotonicity check. */
    static final int PER_DECADE = 8;
    /** Decades above the root over which φ must stay ≤ 0. */
    static final int CHECKED_DECADES = 2;
    /** Longest lifetime scanned, µs (10 s): beyond it every sample's lifetime is limited by intrinsic recombination. */
    static final double MAX_TAU_US = 1e7;

    private GenerationThreshold() {
    }

    /**
     * τ*_s in measured µs: a pixel measured at τ exceeds N* exactly when τ &lt; τ*_s ({@link
     * TrapDensityConverter#LIFETIME_FLOOR_US} when none does, +∞ when every one does).
     *
     * @param conv           the sample's converter (its conditions hold the drawn G)
     * @param generation     the drawn G, cm⁻³ s⁻¹
     * @param surfaceRate    1/τ_surf, 1/s
     * @param resolution     the detection resolution δ
     * @param threshold      N*, cm⁻³
     * @param lifetimeFactor m_s = τ_measured/τ_true
     */
    static double lifetimeUs(TrapDensityConverter conv, double generation, double surfaceRate, double resolution,
                             double threshold, double lifetimeFactor) {
        UnivariateFunction phi = tauUs -> {
            double tauS = tauUs / lifetimeFactor * Units.S_PER_US;
            double dn = generation * tauS;
            double r0 = conv.intrinsic().rateConstantPerS(dn) + surfaceRate;
            double rate = 1.0 / tauS - r0;
            return Math.min(conv.srh().lifetimeDensityProductSCm3(dn) * rate / threshold - 1,
                    rate / (resolution * r0) - 1);
        };
        double step = Math.pow(10, 1.0 / PER_DECADE);
        double lo = TrapDensityConverter.LIFETIME_FLOOR_US;
        double root;
        if (!(phi.value(lo) > 0)) {
            root = lo;
        } else {
            double hi = lo * step;
            while (hi <= MAX_TAU_US && phi.value(hi) > 0) {
                lo = hi;
                hi *= step;
            }
            if (hi > MAX_TAU_US) {
                return Double.POSITIVE_INFINITY;
            }
            root = new BracketingNthOrderBrentSolver(1e-14, 1e-12, 5).solve(200, phi, lo, hi,
                    AllowedSolution.RIGHT_SIDE);
        }
        for (double t = Math.max(root, lo * step), end = root * Math.pow(10, CHECKED_DECADES); t <= end;
                t *= step) {
            if (phi.value(t) > 0) {
                throw new InvalidValueException("generation", "cm^-3 s^-1", String.format(java.util.Locale.ROOT,
                        "under this fixed generation rate (G = %.3g cm^-3 s^-1) a sample's trap density falls"
                        + " below N* at %.4g us and exceeds it again at %.4g us (the SRH factor rises with"
                        + " Delta n = G*tau faster than the SRH rate falls): the exceedance is not one lifetime"
                        + " threshold; convert the lifetimes at a fixed injection level instead", generation, root,
                        t));
            }
        }
        return root;
    }
}
