package trapmap.viewer.ui.charts;

import trapmap.maps.io.ColourMap;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.Mask;
import trapmap.maps.stats.MapStatistics;
import trapmap.maps.stats.StatisticsRequest;
import trapmap.viewer.ui.canvas.DisplayStyle;

/**
 * A display style chosen from the data: colour map BLUE_YELLOW over the 1st to 99th percentile of the pixels with
 * data, on a log scale (positive pixels only) for quantities that span decades, linear otherwise; for signed
 * changes (difference, relative change) a range symmetric about zero so that "no change" sits mid-scale.
 */
public final class AutoStyle {
    private AutoStyle() {
    }

    /** The style of {@code map}. */
    public static DisplayStyle of(WaferMap map) {
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
                return new DisplayStyle(ColourMap.BLUE_YELLOW, true, lo, hi);
            }
        }
        MapStatistics st = MapStatistics.of(map, null, StatisticsRequest.of(new double[] {1, 99}));
        double lo = st.count() == 0 ? 0 : st.percentile(1);
        double hi = st.count() == 0 ? 1 : st.percentile(99);
        switch (map.quantity()) {
            case DIFFERENCE, RELATIVE_CHANGE -> {
                double m = Math.max(Math.abs(lo), Math.abs(hi));
                lo = -m;
                hi = m;
            }
            default -> {
            }
        }
        if (!(hi > lo)) {
            double pad = lo == 0 ? 0.5 : Math.abs(lo) * 0.05;
            lo -= pad;
            hi += pad;
        }
        return new DisplayStyle(ColourMap.BLUE_YELLOW, false, lo, hi);
    }
}
