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
        if (!Double.isFinite(threshold)) {
            BitSet b = new BitSet(n);
            for (int i = 0; i < n; i++) {
                if (above ? s[i] > threshold : s[i] < threshold) {
                    if (mask == null || mask.containsIndex(i)) {
                        b.set(i);
                    }
                }
            }
            return b;
        }
        // for a float v: v > t exactly when v ≥ the smallest float above t, v < t when v ≤ the largest float below
        float f = (float) threshold;
        float up = f > threshold ? f : Math.nextUp(f);
        float down = f < threshold ? f : Math.nextDown(f);
        long[] words = new long[(n + 63) >>> 6];
        int chunks = (n + CHUNK - 1) / CHUNK;
        IntStream.range(0, chunks).parallel().forEach(c -> {
            int from = c * CHUNK;
            int to = Math.min(n, from + CHUNK);
            for (int base = from; base < to; base += 64) {
                int end = Math.min(to, base + 64);
                // branch-free float comparisons (false for NaN): noisy maps would defeat branch prediction
                long word = 0;
                if (above) {
                    for (int i = base; i < end; i++) {
                        word |= (s[i] >= up ? 1L : 0L) << (i - base);
                    }
                } else {
                    for (int i = base; i < end; i++) {
                        word |= (s[i] <= down ? 1L : 0L) << (i - base);
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
     * Copies bits [{@code start}, {@code start + len}) of a bit set's words into {@code out} so that bit 0 of
     * {@code out[0]} is bit {@code start}; returns false when they are all clear.
     */
    static boolean extract(long[] words, long start, int len, long[] out) {
        int n = (len + 63) >>> 6;
        long any = 0;
        for (int i = 0; i < n; i++) {
            long bit = start + 64L * i;
            int wi = (int) (bit >>> 6);
            int sh = (int) (bit & 63);
            long lo = wi < words.length ? words[wi] >>> sh : 0;
            long hi = sh == 0 || wi + 1 >= words.length ? 0 : words[wi + 1] << (64 - sh);
            long v = lo | hi;
            int rest = len - 64 * i;
            if (rest < 64) {
                v &= (1L << rest) - 1;
            }
            out[i] = v;
            any |= v;
        }
        return any != 0;
    }

    /**
     * Fraction of flagged map pixels in each level-{@code level} pixel of the block at ({@code x0}, {@code y0}) of
     * {@code w}×{@code h} level pixels (one entry of a flagged-fraction pyramid); false when none is flagged (then
     * {@code out} is left unspecified). Reads each map row of the block once, 64 pixels at a time.
     */
    static boolean fractions(long[] words, int mapWidth, int mapHeight, int level, int x0, int y0, int w, int h,
                             float[] out) {
        int f = 1 << level;
        int mx0 = x0 * f;
        int mx1 = Math.min(mapWidth, (x0 + w) * f);
        int len = mx1 - mx0;
        long[] row = new long[(len + 63) >>> 6];
        int[] counts = new int[w];
        boolean any = false;
        for (int y = 0; y < h; y++) {
            int my0 = (y0 + y) * f;
            int my1 = Math.min(mapHeight, my0 + f);
            java.util.Arrays.fill(counts, 0);
            boolean rowAny = false;
            for (int my = my0; my < my1; my++) {
                if (!extract(words, (long) my * mapWidth + mx0, len, row)) {
                    continue;
                }
                rowAny = true;
                if (f < 64) {
                    long mask = (1L << f) - 1;
                    for (int k = 0; k < w; k++) {
                        int b = k * f;
                        long word = row[b >>> 6];
                        if (word != 0) {
                            counts[k] += Long.bitCount((word >>> (b & 63)) & mask);
                        }
                    }
                } else {
                    int per = f >>> 6;
                    for (int k = 0; k < w; k++) {
                        int c = 0;
                        for (int j = k * per, end = Math.min(row.length, j + per); j < end; j++) {
                            c += Long.bitCount(row[j]);
                        }
                        counts[k] += c;
                    }
                }
            }
            for (int k = 0; k < w; k++) {
                int cw = Math.min(f, mapWidth - (x0 + k) * f);
                out[y * w + k] = rowAny ? (float) counts[k] / (cw * (my1 - my0)) : 0;
                any |= rowAny && counts[k] != 0;
            }
        }
        return any;
    }
}
