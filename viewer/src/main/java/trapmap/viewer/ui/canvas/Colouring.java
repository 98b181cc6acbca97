package trapmap.viewer.ui.canvas;

import trapmap.maps.io.ColourMap;

/**
 * Turns samples into opaque colours for one {@link DisplayStyle}: value → position t in [0, 1] on a linear or
 * logarithmic scale between {@code low} and {@code high} (clamped), t → one of the 256 colour-map entries. Samples
 * without data (NaN, and values ≤ 0 on a log scale) take {@link #noDataRgb}.
 */
final class Colouring {
    private final int[] lut = new int[256];
    private final boolean log;
    private final double offset;
    private final double scale;
    private final int noData;

    Colouring(DisplayStyle style) {
        ColourMap cm = style.colours();
        for (int i = 0; i < 256; i++) {
            lut[i] = cm.rgb(i);
        }
        log = style.logarithmic();
        double lo = log ? Math.log(style.low()) : style.low();
        double hi = log ? Math.log(style.high()) : style.high();
        offset = lo;
        scale = 255 / (hi - lo);
        noData = noDataRgb(cm);
    }

    /**
     * Colour of pixels without data: a mid-dark neutral grey, unlike any entry of the coloured maps; on the grey map
     * (where grey is data) a dark violet.
     */
    static int noDataRgb(ColourMap cm) {
        return cm == ColourMap.GREY ? 0x3C2450 : 0x505050;
    }

    int noData() {
        return noData;
    }

    /** The colour of one value (0xRRGGBB). */
    int rgb(double v) {
        if (!(v == v) || (log && !(v > 0))) {
            return noData;
        }
        double p = ((log ? Math.log(v) : v) - offset) * scale;
        int i = p <= 0 ? 0 : p >= 255 ? 255 : (int) (p + 0.5);
        return lut[i];
    }

    /** Colours the {@code w}×{@code h} block at ({@code x0}, {@code y0}) of a row-major {@code src} into {@code out}. */
    void colourise(float[] src, int srcWidth, int x0, int y0, int w, int h, int[] out) {
        for (int y = 0; y < h; y++) {
            int s = (y0 + y) * srcWidth + x0;
            int o = y * w;
            for (int x = 0; x < w; x++) {
                out[o + x] = rgb(src[s + x]);
            }
        }
    }
}
