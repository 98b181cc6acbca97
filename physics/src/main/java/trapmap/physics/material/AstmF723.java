package trapmap.physics.material;

import trapmap.shared.check.Checks;

/**
 * Resistivity ↔ dopant density for boron- and phosphorus-doped silicon at 23 °C: ASTM F723 (SEMI MF723), the
 * fits of Thurber et al., NBS Special Publication 400-64. Forward (ρ → N) and inverse (N → ρ) are separate fits
 * that round-trip only to about 2 %; never chain them. Validity: ρ 1e-4 … 1e4 Ω·cm; N 1e12 … 1e21 cm^-3 (B),
 * 1e12 … 5e20 cm^-3 (P).
 */
public final class AstmF723 {
    /** Lowest resistivity covered by the fits, Ω·cm. */
    public static final double MIN_RESISTIVITY_OHM_CM = 1e-4;
    /** Highest resistivity covered by the fits, Ω·cm. */
    public static final double MAX_RESISTIVITY_OHM_CM = 1e4;

    private AstmF723() {
    }

    /** Boron density from resistivity: N = 1.330e16/ρ + 1.082e17/[ρ (1 + (54.56 ρ)^1.105)]. */
    public static double boronPerCm3(double resistivityOhmCm) {
        double rho = checkRho(resistivityOhmCm);
        return 1.330e16 / rho + 1.082e17 / (rho * (1 + Math.pow(54.56 * rho, 1.105)));
    }

    /** Phosphorus density from resistivity: N = (6.242e18/ρ)·10^Z(log10 ρ). */
    public static double phosphorusPerCm3(double resistivityOhmCm) {
        double rho = checkRho(resistivityOhmCm);
        double x = Math.log10(rho);
        double z = (-3.1083 - 3.2626 * x - 1.2196 * x * x - 0.13923 * x * x * x)
                / (1 + 1.0265 * x + 0.38755 * x * x + 0.041833 * x * x * x);
        return 6.242e18 / rho * Math.pow(10, z);
    }

    /** Resistivity of boron-doped silicon: ρ = 1.305e16/N + 1.133e17/[N (1 + (2.58e-19 N)^−0.737)]. */
    public static double boronResistivityOhmCm(double densityPerCm3) {
        double n = Checks.inRange(densityPerCm3, 1e12, 1e21, "dopantDensity", "cm^-3");
        return 1.305e16 / n + 1.133e17 / (n * (1 + Math.pow(2.58e-19 * n, -0.737)));
    }

    /** Resistivity of phosphorus-doped silicon: ρ = (6.242e18/N)·10^Z(log10 N − 16). */
    public static double phosphorusResistivityOhmCm(double densityPerCm3) {
        double n = Checks.inRange(densityPerCm3, 1e12, 5e20, "dopantDensity", "cm^-3");
        double x = Math.log10(n) - 16;
        double z = (-3.0769 + 2.2108 * x - 0.62272 * x * x + 0.057501 * x * x * x)
                / (1 - 0.68157 * x + 0.19833 * x * x - 0.018376 * x * x * x);
        return 6.242e18 / n * Math.pow(10, z);
    }

    private static double checkRho(double rho) {
        return Checks.inRange(rho, MIN_RESISTIVITY_OHM_CM, MAX_RESISTIVITY_OHM_CM, "resistivity", "ohm*cm");
    }
}
