package trapmap.viewer.ui.canvas;

import trapmap.maps.io.ColourMap;
import trapmap.viewer.graphics.Categories;
import trapmap.viewer.graphics.DisplayStyle;

/**
 * Turns samples into opaque colours for one {@link DisplayStyle}: value → position t in [0, 1] on a linear or
 * logarithmic scale between {@code low} and {@code high} (clamped), t → one of the 256 colour-map entries; or, for a
 * map of categories, value → its category's colour ({@link Categories}). Samples without data (NaN, and values ≤ 0 on
 * a log scale) take {@link #noDataRgb}.
 */
final class Colouring {
    private final int[] lut = new int[256];
    private final boolean log;
    private final double offset;
    private final double scale;
    private final int noData;
    /** Log scale: the value from which each entry starts (entry i for bounds[i-1] ≤ v < bounds[i]); +∞ padded. */
    private final double[] bounds;
    /**
     * Log scale: for each bucket of positive floats sharing their top bits (sign, exponent, {@value #BUCKET_BITS}
     * mantissa bits), the entry of the bucket's smallest value; a value then only steps over the few bounds inside
     * its bucket. Covers the buckets from {@code low} to {@code high}.
     */
    private final int[] bucketEntry;
    private final int firstBucket;
    /** The categories' colours, or null for a continuous scale. */
    private final Categories categories;
    static final int BUCKET_BITS = 10;
    private static final int BUCKET_SHIFT = 23 - BUCKET_BITS;

    Colouring(DisplayStyle style) {
        this(style, null);
    }

    /** A colouring by {@code categories} (null: by {@code style}'s continuous scale). */
    Colouring(DisplayStyle style, Categories categories) {
        this.categories = categories;
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
        if (log) {
            // entry i covers positions p in [i - 0.5, i + 0.5): searching these bounds avoids a logarithm per pixel
            bounds = new double[256];
            for (int k = 0; k < 255; k++) {
                bounds[k] = Math.exp(offset + (k + 0.5) / scale);
            }
            bounds[255] = Double.POSITIVE_INFINITY;
            firstBucket = Float.floatToRawIntBits((float) style.low()) >>> BUCKET_SHIFT;
            int lastBucket = Float.floatToRawIntBits(Math.nextUp((float) style.high())) >>> BUCKET_SHIFT;
            bucketEntry = new int[lastBucket - firstBucket + 1];
            for (int j = 0, i = 0; j < bucketEntry.length; j++) {
                float start = Float.intBitsToFloat((firstBucket + j) << BUCKET_SHIFT);
                while (start >= bounds[i]) {
                    i++;
                }
                bucketEntry[j] = i;
            }
        } else {
            bounds = null;
            bucketEntry = null;
            firstBucket = 0;
        }
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
        if (categories != null) {
            return categories.rgb(v, noData);
        }
        if (log) {
            if (!(v > 0)) {
                return noData; // also NaN
            }
            return lut[logEntry((float) v)];
        }
        if (!(v == v)) {
            return noData;
        }
        double p = (v - offset) * scale;
        int i = p <= 0 ? 0 : p >= 255 ? 255 : (int) (p + 0.5);
        return lut[i];
    }

    /** Entry for a positive value on the log scale. */
    private int logEntry(float v) {
        int j = (Float.floatToRawIntBits(v) >>> BUCKET_SHIFT) - firstBucket;
        if (j < 0) {
            return 0;
        }
        if (j >= bucketEntry.length) {
            return 255;
        }
        int i = bucketEntry[j];
        while (v >= bounds[i]) {
            i++;
        }
        return i;
    }

    /** Colours the {@code w}×{@code h} block at ({@code x0}, {@code y0}) of a row-major {@code src} into {@code out}. */
    void colourise(float[] src, int srcWidth, int x0, int y0, int w, int h, int[] out) {
        for (int y = 0; y < h; y++) {
            int s = (y0 + y) * srcWidth + x0;
            int o = y * w;
            if (log && categories == null) {
                for (int x = 0; x < w; x++) {
                    float v = src[s + x];
                    out[o + x] = v > 0 ? lut[logEntry(v)] : noData;
                }
            } else {
                for (int x = 0; x < w; x++) {
                    out[o + x] = rgb(src[s + x]);
                }
            }
        }
    }
}
