package trapmap.maps.region;

import trapmap.shared.check.Checks;

/**
 * Which pixels form regions: those strictly above (or strictly below) a threshold, grouped by 8-connectivity, and
 * kept when the group covers at least a minimum area.
 *
 * @param threshold  the threshold, in the unit of the map
 * @param side       {@link Side#ABOVE} for hot spots (high trap density), {@link Side#BELOW} for low-lifetime spots
 * @param minAreaMm2 smallest region kept, mm² (0 keeps single pixels)
 */
public record RegionCriteria(double threshold, Side side, double minAreaMm2) {

    /** Which side of the threshold a region pixel lies on. */
    public enum Side {
        /** value &gt; threshold; the peak is the largest value. */
        ABOVE,
        /** value &lt; threshold; the peak is the smallest value. */
        BELOW
    }

    public RegionCriteria {
        Checks.finite(threshold, "threshold", "");
        Checks.notNull(side, "side");
        Checks.nonNegative(minAreaMm2, "minArea", "mm²");
    }

    public static RegionCriteria above(double threshold, double minAreaMm2) {
        return new RegionCriteria(threshold, Side.ABOVE, minAreaMm2);
    }

    public static RegionCriteria below(double threshold, double minAreaMm2) {
        return new RegionCriteria(threshold, Side.BELOW, minAreaMm2);
    }

    /** True when {@code value} belongs to a region (NaN never does). */
    public boolean selects(float value) {
        return side == Side.ABOVE ? value > threshold : value < threshold;
    }

    /** True when {@code a} is a more extreme peak than {@code b} on this side. */
    boolean morePeaked(double a, double b) {
        return side == Side.ABOVE ? a > b : a < b;
    }
}
