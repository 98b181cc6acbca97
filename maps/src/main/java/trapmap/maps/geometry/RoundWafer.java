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
        return new Frame(this).flatD;
    }

    @Override
    public Prepared prepared() {
        return new Frame(this);
    }

    @Override
    public double areaMm2() {
        double r = radiusMm();
        double disk = Math.PI * r * r;
        Frame f = new Frame(this);
        if (fiducial instanceof Fiducial.Flat flat) {
            return disk - segmentArea(r, f.flatD, flat.lengthMm() / 2);
        }
        if (fiducial instanceof Fiducial.Notch) {
            double triangle = f.cornerX * (f.apexY - f.cornerY);
            return disk - triangle - segmentArea(r, -f.cornerY, f.cornerX);
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

    /**
     * The wafer in its local frame (centre at the origin, fiducial on the −v axis) with every derived constant
     * computed once. The outline is mirror-symmetric about the v axis, so distances are taken for u ≥ 0.
     */
    private static final class Frame extends LocalFrame {
        private final double r;
        private final int kind; // 0 none, 1 flat, 2 notch
        private final double flatHalf;
        private final double flatD;
        private final double apexY;
        private final double cotHalf;
        private final double cornerX;
        private final double cornerY;

        Frame(RoundWafer w) {
            super(w.centreXMm, w.centreYMm, Math.toRadians(w.fiducialAngleDeg - BOTTOM_DEG));
            r = w.radiusMm();
            if (w.fiducial instanceof Fiducial.Flat f) {
                kind = 1;
                flatHalf = f.lengthMm() / 2;
                flatD = Math.sqrt(r * r - flatHalf * flatHalf);
                apexY = cotHalf = cornerX = cornerY = Double.NaN;
            } else if (w.fiducial instanceof Fiducial.Notch n) {
                kind = 2;
                flatHalf = flatD = Double.NaN;
                double half = Math.toRadians(n.openingAngleDeg() / 2);
                apexY = -r + n.depthMm();
                cotHalf = 1 / Math.tan(half);
                // where the right-hand side of the V (direction (sin, −cos) of the half angle) meets the circle
                double ux = Math.sin(half);
                double uy = -Math.cos(half);
                double b = apexY * uy;
                double t = -b + Math.sqrt(b * b - apexY * apexY + r * r);
                cornerX = t * ux;
                cornerY = apexY + t * uy;
            } else {
                kind = 0;
                flatHalf = flatD = apexY = cotHalf = cornerX = cornerY = Double.NaN;
            }
        }

        @Override
        boolean containsLocal(double u, double v) {
            if (u * u + v * v > r * r) {
                return false;
            }
            if (kind == 1) {
                return v >= -flatD;
            }
            if (kind == 2) {
                return v >= apexY - Math.abs(u) * cotHalf;
            }
            return true;
        }

        @Override
        double size() {
            return r;
        }

        @Override
        double unsignedDistance(double u0, double v, boolean exact) {
            double u = Math.abs(u0); // the outline is mirror-symmetric about the v axis
            double rho = length(u, v, exact);
            if (kind == 1) {
                double toFlat = u <= flatHalf ? Math.abs(v + flatD) : length(u - flatHalf, v + flatD, exact);
                // the arc runs counter-clockwise from the flat's end (c, −d) to the top (0, r)
                double toArc = flatHalf * v + flatD * u >= 0 ? Math.abs(rho - r)
                        : length(u - flatHalf, v + flatD, exact);
                return Math.min(toFlat, toArc);
            }
            if (kind == 2) {
                double toSide = segmentDistance(u, v, 0, apexY, cornerX, cornerY, exact);
                double toArc = cornerX * v - cornerY * u >= 0 ? Math.abs(rho - r)
                        : length(u - cornerX, v - cornerY, exact);
                return Math.min(toSide, toArc);
            }
            return Math.abs(rho - r);
        }
    }

    /** Area of the circular segment beyond a chord at distance d from the centre with half-length c. */
    static double segmentArea(double r, double d, double c) {
        return r * r * Math.acos(d / r) - d * c;
    }

    /** Distance from (px, py) to the segment from a to b, mm; lengths by {@link LocalFrame#length}. */
    static double segmentDistance(double px, double py, double ax, double ay, double bx, double by, boolean exact) {
        double ex = bx - ax;
        double ey = by - ay;
        double t = ((px - ax) * ex + (py - ay) * ey) / (ex * ex + ey * ey);
        t = Math.max(0, Math.min(1, t));
        return LocalFrame.length(px - ax - t * ex, py - ay - t * ey, exact);
    }
}
