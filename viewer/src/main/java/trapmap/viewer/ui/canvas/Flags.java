package trapmap.viewer.ui.canvas;

import java.util.BitSet;
import java.util.stream.IntStream;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;

/** Flagging pixels against a threshold, and counting flagged pixels per block for the low-zoom tint. */
final class Flags {
    private Flags() {
    }

    /** Pixels per parallel chunk: a multiple of 64 so chunks fill whole words of the bit set. */
    private static final int CHUNK = 64 * 4096;

    /** See {@link MapCanvas#flag}. */
    static BitSet flag(FloatRaster r, Mask mask, double threshold, boolean above) {
        if (mask != null && (mask.width() != r.width() || mask.height() != r.height())) {
            throw new IllegalArgumentException("mask " + mask.width() + "x" + mask.height() + " does not match map "
                    + r.width() + "x" + r.height());
        }
        float[] s = r.samples();
        int n = s.length;
        long[] words = new long[(n + 63) >>> 6];
        int chunks = (n + CHUNK - 1) / CHUNK;
        IntStream.range(0, chunks).parallel().forEach(c -> {
            int from = c * CHUNK;
            int to = Math.min(n, from + CHUNK);
            for (int base = from; base < to; base += 64) {
                int end = Math.min(to, base + 64);
                long word = 0;
                for (int i = base; i < end; i++) {
                    float v = s[i];
                    boolean hit = above ? v > threshold : v < threshold; // false for NaN
                    if (hit) {
                        word |= 1L << (i - base);
                    }
                }
                if (word != 0 && mask != null) {
                    for (long rest = word; rest != 0; rest &= rest - 1) {
                        int b = Long.numberOfTrailingZeros(rest);
                        if (!mask.containsIndex(base + b)) {
                            word &= ~(1L << b);
                        }
                    }
                }
                words[base >>> 6] = word;
            }
        });
        return BitSet.valueOf(words);
    }

    /** Number of set bits in [{@code from}, {@code from + len}) of the words of a bit set. */
    static int countBits(long[] words, long from, int len) {
        int n = 0;
        long to = from + len;
        while (from < to) {
            int wi = (int) (from >>> 6);
            if (wi >= words.length) {
                break;
            }
            int bit = (int) (from & 63);
            int take = (int) Math.min(64 - bit, to - from);
            long word = words[wi] >>> bit;
            if (take < 64) {
                word &= (1L << take) - 1;
            }
            n += Long.bitCount(word);
            from += take;
        }
        return n;
    }

    /**
     * Fraction of flagged map pixels in each level-{@code level} pixel of the block at ({@code x0}, {@code y0}) of
     * {@code w}×{@code h} level pixels; false when none is flagged (then {@code out} is left unspecified).
     */
    static boolean fractions(long[] words, int mapWidth, int mapHeight, int level, int x0, int y0, int w, int h,
                             float[] out) {
        int f = 1 << level;
        boolean any = false;
        for (int y = 0; y < h; y++) {
            int my0 = (y0 + y) * f;
            int my1 = Math.min(mapHeight, my0 + f);
            for (int x = 0; x < w; x++) {
                int mx0 = (x0 + x) * f;
                int mx1 = Math.min(mapWidth, mx0 + f);
                int count = 0;
                for (int my = my0; my < my1; my++) {
                    count += countBits(words, (long) my * mapWidth + mx0, mx1 - mx0);
                }
                float frac = count == 0 ? 0 : (float) count / ((my1 - my0) * (mx1 - mx0));
                out[y * w + x] = frac;
                any |= count != 0;
            }
        }
        return any;
    }
}
