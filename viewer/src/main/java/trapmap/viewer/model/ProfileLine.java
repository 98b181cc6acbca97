package trapmap.viewer.model;

import trapmap.shared.check.Checks;

/**
 * A line-profile line in wafer coordinates (mm from the wafer centre, x right, y up) with the width of the band
 * averaged across it.
 */
public record ProfileLine(double x0Mm, double y0Mm, double x1Mm, double y1Mm, double bandWidthMm) {
    public ProfileLine {
        Checks.finite(x0Mm, "line start x", "mm");
        Checks.finite(y0Mm, "line start y", "mm");
        Checks.finite(x1Mm, "line end x", "mm");
        Checks.finite(y1Mm, "line end y", "mm");
        Checks.inRange(bandWidthMm, 0, 100, "band width", "mm");
        if (x0Mm == x1Mm && y0Mm == y1Mm) {
            throw new IllegalArgumentException("a profile line needs two different points");
        }
    }

    public double lengthMm() {
        return Math.hypot(x1Mm - x0Mm, y1Mm - y0Mm);
    }

    public ProfileLine withBandWidth(double mm) {
        return new ProfileLine(x0Mm, y0Mm, x1Mm, y1Mm, mm);
    }
}
