package trapmap.maps.compare;

import trapmap.maps.raster.PixelGrid;

/**
 * Pixel coordinates in the after map B for pixel coordinates (x, y) in the before map A under a registration:
 * bx = xx·x + xy·y + x0, by = yx·x + yy·y + y0. A rigid map between two grids is affine in pixels, so whole rows
 * are walked without trigonometry.
 */
record PixelMapping(double xx, double xy, double x0, double yx, double yy, double y0) {

    static PixelMapping of(PixelGrid a, PixelGrid b, Registration r) {
        double[] p00 = toB(a, b, r, 0, 0);
        double[] p10 = toB(a, b, r, 1, 0);
        double[] p01 = toB(a, b, r, 0, 1);
        return new PixelMapping(p10[0] - p00[0], p01[0] - p00[0], p00[0], p10[1] - p00[1], p01[1] - p00[1], p00[1]);
    }

    private static double[] toB(PixelGrid a, PixelGrid b, Registration r, double x, double y) {
        double[] mm = r.toAfterMm(a.xMm(x), a.yMm(y));
        return new double[] {b.xPx(mm[0]), b.yPx(mm[1])};
    }

    double bx(double x, double y) {
        return xx * x + xy * y + x0;
    }

    double by(double x, double y) {
        return yx * x + yy * y + y0;
    }
}
