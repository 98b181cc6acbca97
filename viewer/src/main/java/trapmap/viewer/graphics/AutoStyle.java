package trapmap.viewer.graphics;

import trapmap.maps.io.ColourMap;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.Mask;
import trapmap.maps.stats.MapStatistics;
import trapmap.maps.stats.StatisticsRequest;

/**
 * A display style chosen from the data: colour map BLUE_YELLOW over the 1st to 99th percentile of the pixels with
 * data, on a log scale (positive pixels only) for quantities that span decades, linear otherwise. Changes use the
 * DIVERGING map with "no change" mid-scale: differences and relative changes on a linear range symmetric about zero,
 * ratios on a log range symmetric about one. Quantities with a {@link Quantity#defaultRange()} (fractions: 0 to 1)
 * keep that range whatever the data.
 */
public final class AutoStyle {
    private AutoStyle() {
    }

    /** The style of {@code map}. */
    public static DisplayStyle of(WaferMap map) {
        double[] fixed = map.quantity().defaultRange();
        if (fixed != null) {
            return new DisplayStyle(ColourMap.BLUE_YELLOW, false, fixed[0], fixed[1]);
        }
        float[] s = map.raster().samples();
        if (map.quantity().logarithmic()) {
            Mask positive = Mask.of(map.width(), map.height(), i -> s[i] > 0);
            MapStatistics st = MapStatistics.of(map, positive, StatisticsRequest.of(new double[] {1, 99}));
            if (st.count() > 0) {
                double lo = st.percentile(1);
                double hi = st.percentile(99);
                if (!(hi > lo)) {
                    lo /= 2;
                    hi *= 2;
                }
                if (map.quantity() == Quantity.RATIO) {
                    double m = Math.max(Math.max(hi, 1 / lo), 1.01);
                    return new DisplayStyle(ColourMap.DIVERGING, true, 1 / m, m);
                }
                return new DisplayStyle(ColourMap.BLUE_YELLOW, true, lo, hi);
            }
        }
        MapStatistics st = MapStatistics.of(map, null, StatisticsRequest.of(new double[] {1, 99}));
        double lo = st.count() == 0 ? 0 : st.percentile(1);
        double hi = st.count() == 0 ? 1 : st.percentile(99);
        boolean change = map.quantity() == Quantity.DIFFERENCE || map.quantity() == Quantity.RELATIVE_CHANGE;
        if (change) {
            double m = Math.max(Math.abs(lo), Math.abs(hi));
            lo = -m;
            hi = m;
        }
        if (!(hi > lo)) {
            double pad = lo == 0 ? 0.5 : Math.abs(lo) * 0.05;
            lo -= pad;
            hi += pad;
        }
        return new DisplayStyle(change ? ColourMap.DIVERGING : ColourMap.BLUE_YELLOW, false, lo, hi);
    }

    /** One style for two maps of one quantity (before and after), covering both maps' automatic ranges. */
    public static DisplayStyle common(WaferMap a, WaferMap b) {
        DisplayStyle sa = of(a);
        DisplayStyle sb = of(b);
        return new DisplayStyle(sa.colours(), sa.logarithmic(), Math.min(sa.low(), sb.low()),
                Math.max(sa.high(), sb.high()));
    }
}
