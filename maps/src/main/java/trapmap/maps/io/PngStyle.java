package trapmap.maps.io;

import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;

/**
 * How a map is drawn into a PNG picture (8 bits per channel; a picture for reports, not a quantitative file).
 * Pixels without data, and pixels ≤ 0 on a log scale, are transparent.
 *
 * @param colours colour map
 * @param scale   value scale
 * @param min     value drawn with the first colour; NaN: the 1st percentile of the valid pixels
 * @param max     value drawn with the last colour; NaN: the 99th percentile of the valid pixels
 */
public record PngStyle(ColourMap colours, Scale scale, double min, double max) {

    /** Blue-to-yellow colours, scale chosen by the quantity, automatic range. */
    public static final PngStyle DEFAULT = new PngStyle(ColourMap.BLUE_YELLOW, Scale.AUTO, Double.NaN, Double.NaN);

    /** Value scale of a picture. */
    public enum Scale {
        /** Logarithmic for quantities that span decades ({@code Quantity.logarithmic()}), otherwise linear. */
        AUTO,
        LINEAR,
        LOG
    }

    public PngStyle {
        Checks.notNull(colours, "colours");
        Checks.notNull(scale, "scale");
        if (Double.isInfinite(min) || Double.isInfinite(max)) {
            throw new InvalidValueException("range", "", "the colour range must be finite or NaN (automatic) but was ["
                    + min + ", " + max + "]");
        }
        if (!Double.isNaN(min) && !Double.isNaN(max) && !(max > min)) {
            throw new InvalidValueException("range", "", "the colour range needs max > min but was [" + min + ", "
                    + max + "]");
        }
    }

    public PngStyle withColours(ColourMap c) {
        return new PngStyle(c, scale, min, max);
    }

    public PngStyle withScale(Scale s) {
        return new PngStyle(colours, s, min, max);
    }

    /** A fixed colour range (NaN for either end: automatic). */
    public PngStyle withRange(double lo, double hi) {
        return new PngStyle(colours, scale, lo, hi);
    }
}
