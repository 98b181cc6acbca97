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
        double dx = xMm - cx;
        double dy = yMm - cy;
        double u = cos * dx + sin * dy;
        double v = -sin * dx + cos * dy;
        double d = unsignedDistance(u, v);
        return containsLocal(u, v) ? d : -d;
    }

    /** True when the local point (u, v), mm, lies inside the outline or on it. */
    abstract boolean containsLocal(double u, double v);

    /** Distance from the local point (u, v) to the outline, mm, without sign. */
    abstract double unsignedDistance(double u, double v);
}
