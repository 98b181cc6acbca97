package trapmap.maps.profile;

import trapmap.maps.raster.FloatRaster;

/**
 * Bilinear interpolation between pixel centres, aware of missing data.
 *
 * <p>The value at (x, y) (pixel coordinates, pixel centres at integers) is Σ wᵢ·vᵢ over the four surrounding pixel
 * centres with weights (1 − fx)(1 − fy), fx(1 − fy), (1 − fx)fy, fx·fy. Where some of them are NaN or beyond the
 * raster, the weights of the others are renormalised as long as they add up to at least one half (the point is
 * nearer to data than to the gap); otherwise the result is NaN. With all four present this is plain bilinear
 * interpolation, exact for any function linear in x and y.
 */
public final class Bilinear {
    private Bilinear() {
    }

    /** The interpolated value at pixel coordinates ({@code xPx}, {@code yPx}), or NaN. */
    public static double sample(FloatRaster raster, double xPx, double yPx) {
        if (!(Double.isFinite(xPx) && Double.isFinite(yPx))) {
            return Double.NaN;
        }
        double fx0 = Math.floor(xPx);
        double fy0 = Math.floor(yPx);
        if (fx0 < -1 || fy0 < -1 || fx0 > raster.width() || fy0 > raster.height()) {
            return Double.NaN;
        }
        int x0 = (int) fx0;
        int y0 = (int) fy0;
        double fx = xPx - x0;
        double fy = yPx - y0;
        double sum = 0;
        double weight = 0;
        for (int k = 0; k < 4; k++) {
            int dx = k & 1;
            int dy = k >> 1;
            double w = (dx == 0 ? 1 - fx : fx) * (dy == 0 ? 1 - fy : fy);
            if (w == 0) {
                continue;
            }
            int x = x0 + dx;
            int y = y0 + dy;
            if (!raster.contains(x, y)) {
                continue;
            }
            float v = raster.get(x, y);
            if (v == v) {
                sum += w * v;
                weight += w;
            }
        }
        return weight >= 0.5 ? sum / weight : Double.NaN;
    }
}
