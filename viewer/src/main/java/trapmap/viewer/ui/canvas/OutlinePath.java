package trapmap.viewer.ui.canvas;

import java.awt.geom.Path2D;
import trapmap.maps.geometry.WaferShape;

/**
 * Closed polygons in wafer millimetres tracing a {@link WaferShape}'s edge, or the line at a given distance inside
 * it, found along rays from the shape centre by bisection on {@link WaferShape.Prepared#distanceToEdgeMm}. Every
 * shape here (disk with flat or notch, full or pseudo square) is star-shaped about its centre, so each ray crosses
 * the line once.
 */
final class OutlinePath {
    /** Rays per turn: 0.25° apart, about 0.3 mm along the edge of a 150 mm wafer, enough to show a notch. */
    static final int RAYS = 1440;

    private OutlinePath() {
    }

    /** The polygon of points at distance {@code insetMm} (≥ 0) inside the edge; null when nothing is that far in. */
    static Path2D.Double trace(WaferShape shape, double insetMm) {
        WaferShape.Prepared p = shape.prepared();
        double cx = shape.centreXMm();
        double cy = shape.centreYMm();
        double rMax = shape.boundingRadiusMm() * 1.01 + 1e-6;
        if (p.distanceToEdgeMm(cx, cy) < insetMm) {
            return null;
        }
        Path2D.Double path = new Path2D.Double(Path2D.WIND_NON_ZERO, RAYS + 1);
        for (int i = 0; i < RAYS; i++) {
            double a = 2 * Math.PI * i / RAYS;
            double dx = Math.cos(a);
            double dy = Math.sin(a);
            double lo = 0;
            double hi = rMax;
            for (int it = 0; it < 40; it++) {
                double mid = 0.5 * (lo + hi);
                if (p.distanceToEdgeMm(cx + mid * dx, cy + mid * dy) >= insetMm) {
                    lo = mid;
                } else {
                    hi = mid;
                }
            }
            double x = cx + lo * dx;
            double y = cy + lo * dy;
            if (i == 0) {
                path.moveTo(x, y);
            } else {
                path.lineTo(x, y);
            }
        }
        path.closePath();
        return path;
    }
}
