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
 */
public record Region(int id, int pixelCount, double areaMm2, double centroidXMm, double centroidYMm,
                     BoundsMm bounds, double peakValue, double peakXMm, double peakYMm, double meanValue,
                     double edgeDistanceMm) {

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
