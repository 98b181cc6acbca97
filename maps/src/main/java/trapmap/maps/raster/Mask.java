package trapmap.maps.raster;

import java.util.BitSet;
import java.util.function.IntPredicate;

/** A set of pixels of a raster of known size, for statistics, regions and exclusions. Immutable. */
public final class Mask {
    private final int width;
    private final int height;
    private final BitSet bits;

    private Mask(int width, int height, BitSet bits) {
        this.width = width;
        this.height = height;
        this.bits = bits;
    }

    /** Pixels per block when a large mask is built or read in parallel: a whole number of 64-bit words. */
    public static final int BLOCK_PX = 1 << 16;

    /**
     * The pixels whose index satisfies {@code test}. A large mask is built in blocks on all cores, so {@code test}
     * must be a pure function of the index (it may be called from several threads, in any order).
     */
    public static Mask of(int width, int height, IntPredicate test) {
        int n = width * height;
        long[] words = new long[Blocks.count(n, 64)];
        Blocks.run(Blocks.count(n, BLOCK_PX), n, b -> {
            int end = (int) Math.min(n, (long) (b + 1) * BLOCK_PX);
            for (int i = b * BLOCK_PX; i < end; i += 64) {
                long word = 0;
                for (int j = 0, m = Math.min(64, end - i); j < m; j++) {
                    if (test.test(i + j)) {
                        word |= 1L << j;
                    }
                }
                words[i >>> 6] = word;
            }
        });
        return new Mask(width, height, BitSet.valueOf(words));
    }

    /** Sets bits {@code [from, to)} of {@code words} (pixel i is bit i % 64 of word i / 64), whole words at a time. */
    public static void setRange(long[] words, int from, int to) {
        if (from >= to) {
            return;
        }
        int first = from >>> 6;
        int last = (to - 1) >>> 6;
        long head = -1L << from; // shifts take the bit index modulo 64
        long tail = -1L >>> -to;
        if (first == last) {
            words[first] |= head & tail;
            return;
        }
        words[first] |= head;
        java.util.Arrays.fill(words, first + 1, last, -1L);
        words[last] |= tail;
    }

    /**
     * The mask whose bits are {@code words} (pixel i is bit i % 64 of word i / 64, as {@link #words()} gives them);
     * bits beyond width × height must be clear.
     */
    public static Mask ofWords(int width, int height, long[] words) {
        if (words.length != Blocks.count((long) width * height, 64)) {
            throw new IllegalArgumentException(words.length + " words do not hold a " + width + "x" + height
                    + " mask");
        }
        return new Mask(width, height, BitSet.valueOf(words));
    }

    /**
     * The pixels as 64-bit words, ⌈width·height / 64⌉ of them: pixel i is bit i % 64 of word i / 64. A copy, for
     * fast passes over large masks.
     */
    public long[] words() {
        long[] w = bits.toLongArray();
        return w.length == Blocks.count((long) width * height, 64) ? w
                : java.util.Arrays.copyOf(w, Blocks.count((long) width * height, 64));
    }

    /** Every pixel. */
    public static Mask all(int width, int height) {
        BitSet b = new BitSet(width * height);
        b.set(0, width * height);
        return new Mask(width, height, b);
    }

    /** The pixels of {@code raster} that hold data (not NaN). */
    public static Mask valid(FloatRaster raster) {
        float[] s = raster.samples();
        int n = s.length;
        long[] words = new long[Blocks.count(n, 64)];
        Blocks.run(Blocks.count(n, BLOCK_PX), n, b -> {
            int end = (int) Math.min(n, (long) (b + 1) * BLOCK_PX);
            for (int i = b * BLOCK_PX; i < end; i += 64) {
                long word = 0;
                for (int j = 0, m = Math.min(64, end - i); j < m; j++) {
                    float v = s[i + j];
                    word |= (v == v ? 1L : 0L) << j;
                }
                words[i >>> 6] = word;
            }
        });
        return new Mask(raster.width(), raster.height(), BitSet.valueOf(words));
    }

    public int width() {
        return width;
    }

    public int height() {
        return height;
    }

    public boolean contains(int x, int y) {
        return x >= 0 && y >= 0 && x < width && y < height && bits.get(y * width + x);
    }

    /** True when pixel index {@code i} (row-major) is in the mask. */
    public boolean containsIndex(int i) {
        return bits.get(i);
    }

    /** Number of pixels in the mask. */
    public int count() {
        return bits.cardinality();
    }

    public Mask and(Mask other) {
        checkSize(other);
        BitSet b = (BitSet) bits.clone();
        b.and(other.bits);
        return new Mask(width, height, b);
    }

    public Mask or(Mask other) {
        checkSize(other);
        BitSet b = (BitSet) bits.clone();
        b.or(other.bits);
        return new Mask(width, height, b);
    }

    /** The pixels not in this mask. */
    public Mask not() {
        BitSet b = (BitSet) bits.clone();
        b.flip(0, width * height);
        return new Mask(width, height, b);
    }

    /**
     * The edge of this mask: its pixels with a 4-neighbour outside it or on the raster's border, so that drawing
     * them outlines every region (holes included) one pixel wide, inside the region.
     */
    public Mask edge() {
        return new Mask(width, height, edgePixels(bits, width, height));
    }

    /**
     * The edge pixels of a pixel set given as bits (index {@code y * width + x}): set pixels with a 4-neighbour not
     * set, or on the border of the {@code width} × {@code height} raster. Runs in time proportional to the set pixels.
     */
    public static BitSet edgePixels(BitSet pixels, int width, int height) {
        if (width < 1 || height < 1) {
            throw new IllegalArgumentException("raster size must be at least 1x1 px but was " + width + "x" + height
                    + " px");
        }
        int n = width * height;
        BitSet e = new BitSet(n);
        for (int i = pixels.nextSetBit(0); i >= 0 && i < n; i = pixels.nextSetBit(i + 1)) {
            int x = i % width;
            int y = i / width;
            if (x == 0 || y == 0 || x == width - 1 || y == height - 1 || !pixels.get(i - 1) || !pixels.get(i + 1)
                    || !pixels.get(i - width) || !pixels.get(i + width)) {
                e.set(i);
            }
        }
        return e;
    }

    /** Index of the next pixel in the mask at or after {@code from}, or -1. */
    public int nextIndex(int from) {
        return bits.nextSetBit(from);
    }

    private void checkSize(Mask o) {
        if (o.width != width || o.height != height) {
            throw new IllegalArgumentException("mask " + o.width + "x" + o.height + " does not match " + width + "x"
                    + height);
        }
    }
}
