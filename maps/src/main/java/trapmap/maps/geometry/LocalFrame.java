package trapmap.maps.geometry;

/**
 * A wafer outline in its own frame: centred at the origin and turned so that its axes of symmetry are u and v.
 * Subclasses answer the point queries in that frame; this class moves wafer coordinates (mm) into it.
 */
abstract class LocalFrame implements WaferShape.Prepared {
    private final double cx;
    private final double cy;
    private final double cos;
    private final double sin;

    /**
     * @param centreXMm centre of the outline, mm
     * @param centreYMm centre of the outline, mm
     * @param turnRad   counter-clockwise turn of the local frame against the wafer coordinates, radians
     */
    LocalFrame(double centreXMm, double centreYMm, double turnRad) {
        cx = centreXMm;
        cy = centreYMm;
        cos = Math.cos(turnRad);
        sin = Math.sin(turnRad);
    }

    @Override
    public final boolean contains(double xMm, double yMm) {
        double dx = xMm - cx;
        double dy = yMm - cy;
        return containsLocal(cos * dx + sin * dy, -sin * dx + cos * dy);
    }

    @Override
    public final double distanceToEdgeMm(double xMm, double yMm) {
        return distance(xMm, yMm, true);
    }

    @Override
    public final double nearDistanceToEdgeMm(double xMm, double yMm) {
        return distance(xMm, yMm, false);
    }

    @Override
    public final double nearDistanceErrorMm(double extentMm) {
        return 1e-12 * (1 + extentMm + size());
    }

    private double distance(double xMm, double yMm, boolean exact) {
        double dx = xMm - cx;
        double dy = yMm - cy;
        double u = cos * dx + sin * dy;
        double v = -sin * dx + cos * dy;
        double d = unsignedDistance(u, v, exact);
        return containsLocal(u, v) ? d : -d;
    }

    /** True when the local point (u, v), mm, lies inside the outline or on it. */
    abstract boolean containsLocal(double u, double v);

    /**
     * Distance from the local point (u, v) to the outline, mm, without sign; with {@link #length} for the lengths of
     * vectors ({@code exact}: by {@link Math#hypot}, else faster within {@link #nearDistanceErrorMm}).
     */
    abstract double unsignedDistance(double u, double v, boolean exact);

    /** A size of the outline, mm, at least its largest distance from its centre. */
    abstract double size();

    /** The length of (a, b): {@link Math#hypot} when {@code exact}, else the square root of the sum of squares. */
    static double length(double a, double b, boolean exact) {
        return exact ? Math.hypot(a, b) : Math.sqrt(a * a + b * b);
    }
}
