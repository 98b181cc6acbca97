package trapmap.maps.batch;

import java.util.BitSet;
import java.util.function.DoubleUnaryOperator;
import trapmap.maps.raster.PixelGrid;

/**
 * Where one wafer was evaluated and where it was flagged, on cells of {@code pitchMm} in wafer coordinates (mm,
 * origin at the wafer centre, y up). Cell (i, j) covers x in [(i − ½)·pitch, (i + ½)·pitch), likewise y; cells are
 * stored row by row from (minI, minJ). A cell holds a pixel whose centre lies in it; where the pixels are larger than
 * the cells, a pixel is held also by every cell whose centre lies in the pixel's square, so that the cells of a
 * region touch whatever the pitch (at or below the cell size this adds no cell).
 *
 * @param family  wafers of one family (outline format) share a recurrence map
 * @param pitchMm cell size, mm
 * @param minI    first cell column
 * @param minJ    first cell row
 * @param width   cell columns
 * @param height  cell rows
 * @param covered cells holding at least one evaluated pixel
 * @param flagged cells holding at least one pixel of a flagged region
 */
public record Footprint(String family, double pitchMm, int minI, int minJ, int width, int height, BitSet covered,
                        BitSet flagged) {
    /** Cell size of the recurrence footprint, mm. */
    public static final double PITCH_MM = 1.0;

    /**
     * The footprint of one wafer: the {@link #PITCH_MM} cells holding an evaluated pixel ({@code indices[0..count)},
     * ascending), and those holding a flagged one ({@code flagged}: pixel indices, all of them evaluated).
     */
    static Footprint of(String family, PixelGrid grid, int[] indices, int count, BitSet flagged) {
        return of(family, grid, indices, count, flagged, PITCH_MM);
    }

    /** As {@link #of(String, PixelGrid, int[], int, BitSet)} on cells of {@code p} mm. */
    static Footprint of(String family, PixelGrid grid, int[] indices, int count, BitSet flagged, double p) {
        if (grid.pitchMm() > p) {
            Footprint f = ofCoarsePixels(family, grid, indices, count, flagged, p);
            if (f != null) {
                return f;
            }
        }
        int w = grid.width();
        int h = grid.height();
        int i0 = cell(Math.min(grid.xMm(0), grid.xMm(w - 1)), p);
        int i1 = cell(Math.max(grid.xMm(0), grid.xMm(w - 1)), p);
        int j0 = cell(Math.min(grid.yMm(0), grid.yMm(h - 1)), p);
        int j1 = cell(Math.max(grid.yMm(0), grid.yMm(h - 1)), p);
        int cw = i1 - i0 + 1;
        int ch = j1 - j0 + 1;
        // each loop is a small method of its own: a batch calls this once per wafer, and HotSpot compiles a loop that
        // runs long while it runs (on-stack replacement), a small method quickly and once, a large one again per loop
        int[] column = columns(grid, p, i0);
        // runs of columns in the same cell: a cell of a row is covered once any of its pixels is evaluated
        int[] runOf = new int[w];
        int[] runStart = new int[w + 1];
        runs(column, runOf, runStart);
        long[] words = new long[(cw * ch + 63) >>> 6]; // the covered cells, as the words of a BitSet
        covered(grid, p, j0, cw, indices, count, column, runOf, runStart, words);
        long[] hit = new long[words.length];
        flagged(grid, p, j0, cw, column, flagged.toLongArray(), hit);
        return new Footprint(family, p, i0, j0, cw, ch, BitSet.valueOf(words), BitSet.valueOf(hit));
    }

    /**
     * The footprint of a map whose pixels are larger than the cells: each pixel marks every cell whose centre lies in
     * its square, (x − pitch/2, x + pitch/2] along each axis (the cell under the pixel's centre among them), so that
     * the cells of neighbouring pixels touch. Each edge between two pixels is computed once for both, so that rounding
     * leaves no cell between them. Null when the cells would reach beyond {@link RecurrenceMap#MAX_OFFSET_MM}: such a
     * wafer is left out of the recurrence map whatever its cells, which are then those under the pixels' centres (as
     * many as pixels, not the pixel's area in cells each).
     */
    private static Footprint ofCoarsePixels(String family, PixelGrid grid, int[] indices, int count, BitSet flagged,
                                            double p) {
        int w = grid.width();
        int h = grid.height();
        int[] colLo = new int[w];
        int[] colHi = new int[w];
        spans(w, p, grid::xMm, colLo, colHi);
        int[] rowLo = new int[h];
        int[] rowHi = new int[h];
        spans(h, p, grid::yMm, rowLo, rowHi);
        int i0 = Math.min(colLo[0], colLo[w - 1]);
        int i1 = Math.max(colHi[0], colHi[w - 1]);
        int j0 = Math.min(rowLo[0], rowLo[h - 1]);
        int j1 = Math.max(rowHi[0], rowHi[h - 1]);
        double reach = p * Math.max(Math.max(Math.abs((double) i0), Math.abs(i1 + 1.0)),
                Math.max(Math.abs((double) j0), Math.abs(j1 + 1.0)));
        if (!(reach <= RecurrenceMap.MAX_OFFSET_MM)) {
            return null;
        }
        int cw = i1 - i0 + 1;
        int ch = j1 - j0 + 1;
        BitSet covered = new BitSet(cw * ch);
        for (int k = 0; k < count; k++) {
            mark(covered, indices[k], w, i0, j0, cw, colLo, colHi, rowLo, rowHi);
        }
        BitSet hit = new BitSet(cw * ch);
        for (int i = flagged.nextSetBit(0); i >= 0; i = flagged.nextSetBit(i + 1)) {
            mark(hit, i, w, i0, j0, cw, colLo, colHi, rowLo, rowHi);
        }
        return new Footprint(family, p, i0, j0, cw, ch, covered, hit);
    }

    /**
     * For each of {@code n} pixels along one axis ({@code mm}: the position of a pixel coordinate, mm), the first and
     * last cell whose centre lies in the pixel's extent, widened to the cell under the pixel's centre.
     */
    private static void spans(int n, double p, DoubleUnaryOperator mm, int[] lo, int[] hi) {
        double before = mm.applyAsDouble(-0.5);
        for (int x = 0; x < n; x++) {
            double after = mm.applyAsDouble(x + 0.5);
            double low = Math.min(before, after);
            double high = Math.max(before, after);
            int centre = cell(mm.applyAsDouble(x), p);
            lo[x] = Math.min(centre, (int) Math.floor(low / p) + 1); // cell centres i·p in (low, high]
            hi[x] = Math.max(centre, (int) Math.floor(high / p));
            before = after;
        }
    }

    /** Sets in {@code cells} the cells of pixel {@code index}. */
    private static void mark(BitSet cells, int index, int w, int i0, int j0, int cw, int[] colLo, int[] colHi,
                             int[] rowLo, int[] rowHi) {
        int x = index % w;
        int y = index / w;
        int from = colLo[x] - i0;
        int to = colHi[x] - i0 + 1;
        for (int j = rowLo[y] - j0; j <= rowHi[y] - j0; j++) {
            cells.set(j * cw + from, j * cw + to);
        }
    }

    /**
     * This footprint on cells {@code factor} times as large (odd, so that each cell lies in exactly one larger cell:
     * cell i in larger cell floor(i/factor + ½)): a larger cell is covered, or flagged, when one of its cells is. The
     * result equals the footprint made from the wafer's pixels on the larger cells directly, since a pixel lies in a
     * larger cell exactly when its cell does, for maps whose pixels are no larger than the cells; for coarser pixels it
     * holds every larger cell of the direct footprint, and also those that a pixel's square reaches beyond them.
     *
     * @throws IllegalArgumentException when {@code factor} is not a positive odd number
     */
    public Footprint coarsened(int factor) {
        if (factor < 1 || factor % 2 == 0) {
            throw new IllegalArgumentException("the cell factor must be a positive odd number (1, 3, 5, ...) so that"
                    + " cells nest, but was " + factor);
        }
        if (factor == 1) {
            return this;
        }
        int i0 = coarse(minI, factor);
        int j0 = coarse(minJ, factor);
        int cw = coarse(minI + width - 1, factor) - i0 + 1;
        int ch = coarse(minJ + height - 1, factor) - j0 + 1;
        return new Footprint(family, pitchMm * factor, i0, j0, cw, ch, coarse(covered, factor, i0, j0, cw),
                coarse(flagged, factor, i0, j0, cw));
    }

    private BitSet coarse(BitSet cells, int factor, int i0, int j0, int cw) {
        BitSet out = new BitSet();
        for (int b = cells.nextSetBit(0); b >= 0; b = cells.nextSetBit(b + 1)) {
            int i = coarse(minI + b % width, factor) - i0;
            int j = coarse(minJ + b / width, factor) - j0;
            out.set(j * cw + i);
        }
        return out;
    }

    /** The larger cell floor(i/factor + ½) of cell i, factor odd. */
    private static int coarse(int i, int factor) {
        return Math.floorDiv(2 * i + factor, 2 * factor);
    }

    /** The cell column of each pixel column, from the first cell column {@code i0}. */
    private static int[] columns(PixelGrid grid, double p, int i0) {
        int[] column = new int[grid.width()];
        for (int x = 0; x < column.length; x++) {
            column[x] = cell(grid.xMm(x), p) - i0;
        }
        return column;
    }

    /**
     * The runs of pixel columns in the same cell column: each column's run into {@code runOf}, each run's first
     * column into {@code runStart} (and the width after the last run).
     */
    private static void runs(int[] column, int[] runOf, int[] runStart) {
        int w = column.length;
        int runs = 0;
        for (int x = 0; x < w; x++) {
            if (x == 0 || column[x] != column[x - 1]) {
                runStart[runs++] = x;
            }
            runOf[x] = runs - 1;
        }
        runStart[runs] = w;
    }

    /** Sets in {@code words} the cells of the evaluated pixels {@code indices[0..count)} (ascending). */
    private static void covered(PixelGrid grid, double p, int j0, int cw, int[] indices, int count, int[] column,
                                int[] runOf, int[] runStart, long[] words) {
        int w = grid.width();
        int k = 0;
        while (k < count) {
            int first = indices[k];
            int y = first / w;
            int row = y * w;
            int rowCell = (cell(grid.yMm(y), p) - j0) * cw;
            int end = rowEnd(indices, k, Math.min(count, k + w), row + w);
            int last = indices[end - 1];
            if (last - first == end - 1 - k) {
                // the indices ascend, so the row's pixels from the first to the last evaluated one all are: the
                // cells of their runs, one stretch of cells when no cell lies between two runs' (pitch <= 1 mm)
                int firstRun = runOf[first - row];
                int lastRun = runOf[last - row];
                int from = column[runStart[firstRun]];
                int to = column[runStart[lastRun]];
                if (Math.abs(to - from) == lastRun - firstRun) {
                    setRange(words, rowCell + Math.min(from, to), rowCell + Math.max(from, to) + 1);
                } else {
                    for (int r = firstRun; r <= lastRun; r++) {
                        int c = rowCell + column[runStart[r]];
                        words[c >>> 6] |= 1L << c;
                    }
                }
            } else {
                for (int j = k; j < end; j++) {
                    int c = rowCell + column[indices[j] - row];
                    words[c >>> 6] |= 1L << c;
                }
            }
            k = end;
        }
    }

    /** Sets in {@code hit} the cells of the flagged pixels, the set bits of {@code flaggedWords} (BitSet words). */
    private static void flagged(PixelGrid grid, double p, int j0, int cw, int[] column, long[] flaggedWords,
                                long[] hit) {
        int w = grid.width();
        int rowStart = 0;
        int rowEnd = 0;
        int rowCell = 0;
        int lastCell = -1;
        for (int wi = 0; wi < flaggedWords.length; wi++) {
            for (long bits = flaggedWords[wi]; bits != 0; bits &= bits - 1) {
                int i = (wi << 6) + Long.numberOfTrailingZeros(bits); // ascending
                if (i >= rowEnd) { // a new row
                    int y = i / w;
                    rowStart = y * w;
                    rowEnd = rowStart + w;
                    rowCell = (cell(grid.yMm(y), p) - j0) * cw;
                }
                int c = rowCell + column[i - rowStart]; // flagged pixels are evaluated ones
                if (c != lastCell) {
                    hit[c >>> 6] |= 1L << c;
                    lastCell = c;
                }
            }
        }
    }

    /** Sets the bits [from, to) of a BitSet's words. */
    private static void setRange(long[] words, int from, int to) {
        int first = from >>> 6;
        int last = (to - 1) >>> 6;
        long firstMask = -1L << from; // the shifts take the bit index modulo 64
        long lastMask = -1L >>> -to;
        if (first == last) {
            words[first] |= firstMask & lastMask;
            return;
        }
        words[first] |= firstMask;
        for (int i = first + 1; i < last; i++) {
            words[i] = -1L;
        }
        words[last] |= lastMask;
    }

    /** The first k in [from, to) with indices[k] ≥ end (to when none): indices ascend. */
    private static int rowEnd(int[] indices, int from, int to, int end) {
        int lo = from;
        int hi = to;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (indices[mid] < end) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo;
    }

    static int cell(double mm, double pitchMm) {
        return (int) Math.floor(mm / pitchMm + 0.5);
    }
}
