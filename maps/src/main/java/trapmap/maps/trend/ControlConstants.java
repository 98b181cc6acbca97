package trapmap.maps.trend;

import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.ConcurrentMap;
import org.apache.commons.math3.special.Erf;
import trapmap.shared.check.Checks;

/**
 * The control-chart constants for subgroups of n normally distributed values, computed from their definitions
 * rather than copied from a table, so that any subgroup size from 2 to {@link #MAX_N} is served:
 * <ul>
 * <li>d2(n) = E[R]/σ, the mean range of n standard normal values:
 * d2 = ∫ [1 − Φ(x)ⁿ − (1 − Φ(x))ⁿ] dx (Tippett, Biometrika 17, 364 (1925));</li>
 * <li>d3(n) = sd(R)/σ, from E[R²] = 2 ∫∫<sub>x&lt;y</sub> [1 − Φ(y)ⁿ − (1 − Φ(x))ⁿ + (Φ(y) − Φ(x))ⁿ] dx dy
 * (Harter, Ann. Math. Stat. 31, 1122 (1960));</li>
 * <li>D3 = max(0, 1 − 3 d3/d2), D4 = 1 + 3 d3/d2 and A2 = 3/(d2 √n), the factors of the R and X̄ chart
 * (Montgomery, <i>Introduction to Statistical Quality Control</i>, §6.2).</li>
 * </ul>
 * The integrals are taken by the trapezoidal rule on [−{@value #HALF_WIDTH}, {@value #HALF_WIDTH}] in steps of
 * {@value #STEP}; the values agree with the tables of ASTM E2587 and Montgomery's Appendix VI to their three decimals
 * ({@code ControlConstantsTest}). Each n is computed once and kept.
 */
public final class ControlConstants {
    /** The largest subgroup size served (a range chart is a poor estimator long before that). */
    public static final int MAX_N = 100;
    static final double HALF_WIDTH = 9.0;
    static final double STEP = 0.01;

    private static final double[] GRID_CDF = cdfGrid();
    private static final ConcurrentMap<Integer, ControlConstants> CACHE = new ConcurrentHashMap<>();

    private final int n;
    private final double d2;
    private final double d3;

    private ControlConstants(int n, double d2, double d3) {
        this.n = n;
        this.d2 = d2;
        this.d3 = d3;
    }

    /** The constants for subgroups of {@code n} values, 2 ≤ n ≤ {@link #MAX_N}. */
    public static ControlConstants of(int n) {
        Checks.inRange(n, 2, MAX_N, "subgroup size", "values");
        return CACHE.computeIfAbsent(n, ControlConstants::compute);
    }

    public int n() {
        return n;
    }

    /** Mean range of n standard normal values (E[R] = d2 σ). */
    public double d2() {
        return d2;
    }

    /** Standard deviation of that range (sd(R) = d3 σ). */
    public double d3() {
        return d3;
    }

    /** Lower R-chart factor: LCL = D3 R̄ (0 for n ≤ 6). */
    public double bigD3() {
        return Math.max(0.0, 1.0 - 3.0 * d3 / d2);
    }

    /** Upper R-chart factor: UCL = D4 R̄. */
    public double bigD4() {
        return 1.0 + 3.0 * d3 / d2;
    }

    /** X̄-chart factor: limits x̿ ± A2 R̄. */
    public double a2() {
        return 3.0 / (d2 * Math.sqrt(n));
    }

    private static double[] cdfGrid() {
        int m = (int) Math.round(2 * HALF_WIDTH / STEP) + 1;
        double[] f = new double[m];
        for (int i = 0; i < m; i++) {
            double x = -HALF_WIDTH + i * STEP;
            f[i] = 0.5 * Erf.erfc(-x / Math.sqrt(2.0));
        }
        return f;
    }

    private static ControlConstants compute(int n) {
        double[] f = GRID_CDF;
        int m = f.length;
        double[] upper = new double[m]; // Φ(x)^n
        double[] lower = new double[m]; // (1 − Φ(x))^n
        for (int i = 0; i < m; i++) {
            upper[i] = Math.pow(f[i], n);
            lower[i] = Math.pow(1.0 - f[i], n);
        }
        double[] g = new double[m];
        for (int i = 0; i < m; i++) {
            g[i] = 1.0 - upper[i] - lower[i];
        }
        double d2 = trapezoid(g, m);
        // E[R²]: for each y the inner integral over x ≤ y, then the outer one over y.
        double[] inner = new double[m];
        double[] h = new double[m];
        for (int j = 0; j < m; j++) {
            for (int i = 0; i <= j; i++) {
                h[i] = 1.0 - upper[j] - lower[i] + Math.pow(f[j] - f[i], n);
            }
            inner[j] = trapezoid(h, j + 1);
        }
        double meanSquare = 2.0 * trapezoid(inner, m);
        double d3 = Math.sqrt(Math.max(0.0, meanSquare - d2 * d2));
        return new ControlConstants(n, d2, d3);
    }

    private static double trapezoid(double[] y, int count) {
        if (count < 2) {
            return 0.0;
        }
        double sum = 0.5 * (y[0] + y[count - 1]);
        for (int i = 1; i < count - 1; i++) {
            sum += y[i];
        }
        return sum * STEP;
    }
}
