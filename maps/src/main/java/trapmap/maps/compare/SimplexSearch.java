package trapmap.maps.compare;

import java.util.function.ToDoubleFunction;
import org.apache.commons.math3.exception.TooManyEvaluationsException;
import org.apache.commons.math3.optim.ConvergenceChecker;
import org.apache.commons.math3.optim.InitialGuess;
import org.apache.commons.math3.optim.MaxEval;
import org.apache.commons.math3.optim.PointValuePair;
import org.apache.commons.math3.optim.nonlinear.scalar.GoalType;
import org.apache.commons.math3.optim.nonlinear.scalar.ObjectiveFunction;
import org.apache.commons.math3.optim.nonlinear.scalar.noderiv.NelderMeadSimplex;
import org.apache.commons.math3.optim.nonlinear.scalar.noderiv.SimplexOptimizer;

/**
 * Downhill simplex minimisation (Nelder & Mead, Computer Journal 7, 308 (1965); standard coefficients 1, 2, ½, ½)
 * by Commons Math's {@link SimplexOptimizer} with a {@link NelderMeadSimplex}. The first simplex is the start point
 * and one vertex a step along each axis; the search stops when every vertex lies within {@code tolerance} of the
 * best one in every coordinate, so parameters should be scaled to comparable units. NaN values count as +∞. When
 * the evaluations run out, the best point evaluated is returned.
 */
final class SimplexSearch {
    private SimplexSearch() {
    }

    record Minimum(double[] point, double value, int evaluations) {
    }

    static Minimum minimise(ToDoubleFunction<double[]> f, double[] start, double[] steps, double tolerance,
                            int maxEvaluations) {
        int n = start.length;
        double[][] reference = new double[n + 1][n];
        for (int i = 0; i < n; i++) {
            reference[i + 1][i] = steps[i];
        }
        Best best = new Best();
        ObjectiveFunction objective = new ObjectiveFunction(x -> {
            double y = f.applyAsDouble(x);
            double v = Double.isNaN(y) ? Double.POSITIVE_INFINITY : y;
            best.offer(x, v);
            return v;
        });
        SimplexOptimizer optimizer = new SimplexOptimizer(new VertexSpread(n, tolerance));
        try {
            PointValuePair p = optimizer.optimize(new MaxEval(maxEvaluations), objective, GoalType.MINIMIZE,
                    new InitialGuess(start), new NelderMeadSimplex(reference));
            return new Minimum(p.getPoint(), p.getValue(), optimizer.getEvaluations());
        } catch (TooManyEvaluationsException e) {
            return new Minimum(best.point, best.value, maxEvaluations);
        }
    }

    /** The lowest value evaluated (the first on a tie: the simplex keeps older vertices on ties too). */
    private static final class Best {
        double[] point;
        double value = Double.NaN;

        void offer(double[] x, double v) {
            if (point == null || v < value) {
                point = x.clone();
                value = v;
            }
        }
    }

    /**
     * Converged when every vertex lies within the tolerance of the best vertex in every coordinate. The optimizer
     * asks about the vertices of its sorted simplex in order, best first, after each iteration, and stops asking at
     * the first "no"; the checker keeps the best vertex from the first question of each round.
     */
    private static final class VertexSpread implements ConvergenceChecker<PointValuePair> {
        private final int dimension;
        private final double tolerance;
        private double[] best;
        private int vertex;

        VertexSpread(int dimension, double tolerance) {
            this.dimension = dimension;
            this.tolerance = tolerance;
        }

        @Override
        public boolean converged(int iteration, PointValuePair previous, PointValuePair current) {
            double[] p = current.getPointRef();
            if (vertex == 0) {
                best = p;
                vertex = 1;
                return true;
            }
            boolean close = true;
            for (int j = 0; j < p.length; j++) {
                close &= Math.abs(p[j] - best[j]) <= tolerance;
            }
            vertex = close && vertex < dimension ? vertex + 1 : 0;
            return close;
        }
    }
}
