package trapmap.physics.recombination;

import org.apache.commons.math3.analysis.solvers.BrentSolver;
import trapmap.shared.check.Checks;

/**
 * Surface-limited lifetime of a wafer with equal recombination velocity S on both surfaces.
 * <ul>
 * <li>Sproul, "Dimensionless solution of the equation describing the effect of surface recombination on carrier
 * decay in semiconductors", JAP 76, 2851 (1994): τ_s ≈ W/(2S) + (1/D)(W/π)², accurate to about 5 %.</li>
 * <li>Exact fundamental decay mode: τ_s = 1/(α0² D) with tan(α0 W/2) = S/(α0 D), solved with Brent's method.</li>
 * </ul>
 */
public final class SurfaceLifetime {
    private SurfaceLifetime() {
    }

    /** Sproul's approximation, s. W in cm, S in cm/s, D in cm²/s. */
    public static double sproulS(double thicknessCm, double srvCmPerS, double diffusivityCm2PerS) {
        check(thicknessCm, srvCmPerS, diffusivityCm2PerS);
        if (srvCmPerS == 0) {
            return Double.POSITIVE_INFINITY;
        }
        double wPi = thicknessCm / Math.PI;
        return thicknessCm / (2 * srvCmPerS) + wPi * wPi / diffusivityCm2PerS;
    }

    /** The exact fundamental-mode solution, s. W in cm, S in cm/s, D in cm²/s. */
    public static double exactS(double thicknessCm, double srvCmPerS, double diffusivityCm2PerS) {
        check(thicknessCm, srvCmPerS, diffusivityCm2PerS);
        if (srvCmPerS == 0) {
            return Double.POSITIVE_INFINITY;
        }
        // With x = α0 W/2 in (0, π/2): x tan x = S W / (2 D), monotonic in x.
        double target = srvCmPerS * thicknessCm / (2 * diffusivityCm2PerS);
        double x;
        if (target < 1e-8) {
            x = Math.sqrt(target); // x tan x → x² for small x; relative error below 1e-8
        } else {
            double hi = Math.PI / 2 * (1 - 1e-15);
            x = new BrentSolver(1e-16, 1e-15).solve(1000, v -> v * Math.tan(v) - target, 0, hi);
        }
        return thicknessCm * thicknessCm / (4 * x * x * diffusivityCm2PerS);
    }

    /** τ_s by the chosen model, s. */
    public static double lifetimeS(SurfaceModel model, double thicknessCm, double srvCmPerS,
                                   double diffusivityCm2PerS) {
        return model == SurfaceModel.EXACT ? exactS(thicknessCm, srvCmPerS, diffusivityCm2PerS)
                : sproulS(thicknessCm, srvCmPerS, diffusivityCm2PerS);
    }

    private static void check(double w, double s, double d) {
        Checks.positive(w, "thickness", "cm");
        Checks.nonNegative(s, "surfaceRecombinationVelocity", "cm/s");
        Checks.positive(d, "diffusivity", "cm^2/s");
    }
}
