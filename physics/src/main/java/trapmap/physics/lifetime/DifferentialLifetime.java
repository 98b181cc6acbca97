package trapmap.physics.lifetime;

import java.util.function.DoubleUnaryOperator;
import org.apache.commons.math3.analysis.integration.IterativeLegendreGaussIntegrator;
import trapmap.shared.check.Checks;

/**
 * Differential (small-signal) versus actual lifetime (Schmidt, IEEE Trans. Electron Devices 46, 2018 (1999)).
 * Modulated or transient measurements on a bias light give τ_diff = dΔn/dG; the SRH inversion needs the actual
 * lifetime τ_act = Δn/U. With U = Δn/τ_act and τ_diff = 1/(dU/dΔn):
 * <pre>
 * τ_diff = τ_act / [1 − (Δn/τ_act)·dτ_act/dΔn]
 * τ_act(Δn) = Δn / ∫_0^Δn dΔn'/τ_diff(Δn')
 * </pre>
 */
public final class DifferentialLifetime {
    /** Decades below Δn over which the integral is evaluated; the rest is taken at constant τ_diff. */
    private static final double DECADES = 14;

    private DifferentialLifetime() {
    }

    /**
     * τ_diff from the actual lifetime and its slope.
     *
     * @param actualS        τ_act at Δn, s
     * @param slopeSCm3      dτ_act/dΔn at Δn, s·cm³
     * @param injectionPerCm3 Δn, cm^-3
     */
    public static double differentialS(double actualS, double slopeSCm3, double injectionPerCm3) {
        Checks.positive(actualS, "actualLifetime", "s");
        Checks.finite(slopeSCm3, "lifetimeSlope", "s*cm^3");
        Checks.positive(injectionPerCm3, "injection", "cm^-3");
        return actualS / (1 - injectionPerCm3 / actualS * slopeSCm3);
    }

    /**
     * τ_act at {@code injectionPerCm3} from a differential-lifetime curve τ_diff(Δn) (s), by integrating
     * dΔn/τ_diff over ln Δn with Gauss–Legendre quadrature (Apache Commons Math).
     */
    public static double actualS(DoubleUnaryOperator differentialS, double injectionPerCm3) {
        Checks.positive(injectionPerCm3, "injection", "cm^-3");
        double upper = Math.log(injectionPerCm3);
        double lower = upper - DECADES * Math.log(10);
        double low = Math.exp(lower);
        IterativeLegendreGaussIntegrator integrator = new IterativeLegendreGaussIntegrator(16, 1e-12, 1e-300);
        double integral = integrator.integrate(100_000, u -> {
            double dn = Math.exp(u);
            return dn / differentialS.applyAsDouble(dn);
        }, lower, upper);
        double tail = low / differentialS.applyAsDouble(low);
        return injectionPerCm3 / (integral + tail);
    }
}
