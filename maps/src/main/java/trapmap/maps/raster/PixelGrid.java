package trapmap.maps.raster;

import trapmap.shared.check.Checks;

/**
 * Placement of a raster on the wafer: square pixels of {@code pitchMm}, and the wafer centre at pixel coordinates
 * ({@code centreXPx}, {@code centreYPx}) where pixel (x, y) has its centre at (x, y). Wafer coordinates are in mm
 * from the wafer centre, x to the right and y upwards (row 0 is the top of the image):
 * x_mm = (x − centreXPx)·pitch, y_mm = (centreYPx − y)·pitch.
 *
 * @param width      pixels per row
 * @param height     rows
 * @param pitchMm    pixel pitch, mm
 * @param centreXPx  column of the wafer centre (may be fractional)
 * @param centreYPx  row of the wafer centre (may be fractional)
 */
public record PixelGrid(int width, int height, double pitchMm, double centreXPx, double centreYPx) {

    public PixelGrid {
        if (width <= 0 || height <= 0) {
            throw new IllegalArgumentException("grid size must be positive but was " + width + "x" + height);
        }
        Checks.positive(pitchMm, "pixelPitch", "mm");
        Checks.finite(centreXPx, "centreX", "px");
        Checks.finite(centreYPx, "centreY", "px");
    }

    /** A grid whose wafer centre is the centre of the raster. */
    public static PixelGrid centred(int width, int height, double pitchMm) {
        return new PixelGrid(width, height, pitchMm, (width - 1) / 2.0, (height - 1) / 2.0);
    }

    public double xMm(double xPx) {
        return (xPx - centreXPx) * pitchMm;
    }

    public double yMm(double yPx) {
        return (centreYPx - yPx) * pitchMm;
    }

    public double xPx(double xMm) {
        return centreXPx + xMm / pitchMm;
    }

    public double yPx(double yMm) {
        return centreYPx - yMm / pitchMm;
    }

    /** Area of one pixel, mm². */
    public double pixelAreaMm2() {
        return pitchMm * pitchMm;
    }

    /** The same placement for a raster of another size (centre kept in mm). */
    public PixelGrid withPitch(double mm) {
        return new PixelGrid(width, height, mm, centreXPx, centreYPx);
    }

    /** The same raster and pitch with the wafer centre at pixel ({@code xPx}, {@code yPx}). */
    public PixelGrid withCentre(double xPx, double yPx) {
        return new PixelGrid(width, height, pitchMm, xPx, yPx);
    }

    /*
     * equals and hashCode written out with the generated record semantics (each component in order; doubles compared
     * with Double.compare, hash = 31 * hash + Integer/Double.hashCode of each): the generated ones are made at run time
     * by java.lang.runtime.ObjectMethods, a tree of method handles whose classes are spun and compiled in every process
     * that first hashes a grid (each batch, through the outline-fit cache). RecordMethodsTest checks the sameness.
     */
    @Override
    public boolean equals(Object o) {
        return o == this || o instanceof PixelGrid g && width == g.width && height == g.height
                && Double.compare(pitchMm, g.pitchMm) == 0 && Double.compare(centreXPx, g.centreXPx) == 0
                && Double.compare(centreYPx, g.centreYPx) == 0;
    }

    @Override
    public int hashCode() {
        int h = Integer.hashCode(width);
        h = 31 * h + Integer.hashCode(height);
        h = 31 * h + Double.hashCode(pitchMm);
        h = 31 * h + Double.hashCode(centreXPx);
        return 31 * h + Double.hashCode(centreYPx);
    }
}
