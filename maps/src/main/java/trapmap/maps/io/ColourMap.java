package trapmap.maps.io;

/**
 * Colour maps for map pictures: 256 opaque sRGB colours each, index 0 for the low end of the range.
 * <ul>
 *   <li>{@link #GREY}: black to white, linear in sRGB code values.</li>
 *   <li>{@link #BLUE_YELLOW}: dark blue through teal and green to yellow. Built here from five anchor colours given in
 *       CIELAB (D65) with strictly increasing lightness L* = 12, 32, 52, 72, 92, interpolated linearly in L*a*b* and
 *       converted to sRGB (out-of-gamut channels clipped), so that lightness grows steadily with the value and the
 *       picture stays readable in grey print.</li>
 * </ul>
 */
public enum ColourMap {
    GREY(null),
    BLUE_YELLOW(new double[][] {
        // L*, a*, b*
        {12, 22, -46},
        {32, 14, -52},
        {52, -22, -20},
        {72, -42, 28},
        {92, -6, 84},
    });

    private final int[] rgb = new int[256];

    ColourMap(double[][] labAnchors) {
        for (int i = 0; i < 256; i++) {
            if (labAnchors == null) {
                rgb[i] = (i << 16) | (i << 8) | i;
            } else {
                double pos = i / 255.0 * (labAnchors.length - 1);
                int k = Math.min((int) pos, labAnchors.length - 2);
                double f = pos - k;
                double[] a = labAnchors[k];
                double[] b = labAnchors[k + 1];
                rgb[i] = labToRgb(a[0] + f * (b[0] - a[0]), a[1] + f * (b[1] - a[1]), a[2] + f * (b[2] - a[2]));
            }
        }
    }

    /** The opaque colour (0xRRGGBB) of entry {@code index} in [0, 255]. */
    public int rgb(int index) {
        return rgb[index];
    }

    /** The colour for a position {@code t} in [0, 1] (clamped). */
    public int rgbAt(double t) {
        double c = t != t ? 0 : Math.max(0, Math.min(1, t));
        return rgb[(int) Math.round(c * 255)];
    }

    /** CIELAB (D65 white) to an sRGB 0xRRGGBB colour, channels clipped to the gamut. */
    static int labToRgb(double l, double a, double bStar) {
        double fy = (l + 16) / 116;
        double fx = fy + a / 500;
        double fz = fy - bStar / 200;
        double x = 0.95047 * labInverse(fx);
        double y = labInverse(fy);
        double z = 1.08883 * labInverse(fz);
        double r = 3.2404542 * x - 1.5371385 * y - 0.4985314 * z;
        double g = -0.9692660 * x + 1.8760108 * y + 0.0415560 * z;
        double b = 0.0556434 * x - 0.2040259 * y + 1.0572252 * z;
        return (encode(r) << 16) | (encode(g) << 8) | encode(b);
    }

    private static double labInverse(double t) {
        double d = 6.0 / 29;
        return t > d ? t * t * t : 3 * d * d * (t - 4.0 / 29);
    }

    private static int encode(double linear) {
        double c = Math.max(0, Math.min(1, linear));
        double v = c <= 0.0031308 ? 12.92 * c : 1.055 * Math.pow(c, 1 / 2.4) - 0.055;
        return (int) Math.round(v * 255);
    }
}
