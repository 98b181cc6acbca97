package trapmap.maps.geometry;

import java.util.Locale;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;

/**
 * A round wafer with an optional primary flat or notch.
 *
 * <p>Geometry: a circle of radius R = diameter/2 about the centre. A flat of length L removes the circular segment
 * beyond the chord at distance √(R² − L²/4) from the centre. A notch of depth δ and opening angle α removes the V
 * whose apex lies δ inside the circle on the fiducial axis and whose sides open outwards at ±α/2. The fiducial axis
 * points from the centre to the middle of the flat or notch at {@code fiducialAngleDeg}, counter-clockwise from +x in
 * wafer coordinates; 270° (the default) puts it at the bottom of the map.
 *
 * @param diameterMm       diameter of the circle, mm
 * @param fiducial         flat, notch or none
 * @param fiducialAngleDeg direction of the fiducial, degrees counter-clockwise from +x (270 = bottom)
 * @param centreXMm        centre in wafer coordinates, mm
 * @param centreYMm        centre in wafer coordinates, mm
 */
public record RoundWafer(double diameterMm, Fiducial fiducial, double fiducialAngleDeg, double centreXMm,
                         double centreYMm) implements WaferShape {

    /** Default fiducial direction: the bottom of the map. */
    public static final double BOTTOM_DEG = 270.0;

    public RoundWafer {
        Checks.positive(diameterMm, "diameter", "mm");
        Checks.notNull(fiducial, "fiducial");
        Checks.finite(fiducialAngleDeg, "fiducialAngle", "deg");
        Checks.finite(centreXMm, "centreX", "mm");
        Checks.finite(centreYMm, "centreY", "mm");
        if (fiducial instanceof Fiducial.Flat f && !(f.lengthMm() < diameterMm)) {
            throw new InvalidValueException("flatLength", "mm", "flatLength must be < the diameter " + diameterMm
                    + " mm but was " + f.lengthMm());
        }
        if (fiducial instanceof Fiducial.Notch n && !(n.depthMm() < diameterMm / 2)) {
            throw new InvalidValueException("notchDepth", "mm", "notchDepth must be < the radius " + diameterMm / 2
                    + " mm but was " + n.depthMm());
        }
    }

    /** A plain disk centred on the wafer origin. */
    public static RoundWafer disk(double diameterMm) {
        return new RoundWafer(diameterMm, Fiducial.NONE, BOTTOM_DEG, 0, 0);
    }

    /** A centred wafer with the fiducial at the bottom. */
    public static RoundWafer of(double diameterMm, Fiducial fiducial) {
        return new RoundWafer(diameterMm, fiducial, BOTTOM_DEG, 0, 0);
    }

    public double radiusMm() {
        return diameterMm / 2;
    }

    /** The same wafer with the fiducial turned to {@code deg}. */
    public RoundWafer withFiducialAngle(double deg) {
        return new RoundWafer(diameterMm, fiducial, deg, centreXMm, centreYMm);
    }

    @Override
    public RoundWafer movedTo(double xMm, double yMm) {
        return new RoundWafer(diameterMm, fiducial, fiducialAngleDeg, xMm, yMm);
    }

    @Override
    public double boundingRadiusMm() {
        return radiusMm();
    }

    /** Distance from the centre to a flat (its chord), mm; NaN without a flat. */
    public double flatDistanceMm() {
        if (fiducial instanceof Fiducial.Flat f) {
            double r = radiusMm();
            double c = f.lengthMm() / 2;
            return Math.sqrt(r * r - c * c);
        }
        return Double.NaN;
    }

    @Override
    public boolean contains(double xMm, double yMm) {
        Local p = local(xMm, yMm);
        return containsLocal(p.u, p.v);
    }

    @Override
    public double distanceToEdgeMm(double xMm, double yMm) {
        Local p = local(xMm, yMm);
        double d = unsignedDistanceLocal(Math.abs(p.u), p.v);
        return containsLocal(p.u, p.v) ? d : -d;
    }

    @Override
    public double areaMm2() {
        double r = radiusMm();
        double disk = Math.PI * r * r;
        if (fiducial instanceof Fiducial.Flat f) {
            double c = f.lengthMm() / 2;
            double d = Math.sqrt(r * r - c * c);
            return disk - segmentArea(r, d, c);
        }
        if (fiducial instanceof Fiducial.Notch n) {
            double[] p1 = notchCorner(n);
            double apexY = -r + n.depthMm();
            double triangle = p1[0] * (apexY - p1[1]);
            return disk - triangle - segmentArea(r, -p1[1], p1[0]);
        }
        return disk;
    }

    @Override
    public String describe() {
        String mark;
        if (fiducial instanceof Fiducial.Flat f) {
            mark = String.format(Locale.ROOT, ", flat %.2f mm at %.1f°", f.lengthMm(), fiducialAngleDeg);
        } else if (fiducial instanceof Fiducial.Notch n) {
            mark = String.format(Locale.ROOT, ", notch %.2f mm deep, %.0f° at %.1f°", n.depthMm(),
                    n.openingAngleDeg(), fiducialAngleDeg);
        } else {
            mark = "";
        }
        return String.format(Locale.ROOT, "round Ø%.2f mm%s, centre (%.2f, %.2f) mm", diameterMm, mark, centreXMm,
                centreYMm);
    }

    // ---- local frame: centre at the origin, fiducial on the −v axis ----

    private record Local(double u, double v) {
    }

    private Local local(double xMm, double yMm) {
        double dx = xMm - centreXMm;
        double dy = yMm - centreYMm;
        double turn = Math.toRadians(fiducialAngleDeg - BOTTOM_DEG);
        double c = Math.cos(turn);
        double s = Math.sin(turn);
        return new Local(c * dx + s * dy, -s * dx + c * dy);
    }

    private boolean containsLocal(double u, double v) {
        double r = radiusMm();
        if (u * u + v * v > r * r) {
            return false;
        }
        if (fiducial instanceof Fiducial.Flat) {
            return v >= -flatDistanceMm();
        }
        if (fiducial instanceof Fiducial.Notch n) {
            double half = Math.toRadians(n.openingAngleDeg() / 2);
            double apexY = -r + n.depthMm();
            return v >= apexY - Math.abs(u) / Math.tan(half);
        }
        return true;
    }

    /** Distance to the outline for a point folded onto u ≥ 0 (the shape is mirror-symmetric about the v axis). */
    private double unsignedDistanceLocal(double u, double v) {
        double r = radiusMm();
        double rho = Math.hypot(u, v);
        if (fiducial instanceof Fiducial.Flat f) {
            double c = f.lengthMm() / 2;
            double d = flatDistanceMm();
            double toFlat = u <= c ? Math.abs(v + d) : Math.hypot(u - c, v + d);
            // the arc runs counter-clockwise from the flat's end (c, −d) to the top (0, r)
            double toArc = c * v + d * u >= 0 ? Math.abs(rho - r) : Math.hypot(u - c, v + d);
            return Math.min(toFlat, toArc);
        }
        if (fiducial instanceof Fiducial.Notch n) {
            double[] p1 = notchCorner(n);
            double apexY = -r + n.depthMm();
            double toSide = segmentDistance(u, v, 0, apexY, p1[0], p1[1]);
            double toArc = p1[0] * v - p1[1] * u >= 0 ? Math.abs(rho - r) : Math.hypot(u - p1[0], v - p1[1]);
            return Math.min(toSide, toArc);
        }
        return Math.abs(rho - r);
    }

    /** Where the right-hand side of the notch meets the circle (u > 0, local frame). */
    private double[] notchCorner(Fiducial.Notch n) {
        double r = radiusMm();
        double half = Math.toRadians(n.openingAngleDeg() / 2);
        double ux = Math.sin(half);
        double uy = -Math.cos(half);
        double apexY = -r + n.depthMm();
        double b = apexY * uy; // apex · direction
        double t = -b + Math.sqrt(b * b - apexY * apexY + r * r);
        return new double[] {t * ux, apexY + t * uy};
    }

    /** Area of the circular segment beyond a chord at distance d from the centre with half-length c. */
    static double segmentArea(double r, double d, double c) {
        return r * r * Math.acos(d / r) - d * c;
    }

    static double segmentDistance(double px, double py, double ax, double ay, double bx, double by) {
        double ex = bx - ax;
        double ey = by - ay;
        double t = ((px - ax) * ex + (py - ay) * ey) / (ex * ex + ey * ey);
        t = Math.max(0, Math.min(1, t));
        return Math.hypot(px - ax - t * ex, py - ay - t * ey);
    }
}
