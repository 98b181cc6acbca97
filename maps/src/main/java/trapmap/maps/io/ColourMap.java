package trapmap.maps.io;

/**
 * Colour maps for map pictures: 256 opaque sRGB colours each, index 0 for the low end of the range.
 *
 * <p>Every map except {@link #GREY} is built here from a few anchor colours given in CIELAB (D65 white). The 256
 * entries are spaced at equal distances along the polyline through the anchors in L*a*b*, so the CIE76 colour
 * difference between neighbouring entries is the same along the whole map (up to 8-bit rounding); they are then
 * converted to sRGB. Every anchor and every point between them lies inside the sRGB gamut, so nothing is clipped.
 * On the sequential maps the anchors' lightness L* rises strictly, so lightness grows steadily with the value and a
 * picture stays readable in grey print. On the {@link #DIVERGING} map lightness is symmetric about the centre: its
 * two halves have mirrored anchor lightness and equal segment lengths in L*a*b*, so the centre anchor falls midway.
 *
 * <ul>
 *   <li>{@link #GREY}: black to white, linear in sRGB code values.</li>
 *   <li>{@link #BLUE_YELLOW}: dark blue through teal and green to yellow; the map to use for colour-blind viewers
 *       (its ends differ on the blue–yellow axis that deuteranopes and protanopes keep, and its lightness still
 *       rises under their simulated vision).</li>
 *   <li>{@link #HEAT}: dark violet through magenta-red and orange to pale yellow.</li>
 *   <li>{@link #SEA}: dark green through teal and cyan to white.</li>
 *   <li>{@link #DIVERGING}: blue, pale neutral centre, red; for differences and ratios about a central value.</li>
 * </ul>
 */
public enum ColourMap {
    GREY("Grey", "black to white, linear in sRGB code values", null, false),
    BLUE_YELLOW("Blue–yellow", "dark blue to yellow, lightness rising steadily; safe for colour-blind viewers",
            new double[][] {
                // L*, a*, b*
                {12, 18, -36},
                {32, 14, -47},
                {52, -22, -20},
                {72, -40, 32},
                {92, -14, 76},
            }, false),
    HEAT("Heat", "dark violet through red and orange to pale yellow, lightness rising steadily",
            new double[][] {
                {10, 28, -36},
                {30, 50, -42},
                {50, 58, 8},
                {70, 26, 58},
                {92, -4, 42},
            }, false),
    SEA("Sea", "dark green through teal and cyan to white, lightness rising steadily",
            new double[][] {
                {12, -17, 6},
                {32, -27, 3},
                {52, -29, -6},
                {72, -35, -17},
                {92, -12, -6},
                {98, 0, 0},
            }, false),
    DIVERGING("Blue–red diverging", "blue below and red above a pale centre, for differences and ratios",
            new double[][] {
                {30, 18, -50},
                {50, 6, -42},
                {70, -2, -24},
                {94, 0, 0},
                {70, 20, 13.5},
                {50, 36, 24.8},
                {30, 44, 36.7},
            }, true);

    private final String displayName;
    private final String description;
    private final boolean diverging;
    private final int[] rgb = new int[256];
    /** Largest amount by which an entry's linear sRGB channel left [0, 1] before clipping (0: none clipped). */
    private double gamutExcess;

    ColourMap(String displayName, String description, double[][] labAnchors, boolean diverging) {
        this.displayName = displayName;
        this.description = description;
        this.diverging = diverging;
        if (labAnchors == null) {
            for (int i = 0; i < 256; i++) {
                rgb[i] = (i << 16) | (i << 8) | i;
            }
            return;
        }
        int n = labAnchors.length;
        double[] cumulative = new double[n];
        for (int k = 1; k < n; k++) {
            cumulative[k] = cumulative[k - 1] + distance(labAnchors[k - 1], labAnchors[k]);
        }
        int k = 0;
        for (int i = 0; i < 256; i++) {
            double s = i / 255.0 * cumulative[n - 1];
            while (k < n - 2 && s > cumulative[k + 1]) {
                k++;
            }
            double f = (s - cumulative[k]) / (cumulative[k + 1] - cumulative[k]);
            double[] a = labAnchors[k];
            double[] b = labAnchors[k + 1];
            double[] lab = {a[0] + f * (b[0] - a[0]), a[1] + f * (b[1] - a[1]), a[2] + f * (b[2] - a[2])};
            rgb[i] = labToRgb(lab[0], lab[1], lab[2]);
            for (double c : labToLinearRgb(lab[0], lab[1], lab[2])) {
                gamutExcess = Math.max(gamutExcess, Math.max(c - 1, -c));
            }
        }
    }

    /** Largest amount by which an entry's linear sRGB channel left [0, 1] before clipping; 0 when none did. */
    double gamutExcess() {
        return gamutExcess;
    }

    /** Name for menus, e.g. {@code Blue–yellow}. */
    public String displayName() {
        return displayName;
    }

    /** One line saying what the map looks like and what it suits. */
    public String description() {
        return description;
    }

    /** True for a map whose centre is the neutral value (differences, ratios); false for a sequential map. */
    public boolean diverging() {
        return diverging;
    }

    /** True for the map meant for viewers with red–green colour-vision deficiency ({@link #BLUE_YELLOW}). */
    public boolean colourBlindSafe() {
        return this == BLUE_YELLOW;
    }

    /** The opaque colour (0xRRGGBB) of entry {@code index} in [0, 255]. */
    public int rgb(int index) {
        return rgb[index];
    }

    /** The colour for a position {@code t} in [0, 1] (clamped). */
    public int rgbAt(double t) {
        double c = t != t ? 0 : Math.max(0, Math.min(1, t));
        return rgb[roundHalfUp(c * 255)];
    }

    /**
     * {@link Math#round(double)} of x in [0, 255]: floor(x), plus one when the fraction is at least a half. For
     * non-negative x below 2⁵² the fraction x − ⌊x⌋ is exact, so this is the same integer, at a fraction of the cost
     * (it runs once per pixel of a picture).
     */
    static int roundHalfUp(double x) {
        int r = (int) x;
        return x - r >= 0.5 ? r + 1 : r;
    }

    private static double distance(double[] p, double[] q) {
        double dl = p[0] - q[0];
        double da = p[1] - q[1];
        double db = p[2] - q[2];
        return Math.sqrt(dl * dl + da * da + db * db);
    }

    /**
     * CIELAB (D65 white) to an sRGB 0xRRGGBB colour, channels clipped to the gamut. Lab inverse from CIE 15:2004
     * §8.2.1; XYZ to linear sRGB and the sRGB transfer function from IEC 61966-2-1:1999.
     */
    static int labToRgb(double l, double a, double bStar) {
        double[] c = labToLinearRgb(l, a, bStar);
        return (encode(c[0]) << 16) | (encode(c[1]) << 8) | encode(c[2]);
    }

    /** CIELAB (D65 white) to linear sRGB channels, not clipped. */
    static double[] labToLinearRgb(double l, double a, double bStar) {
        double fy = (l + 16) / 116;
        double fx = fy + a / 500;
        double fz = fy - bStar / 200;
        double x = 0.95047 * labInverse(fx);
        double y = labInverse(fy);
        double z = 1.08883 * labInverse(fz);
        double r = 3.2404542 * x - 1.5371385 * y - 0.4985314 * z;
        double g = -0.9692660 * x + 1.8760108 * y + 0.0415560 * z;
        double b = 0.0556434 * x - 0.2040259 * y + 1.0572252 * z;
        return new double[] {r, g, b};
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
