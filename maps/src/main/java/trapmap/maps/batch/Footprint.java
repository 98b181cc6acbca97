package trapmap.maps.batch;

import java.util.BitSet;
import trapmap.maps.raster.PixelGrid;

/**
 * Where one wafer was evaluated and where it was flagged, on cells of {@code pitchMm} in wafer coordinates (mm,
 * origin at the wafer centre, y up). Cell (i, j) covers x in [(i − ½)·pitch, (i + ½)·pitch), likewise y; cells are
 * stored row by row from (minI, minJ).
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
     * The footprint of one wafer: the {@link #PITCH_MM} cells holding an evaluated pixel, and those holding a flagged
     * one ({@code flagged}: pixel indices, all of them evaluated).
     */
    static Footprint of(String family, PixelGrid grid, boolean[] evaluated, BitSet flagged) {
        double p = PITCH_MM;
        int w = grid.width();
        int h = grid.height();
        int i0 = cell(Math.min(grid.xMm(0), grid.xMm(w - 1)), p);
        int i1 = cell(Math.max(grid.xMm(0), grid.xMm(w - 1)), p);
        int j0 = cell(Math.min(grid.yMm(0), grid.yMm(h - 1)), p);
        int j1 = cell(Math.max(grid.yMm(0), grid.yMm(h - 1)), p);
        int cw = i1 - i0 + 1;
        int ch = j1 - j0 + 1;
        int[] column = new int[w];
        for (int x = 0; x < w; x++) {
            column[x] = cell(grid.xMm(x), p) - i0;
        }
        // runs of columns in the same cell: a cell of a row is covered once any of its pixels is evaluated
        int[] runStart = new int[w + 1];
        int runs = 0;
        for (int x = 0; x < w; x++) {
            if (x == 0 || column[x] != column[x - 1]) {
                runStart[runs++] = x;
            }
        }
        runStart[runs] = w;
        long[] words = new long[(cw * ch + 63) >>> 6]; // the covered cells, as the words of a BitSet
        for (int y = 0; y < h; y++) {
            int rowCell = (cell(grid.yMm(y), p) - j0) * cw;
            int row = y * w;
            for (int r = 0; r < runs; r++) {
                for (int x = runStart[r], end = runStart[r + 1]; x < end; x++) {
                    if (evaluated[row + x]) {
                        int c = rowCell + column[x];
                        words[c >>> 6] |= 1L << c;
                        break;
                    }
                }
            }
        }
        BitSet hit = new BitSet(cw * ch);
        for (int i = flagged.nextSetBit(0); i >= 0; i = flagged.nextSetBit(i + 1)) {
            int y = i / w;
            hit.set((cell(grid.yMm(y), p) - j0) * cw + column[i - y * w]); // flagged pixels are evaluated ones
        }
        return new Footprint(family, p, i0, j0, cw, ch, BitSet.valueOf(words), hit);
    }

    static int cell(double mm, double pitchMm) {
        return (int) Math.floor(mm / pitchMm + 0.5);
    }
}
