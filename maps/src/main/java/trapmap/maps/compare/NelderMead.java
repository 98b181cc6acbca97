package trapmap.maps.compare;

import java.util.function.ToDoubleFunction;

/**
 * Nelder–Mead downhill simplex (Nelder & Mead, Computer Journal 7, 308 (1965); standard coefficients 1, 2, ½, ½).
 * Stops when every vertex lies within {@code tolerance} of the best one in every coordinate, so parameters should
 * be scaled to comparable units. NaN values count as +∞.
 */
final class NelderMead {
    private NelderMead() {
    }

    record Minimum(double[] point, double value, int evaluations) {
    }

    static Minimum minimise(ToDoubleFunction<double[]> f, double[] start, double[] steps, double tolerance,
                            int maxEvaluations) {
        int n = start.length;
        double[][] p = new double[n + 1][];
        double[] v = new double[n + 1];
        p[0] = start.clone();
        for (int i = 0; i < n; i++) {
            p[i + 1] = start.clone();
            p[i + 1][i] += steps[i];
        }
        int evals = 0;
        for (int i = 0; i <= n; i++) {
            v[i] = value(f, p[i]);
            evals++;
        }
        while (evals < maxEvaluations) {
            sort(p, v);
            if (spread(p) <= tolerance) {
                break;
            }
            double[] centroid = new double[n];
            for (int i = 0; i < n; i++) {
                for (int j = 0; j < n; j++) {
                    centroid[j] += p[i][j] / n;
                }
            }
            double[] reflected = along(centroid, p[n], -1);
            double fr = value(f, reflected);
            evals++;
            if (fr < v[0]) {
                double[] expanded = along(centroid, p[n], -2);
                double fe = value(f, expanded);
                evals++;
                if (fe < fr) {
                    p[n] = expanded;
                    v[n] = fe;
                } else {
                    p[n] = reflected;
                    v[n] = fr;
                }
            } else if (fr < v[n - 1]) {
                p[n] = reflected;
                v[n] = fr;
            } else {
                boolean outside = fr < v[n];
                double[] contracted = along(centroid, outside ? reflected : p[n], 0.5);
                double fc = value(f, contracted);
                evals++;
                if (fc < Math.min(fr, v[n])) {
                    p[n] = contracted;
                    v[n] = fc;
                } else {
                    for (int i = 1; i <= n; i++) {
                        p[i] = along(p[0], p[i], 0.5);
                        v[i] = value(f, p[i]);
                        evals++;
                    }
                }
            }
        }
        sort(p, v);
        return new Minimum(p[0], v[0], evals);
    }

    private static double value(ToDoubleFunction<double[]> f, double[] x) {
        double y = f.applyAsDouble(x);
        return Double.isNaN(y) ? Double.POSITIVE_INFINITY : y;
    }

    /** from + t·(to − from). */
    private static double[] along(double[] from, double[] to, double t) {
        double[] r = new double[from.length];
        for (int i = 0; i < r.length; i++) {
            r[i] = from[i] + t * (to[i] - from[i]);
        }
        return r;
    }

    private static double spread(double[][] p) {
        double s = 0;
        for (int i = 1; i < p.length; i++) {
            for (int j = 0; j < p[0].length; j++) {
                s = Math.max(s, Math.abs(p[i][j] - p[0][j]));
            }
        }
        return s;
    }

    private static void sort(double[][] p, double[] v) {
        for (int i = 1; i < v.length; i++) {
            double[] pi = p[i];
            double vi = v[i];
            int j = i - 1;
            while (j >= 0 && v[j] > vi) {
                p[j + 1] = p[j];
                v[j + 1] = v[j];
                j--;
            }
            p[j + 1] = pi;
            v[j + 1] = vi;
        }
    }
}
