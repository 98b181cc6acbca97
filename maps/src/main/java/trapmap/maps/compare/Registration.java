package trapmap.maps.compare;

import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;

/**
 * A rigid placement of the "after" map B on the "before" map A, in wafer coordinates (mm, x right, y up; see
 * {@link trapmap.maps.raster.PixelGrid}). A point p_B of B lands at
 * <pre>
 *     p_A = R(rotationDeg) · M · p_B + (shiftXMm, shiftYMm)
 * </pre>
 * where M mirrors first ({@code flipX}: x → −x, {@code flipY}: y → −y) and R then turns counter-clockwise by
 * {@code rotationDeg} (y up, so counter-clockwise as seen on screen). Because mirroring both axes is a half turn,
 * (flipX, flipY, θ) and (!flipX, !flipY, θ + 180°) describe the same placement; {@link #canonical()} picks one.
 *
 * @param flipX         B is mirrored left–right before turning
 * @param flipY         B is mirrored top–bottom before turning
 * @param rotationDeg   total counter-clockwise turn including quarter turns, degrees, kept in (−180, 180]
 * @param shiftXMm      shift along x after turning, mm
 * @param shiftYMm      shift along y after turning, mm
 * @param score         quality in [0, 1]: correlation of the (log) samples valid in both maps after alignment,
 *                      NaN when not evaluated
 * @param overlapPixels pixels of A's grid holding data in both maps after alignment (0 when not evaluated)
 */
public record Registration(boolean flipX, boolean flipY, double rotationDeg, double shiftXMm, double shiftYMm,
                           double score, int overlapPixels) {

    private static final Registration IDENTITY = explicit(false, false, 0, 0, 0);

    public Registration {
        Checks.finite(rotationDeg, "rotation", "deg");
        Checks.finite(shiftXMm, "shiftX", "mm");
        Checks.finite(shiftYMm, "shiftY", "mm");
        if (!Double.isNaN(score)) {
            Checks.inRange(score, 0, 1, "score", "");
        }
        if (overlapPixels < 0) {
            throw new InvalidValueException("overlapPixels", "px", "overlapPixels must be >= 0 px but was "
                    + overlapPixels);
        }
        rotationDeg = normaliseDeg(rotationDeg);
        shiftXMm += 0.0; // no −0
        shiftYMm += 0.0;
    }

    /** B lies on A as it is: no mirror, no turn, no shift (score not evaluated). */
    public static Registration identity() {
        return IDENTITY;
    }

    /** A placement known in advance, e.g. from the tools' conventions (score not evaluated). */
    public static Registration explicit(boolean flipX, boolean flipY, double rotationDeg, double shiftXMm,
                                        double shiftYMm) {
        return new Registration(flipX, flipY, rotationDeg, shiftXMm, shiftYMm, Double.NaN, 0);
    }

    /** This placement with a score and overlap. */
    public Registration withQuality(double newScore, int newOverlapPixels) {
        return new Registration(flipX, flipY, rotationDeg, shiftXMm, shiftYMm, newScore, newOverlapPixels);
    }

    /**
     * The same placement written without a double mirror and with the smaller turn: no flip when the placement
     * keeps handedness, otherwise exactly one flip and |rotation| ≤ 90° (flipX at exactly ±90°).
     */
    public Registration canonical() {
        boolean swap;
        if (flipX == flipY) {
            swap = flipX;
        } else {
            double a = Math.abs(rotationDeg);
            swap = a > 90 || (a == 90 && flipY);
        }
        return swap ? new Registration(!flipX, !flipY, rotationDeg + 180, shiftXMm, shiftYMm, score, overlapPixels)
                : this;
    }

    /** Whole quarter turns of the rotation as written, 0..3 counter-clockwise. */
    public int quarterTurns() {
        return Math.floorMod((int) Math.round(rotationDeg / 90), 4);
    }

    /** Turn left after removing the whole quarter turns, degrees in [−45, 45]. */
    public double fineRotationDeg() {
        return rotationDeg - 90 * Math.round(rotationDeg / 90);
    }

    /** True when B is mirrored relative to A (one flip, in whatever form it is written). */
    public boolean mirrored() {
        return flipX != flipY;
    }

    /** Where the point (xMm, yMm) of B's wafer coordinates lies in A's wafer coordinates, {x, y} in mm. */
    public double[] toBeforeMm(double xMm, double yMm) {
        double mx = flipX ? -xMm : xMm;
        double my = flipY ? -yMm : yMm;
        double t = Math.toRadians(rotationDeg);
        double c = Math.cos(t);
        double s = Math.sin(t);
        return new double[] {c * mx - s * my + shiftXMm, s * mx + c * my + shiftYMm};
    }

    /** Where the point (xMm, yMm) of A's wafer coordinates lies in B's wafer coordinates, {x, y} in mm. */
    public double[] toAfterMm(double xMm, double yMm) {
        double dx = xMm - shiftXMm;
        double dy = yMm - shiftYMm;
        double t = Math.toRadians(rotationDeg);
        double c = Math.cos(t);
        double s = Math.sin(t);
        double rx = c * dx + s * dy;
        double ry = -s * dx + c * dy;
        return new double[] {flipX ? -rx : rx, flipY ? -ry : ry};
    }

    /**
     * True when both describe the same placement (whatever the form) within the given tolerances; score and
     * overlap are ignored.
     */
    public boolean samePlacement(Registration other, double toleranceDeg, double toleranceMm) {
        if (mirrored() != other.mirrored()) {
            return false;
        }
        return Math.abs(normaliseDeg(rotationWithoutFlipYDeg() - other.rotationWithoutFlipYDeg())) <= toleranceDeg
                && Math.abs(shiftXMm - other.shiftXMm) <= toleranceMm
                && Math.abs(shiftYMm - other.shiftYMm) <= toleranceMm;
    }

    /**
     * Turn of this placement written with {@code flipY = false} (a mirror, if any, as flipX), degrees in (−180,
     * 180]; two placements with the same mirror are the same when these and the shifts agree.
     */
    public double rotationWithoutFlipYDeg() {
        return normaliseDeg(flipY ? rotationDeg + 180 : rotationDeg);
    }

    /** The angle in (−180, 180]. */
    static double normaliseDeg(double deg) {
        double d = deg % 360;
        if (d <= -180) {
            d += 360;
        } else if (d > 180) {
            d -= 360;
        }
        return d == 0 ? 0 : d; // no −0
    }

    @Override
    public String toString() {
        return String.format(java.util.Locale.ROOT,
                "Registration[flipX=%s, flipY=%s, rotation=%.3f deg, shift=(%.3f, %.3f) mm, score=%.3f, overlap=%d px]",
                flipX, flipY, rotationDeg, shiftXMm, shiftYMm, score, overlapPixels);
    }
}
