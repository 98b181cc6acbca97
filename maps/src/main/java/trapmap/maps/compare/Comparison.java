package trapmap.maps.compare;

import trapmap.maps.model.WaferMap;

/**
 * The per-pixel maps and the paired statistics of a before/after pair.
 *
 * @param difference     after − before ({@link trapmap.maps.model.Quantity#DIFFERENCE}, in the maps' unit, which
 *                       the {@code compare} step records)
 * @param ratio          after / before ({@link trapmap.maps.model.Quantity#RATIO})
 * @param relativeChange (after − before) / before ({@link trapmap.maps.model.Quantity#RELATIVE_CHANGE})
 * @param reduction      1 − after/before ({@link trapmap.maps.model.Quantity#FRACTION}) for density quantities,
 *                       null for others
 * @param statistics     paired statistics
 */
public record Comparison(WaferMap difference, WaferMap ratio, WaferMap relativeChange, WaferMap reduction,
                         PairedStatistics statistics) {

    /** True when a reduction map was made (density quantities). */
    public boolean hasReduction() {
        return reduction != null;
    }
}
