package trapmap.viewer.graphics;

import trapmap.maps.io.ColourMap;

/**
 * How values become colours: colour map, linear or logarithmic scale, and the value range mapped onto it (in the
 * displayed quantity's unit). Values below {@code low} take the first colour, above {@code high} the last.
 *
 * @param colours     colour map
 * @param logarithmic true for a log scale (equal ratios take equal steps of colour)
 * @param low         value of the first colour, in the quantity's unit (&gt; 0 on a log scale)
 * @param high        value of the last colour, in the quantity's unit (&gt; low)
 */
public record DisplayStyle(ColourMap colours, boolean logarithmic, double low, double high) {
    /**
     * Checks the range.
     *
     * @throws IllegalArgumentException when the colour map is missing, low ≥ high, or low ≤ 0 on a log scale
     */
    public DisplayStyle {
        if (colours == null) {
            throw new IllegalArgumentException("colour map is required");
        }
        if (!(high > low) || (logarithmic && !(low > 0))) {
            throw new IllegalArgumentException("range must satisfy low < high (and low > 0 on a log scale), got "
                    + low + " .. " + high);
        }
    }
}
