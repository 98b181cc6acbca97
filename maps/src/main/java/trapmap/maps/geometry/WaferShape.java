package trapmap.maps.geometry;

import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.check.Checks;

/**
 * The outline of a wafer in wafer coordinates (mm, x to the right, y upwards, as {@link PixelGrid} defines them).
 * A shape may sit off the grid's wafer centre (a fitted outline does): {@link #centreXMm()}, {@link #centreYMm()}.
 * Implementations are immutable.
 */
public sealed interface WaferShape permits RoundWafer, SquareWafer {

    /** True when the point lies inside the wafer or on its edge. */
    default boolean contains(double xMm, double yMm) {
        return prepared().contains(xMm, yMm);
    }

    /**
     * Euclidean distance from the point to the nearest point of the outline, mm: positive inside, negative outside,
     * zero on the edge. Exact for every shape here, including near a notch or a pseudo-square corner.
     */
    default double distanceToEdgeMm(double xMm, double yMm) {
        return prepared().distanceToEdgeMm(xMm, yMm);
    }

    /**
     * The same outline with its derived constants (rotation, fiducial geometry) computed once: use it in loops over
     * many points.
     */
    Prepared prepared();

    /** Nominal area enclosed by the outline, mm². */
    double areaMm2();

    /** Radius of a circle about the shape centre that encloses the whole outline, mm. */
    double boundingRadiusMm();

    /** Shape centre in wafer coordinates, mm. */
    double centreXMm();

    /** Shape centre in wafer coordinates, mm. */
    double centreYMm();

    /** The same outline with its centre at ({@code xMm}, {@code yMm}). */
    WaferShape movedTo(double xMm, double yMm);

    /** One-line description with the dimensions, e.g. {@code round Ø150.00 mm, flat 57.50 mm at 270.0°}. */
    String describe();

    /**
     * The pixels of {@code grid} whose centre lies inside the outline and at least {@code edgeExclusionMm} from it.
     * Built in parallel; the exact edge distance is evaluated only in the band outside the largest circle about the
     * centre that lies inside the outline.
     *
     * @param edgeExclusionMm width of the excluded rim, mm (0 keeps every pixel whose centre is inside)
     * @throws trapmap.shared.error.InvalidValueException when the exclusion is negative or not finite
     */
    default Mask mask(PixelGrid grid, double edgeExclusionMm) {
        Checks.nonNegative(edgeExclusionMm, "edgeExclusion", "mm");
        int w = grid.width();
        double cx = centreXMm();
        double cy = centreYMm();
        double reach = boundingRadiusMm() - edgeExclusionMm;
        double reach2 = reach < 0 ? -1 : reach * reach;
        Prepared p = prepared();
        // A point nearer the centre than (distance of the centre from the edge) − exclusion is inside and far enough
        // from the edge (the distance to the edge changes no faster than the distance moved): no exact test needed.
        // The margin of 1e-6 mm keeps the rounding of that bound from deciding a pixel the exact test would not.
        double inner = p.distanceToEdgeMm(cx, cy) - edgeExclusionMm - 1e-6;
        double inner2 = inner > 0 ? inner * inner : -1;
        return Mask.of(w, grid.height(), i -> {
            double x = grid.xMm(i % w);
            double y = grid.yMm(i / w);
            double dx = x - cx;
            double dy = y - cy;
            double d2 = dx * dx + dy * dy;
            if (d2 > reach2) {
                return false;
            }
            return d2 < inner2 || p.distanceToEdgeMm(x, y) >= edgeExclusionMm;
        });
    }

    /** Point queries on a shape whose derived constants are already computed (see {@link #prepared()}). */
    interface Prepared {
        /** As {@link WaferShape#contains(double, double)}. */
        boolean contains(double xMm, double yMm);

        /** As {@link WaferShape#distanceToEdgeMm(double, double)}. */
        double distanceToEdgeMm(double xMm, double yMm);
    }
}
