package trapmap.maps.io;

import java.awt.image.BufferedImage;
import java.awt.image.DataBufferInt;
import java.io.IOException;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Iterator;
import javax.imageio.IIOImage;
import javax.imageio.ImageIO;
import javax.imageio.ImageWriter;
import javax.imageio.stream.FileImageOutputStream;
import javax.imageio.stream.ImageOutputStream;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.shared.error.InvalidValueException;

/**
 * Draws maps as 8-bit RGBA pictures (PNG). Not quantitative: for reports and quick looks. The colour range is the
 * style's, or by default the 1st to 99th percentile of the valid pixels (estimated from at most 2²⁰ evenly spaced
 * valid pixels); values outside are drawn with the end colours. Pixels without data, and pixels ≤ 0 on a log scale,
 * are transparent.
 */
final class PngMaps {
    private static final int SAMPLE_LIMIT = 1 << 20;

    private PngMaps() {
    }

    /** True when {@code style} draws {@code map} on a log scale. */
    static boolean logScale(WaferMap map, PngStyle style) {
        return style.scale() == PngStyle.Scale.LOG
                || (style.scale() == PngStyle.Scale.AUTO && map.quantity().logarithmic());
    }

    /** The picture of a map (TYPE_INT_ARGB). */
    static BufferedImage render(WaferMap map, PngStyle style) {
        boolean log = logScale(map, style);
        return render(map, style, log, range(map.raster().samples(), log, style));
    }

    private static BufferedImage render(WaferMap map, PngStyle style, boolean log, double[] range) {
        double lo = log ? Math.log10(range[0]) : range[0];
        double hi = log ? Math.log10(range[1]) : range[1];
        double span = hi - lo;
        int w = map.width();
        int h = map.height();
        float[] s = map.raster().samples();
        BufferedImage img = new BufferedImage(w, h, BufferedImage.TYPE_INT_ARGB);
        // drawn straight into the picture's pixels (non-premultiplied ARGB, as setRGB would store them)
        int[] argb = ((DataBufferInt) img.getRaster().getDataBuffer()).getData();
        ColourMap colours = style.colours();
        // row by row, a small method per row: HotSpot compiles it once, instead of compiling this whole method while
        // a loop over every pixel runs (on-stack replacement) and again at its next call
        if (log && span > 0 && argb.length >= TABLE_PIXELS) {
            LogColours table = new LogColours(logBounds(lo, span));
            for (int y = 0; y < h; y++) {
                logRow(s, argb, y * w, y * w + w, table, colours);
            }
            return img;
        }
        for (int y = 0; y < h; y++) {
            row(s, argb, y * w, y * w + w, log, lo, span, colours);
        }
        return img;
    }

    /** The colours of the pixels {@code s[from..to)} on a log scale, from {@code table}; invalid ones left alone. */
    private static void logRow(float[] s, int[] argb, int from, int to, LogColours table, ColourMap colours) {
        for (int i = from; i < to; i++) {
            float v = s[i];
            if (valid(v, true)) {
                argb[i] = 0xFF000000 | colours.rgb(table.index(Float.floatToRawIntBits(v)));
            }
        }
    }

    /** The colours of the pixels {@code s[from..to)} over [lo, lo + span]; invalid ones left alone (transparent). */
    private static void row(float[] s, int[] argb, int from, int to, boolean log, double lo, double span,
                            ColourMap colours) {
        for (int i = from; i < to; i++) {
            float v = s[i];
            if (!valid(v, log)) {
                continue; // transparent
            }
            double t = span > 0 ? ((log ? Math.log10(v) : v) - lo) / span : 0.5;
            argb[i] = 0xFF000000 | colours.rgbAt(t);
        }
    }

    /** Pictures of at least this many pixels on a log scale take their colours from {@link #logBounds}. */
    static final int TABLE_PIXELS = 1 << 15;

    /**
     * The colour index {@link ColourMap#rgbAt} gives a positive finite value {@code v} on a log scale from
     * {@code lo} over {@code span} (log10 units).
     */
    static int logIndex(float v, double lo, double span) {
        double t = (Math.log10(v) - lo) / span;
        double c = t != t ? 0 : Math.max(0, Math.min(1, t));
        return ColourMap.roundHalfUp(c * 255);
    }

    /**
     * For each colour index j (0–255) the bits ({@link Float#floatToRawIntBits}) of the smallest positive finite
     * float whose {@link #logIndex} is at least j ({@code 0x7F800000}, +∞, when none is). The index is a
     * non-decreasing function of the value (log10 is semi-monotonic, and the arithmetic, clamping and rounding that
     * follow keep the order), and the bits of positive floats ascend with their values, so bisection over the bits
     * finds each bound exactly, and a value's index is the number of bounds above 0 at or below its bits: the colour
     * of {@code 1 + 255} bisections of about 31 steps instead of one logarithm per pixel.
     */
    static int[] logBounds(double lo, double span) {
        int[] bounds = new int[256];
        int from = 1; // the smallest positive float
        for (int j = 0; j < bounds.length; j++) {
            from = logBound(j, from, lo, span);
            bounds[j] = from;
        }
        return bounds;
    }

    /**
     * The bits of the smallest positive finite float at or above the bits {@code from} whose {@link #logIndex} is at
     * least {@code j} ({@code 0x7F800000}, +∞, when none is): a method of its own so that HotSpot compiles it once by
     * its calls instead of {@link #logBounds} while its loops run. The index does not decrease with the bits, so that
     * float is the one a bisection over all bits from {@code from} up finds; it is found the same way within a
     * bracket around the float where the index reaches j on the scale ({@code 10^(lo + span (j - ½) / 255)}), widened
     * from there in doubling steps until the index changes across it: a few logarithms instead of about 31.
     */
    private static int logBound(int j, int from, double lo, double span) {
        final int inf = Float.floatToRawIntBits(Float.POSITIVE_INFINITY);
        long guess = Float.floatToRawIntBits((float) Math.pow(10, lo + span * (j - 0.5) / 255));
        guess = Math.max(from, Math.min(inf - 1L, guess));
        long a; // every float below a (and at or above from) has an index below j
        long b; // the index at b is at least j, or b is +∞
        if (logIndex(Float.intBitsToFloat((int) guess), lo, span) >= j) {
            b = guess;
            a = from;
            for (long step = 1; guess - step > from; step *= 2) {
                if (logIndex(Float.intBitsToFloat((int) (guess - step)), lo, span) < j) {
                    a = guess - step + 1;
                    break;
                }
                b = guess - step;
            }
        } else {
            a = guess + 1;
            b = inf;
            for (long step = 1; guess + step < inf; step *= 2) {
                if (logIndex(Float.intBitsToFloat((int) (guess + step)), lo, span) >= j) {
                    b = guess + step;
                    break;
                }
                a = guess + step + 1;
            }
        }
        return bisect(j, (int) a, (int) b, lo, span);
    }

    /**
     * The bits of the smallest float in [a, b) whose {@link #logIndex} is at least j, or b (bits ascending with the
     * values; the index non-decreasing in them).
     */
    static int bisect(int j, int a, int b, double lo, double span) {
        while (a < b) {
            int mid = a + (b - a) / 2;
            if (logIndex(Float.intBitsToFloat(mid), lo, span) >= j) {
                b = mid;
            } else {
                a = mid + 1;
            }
        }
        return a;
    }

    /** The colour index of a positive finite float's bits: the largest j with {@code bounds[j] <= bits}. */
    static int colourIndex(int[] bounds, int bits) {
        int k = 0;
        for (int step = 128; step > 0; step >>= 1) {
            if (bounds[k + step] <= bits) {
                k += step;
            }
        }
        return k;
    }

    /**
     * {@link #colourIndex} through a table of the starting index of each group of 2¹⁶ consecutive float bit patterns
     * (sign, exponent and the top 7 bits of the significand: about 0.8 % of a value): a value's index is at least the
     * index of its group's first pattern, and the bounds ahead of it are passed one by one, seldom more than one.
     * Replaces the 8 unpredictable branches of the bisection per pixel by a load and a comparison or two. The table
     * covers the groups from that of {@code bounds[1]} to that of {@code bounds[255]} (a few hundred to a few thousand
     * groups for a colour range of a few decades); below it the index starts at 0, above it is 255.
     */
    static final class LogColours {
        private static final int SHIFT = 16;
        private final int[] bounds;
        private final int first;
        private final int last;
        private final byte[] start;

        LogColours(int[] bounds) {
            this.bounds = bounds;
            int top = Float.floatToRawIntBits(Float.MAX_VALUE);
            this.first = bounds[1] >>> SHIFT;
            this.last = Math.min(bounds[255], top) >>> SHIFT;
            this.start = new byte[Math.max(0, last - first + 1)];
            int k = 0;
            for (int g = first; g <= last; g++) {
                int bits = g << SHIFT;
                while (k < 255 && bounds[k + 1] <= bits) {
                    k++;
                }
                start[g - first] = (byte) k;
            }
        }

        /** The colour index of a positive finite float's bits, as {@link #colourIndex}. */
        int index(int bits) {
            int g = bits >>> SHIFT;
            if (g > last) {
                return 255; // past the group of bounds[255], so at or above it
            }
            int k = g < first ? 0 : start[g - first] & 0xFF;
            while (k < 255 && bounds[k + 1] <= bits) {
                k++;
            }
            return k;
        }
    }

    /** The colour range [min, max] in data units. */
    static double[] range(float[] s, boolean log, PngStyle style) {
        double min = style.min();
        double max = style.max();
        if (log && ((!Double.isNaN(min) && !(min > 0)) || (!Double.isNaN(max) && !(max > 0)))) {
            throw new InvalidValueException("range", "", "a log scale needs a colour range above 0 but was ["
                    + min + ", " + max + "]");
        }
        if (Double.isNaN(min) || Double.isNaN(max)) {
            double[] p = percentiles(s, log);
            min = Double.isNaN(min) ? p[0] : min;
            max = Double.isNaN(max) ? p[1] : max;
        }
        if (!(max >= min)) {
            max = min;
        }
        return new double[] {min, max};
    }

    private static boolean valid(float v, boolean log) {
        return Float.isFinite(v) && (!log || v > 0);
    }

    /** 1st and 99th percentile of the valid samples; {1, 1} when there are none. */
    private static double[] percentiles(float[] s, boolean log) {
        int valid = 0;
        for (float v : s) {
            if (valid(v, log)) {
                valid++;
            }
        }
        if (valid == 0) {
            return new double[] {1, 1};
        }
        int stride = Math.max(1, (valid + SAMPLE_LIMIT - 1) / SAMPLE_LIMIT);
        float[] pick = new float[(valid + stride - 1) / stride];
        int n = 0;
        int k = 0;
        for (float v : s) {
            if (valid(v, log)) {
                if (k++ % stride == 0 && n < pick.length) {
                    pick[n++] = v;
                }
            }
        }
        Arrays.sort(pick, 0, n);
        return new double[] {pick[(int) Math.floor(0.01 * (n - 1))], pick[(int) Math.ceil(0.99 * (n - 1))]};
    }

    /**
     * The picture written to a {@code .png} file: the map with its colour bar (range and unit) and a caption strip
     * ({@link Caption#of}), see {@link CaptionedPicture#compose}.
     */
    static BufferedImage captioned(WaferMap map, PngStyle style) {
        boolean log = logScale(map, style);
        double[] range = range(map.raster().samples(), log, style);
        Caption caption = Caption.of(map);
        boolean codes = map.quantity() == Quantity.STATUS || map.quantity() == Quantity.IDENTIFICATION_STATUS;
        return CaptionedPicture.compose(render(map, style, log, range), new CaptionedPicture.ColourBar(style.colours(), range[0],
                range[1], log, caption.quantityWithUnit(), codes), caption);
    }

    static void write(WaferMap map, Path target, PngStyle style) throws IOException {
        BufferedImage img = captioned(map, style);
        ImageWriter writer = null;
        for (Iterator<ImageWriter> it = ImageIO.getImageWritersByFormatName("png"); it.hasNext();) {
            ImageWriter w = it.next();
            if (writer == null && w.getClass().getName().startsWith("com.sun.imageio.plugins.png")) {
                writer = w;
            } else {
                w.dispose();
            }
        }
        if (writer == null) {
            throw new IOException("the JDK PNG writer is not available in this Java runtime");
        }
        try (ImageOutputStream out = new FileImageOutputStream(target.toFile())) {
            writer.setOutput(out);
            writer.write(new IIOImage(img, null, null));
        } finally {
            writer.dispose();
        }
    }
}
