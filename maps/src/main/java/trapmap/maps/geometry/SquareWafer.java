package trapmap.maps.geometry;

import java.util.Locale;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;

/**
 * A square solar wafer, full-square or pseudo-square.
 *
 * <p>Geometry: the square of side a about the centre, turned by {@code rotationDeg}, intersected with the circle of
 * diameter D (the "pseudo-square diameter", i.e. the diameter of the ingot the wafer was cut from). When
 * D ≥ a·√2 the circle misses the square and the wafer is a full square with sharp corners; when a &lt; D &lt; a·√2
 * each corner is an arc of that circle, leaving a straight length of 2·√(D²/4 − a²/4) on every side.
 *
 * @param sideMm      side length a (flat to flat), mm
 * @param diagonalMm  corner-to-corner diameter D, mm: the pseudo-square diameter, or a·√2 for a full square
 * @param rotationDeg turn of the sides, degrees counter-clockwise (0 = sides parallel to the map axes)
 * @param centreXMm   centre in wafer coordinates, mm
 * @param centreYMm   centre in wafer coordinates, mm
 */
public record SquareWafer(double sideMm, double diagonalMm, double rotationDeg, double centreXMm, double centreYMm)
        implements WaferShape {

    private static final double SQRT2 = Math.sqrt(2);

    public SquareWafer {
        Checks.positive(sideMm, "side", "mm");
        Checks.positive(diagonalMm, "diagonal", "mm");
        Checks.finite(rotationDeg, "rotation", "deg");
        Checks.finite(centreXMm, "centreX", "mm");
        Checks.finite(centreYMm, "centreY", "mm");
        if (!(diagonalMm > sideMm)) {
            throw new InvalidValueException("diagonal", "mm", "diagonal must be > the side " + sideMm
                    + " mm (a smaller one leaves no straight edge) but was " + diagonalMm);
        }
        diagonalMm = Math.min(diagonalMm, sideMm * SQRT2);
    }

    /** A centred full square (sharp corners). */
    public static SquareWafer full(double sideMm) {
        return new SquareWafer(sideMm, sideMm * SQRT2, 0, 0, 0);
    }

    /** A centred pseudo-square with corners on a circle of {@code diameterMm}. */
    public static SquareWafer pseudo(double sideMm, double diameterMm) {
        return new SquareWafer(sideMm, diameterMm, 0, 0, 0);
    }

    /** True when the corners are sharp (no arc). */
    public boolean isFullSquare() {
        return diagonalMm >= sideMm * SQRT2 * (1 - 1e-12);
    }

    /** Length of the straight part of each side, mm (the full side for a full square). */
    public double straightSideMm() {
        return 2 * straightHalf();
    }

    /** Chord across each rounded corner (between the ends of two adjacent straight parts), mm; 0 for a full square. */
    public double cornerChordMm() {
        return SQRT2 * (sideMm / 2 - straightHalf());
    }

    public SquareWafer withRotation(double deg) {
        return new SquareWafer(sideMm, diagonalMm, deg, centreXMm, centreYMm);
    }

    @Override
    public SquareWafer movedTo(double xMm, double yMm) {
        return new SquareWafer(sideMm, diagonalMm, rotationDeg, xMm, yMm);
    }

    @Override
    public double boundingRadiusMm() {
        return diagonalMm / 2;
    }

    @Override
    public Prepared prepared() {
        return new Frame(this);
    }

    @Override
    public double areaMm2() {
        if (isFullSquare()) {
            return sideMm * sideMm;
        }
        double r = diagonalMm / 2;
        double h = sideMm / 2;
        return Math.PI * r * r - 4 * RoundWafer.segmentArea(r, h, Math.sqrt(r * r - h * h));
    }

    @Override
    public String describe() {
        String kind = isFullSquare() ? String.format(Locale.ROOT, "full square %.2f mm", sideMm)
                : String.format(Locale.ROOT, "pseudo-square %.2f mm Ø%.2f mm", sideMm, diagonalMm);
        return String.format(Locale.ROOT, "%s, turned %.2f°, centre (%.2f, %.2f) mm", kind, rotationDeg, centreXMm,
                centreYMm);
    }

    private double straightHalf() {
        double h = sideMm / 2;
        if (isFullSquare()) {
            return h;
        }
        double r = diagonalMm / 2;
        return Math.sqrt(r * r - h * h);
    }

    /**
     * The wafer in its local frame (sides parallel to the axes) with every derived constant computed once. The
     * outline has the symmetry of the square, so distances are taken after folding onto 0 ≤ v ≤ u.
     */
    private static final class Frame extends LocalFrame {
        private final double h;
        private final double r;
        private final double yc;
        private final boolean full;

        Frame(SquareWafer w) {
            super(w.centreXMm, w.centreYMm, Math.toRadians(w.rotationDeg));
            h = w.sideMm / 2;
            r = w.diagonalMm / 2;
            full = w.isFullSquare();
            yc = w.straightHalf();
        }

        @Override
        boolean containsLocal(double u, double v) {
            if (Math.abs(u) > h || Math.abs(v) > h) {
                return false;
            }
            return full || u * u + v * v <= r * r;
        }

        @Override
        double size() {
            return r + h;
        }

        @Override
        double unsignedDistance(double u0, double v0, boolean exact) {
            double u = Math.abs(u0);
            double v = Math.abs(v0);
            if (v > u) {
                double t = u;
                u = v;
                v = t;
            }
            double toSide = v <= yc ? Math.abs(u - h) : length(u - h, v - yc, exact);
            if (full) {
                return toSide;
            }
            // the corner arc runs counter-clockwise from (h, yc) to the diagonal
            double toArc = h * v - yc * u >= 0 ? Math.abs(length(u, v, exact) - r) : length(u - h, v - yc, exact);
            return Math.min(toSide, toArc);
        }
    }
}
