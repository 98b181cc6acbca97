package trapmap.maps.profile;

import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.check.Checks;

/**
 * Azimuthal average of a map about a centre: the mean of the pixels whose centres lie in each ring
 * i·w ≤ r &lt; (i + 1)·w (w = ring width), for the concentric patterns of Czochralski wafers (oxygen rings, vacancy- and
 * interstitial-rich zones). NaN pixels and pixels outside the mask are not counted; empty rings have a NaN mean.
 */
public final class RadialProfile {
    private final double ringWidthMm;
    private final double centreXMm;
    private final double centreYMm;
    private final double[] mean;
    private final long[] count;

    private RadialProfile(double ringWidthMm, double centreXMm, double centreYMm, double[] mean, long[] count) {
        this.ringWidthMm = ringWidthMm;
        this.centreXMm = centreXMm;
        this.centreYMm = centreYMm;
        this.mean = mean;
        this.count = count;
    }

    /** Profile of a map about its wafer centre (mask null: every pixel). */
    public static RadialProfile of(WaferMap map, Mask mask, double ringWidthMm) {
        Checks.notNull(map, "map");
        return of(map.raster(), map.grid(), mask, ringWidthMm, 0, 0);
    }

    /**
     * Profile of {@code raster} about ({@code centreXMm}, {@code centreYMm}) in wafer coordinates.
     *
     * @param mask        pixels to use (null: all)
     * @param ringWidthMm radial width of each ring, mm
     */
    public static RadialProfile of(FloatRaster raster, PixelGrid grid, Mask mask, double ringWidthMm,
                                   double centreXMm, double centreYMm) {
        Checks.notNull(raster, "raster");
        Checks.notNull(grid, "grid");
        Checks.positive(ringWidthMm, "ringWidth", "mm");
        Checks.finite(centreXMm, "centreX", "mm");
        Checks.finite(centreYMm, "centreY", "mm");
        int w = raster.width();
        int h = raster.height();
        if (grid.width() != w || grid.height() != h) {
            throw new IllegalArgumentException("grid " + grid.width() + "x" + grid.height() + " does not match raster "
                    + w + "x" + h);
        }
        if (mask != null && (mask.width() != w || mask.height() != h)) {
            throw new IllegalArgumentException("mask " + mask.width() + "x" + mask.height() + " does not match raster "
                    + w + "x" + h);
        }
        double reach = 0;
        for (int corner = 0; corner < 4; corner++) {
            double x = grid.xMm((corner & 1) == 0 ? 0 : w - 1) - centreXMm;
            double y = grid.yMm((corner >> 1) == 0 ? 0 : h - 1) - centreYMm;
            reach = Math.max(reach, Math.hypot(x, y));
        }
        int rings = (int) Math.floor(reach / ringWidthMm) + 1;
        double[] sum = new double[rings];
        long[] cnt = new long[rings];
        float[] s = raster.samples();
        int last = -1;
        for (int y = 0; y < h; y++) {
            double dy = grid.yMm(y) - centreYMm;
            for (int x = 0; x < w; x++) {
                int i = y * w + x;
                float v = s[i];
                if (v != v || mask != null && !mask.containsIndex(i)) {
                    continue;
                }
                double dx = grid.xMm(x) - centreXMm;
                int ring = Math.min(rings - 1, (int) (Math.sqrt(dx * dx + dy * dy) / ringWidthMm));
                sum[ring] += v;
                cnt[ring]++;
                last = Math.max(last, ring);
            }
        }
        int kept = last + 1;
        double[] mean = new double[kept];
        long[] count = new long[kept];
        for (int k = 0; k < kept; k++) {
            mean[k] = cnt[k] == 0 ? Double.NaN : sum[k] / cnt[k];
            count[k] = cnt[k];
        }
        return new RadialProfile(ringWidthMm, centreXMm, centreYMm, mean, count);
    }

    /** Rings up to the outermost one that holds a counted pixel. */
    public int ringCount() {
        return mean.length;
    }

    public double ringWidthMm() {
        return ringWidthMm;
    }

    public double centreXMm() {
        return centreXMm;
    }

    public double centreYMm() {
        return centreYMm;
    }

    public double innerRadiusMm(int ring) {
        return ring * ringWidthMm;
    }

    public double outerRadiusMm(int ring) {
        return (ring + 1) * ringWidthMm;
    }

    /** Middle of the ring, mm. */
    public double radiusMm(int ring) {
        return (ring + 0.5) * ringWidthMm;
    }

    /** Mean of the ring's pixels, NaN when it has none. */
    public double mean(int ring) {
        return mean[ring];
    }

    /** Pixels counted in the ring. */
    public long count(int ring) {
        return count[ring];
    }

    /** All ring means (a copy). */
    public double[] means() {
        return mean.clone();
    }
}
