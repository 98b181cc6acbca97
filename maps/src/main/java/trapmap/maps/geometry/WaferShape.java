package trapmap.maps.geometry;

import trapmap.maps.raster.Blocks;
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
     * centre that lies inside the outline, and there once for each stretch of a row that it decides.
     *
     * @param edgeExclusionMm width of the excluded rim, mm (0 keeps every pixel whose centre is inside)
     * @throws trapmap.shared.error.InvalidValueException when the exclusion is negative or not finite
     */
    default Mask mask(PixelGrid grid, double edgeExclusionMm) {
        Checks.nonNegative(edgeExclusionMm, "edgeExclusion", "mm");
        int w = grid.width();
        int n = w * grid.height();
        double cx = centreXMm();
        double cy = centreYMm();
        double reach = boundingRadiusMm() - edgeExclusionMm;
        double reach2 = reach < 0 ? -1 : reach * reach;
        Prepared p = prepared();
        // Shortcuts that never decide a pixel otherwise than the exact test (distance to the edge >= exclusion):
        // a point nearer the centre than (distance of the centre from the edge) − exclusion is inside and far enough
        // from the edge; and since the distance to the edge changes no faster than the distance moved, an exact
        // distance d decides the next ⌊(|d − exclusion| − margin) / pitch⌋ pixels of its row the same way. The margin
        // of 1e-6 mm keeps rounding from deciding a pixel the exact test would not.
        double margin = 1e-6;
        double inner = p.distanceToEdgeMm(cx, cy) - edgeExclusionMm - margin;
        double inner2 = inner > 0 ? inner * inner : -1;
        double pitch = grid.pitchMm();
        long[] words = new long[Blocks.count(n, 64)];
        Blocks.run(Blocks.count(n, Mask.BLOCK_PX), n, b -> {
            int i = b * Mask.BLOCK_PX;
            int end = Math.min(n, i + Mask.BLOCK_PX);
            int x = i % w;
            int y = i / w;
            while (i < end) {
                int rowEnd = Math.min(end, i + (w - x));
                double yMm = grid.yMm(y);
                double dy = yMm - cy;
                double dy2 = dy * dy;
                while (i < rowEnd) {
                    double xMm = grid.xMm(x);
                    double dx = xMm - cx;
                    double d2 = dx * dx + dy2;
                    boolean in;
                    int run = 1;
                    if (d2 > reach2) {
                        in = false;
                    } else if (d2 < inner2) {
                        in = true;
                        run = innerRun(grid, x, rowEnd - i, dy2, cx, inner2);
                    } else {
                        double d = p.distanceToEdgeMm(xMm, yMm);
                        in = d >= edgeExclusionMm;
                        double slack = Math.abs(d - edgeExclusionMm) - margin;
                        if (slack >= pitch) {
                            run = (int) Math.min(rowEnd - i, 1 + (long) (slack / pitch));
                        }
                    }
                    if (in) {
                        Mask.setRange(words, i, i + run);
                    }
                    i += run;
                    x += run;
                }
                x = 0;
                y++;
            }
        });
        return Mask.ofWords(w, grid.height(), words);
    }

    /**
     * The number of pixels from column {@code x} of a row (at most {@code max}) whose centres lie strictly inside the
     * circle {@code (xMm − cx)² + dy2 < inner2}, the first one being inside: the circle's chord on the row, from its
     * square root, then checked at its last pixel by the exact test of {@link #mask} (a chord of a circle is one
     * stretch of a row, so the pixels between two inside ones are inside too).
     */
    private static int innerRun(PixelGrid grid, int x, int max, double dy2, double cx, double inner2) {
        double step = Math.abs(grid.xMm(x + 1) - grid.xMm(x));
        double half = Math.sqrt(Math.max(0, inner2 - dy2));
        double ahead = grid.xMm(x + 1) > grid.xMm(x) ? cx + half - grid.xMm(x) : grid.xMm(x) - (cx - half);
        int run = (int) Math.max(1, Math.min(max, 1 + (long) Math.floor(ahead / step)));
        while (run > 1) {
            double dx = grid.xMm(x + run - 1) - cx;
            if (dx * dx + dy2 < inner2) {
                break;
            }
            run--;
        }
        return run;
    }

    /** Point queries on a shape whose derived constants are already computed (see {@link #prepared()}). */
    interface Prepared {
        /** As {@link WaferShape#contains(double, double)}. */
        boolean contains(double xMm, double yMm);

        /** As {@link WaferShape#distanceToEdgeMm(double, double)}. */
        double distanceToEdgeMm(double xMm, double yMm);

        /**
         * {@link #distanceToEdgeMm} with square roots of sums of squares where it takes {@link Math#hypot} (several
         * times faster), for deciding which side of a threshold a point lies on: it differs from the exact distance by
         * less than {@link #nearDistanceErrorMm}, so a point farther than that from the threshold lies on the same side
         * of it; only nearer ones need the exact distance.
         */
        default double nearDistanceToEdgeMm(double xMm, double yMm) {
            return distanceToEdgeMm(xMm, yMm);
        }

        /**
         * A bound, mm, on |{@link #nearDistanceToEdgeMm} − {@link #distanceToEdgeMm}| at a point whose coordinates
         * relative to the shape centre are at most {@code extentMm} in size: 1e-12 of (1 mm + extent + the shape's
         * size), far above the few units in the last place that a square root, a square and a sum add to
         * {@link Math#hypot}'s own rounding (about 1e-16 relative each).
         */
        default double nearDistanceErrorMm(double extentMm) {
            return 0;
        }
    }
}
