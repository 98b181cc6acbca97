package trapmap.maps.region;

/**
 * One connected region of a threshold map. Positions are wafer coordinates (mm from the wafer centre, x to the
 * right, y upwards).
 *
 * @param id             1-based number, in the order the regions are met scanning the map from its top row
 * @param pixelCount     pixels in the region
 * @param areaMm2        pixelCount × pixel area, mm²
 * @param centroidXMm    mean x of the pixel centres, mm
 * @param centroidYMm    mean y of the pixel centres, mm
 * @param bounds         bounding box of the pixel squares (not just their centres), mm
 * @param peakValue      most extreme value in the threshold's direction (largest above, smallest below)
 * @param peakXMm        x of the peak pixel (the first in scan order if several share the value), mm
 * @param peakYMm        y of the peak pixel, mm
 * @param meanValue      arithmetic mean of the region's values
 * @param edgeDistanceMm smallest distance from a pixel centre of the region to the wafer edge, mm (0 or less when the
 *                       region reaches the edge)
 * @param centroidInside true when the centroid lies on a pixel of the region; false for a ring, an arc or an L
 *                       whose centroid falls in the gap it encloses
 * @param positionXMm    x of the region's reported position, mm: the centroid when it lies inside the region,
 *                       otherwise the centre of the region's pixel nearest to the centroid (the lowest pixel index
 *                       among equally near ones), so that a ring's position is a point of the ring
 * @param positionYMm    y of the region's reported position, mm
 */
public record Region(int id, int pixelCount, double areaMm2, double centroidXMm, double centroidYMm,
                     BoundsMm bounds, double peakValue, double peakXMm, double peakYMm, double meanValue,
                     double edgeDistanceMm, boolean centroidInside, double positionXMm, double positionYMm) {

    /**
     * Where a region's centroid falls among its pixels: the region pixel whose centre is nearest to the centroid, and
     * whether the centroid lies on it (on the pixel's square, edges included). The pixel squares are the Voronoi
     * cells of the pixel centres, so the centroid lies on some pixel of the region exactly when it lies on the
     * nearest one.
     *
     * @param nearestIndex index (row-major) of the region pixel nearest to the centroid
     * @param inside       true when the centroid lies on that pixel
     */
    public record CentroidPixel(int nearestIndex, boolean inside) {
        /**
         * Of the pixels {@code pixels[0..count)} of a raster {@code width} wide, with centroid ({@code cxPx},
         * {@code cyPx}) in pixel coordinates.
         */
        public static CentroidPixel of(int[] pixels, int count, int width, double cxPx, double cyPx) {
            Nearest nearest = new Nearest();
            // in calls of at most 64 pixels: HotSpot compiles the short loop once, by its calls, instead of on-stack
            // replacement while a long loop over a large region runs (and again at the next call)
            for (int k = 0; k < count; k += 64) {
                nearest.scan(pixels, k, Math.min(count, k + 64), width, cxPx, cyPx);
            }
            int best = nearest.best;
            int y = best / width;
            boolean inside = Math.abs(best - y * width - cxPx) <= 0.5 && Math.abs(y - cyPx) <= 0.5;
            return new CentroidPixel(best, inside);
        }

        /** The pixel nearest the centroid so far (the first in index order of equally near ones). */
        private static final class Nearest {
            int best = -1;
            double bestD = Double.POSITIVE_INFINITY;

            void scan(int[] pixels, int from, int to, int width, double cxPx, double cyPx) {
                int best = this.best;
                double bestD = this.bestD;
                for (int k = from; k < to; k++) {
                    int i = pixels[k];
                    int y = i / width;
                    double dx = i - y * width - cxPx;
                    double dy = y - cyPx;
                    double d = dx * dx + dy * dy;
                    if (d < bestD || d == bestD && i < best) {
                        bestD = d;
                        best = i;
                    }
                }
                this.best = best;
                this.bestD = bestD;
            }
        }
    }

    /**
     * An axis-aligned box in wafer coordinates.
     *
     * @param minXMm left edge, mm
     * @param minYMm bottom edge, mm
     * @param maxXMm right edge, mm
     * @param maxYMm top edge, mm
     */
    public record BoundsMm(double minXMm, double minYMm, double maxXMm, double maxYMm) {
        public double widthMm() {
            return maxXMm - minXMm;
        }

        public double heightMm() {
            return maxYMm - minYMm;
        }
    }

    /** Diameter of the disk with the region's area, mm. */
    public double equivalentDiameterMm() {
        return 2 * Math.sqrt(areaMm2 / Math.PI);
    }

    /** True when some pixel centre of the region lies within {@code marginMm} of the wafer edge. */
    public boolean reachesEdge(double marginMm) {
        return edgeDistanceMm <= marginMm;
    }
}
