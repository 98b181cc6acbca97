package trapmap.maps.raster;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.stream.IntStream;

/**
 * Samples of one raster at halving resolutions: level 0 is the raster itself, each pixel of level k ≥ 1 reduces the
 * 2×2 block of level k − 1 below it, ignoring samples without data, so level k pixel (x, y) covers raster pixels
 * [x·2^k, (x+1)·2^k) × [y·2^k, (y+1)·2^k). How a block is reduced is the {@link Rule}: a mean for maps of a
 * quantity, the most common value for maps of category codes ({@link Rule#MOST_COMMON}), where a mean would be
 * another category or none. Levels are built in order, rows in parallel, and added as they are built, so a reader
 * on another thread sees a growing, never changing, list; building is synchronised.
 */
public final class BlockMeanPyramid {
    /** How a coarser pixel is formed from its 2×2 block. */
    public enum Rule {
        /**
         * The exact mean of the valid (non-NaN) raster samples of the whole 2^k × 2^k block (each finer pixel's mean
         * weighted by its count of valid samples), NaN when the block has none. Blocks on an odd edge are smaller,
         * so level k + 1 is ⌈w/2⌉ × ⌈h/2⌉. What a picture of the map needs.
         */
        EXACT_MEAN(true, false, 1),
        /**
         * The plain mean of the finite pixels of the 2×2 block of level k − 1, NaN unless at least two of the four
         * are finite; an odd last row or column is dropped, so level k + 1 is ⌊w/2⌋ × ⌊h/2⌋. For registration,
         * where a lone sample on the border of the data would add noise to a correlation.
         */
        TWO_OF_FOUR(false, true, 2),
        /**
         * For maps of category codes: the value that occurs most often among the valid (non-NaN) raster samples of
         * the whole 2^k × 2^k block, the lowest of them (in {@link Float#compare} order) when several occur equally
         * often; NaN only when the block has no valid sample, as {@link #EXACT_MEAN}. Every value of every level is
         * thus one of the raster's values. Blocks on an odd edge are smaller, so the sizes are those of
         * {@link #EXACT_MEAN}. Built from per-pixel value counts of the level below ({@link BlockModes}), so it is
         * only built by the pyramid, not by {@link #halve}.
         */
        MOST_COMMON(true, false, 1);

        private final boolean partialEdges;
        private final boolean finiteOnly;
        private final int minValid;

        Rule(boolean partialEdges, boolean finiteOnly, int minValid) {
            this.partialEdges = partialEdges;
            this.finiteOnly = finiteOnly;
            this.minValid = minValid;
        }

        /** Whether each pixel's mean is weighted by the raster samples behind it (counts are kept). */
        boolean weighted() {
            return this == EXACT_MEAN;
        }
    }

    /**
     * One resolution: {@code width}×{@code height} samples, row-major.
     *
     * @param index level number k
     */
    public record Level(int index, int width, int height, float[] samples) {
        /** Raster pixels per level pixel along one axis, 2^k. */
        public int scale() {
            return 1 << index;
        }
    }

    /**
     * Forms the next coarser level from the last one built; one per pyramid, called with the levels in order (under
     * the pyramid's lock), so it may keep what it needs of the last level (counts, value histograms).
     */
    interface Reducer {
        Level next(Level fine);
    }

    private final Rule rule;
    private final int levelCount;
    private volatile List<Level> levels;
    /** Forms the next level; dropped (with what it keeps) once the pyramid is complete. */
    private Reducer reducer;

    /**
     * A pyramid of {@code levelCount} levels (level 0 included) whose levels are built by {@link #build} or
     * {@link #built(int)}.
     */
    public BlockMeanPyramid(FloatRaster raster, Rule rule, int levelCount) {
        if (levelCount < 1) {
            throw new IllegalArgumentException("a pyramid has at least one level, not " + levelCount);
        }
        this.rule = rule;
        this.levelCount = levelCount;
        this.levels = List.of(new Level(0, raster.width(), raster.height(), raster.samples()));
        this.reducer = rule == Rule.MOST_COMMON ? new BlockModes() : new Means(rule);
    }

    /**
     * The number of {@link Rule#EXACT_MEAN} (or {@link Rule#MOST_COMMON}) levels of a {@code width}×{@code height}
     * raster until the longer side is at most {@code topSide} pixels.
     */
    public static int levelsUntil(int width, int height, int topSide) {
        int n = 1;
        for (int w = width, h = height; Math.max(w, h) > topSide; n++) {
            w = (w + 1) / 2;
            h = (h + 1) / 2;
        }
        return n;
    }

    public Rule rule() {
        return rule;
    }

    /** Number of levels once built. */
    public int levelCount() {
        return levelCount;
    }

    /** Level {@code k}, or null while it is not yet built. */
    public Level level(int k) {
        List<Level> l = levels;
        return k < l.size() ? l.get(k) : null;
    }

    public boolean complete() {
        return levels.size() == levelCount;
    }

    /** Builds the missing levels, stopping early when {@code cancelled} becomes true. */
    public synchronized void build(AtomicBoolean cancelled) {
        while (!complete() && !cancelled.get()) {
            addNext();
        }
    }

    /** Level {@code k}, building it and the levels below it first when needed. */
    public synchronized Level built(int k) {
        if (k < 0 || k >= levelCount) {
            throw new IndexOutOfBoundsException("level " + k + " of " + levelCount);
        }
        while (levels.size() <= k) {
            addNext();
        }
        return levels.get(k);
    }

    private void addNext() {
        Level next = reducer.next(levels.get(levels.size() - 1));
        List<Level> grown = new ArrayList<>(levels);
        grown.add(next);
        levels = List.copyOf(grown);
        if (complete()) {
            reducer = null;
        }
    }

    /** The mean rules: {@link #halve}, keeping the counts of valid raster samples where the rule weighs by them. */
    private static final class Means implements Reducer {
        private final Rule rule;
        /** Valid raster samples behind each pixel of the last level (null: level 0, one each; or unweighted). */
        private int[] counts;

        Means(Rule rule) {
            this.rule = rule;
        }

        @Override
        public Level next(Level fine) {
            int[] coarseCounts = rule.weighted()
                    ? new int[coarseSize(fine.width(), rule) * coarseSize(fine.height(), rule)] : null;
            Level next = halve(fine, rule, counts, coarseCounts);
            counts = coarseCounts;
            return next;
        }
    }

    private static int coarseSize(int fine, Rule rule) {
        return rule.partialEdges ? (fine + 1) / 2 : fine / 2;
    }

    /**
     * The next coarser level by {@code rule}: in each 2×2 block (clipped at an odd edge when the rule keeps partial
     * blocks), the mean of the valid fine pixels, each weighted by its count of valid raster samples when
     * {@code counts} is given; NaN when fewer than the rule's minimum are valid.
     *
     * @param counts    valid raster samples behind each fine pixel; null for level 0 or an unweighted rule (one each)
     * @param outCounts receives the counts of the coarse pixels (valid samples behind each); may be null
     * @throws IllegalArgumentException for {@link Rule#MOST_COMMON}, which needs more than the level's samples
     */
    public static Level halve(Level fine, Rule rule, int[] counts, int[] outCounts) {
        if (rule == Rule.MOST_COMMON) {
            throw new IllegalArgumentException("the most common value of a block is built by the pyramid, not"
                    + " from a level's samples alone");
        }
        int fw = fine.width();
        int fh = fine.height();
        int w = coarseSize(fw, rule);
        int h = coarseSize(fh, rule);
        float[] src = fine.samples();
        float[] out = new float[w * h];
        if (rule == Rule.TWO_OF_FOUR && counts == null && outCounts == null) {
            // whole 2×2 blocks only: the same sums in the same order, without the general case's bookkeeping
            IntStream.range(0, h).parallel().forEach(y -> halveTwoOfFour(src, fw, out, w, y));
            return new Level(fine.index() + 1, w, h, out);
        }
        IntStream.range(0, h).parallel().forEach(y -> {
            int y0 = 2 * y;
            int y1 = Math.min(y0 + 1, fh - 1);
            for (int x = 0; x < w; x++) {
                int x0 = 2 * x;
                int x1 = Math.min(x0 + 1, fw - 1);
                double sum = 0;
                int n = 0;
                int valid = 0;
                for (int yy = y0; yy <= y1; yy++) {
                    for (int xx = x0; xx <= x1; xx++) {
                        int i = yy * fw + xx;
                        float v = src[i];
                        if (rule.finiteOnly ? Float.isFinite(v) : v == v) {
                            int c = counts == null ? 1 : counts[i];
                            sum += (double) v * c;
                            n += c;
                            valid++;
                        }
                    }
                }
                out[y * w + x] = n == 0 || valid < rule.minValid ? Float.NaN : (float) (sum / n);
                if (outCounts != null) {
                    outCounts[y * w + x] = n;
                }
            }
        });
        return new Level(fine.index() + 1, w, h, out);
    }

    /** Row {@code y} of a {@link Rule#TWO_OF_FOUR} level from the fine samples {@code src}, {@code fw} wide. */
    private static void halveTwoOfFour(float[] src, int fw, float[] out, int w, int y) {
        int top = 2 * y * fw;
        int bottom = top + fw;
        int o = y * w;
        for (int x = 0; x < w; x++) {
            float a = src[top + 2 * x];
            float b = src[top + 2 * x + 1];
            float c = src[bottom + 2 * x];
            float d = src[bottom + 2 * x + 1];
            double sum = 0;
            int valid = 0;
            if (Float.isFinite(a)) {
                sum += a;
                valid++;
            }
            if (Float.isFinite(b)) {
                sum += b;
                valid++;
            }
            if (Float.isFinite(c)) {
                sum += c;
                valid++;
            }
            if (Float.isFinite(d)) {
                sum += d;
                valid++;
            }
            out[o + x] = valid < 2 ? Float.NaN : (float) (sum / valid);
        }
    }
}
