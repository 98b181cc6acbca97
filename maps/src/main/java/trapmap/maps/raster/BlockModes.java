package trapmap.maps.raster;

import java.util.Arrays;
import java.util.stream.IntStream;

/**
 * The {@link BlockMeanPyramid.Rule#MOST_COMMON} reduction: each pixel of level k + 1 is the most common valid value
 * of the raster samples behind it, the lowest ({@link Float#compare} order) among equally common ones, NaN when none
 * is valid. Exact for the whole 2^k × 2^k block, not a most-common of most-commons: for every pixel of the last level
 * it keeps the distinct valid raster values behind it, ascending, with how often each occurs; a coarser pixel merges
 * the (at most four) sorted lists of its block, adding the counts of equal values, and takes the value with the
 * largest count, the first in ascending order on a tie (level 1 sorts the up to four raster samples of its block
 * instead). A list is never longer than the samples behind its pixel
 * nor than the number of distinct values, so for a map of a few codes the lists stay short. Rows are built in
 * parallel, each into its own arrays; the result does not depend on the number of threads.
 */
final class BlockModes implements BlockMeanPyramid.Reducer {
    /**
     * The value lists of the last level built, per row: pixel x of row y has the values
     * {@code values[y][offsets[y][x] .. offsets[y][x + 1])}, ascending, occurring {@code counts[y][...]} times;
     * null while the last level is the raster (each pixel its own value once, none when NaN).
     */
    private int[][] offsets;
    private float[][] values;
    private int[][] counts;

    @Override
    public BlockMeanPyramid.Level next(BlockMeanPyramid.Level fine) {
        int fw = fine.width();
        int fh = fine.height();
        int w = (fw + 1) / 2;
        int h = (fh + 1) / 2;
        float[] out = new float[w * h];
        int[][] nextOffsets = new int[h][];
        float[][] nextValues = new float[h][];
        int[][] nextCounts = new int[h][];
        IntStream.range(0, h).parallel().forEach(y -> row(fine, y, w, out, nextOffsets, nextValues, nextCounts));
        offsets = nextOffsets;
        values = nextValues;
        counts = nextCounts;
        return new BlockMeanPyramid.Level(fine.index() + 1, w, h, out);
    }

    /** Coarse row {@code y}: its most common values into {@code out}, its value lists into the next arrays. */
    private void row(BlockMeanPyramid.Level fine, int y, int w, float[] out, int[][] nextOffsets,
                     float[][] nextValues, int[][] nextCounts) {
        int fw = fine.width();
        // the merged lists are no longer than the fine rows' lists together
        int capacity = 0;
        for (int yy = 2 * y; yy <= Math.min(2 * y + 1, fine.height() - 1); yy++) {
            capacity += offsets == null ? fw : offsets[yy][fw];
        }
        int[] off = new int[w + 1];
        float[] vals = new float[capacity];
        int[] cnts = new int[capacity];
        int e = offsets == null ? rowOfRaster(fine, y, w, out, off, vals, cnts)
                : rowOfLists(fw, fine.height(), y, w, out, off, vals, cnts);
        off[w] = e;
        nextOffsets[y] = off;
        // a mostly uniform map needs far less than the bound: do not keep the rest
        nextValues[y] = e < capacity / 2 ? Arrays.copyOf(vals, e) : vals;
        nextCounts[y] = e < capacity / 2 ? Arrays.copyOf(cnts, e) : cnts;
    }

    /**
     * Coarse row {@code y} of a level above 1: the sorted lists of each block's up to four pixels merged, counts of
     * equal values added; returns the number of list entries written.
     */
    private int rowOfLists(int fw, int fh, int y, int w, float[] out, int[] off, float[] vals, int[] cnts) {
        int y0 = 2 * y;
        int y1 = Math.min(y0 + 1, fh - 1);
        // the up to four lists of a block: source values, source counts, position, end
        float[][] srcValues = new float[4][];
        int[][] srcCounts = new int[4][];
        int[] pos = new int[4];
        int[] end = new int[4];
        int e = 0;
        for (int x = 0; x < w; x++) {
            int x0 = 2 * x;
            int x1 = Math.min(x0 + 1, fw - 1);
            int lists = 0;
            for (int yy = y0; yy <= y1; yy++) {
                for (int xx = x0; xx <= x1; xx++) {
                    srcValues[lists] = values[yy];
                    srcCounts[lists] = counts[yy];
                    pos[lists] = offsets[yy][xx];
                    end[lists] = offsets[yy][xx + 1];
                    lists++;
                }
            }
            off[x] = e;
            float best = Float.NaN;
            int bestCount = 0;
            while (true) {
                // the lowest value at the head of any list
                int first = -1;
                float lowest = 0;
                for (int l = 0; l < lists; l++) {
                    if (pos[l] < end[l]) {
                        float v = srcValues[l][pos[l]];
                        if (first < 0 || Float.compare(v, lowest) < 0) {
                            first = l;
                            lowest = v;
                        }
                    }
                }
                if (first < 0) {
                    break;
                }
                int n = 0;
                for (int l = first; l < lists; l++) {
                    if (pos[l] < end[l] && Float.compare(srcValues[l][pos[l]], lowest) == 0) {
                        n += srcCounts[l][pos[l]];
                        pos[l]++;
                    }
                }
                vals[e] = lowest;
                cnts[e] = n;
                e++;
                if (n > bestCount) { // strictly more: on a tie the lower value, met first, stays
                    best = lowest;
                    bestCount = n;
                }
            }
            out[y * w + x] = best;
        }
        return e;
    }

    /**
     * Coarse row {@code y} of level 1, straight from the raster: each block's up to four valid samples sorted, then
     * counted as the general merge would; returns the number of list entries written.
     */
    private static int rowOfRaster(BlockMeanPyramid.Level fine, int y, int w, float[] out, int[] off, float[] vals,
                                   int[] cnts) {
        float[] src = fine.samples();
        int fw = fine.width();
        int y0 = 2 * y;
        int y1 = Math.min(y0 + 1, fine.height() - 1);
        float[] block = new float[4];
        int e = 0;
        for (int x = 0; x < w; x++) {
            int x0 = 2 * x;
            int x1 = Math.min(x0 + 1, fw - 1);
            int n = 0;
            for (int yy = y0; yy <= y1; yy++) {
                for (int xx = x0; xx <= x1; xx++) {
                    float v = src[yy * fw + xx];
                    if (v == v) {
                        // insertion into the sorted block
                        int i = n++;
                        while (i > 0 && Float.compare(block[i - 1], v) > 0) {
                            block[i] = block[i - 1];
                            i--;
                        }
                        block[i] = v;
                    }
                }
            }
            off[x] = e;
            float best = Float.NaN;
            int bestCount = 0;
            for (int i = 0; i < n; ) {
                int j = i + 1;
                while (j < n && Float.compare(block[j], block[i]) == 0) {
                    j++;
                }
                vals[e] = block[i];
                cnts[e] = j - i;
                e++;
                if (j - i > bestCount) { // strictly more: on a tie the lower value, met first, stays
                    best = block[i];
                    bestCount = j - i;
                }
                i = j;
            }
            out[y * w + x] = best;
        }
        return e;
    }
}
