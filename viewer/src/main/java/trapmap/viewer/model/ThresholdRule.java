package trapmap.viewer.model;

import trapmap.maps.region.RegionCriteria;
import trapmap.shared.check.Checks;

/**
 * Which pixels are flagged and when a wafer fails: pixels strictly beyond {@code value} on {@code side} (in the
 * displayed quantity's unit), grouped into 8-connected regions of at least {@code minAreaMm2}; the wafer fails when
 * the flagged regions cover more than {@code maxFlaggedFraction} of the evaluated area.
 *
 * @param value              threshold, in the displayed quantity's unit
 * @param side               above or below
 * @param minAreaMm2         smallest region counted, mm²
 * @param maxFlaggedFraction largest flagged area fraction of a passing wafer, in [0, 1]
 */
public record ThresholdRule(double value, RegionCriteria.Side side, double minAreaMm2, double maxFlaggedFraction) {
    /** Example pass limit on the flagged area fraction (the example rules file's 2 %). */
    public static final double DEFAULT_MAX_FRACTION = 0.02;

    public ThresholdRule {
        Checks.finite(value, "threshold", "");
        Checks.notNull(side, "side");
        Checks.inRange(minAreaMm2, 0, 1e6, "minimum region area", "mm^2");
        Checks.inRange(maxFlaggedFraction, 0, 1, "largest flagged fraction", "");
    }

    /** The default rule for a quantity: its default threshold and side, regions of 4 mm² or more. */
    public static ThresholdRule defaultFor(DisplayedQuantity q) {
        return new ThresholdRule(q.defaultThreshold(), q.defaultSide(), 4, DEFAULT_MAX_FRACTION);
    }

    public RegionCriteria criteria() {
        return side == RegionCriteria.Side.ABOVE ? RegionCriteria.above(value, minAreaMm2)
                : RegionCriteria.below(value, minAreaMm2);
    }

    public ThresholdRule withValue(double v) {
        return new ThresholdRule(v, side, minAreaMm2, maxFlaggedFraction);
    }

    public ThresholdRule withSide(RegionCriteria.Side s) {
        return new ThresholdRule(value, s, minAreaMm2, maxFlaggedFraction);
    }

    public ThresholdRule withMinArea(double mm2) {
        return new ThresholdRule(value, side, mm2, maxFlaggedFraction);
    }

    public ThresholdRule withMaxFraction(double f) {
        return new ThresholdRule(value, side, minAreaMm2, f);
    }
}
