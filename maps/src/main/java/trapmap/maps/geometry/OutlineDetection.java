package trapmap.maps.geometry;

import java.util.Arrays;
import java.util.function.Function;
import org.apache.commons.math3.exception.MathIllegalStateException;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresBuilder;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresOptimizer;
import org.apache.commons.math3.fitting.leastsquares.LevenbergMarquardtOptimizer;
import org.apache.commons.math3.fitting.leastsquares.MultivariateJacobianFunction;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.QRDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.linear.RealVector;
import org.apache.commons.math3.util.Pair;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.check.Checks;

/**
 * Finds the wafer outline in the valid (non-NaN) pixels of a map when no shape is given.
 *
 * <p>Method:
 * <ol>
 *   <li>Fill enclosed NaN holes ({@link DataOutline#filled(Mask)}) and take the edge points: midpoints between each
 *       valid pixel and its invalid 4-neighbours (points on the raster border are skipped).</li>
 *   <li>Round model: algebraic circle fit (Kåsa: least squares of x² + y² + Dx + Ey + F = 0, solved by QR), then a
 *       geometric fit (Levenberg–Marquardt on the radial residuals), repeated while trimming edge points farther than
 *       max(3σ, one pixel) from the circle (σ = 1.4826 × median absolute deviation). A flat or notch shows as a
 *       cluster of edge points inside the circle; its direction is the cluster's mean angle, its depth the deepest
 *       point, and it is a flat when the cluster is more than four times wider than deep (a 90° notch is about
 *       twice as wide as deep). A flat's length follows from its depth s: L = 2·√(R² − (R − s)²). A notch is given
 *       the SEMI M1 opening angle (90°); its angle is not measured.</li>
 *   <li>Square model: centre from the centroid of the filled area, rotation from the minimum-area bounding box of
 *       the edge points, side from the median of max(|u|, |v|) in the square's frame, corner diameter from the
 *       median radius of the points inside the corners; then Levenberg–Marquardt on the exact signed distances
 *       with the same trimming, once as a full square and once as a pseudo-square. The pseudo-square is kept when
 *       its clipped squared-distance cost is at least 2 % lower (small corners, such as G12's 2 mm chords, are
 *       otherwise lost in the pixel noise).</li>
 *   <li>Each model is scored by the fraction of valid pixels it mis-classifies; the square wins only when it is
 *       clearly better (by 0.1 % of the area and by a tenth of the round model's mismatch) and has real straight
 *       sides, so a round wafer is never called a pseudo-square.</li>
 * </ol>
 */
public final class OutlineDetection {
    private static final int MIN_EDGE_POINTS = 12;
    private static final int TRIM_ROUNDS = 5;

    private OutlineDetection() {
    }

    /** The outline of the valid pixels of a map, in its grid's wafer coordinates. */
    public static OutlineFit fit(WaferMap map) {
        Checks.notNull(map, "map");
        return fit(map.raster(), map.grid());
    }

    /**
     * The outline of the valid pixels of {@code raster}.
     *
     * @throws IllegalArgumentException when the sizes differ or there is too little data to fit
     */
    public static OutlineFit fit(FloatRaster raster, PixelGrid grid) {
        return fit(Mask.valid(raster), grid);
    }

    /** The outline of the pixels of {@code valid}. */
    public static OutlineFit fit(Mask valid, PixelGrid grid) {
        Checks.notNull(valid, "valid");
        Checks.notNull(grid, "grid");
        if (valid.width() != grid.width() || valid.height() != grid.height()) {
            throw new IllegalArgumentException("mask " + valid.width() + "x" + valid.height()
                    + " does not match grid " + grid.width() + "x" + grid.height());
        }
        Mask filled = DataOutline.filled(valid);
        double[][] pts = DataOutline.edgePointsMm(filled, grid);
        if (pts[0].length < MIN_EDGE_POINTS) {
            throw new IllegalArgumentException("the wafer outline is not visible in the map: only " + pts[0].length
                    + " edge points between valid and missing data (need " + MIN_EDGE_POINTS + ")");
        }
        double pitch = grid.pitchMm();

        WaferShape round = fitRound(pts[0], pts[1], pitch);
        FitQuality roundQ = quality(OutlineFit.Model.ROUND, round, pts, filled, grid);
        RoundWafer withMark = addFiducial((RoundWafer) round, pts, pitch);
        if (withMark != round) {
            FitQuality q = quality(OutlineFit.Model.ROUND, withMark, pts, filled, grid);
            if (q.mismatchFraction() < roundQ.mismatchFraction()) {
                round = withMark;
                roundQ = q;
            }
        }

        SquareWafer square;
        try {
            square = fitSquare(pts[0], pts[1], filled, grid);
        } catch (MathIllegalStateException | IllegalArgumentException e) {
            square = null; // the data are far from any square; the round model stands alone
        }
        FitQuality squareQ = square == null ? null : quality(OutlineFit.Model.SQUARE, square, pts, filled, grid);

        boolean squareWins = squareQ != null
                && square.straightSideMm() > 0.1 * square.sideMm()
                && squareQ.mismatchFraction() < roundQ.mismatchFraction()
                        - Math.max(0.001, 0.1 * roundQ.mismatchFraction());
        WaferShape shape = squareWins ? square : round;
        FitQuality chosen = squareWins ? squareQ : roundQ;
        FitQuality other = squareWins ? roundQ : squareQ;
        PixelGrid recentred = grid.withCentre(grid.xPx(shape.centreXMm()), grid.yPx(shape.centreYMm()));
        return new OutlineFit(shape, chosen, other, WaferFormat.closestTo(shape, pitch), recentred);
    }

    // ---------------------------------------------------------------- round

    static RoundWafer fitRound(double[] x, double[] y, double pitch) {
        int n = x.length;
        boolean[] use = new boolean[n];
        Arrays.fill(use, true);
        double[] c = kasa(x, y, use);
        for (int round = 0; round < TRIM_ROUNDS; round++) {
            c = geometricCircle(x, y, use, c);
            double[] res = new double[n];
            for (int i = 0; i < n; i++) {
                res[i] = Math.hypot(x[i] - c[0], y[i] - c[1]) - c[2];
            }
            if (!trim(res, use, pitch)) {
                break;
            }
        }
        return new RoundWafer(2 * c[2], Fiducial.NONE, RoundWafer.BOTTOM_DEG, c[0], c[1]);
    }

    /** Kåsa's algebraic circle fit on the used points: {cx, cy, r}. */
    static double[] kasa(double[] x, double[] y, boolean[] use) {
        int m = 0;
        double mx = 0;
        double my = 0;
        for (int i = 0; i < x.length; i++) {
            if (use[i]) {
                mx += x[i];
                my += y[i];
                m++;
            }
        }
        mx /= m;
        my /= m;
        RealMatrix a = new Array2DRowRealMatrix(m, 3);
        RealVector b = new ArrayRealVector(m);
        for (int i = 0, row = 0; i < x.length; i++) {
            if (!use[i]) {
                continue;
            }
            double u = x[i] - mx;
            double v = y[i] - my;
            a.setEntry(row, 0, u);
            a.setEntry(row, 1, v);
            a.setEntry(row, 2, 1);
            b.setEntry(row, -(u * u + v * v));
            row++;
        }
        RealVector s = new QRDecomposition(a).getSolver().solve(b);
        double cu = -s.getEntry(0) / 2;
        double cv = -s.getEntry(1) / 2;
        double r = Math.sqrt(cu * cu + cv * cv - s.getEntry(2));
        return new double[] {mx + cu, my + cv, r};
    }

    /** Geometric circle fit (minimises Σ(|p − c| − r)²) from {@code start}: {cx, cy, r}. */
    static double[] geometricCircle(double[] x, double[] y, boolean[] use, double[] start) {
        int[] idx = indices(use);
        int m = idx.length;
        MultivariateJacobianFunction model = p -> {
            double cx = p.getEntry(0);
            double cy = p.getEntry(1);
            double r = p.getEntry(2);
            RealVector value = new ArrayRealVector(m);
            RealMatrix jac = new Array2DRowRealMatrix(m, 3);
            for (int k = 0; k < m; k++) {
                double dx = x[idx[k]] - cx;
                double dy = y[idx[k]] - cy;
                double d = Math.hypot(dx, dy);
                value.setEntry(k, d - r);
                jac.setEntry(k, 0, d == 0 ? 0 : -dx / d);
                jac.setEntry(k, 1, d == 0 ? 0 : -dy / d);
                jac.setEntry(k, 2, -1);
            }
            return new Pair<>(value, jac);
        };
        return leastSquares(model, start, m);
    }

    /**
     * Looks for a flat or notch: a cluster of edge points clearly inside the fitted circle. Returns {@code circle}
     * itself when there is none.
     */
    static RoundWafer addFiducial(RoundWafer circle, double[][] pts, double pitch) {
        double r = circle.radiusMm();
        double cx = circle.centreXMm();
        double cy = circle.centreYMm();
        int n = pts[0].length;
        double[] deficit = new double[n];
        for (int i = 0; i < n; i++) {
            deficit[i] = r - Math.hypot(pts[0][i] - cx, pts[1][i] - cy);
        }
        double sigma = robustSigma(deficit, null);
        double limit = Math.max(3 * sigma, 1.5 * pitch);
        DataOutline.DoubleList angles = new DataOutline.DoubleList();
        DataOutline.DoubleList depths = new DataOutline.DoubleList();
        for (int i = 0; i < n; i++) {
            if (deficit[i] > limit) {
                angles.add(Math.atan2(pts[1][i] - cy, pts[0][i] - cx));
                depths.add(deficit[i]);
            }
        }
        double[] a = angles.toArray();
        double[] d = depths.toArray();
        if (a.length < 3) {
            return circle;
        }
        Integer[] order = new Integer[a.length];
        for (int i = 0; i < order.length; i++) {
            order[i] = i;
        }
        Arrays.sort(order, (p, q) -> Double.compare(a[p], a[q]));
        double gap = Math.max(8 * pitch / r, 0.01);
        // start the sweep after the widest gap so that a cluster across ±π stays whole
        int start = 0;
        double widest = -1;
        for (int k = 0; k < order.length; k++) {
            double next = k + 1 < order.length ? a[order[k + 1]] : a[order[0]] + 2 * Math.PI;
            double g = next - a[order[k]];
            if (g > widest) {
                widest = g;
                start = (k + 1) % order.length;
            }
        }
        int bestFirst = 0;
        int bestCount = 0;
        int first = 0;
        int count = 1;
        for (int k = 1; k <= order.length; k++) {
            boolean joined = false;
            if (k < order.length) {
                double prev = a[order[(start + k - 1) % order.length]];
                double cur = a[order[(start + k) % order.length]];
                double g = cur - prev;
                if (g < 0) {
                    g += 2 * Math.PI;
                }
                joined = g <= gap;
            }
            if (joined) {
                count++;
            } else {
                if (count > bestCount) {
                    bestCount = count;
                    bestFirst = first;
                }
                first = k;
                count = 1;
            }
        }
        if (bestCount < 3) {
            return circle;
        }
        double sumC = 0;
        double sumS = 0;
        double depth = 0;
        for (int k = 0; k < bestCount; k++) {
            int i = order[(start + bestFirst + k) % order.length];
            sumC += Math.cos(a[i]);
            sumS += Math.sin(a[i]);
            depth = Math.max(depth, d[i]);
        }
        double firstAngle = a[order[(start + bestFirst) % order.length]];
        double lastAngle = a[order[(start + bestFirst + bestCount - 1) % order.length]];
        double span = lastAngle - firstAngle;
        if (span < 0) {
            span += 2 * Math.PI;
        }
        double width = 2 * r * Math.sin(Math.min(span, Math.PI) / 2);
        double angleDeg = Math.toDegrees(Math.atan2(sumS, sumC));
        angleDeg = ((angleDeg % 360) + 360) % 360;
        if (depth >= r) {
            return circle;
        }
        Fiducial mark;
        if (width > 4 * depth) {
            double length = 2 * Math.sqrt(r * r - (r - depth) * (r - depth));
            if (!(length < 2 * r)) {
                return circle;
            }
            mark = Fiducial.flat(length);
        } else {
            mark = Fiducial.notch(depth, 90);
        }
        return new RoundWafer(circle.diameterMm(), mark, angleDeg, cx, cy);
    }

    // ---------------------------------------------------------------- square

    static SquareWafer fitSquare(double[] x, double[] y, Mask filled, PixelGrid grid) {
        double pitch = grid.pitchMm();
        int w = filled.width();
        double sx = 0;
        double sy = 0;
        long cnt = 0;
        for (int i = filled.nextIndex(0); i >= 0; i = filled.nextIndex(i + 1)) {
            sx += i % w;
            sy += i / w;
            cnt++;
        }
        double cx = grid.xMm(sx / cnt);
        double cy = grid.yMm(sy / cnt);
        int n = x.length;
        double rot = minAreaRotationDeg(x, y, cx, cy);
        double t = Math.toRadians(rot);
        double c = Math.cos(t);
        double s = Math.sin(t);
        double[] cheb = new double[n];
        double[] rho = new double[n];
        for (int i = 0; i < n; i++) {
            double dx = x[i] - cx;
            double dy = y[i] - cy;
            double u = c * dx + s * dy;
            double v = -s * dx + c * dy;
            cheb[i] = Math.max(Math.abs(u), Math.abs(v));
            rho[i] = Math.hypot(u, v);
        }
        double half = median(cheb, null);
        double side = 2 * half;
        DataOutline.DoubleList corner = new DataOutline.DoubleList();
        for (int i = 0; i < n; i++) {
            if (cheb[i] < half - pitch) {
                corner.add(rho[i]);
            }
        }
        double[] cornerRho = corner.toArray();
        // small corners (G12: a 2 mm chord) hide in the pixel noise, so the pseudo-square is always tried as well
        double diag0 = cornerRho.length >= 8 ? 2 * median(cornerRho, null) : 0.995 * side * Math.sqrt(2);
        diag0 = Math.max(Math.min(diag0, side * Math.sqrt(2)), side * 1.001);
        Function<double[], SquareWafer> fullOf = p -> new SquareWafer(Math.max(p[2], pitch),
                Math.max(p[2], pitch) * Math.sqrt(2), p[3], p[0], p[1]);
        Function<double[], SquareWafer> pseudoOf = p -> {
            double a = Math.max(p[2], pitch);
            return new SquareWafer(a, Math.max(p[4], a * 1.0001), p[3], p[0], p[1]);
        };
        SquareWafer full = fullOf.apply(trimmedFit(x, y, new double[] {cx, cy, side, rot}, fullOf, pitch));
        SquareWafer pseudo = pseudoOf.apply(trimmedFit(x, y, new double[] {cx, cy, side, rot, diag0}, pseudoOf,
                pitch));
        SquareWafer sq = clippedCost(pseudo, x, y, pitch) < 0.98 * clippedCost(full, x, y, pitch) ? pseudo : full;
        double turn = ((sq.rotationDeg() + 45) % 90 + 90) % 90 - 45;
        return sq.withRotation(turn);
    }

    /** Fits, trims the points farther than max(3σ, one pixel), and fits again until the used set stays. */
    private static double[] trimmedFit(double[] x, double[] y, double[] start,
                                       Function<double[], ? extends WaferShape> shapeOf, double pitch) {
        int n = x.length;
        boolean[] use = new boolean[n];
        Arrays.fill(use, true);
        double[] p = start;
        for (int round = 0; round < TRIM_ROUNDS; round++) {
            p = fitShape(x, y, use, p, shapeOf);
            WaferShape.Prepared shape = shapeOf.apply(p).prepared();
            double[] res = new double[n];
            for (int i = 0; i < n; i++) {
                res[i] = shape.distanceToEdgeMm(x[i], y[i]);
            }
            if (!trim(res, use, pitch)) {
                break;
            }
        }
        return p;
    }

    /** Σ min(d², (3 pixels)²) over all edge points: a least-squares cost that outliers cannot dominate. */
    private static double clippedCost(WaferShape shape, double[] x, double[] y, double pitch) {
        double cap = 9 * pitch * pitch;
        double sum = 0;
        WaferShape.Prepared p = shape.prepared();
        for (int i = 0; i < x.length; i++) {
            double d = p.distanceToEdgeMm(x[i], y[i]);
            sum += Math.min(d * d, cap);
        }
        return sum;
    }

    /** Rotation (degrees, [−45, 45)) whose axis-aligned bounding box of the points has the least area. */
    static double minAreaRotationDeg(double[] x, double[] y, double cx, double cy) {
        double best = 0;
        double bestArea = Double.POSITIVE_INFINITY;
        for (int k = 0; k < 180; k++) {
            double deg = -45 + 0.5 * k;
            double area = boxArea(x, y, cx, cy, deg);
            if (area < bestArea) {
                bestArea = area;
                best = deg;
            }
        }
        double lo = best - 0.5;
        double hi = best + 0.5;
        double g = (Math.sqrt(5) - 1) / 2;
        for (int k = 0; k < 40; k++) {
            double m1 = hi - g * (hi - lo);
            double m2 = lo + g * (hi - lo);
            if (boxArea(x, y, cx, cy, m1) < boxArea(x, y, cx, cy, m2)) {
                hi = m2;
            } else {
                lo = m1;
            }
        }
        return (lo + hi) / 2;
    }

    private static double boxArea(double[] x, double[] y, double cx, double cy, double deg) {
        double t = Math.toRadians(deg);
        double c = Math.cos(t);
        double s = Math.sin(t);
        double umin = Double.POSITIVE_INFINITY;
        double umax = Double.NEGATIVE_INFINITY;
        double vmin = Double.POSITIVE_INFINITY;
        double vmax = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < x.length; i++) {
            double dx = x[i] - cx;
            double dy = y[i] - cy;
            double u = c * dx + s * dy;
            double v = -s * dx + c * dy;
            umin = Math.min(umin, u);
            umax = Math.max(umax, u);
            vmin = Math.min(vmin, v);
            vmax = Math.max(vmax, v);
        }
        return (umax - umin) * (vmax - vmin);
    }

    /** Levenberg–Marquardt on the signed distances of the used points to the shape, numerical Jacobian. */
    static double[] fitShape(double[] x, double[] y, boolean[] use, double[] start,
                             Function<double[], ? extends WaferShape> shapeOf) {
        int[] idx = indices(use);
        int m = idx.length;
        int k = start.length;
        MultivariateJacobianFunction model = point -> {
            double[] p = point.toArray();
            RealVector value = new ArrayRealVector(distances(shapeOf.apply(p), x, y, idx), false);
            RealMatrix jac = new Array2DRowRealMatrix(m, k);
            for (int j = 0; j < k; j++) {
                double step = 1e-5 * Math.max(1, Math.abs(p[j]));
                double[] plus = p.clone();
                double[] minus = p.clone();
                plus[j] += step;
                minus[j] -= step;
                double[] dp = distances(shapeOf.apply(plus), x, y, idx);
                double[] dm = distances(shapeOf.apply(minus), x, y, idx);
                for (int i = 0; i < m; i++) {
                    jac.setEntry(i, j, (dp[i] - dm[i]) / (2 * step));
                }
            }
            return new Pair<>(value, jac);
        };
        return leastSquares(model, start, m);
    }

    private static double[] distances(WaferShape shape, double[] x, double[] y, int[] idx) {
        WaferShape.Prepared p = shape.prepared();
        double[] d = new double[idx.length];
        for (int i = 0; i < idx.length; i++) {
            d[i] = p.distanceToEdgeMm(x[idx[i]], y[idx[i]]);
        }
        return d;
    }

    // ---------------------------------------------------------------- shared

    private static double[] leastSquares(MultivariateJacobianFunction model, double[] start, int m) {
        LeastSquaresOptimizer.Optimum opt = new LevenbergMarquardtOptimizer().optimize(new LeastSquaresBuilder()
                .start(start)
                .model(model)
                .target(new double[m])
                .maxEvaluations(1000)
                .maxIterations(1000)
                .build());
        return opt.getPoint().toArray();
    }

    /**
     * Marks as unused the points whose residual exceeds max(3σ, one pixel). Returns true when the set of used
     * points changed (and enough are left to fit again).
     */
    private static boolean trim(double[] res, boolean[] use, double pitch) {
        double sigma = robustSigma(res, use);
        double limit = Math.max(3 * sigma, pitch);
        boolean changed = false;
        int left = 0;
        boolean[] next = new boolean[use.length];
        for (int i = 0; i < res.length; i++) {
            next[i] = Math.abs(res[i]) <= limit;
            changed |= next[i] != use[i];
            left += next[i] ? 1 : 0;
        }
        if (!changed || left < MIN_EDGE_POINTS) {
            return false;
        }
        System.arraycopy(next, 0, use, 0, use.length);
        return true;
    }

    /** 1.4826 × the median absolute deviation of the used values (a σ estimate that ignores outliers). */
    static double robustSigma(double[] values, boolean[] use) {
        double med = median(values, use);
        double[] dev = new double[values.length];
        for (int i = 0; i < values.length; i++) {
            dev[i] = Math.abs(values[i] - med);
        }
        return 1.4826 * median(dev, use);
    }

    static double median(double[] values, boolean[] use) {
        double[] v = new double[values.length];
        int m = 0;
        for (int i = 0; i < values.length; i++) {
            if (use == null || use[i]) {
                v[m++] = values[i];
            }
        }
        if (m == 0) {
            return Double.NaN;
        }
        Arrays.sort(v, 0, m);
        return m % 2 == 1 ? v[m / 2] : (v[m / 2 - 1] + v[m / 2]) / 2;
    }

    private static int[] indices(boolean[] use) {
        int m = 0;
        for (boolean u : use) {
            m += u ? 1 : 0;
        }
        int[] idx = new int[m];
        for (int i = 0, k = 0; i < use.length; i++) {
            if (use[i]) {
                idx[k++] = i;
            }
        }
        return idx;
    }

    /** Fit quality of {@code shape} against the edge points and the filled data area. */
    private static FitQuality quality(OutlineFit.Model model, WaferShape shape, double[][] pts, Mask filled,
                                      PixelGrid grid) {
        int n = pts[0].length;
        WaferShape.Prepared p = shape.prepared();
        double[] res = new double[n];
        for (int i = 0; i < n; i++) {
            res[i] = p.distanceToEdgeMm(pts[0][i], pts[1][i]);
        }
        double limit = Math.max(3 * robustSigma(res, null), grid.pitchMm());
        double sum2 = 0;
        int in = 0;
        for (double r : res) {
            if (Math.abs(r) <= limit) {
                sum2 += r * r;
                in++;
            }
        }
        int w = grid.width();
        long wrong = 0;
        long valid = 0;
        for (int i = 0, size = w * grid.height(); i < size; i++) {
            boolean data = filled.containsIndex(i);
            boolean inside = p.contains(grid.xMm(i % w), grid.yMm(i / w));
            valid += data ? 1 : 0;
            wrong += data != inside ? 1 : 0;
        }
        return new FitQuality(model, in == 0 ? Double.NaN : Math.sqrt(sum2 / in), (double) in / n,
                (double) wrong / valid, n);
    }
}
