package trapmap.maps.profile;

import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;

/**
 * Values along a straight line between two points in wafer coordinates (mm), sampled bilinearly
 * ({@link Bilinear}) at even spacing, optionally averaged across a band.
 *
 * <p>Samples lie at distances dᵢ = i·L/(n − 1), i = 0 … n − 1, from the start (L = line length, n chosen so that the
 * spacing is as close as possible to the requested step; both end points are sampled). With a band width W &gt; 0,
 * each sample is the mean of m = ⌈W / pitch⌉ bilinear samples spread evenly across the band perpendicular to the
 * line, at offsets −W/2 + (j + ½)·W/m; NaN samples (no data) are left out of that mean and the number used is kept
 * in {@link #sampleCount(int)}. A sample with no data anywhere across the band is NaN.
 */
public final class LineProfile {
    private final double startXMm;
    private final double startYMm;
    private final double endXMm;
    private final double endYMm;
    private final double bandWidthMm;
    private final double[] distanceMm;
    private final double[] value;
    private final int[] sampleCount;

    private LineProfile(double startXMm, double startYMm, double endXMm, double endYMm, double bandWidthMm,
                        double[] distanceMm, double[] value, int[] sampleCount) {
        this.startXMm = startXMm;
        this.startYMm = startYMm;
        this.endXMm = endXMm;
        this.endYMm = endYMm;
        this.bandWidthMm = bandWidthMm;
        this.distanceMm = distanceMm;
        this.value = value;
        this.sampleCount = sampleCount;
    }

    /** Profile of a map with one sample per pixel pitch. */
    public static LineProfile of(WaferMap map, double startXMm, double startYMm, double endXMm, double endYMm,
                                 double bandWidthMm) {
        Checks.notNull(map, "map");
        return of(map.raster(), map.grid(), startXMm, startYMm, endXMm, endYMm, map.grid().pitchMm(), bandWidthMm);
    }

    /**
     * Profile of {@code raster} placed by {@code grid}.
     *
     * @param stepMm      wanted spacing of the samples along the line, mm
     * @param bandWidthMm width of the band averaged across the line, mm (0: the line alone)
     * @throws InvalidValueException when the end points coincide or a length is out of range
     */
    public static LineProfile of(FloatRaster raster, PixelGrid grid, double startXMm, double startYMm,
                                 double endXMm, double endYMm, double stepMm, double bandWidthMm) {
        Checks.notNull(raster, "raster");
        Checks.notNull(grid, "grid");
        if (grid.width() != raster.width() || grid.height() != raster.height()) {
            throw new IllegalArgumentException("grid " + grid.width() + "x" + grid.height() + " does not match raster "
                    + raster.width() + "x" + raster.height());
        }
        Checks.finite(startXMm, "startX", "mm");
        Checks.finite(startYMm, "startY", "mm");
        Checks.finite(endXMm, "endX", "mm");
        Checks.finite(endYMm, "endY", "mm");
        Checks.positive(stepMm, "step", "mm");
        Checks.nonNegative(bandWidthMm, "bandWidth", "mm");
        double length = Math.hypot(endXMm - startXMm, endYMm - startYMm);
        if (!(length > 0)) {
            throw new InvalidValueException("line", "mm", "line must have a length > 0 mm but starts and ends at ("
                    + startXMm + ", " + startYMm + ")");
        }
        int n = (int) Math.max(2, Math.round(length / stepMm) + 1);
        double ux = (endXMm - startXMm) / length;
        double uy = (endYMm - startYMm) / length;
        double px = -uy; // perpendicular, to the left of the direction of travel
        double py = ux;
        int m = bandWidthMm == 0 ? 1 : (int) Math.max(1, Math.ceil(bandWidthMm / grid.pitchMm() - 1e-9));
        double[] offsets = new double[m];
        for (int j = 0; j < m; j++) {
            offsets[j] = bandWidthMm == 0 ? 0 : -bandWidthMm / 2 + (j + 0.5) * bandWidthMm / m;
        }
        double[] dist = new double[n];
        double[] val = new double[n];
        int[] cnt = new int[n];
        for (int i = 0; i < n; i++) {
            double d = length * i / (n - 1);
            double cx = startXMm + d * ux;
            double cy = startYMm + d * uy;
            double sum = 0;
            int used = 0;
            for (double t : offsets) {
                double v = Bilinear.sample(raster, grid.xPx(cx + t * px), grid.yPx(cy + t * py));
                if (v == v) {
                    sum += v;
                    used++;
                }
            }
            dist[i] = d;
            val[i] = used == 0 ? Double.NaN : sum / used;
            cnt[i] = used;
        }
        return new LineProfile(startXMm, startYMm, endXMm, endYMm, bandWidthMm, dist, val, cnt);
    }

    public int size() {
        return value.length;
    }

    /** Distance of sample i from the start, mm. */
    public double distanceMm(int i) {
        return distanceMm[i];
    }

    /** Value of sample i (mean across the band), NaN without data. */
    public double value(int i) {
        return value[i];
    }

    /** Bilinear samples across the band that had data at sample i. */
    public int sampleCount(int i) {
        return sampleCount[i];
    }

    /** The distance axis, mm (a copy). */
    public double[] distancesMm() {
        return distanceMm.clone();
    }

    /** The values (a copy). */
    public double[] values() {
        return value.clone();
    }

    /** Wafer x of sample i, mm. */
    public double xMm(int i) {
        return startXMm + (endXMm - startXMm) * i / (size() - 1);
    }

    /** Wafer y of sample i, mm. */
    public double yMm(int i) {
        return startYMm + (endYMm - startYMm) * i / (size() - 1);
    }

    public double lengthMm() {
        return distanceMm[distanceMm.length - 1];
    }

    public double bandWidthMm() {
        return bandWidthMm;
    }
}
