package trapmap.viewer.model;

import trapmap.maps.io.ColourMap;
import trapmap.shared.check.Checks;

/**
 * How the map is coloured.
 *
 * @param colours      colour map
 * @param logarithmic  log colour scale
 * @param autoRange    true: the range runs from the {@code lowPercent} to the {@code highPercent} percentile of the
 *                     shown wafer (inside the edge exclusion); false: {@code low} to {@code high}
 * @param lowPercent   lower percentile of the automatic range, %
 * @param highPercent  upper percentile of the automatic range, %
 * @param low          lower end of the manual range, in the displayed quantity's unit
 * @param high         upper end of the manual range, in the displayed quantity's unit
 */
public record DisplaySettings(ColourMap colours, boolean logarithmic, boolean autoRange, double lowPercent,
                              double highPercent, double low, double high) {
    /** Automatic range P1–P99, linear, blue to yellow. */
    public static final DisplaySettings DEFAULT = new DisplaySettings(ColourMap.BLUE_YELLOW, false, true, 1,
            99, 1, 100);

    public DisplaySettings {
        Checks.notNull(colours, "colour map");
        Checks.inRange(lowPercent, 0, 100, "lower percentile", "%");
        Checks.inRange(highPercent, 0, 100, "upper percentile", "%");
        if (!(highPercent > lowPercent)) {
            throw new IllegalArgumentException("the upper percentile (" + highPercent + " %) must exceed the lower ("
                    + lowPercent + " %)");
        }
        if (!autoRange && !(high > low)) {
            throw new IllegalArgumentException("the manual range must have low < high, got " + low + " .. " + high);
        }
    }

    public DisplaySettings withColours(ColourMap c) {
        return new DisplaySettings(c, logarithmic, autoRange, lowPercent, highPercent, low, high);
    }

    public DisplaySettings withLogarithmic(boolean log) {
        return new DisplaySettings(colours, log, autoRange, lowPercent, highPercent, low, high);
    }

    public DisplaySettings withAutoRange(double lowPct, double highPct) {
        return new DisplaySettings(colours, logarithmic, true, lowPct, highPct, low, high);
    }

    public DisplaySettings withManualRange(double lo, double hi) {
        return new DisplaySettings(colours, logarithmic, false, lowPercent, highPercent, lo, hi);
    }
}
