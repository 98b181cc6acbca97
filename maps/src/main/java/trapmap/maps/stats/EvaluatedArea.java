package trapmap.maps.stats;

import trapmap.maps.raster.Blocks;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.shared.check.Checks;

/**
 * The pixels a map's statistics, thresholds and regions use, with the counts reported beside them, found in one
 * parallel pass over fixed blocks of the map (instead of one pass per mask and per count).
 *
 * <p>With {@code area} the evaluated area (the wafer less the edge exclusion), and {@code valid} the pixels of the
 * summarised map that hold data (not NaN):
 * <ul>
 *   <li>{@link #evaluatedCount}: the pixels of {@code valid ∧ area} (without an outline: of {@code valid});</li>
 *   <li>{@link #belowLimitCount}: of them, those the conversion marks {@link PixelStatus#BELOW_LIMIT} (0 without a
 *       conversion);</li>
 *   <li>{@link #mask}: of them, those the conversion marks {@link PixelStatus#OK} (all of them without a
 *       conversion);</li>
 *   <li>{@link #invalid}: {@link InvalidArea#of} of the measured map over {@code area}.</li>
 * </ul>
 * Every figure is an integer count or a set of pixels, so it is the same whatever the split into blocks and threads.
 *
 * @param mask            the pixels the statistics use
 * @param evaluatedCount  pixels with data in the evaluated area, before the conversion's statuses are applied
 * @param belowLimitCount of those, the pixels below the conversion's detection limit
 * @param invalid         the invalid area of the measured map
 */
public record EvaluatedArea(Mask mask, int evaluatedCount, int belowLimitCount, InvalidArea invalid) {

    /**
     * The evaluated pixels and counts of one map.
     *
     * @param values        the summarised map (the trap density when converted, else the measured map)
     * @param measured      the measured map as read (the same raster as {@code values} when not converted)
     * @param area          the evaluated area: inside the wafer less the edge exclusion; null when no outline is
     *                      known, in which case the measured map's non-NaN pixels are the area for the invalid-area
     *                      counts and {@code valid} alone decides the mask
     * @param status        the conversion's status code of every pixel ({@link PixelStatus#code()}), or null when the
     *                      map was not converted
     * @param lifetimeFloor true for an effective-lifetime map in µs (see {@link InvalidArea#cause})
     * @param grid          the pixel grid
     */
    public static EvaluatedArea of(FloatRaster values, FloatRaster measured, Mask area, byte[] status,
                                   boolean lifetimeFloor, PixelGrid grid) {
        check(values, measured, area, status, grid);
        float[] v = values.samples();
        float[] m = measured.samples();
        int n = v.length;
        long[] areaWords = area == null ? null : area.words();
        long[] out = new long[Blocks.count(n, 64)];
        int blocks = Blocks.count(n, Mask.BLOCK_PX);
        // per block: evaluated, below limit, non-finite, non-positive, invalid conversion, area (integers: the sums
        // are the same whatever the split)
        int[][] counts = new int[blocks][];
        Blocks.run(blocks, n, b -> counts[b] = block(b * Mask.BLOCK_PX, (int) Math.min(n, (long) (b + 1) * Mask.BLOCK_PX),
                v, m, areaWords, status, lifetimeFloor, out));
        int[] sum = new int[6];
        for (int[] c : counts) {
            for (int k = 0; k < sum.length; k++) {
                sum[k] += c[k];
            }
        }
        return of(values, out, sum, grid);
    }

    /** The evaluated area from its mask words and the counts of {@link #block} added up. */
    static EvaluatedArea of(FloatRaster values, long[] words, int[] sum, PixelGrid grid) {
        return new EvaluatedArea(Mask.ofWords(values.width(), values.height(), words), sum[0], sum[1],
                new InvalidArea(sum[5], sum[2], sum[3], sum[4], grid.pixelAreaMm2()));
    }

    /** Refuses inputs of different sizes. */
    static void check(FloatRaster values, FloatRaster measured, Mask area, byte[] status, PixelGrid grid) {
        Checks.notNull(values, "values");
        Checks.notNull(measured, "measured");
        Checks.notNull(grid, "grid");
        if (area != null) {
            MapStatistics.checkSizes(measured, area, grid);
        }
        if (values.width() != measured.width() || values.height() != measured.height()
                || values.width() != grid.width() || values.height() != grid.height()) {
            throw new IllegalArgumentException("map " + values.width() + "x" + values.height()
                    + " does not match the measured map " + measured.width() + "x" + measured.height()
                    + " and the grid " + grid.width() + "x" + grid.height());
        }
        int n = values.samples().length;
        if (status != null && status.length != n) {
            throw new IllegalArgumentException(status.length + " status codes do not match the map "
                    + values.width() + "x" + values.height());
        }
    }

    /**
     * The pixels [from, end) of a map of {@code v.length} pixels, {@code from} a multiple of 64 (a block of
     * {@link Mask#BLOCK_PX} pixels, or less at the map's end), 64 at a time as bit words: writes their words of the
     * mask into {@code out} and returns their counts {evaluated, below limit, non-finite, non-positive, invalid
     * conversion, area}. Each unusable pixel counts under the first cause of {@link InvalidArea#cause} that applies.
     * (The caller bounds the block, so that the compiled code of a warm-up on a small map takes no other path.)
     */
    static int[] block(int from, int end, float[] v, float[] m, long[] areaWords, byte[] status, boolean lifetimeFloor,
                       long[] out) {
        byte ok = PixelStatus.OK.code();
        byte belowLimit = PixelStatus.BELOW_LIMIT.code();
        byte invalid = PixelStatus.INVALID.code();
        byte noData = PixelStatus.NO_DATA.code();
        int[] c = new int[6];
        for (int i = from; i < end; i += 64) {
            int len = Math.min(64, end - i);
            if (areaWords != null && areaWords[i >>> 6] == 0) {
                out[i >>> 6] = 0; // no pixel of the area (outside the wafer): nothing to count
                continue;
            }
            long valid = 0;      // the summarised map holds data
            long hasData = 0;    // the measured map is not NaN
            long finite = 0;     // the measured value is finite
            long positive = 0;   // ... and > 0
            long unusable = 0;   // ... and invalid for the conversion (status, or the lifetime floor without one)
            long okBits = 0;
            long belowBits = 0;
            for (int j = 0; j < len; j++) {
                float x = v[i + j];
                float y = m[i + j];
                valid |= (x == x ? 1L : 0L) << j;
                hasData |= (y == y ? 1L : 0L) << j;
                finite |= (Float.isFinite(y) ? 1L : 0L) << j;
                positive |= (y > 0 ? 1L : 0L) << j;
            }
            if (status == null) {
                if (lifetimeFloor) {
                    for (int j = 0; j < len; j++) {
                        unusable |= (m[i + j] < TrapDensityConverter.LIFETIME_FLOOR_US ? 1L : 0L) << j;
                    }
                }
            } else if (len == 64 && allOk(status, i)) {
                okBits = -1L; // the usual word inside the wafer: every status OK
            } else {
                for (int j = 0; j < len; j++) {
                    byte s = status[i + j];
                    okBits |= (s == ok ? 1L : 0L) << j;
                    belowBits |= (s == belowLimit ? 1L : 0L) << j;
                    unusable |= (s == invalid || s == noData ? 1L : 0L) << j;
                }
            }
            long inArea = areaWords == null ? hasData : areaWords[i >>> 6];
            long word = areaWords == null ? valid : valid & inArea;
            c[5] += Long.bitCount(inArea);
            c[2] += Long.bitCount(inArea & ~finite);
            c[3] += Long.bitCount(inArea & finite & ~positive);
            c[4] += Long.bitCount(inArea & finite & positive & unusable);
            c[0] += Long.bitCount(word);
            if (status != null) {
                c[1] += Long.bitCount(word & belowBits);
                word &= okBits;
            }
            out[i >>> 6] = word;
        }
        return c;
    }

    /** Eight status codes at a time, read as one little-endian long. */
    private static final java.lang.invoke.VarHandle STATUS_LONGS = java.lang.invoke.MethodHandles.byteArrayViewVarHandle(
            long[].class, java.nio.ByteOrder.LITTLE_ENDIAN);
    /** Eight {@link PixelStatus#OK} codes side by side. */
    private static final long ALL_OK = (PixelStatus.OK.code() & 0xffL) * 0x0101010101010101L;

    /** True when the 64 status codes from {@code i} on are all {@link PixelStatus#OK}. */
    private static boolean allOk(byte[] status, int i) {
        long differ = 0;
        for (int k = 0; k < 64; k += 8) {
            differ |= (long) STATUS_LONGS.get(status, i + k) ^ ALL_OK;
        }
        return differ == 0;
    }
}
