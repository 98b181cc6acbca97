package trapmap.maps.raster;

import java.util.stream.IntStream;

/**
 * The {@link BlockMeanPyramid.Rule#MOST_COMMON} reduction: each pixel of level k + 1 is the most common valid value
 * of the raster samples behind it, the lowest ({@link Float#compare} order) among equally common ones, NaN when none
 * is valid. Exact for the whole 2^k × 2^k block, not a most-common of most-commons: for every pixel of the last level
 * it keeps the distinct valid raster values behind it, ascending, with how often each occurs; a coarser pixel merges
 * the (at most four) sorted lists of its block, adding the counts of equal values, and takes the value with the
 * largest count, the first in ascending order on a tie. A list is never longer than the samples behind its pixel
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
        int y0 = 2 * y;
        int y1 = Math.min(y0 + 1, fine.height() - 1);
        // the merged lists are no longer than the fine rows' lists together
        int capacity = 0;
        for (int yy = y0; yy <= y1; yy++) {
            capacity += offsets == null ? fw : offsets[yy][fw];
        }
        int[] off = new int[w + 1];
        float[] vals = new float[capacity];
        int[] cnts = new int[capacity];
        // the up to four lists of a block: source values, source counts (null: one each), position, end
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
                    if (offsets == null) {
                        int i = yy * fw + xx;
                        float v = fine.samples()[i];
                        srcValues[lists] = fine.samples();
                        srcCounts[lists] = null;
                        pos[lists] = i;
                        end[lists] = v == v ? i + 1 : i;
                    } else {
                        srcValues[lists] = values[yy];
                        srcCounts[lists] = counts[yy];
                        pos[lists] = offsets[yy][xx];
                        end[lists] = offsets[yy][xx + 1];
                    }
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
                        n += srcCounts[l] == null ? 1 : srcCounts[l][pos[l]];
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
        off[w] = e;
        nextOffsets[y] = off;
        // a mostly uniform map needs far less than the bound: do not keep the rest
        nextValues[y] = e < capacity / 2 ? java.util.Arrays.copyOf(vals, e) : vals;
        nextCounts[y] = e < capacity / 2 ? java.util.Arrays.copyOf(cnts, e) : cnts;
    }
}
