package trapmap.maps.compare;

import java.util.ArrayList;
import java.util.List;
import java.util.stream.IntStream;
import trapmap.maps.raster.BlockMeanPyramid;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;

/**
 * A map prepared for registration at a series of resolutions. Level 0 is the map's own grid, level k averages
 * 2^k × 2^k pixels (in the map's own unit; {@link BlockMeanPyramid} with {@link BlockMeanPyramid.Rule#TWO_OF_FOUR}).
 * The levels used for correlation are log-transformed when the map is (almost) all positive, so that a step that
 * multiplies lifetimes changes levels but not contrast; the contrast can be inverted (lifetime against density). Levels are built on demand and a 4096² map is never copied at full
 * size. Not thread-safe: one pyramid per registration.
 */
final class Pyramid {
    /** Share of positive samples above which a map is compared on a log scale. */
    private static final double LOG_SHARE = 0.99;
    /** Samples per parallel task when the map is scanned. */
    private static final int CHUNK = 1 << 16;

    private final FloatRaster raster;
    private final PixelGrid grid;
    private final boolean log;
    private final boolean invert;
    /** The block means in the map's unit, built on demand. */
    private final BlockMeanPyramid means;
    private final List<PixelGrid> grids = new ArrayList<>();
    private final List<Level> prepared = new ArrayList<>();

    Pyramid(FloatRaster raster, PixelGrid grid, boolean invert) {
        this.raster = raster;
        this.grid = grid;
        this.invert = invert;
        float[] samples = raster.samples();
        int chunks = (samples.length + CHUNK - 1) / CHUNK;
        // finite and positive samples per chunk, counted in parallel and summed: exact in any order
        long[] counts = new long[2 * chunks];
        IntStream.range(0, chunks).parallel().forEach(c -> {
            int finiteHere = 0;
            int positiveHere = 0;
            for (int i = c * CHUNK, end = Math.min(samples.length, i + CHUNK); i < end; i++) {
                float v = samples[i];
                if (Float.isFinite(v)) {
                    finiteHere++;
                    if (v > 0) {
                        positiveHere++;
                    }
                }
            }
            counts[2 * c] = finiteHere;
            counts[2 * c + 1] = positiveHere;
        });
        long finite = 0;
        long positive = 0;
        for (int c = 0; c < chunks; c++) {
            finite += counts[2 * c];
            positive += counts[2 * c + 1];
        }
        this.log = finite > 0 && positive >= LOG_SHARE * finite;
        grids.add(grid);
        prepared.add(null);
        this.means = new BlockMeanPyramid(raster, BlockMeanPyramid.Rule.TWO_OF_FOUR, maxLevel() + 1);
    }

    /** Source grid. */
    PixelGrid grid() {
        return grid;
    }

    FloatRaster raster() {
        return raster;
    }

    /** Pitch of level k, mm. */
    double pitchMm(int k) {
        return grid.pitchMm() * (1L << k);
    }

    /** Highest level that still has 8 pixels along its shorter side. */
    int maxLevel() {
        int k = 0;
        while (Math.min(grid.width(), grid.height()) >> (k + 1) >= 8) {
            k++;
        }
        return k;
    }

    /** The level whose pitch is nearest (on a log scale) to {@code pitchMm}. */
    int levelNear(double pitchMm) {
        int k = (int) Math.round(Math.log(pitchMm / grid.pitchMm()) / Math.log(2));
        return Math.max(0, Math.min(maxLevel(), k));
    }

    /** The finest level with at most {@code px} pixels along the longer side. */
    int levelWithin(int px) {
        int k = 0;
        while (Math.max(grid.width(), grid.height()) >> k > px && k < maxLevel()) {
            k++;
        }
        return k;
    }

    /** Level k prepared for correlation. */
    Level level(int k) {
        while (prepared.size() <= k) {
            prepared.add(null);
        }
        Level l = prepared.get(k);
        if (l == null) {
            l = Level.prepare(transformed(k), gridOf(k));
            prepared.set(k, l);
        }
        return l;
    }

    PixelGrid gridOf(int k) {
        while (grids.size() <= k) {
            PixelGrid g = grids.get(grids.size() - 1);
            grids.add(new PixelGrid(g.width() / 2, g.height() / 2, g.pitchMm() * 2, (g.centreXPx() - 0.5) / 2,
                    (g.centreYPx() - 0.5) / 2));
        }
        return grids.get(k);
    }

    private float transform(float v) {
        if (!Float.isFinite(v)) {
            return Float.NaN;
        }
        float t;
        if (log) {
            t = v > 0 ? (float) Math.log(v) : Float.NaN;
        } else {
            t = v;
        }
        return invert ? -t : t;
    }

    /** Level k transformed (log, inverted) into a new array; non-finite and, on a log scale, non-positive → NaN. */
    private float[] transformed(int k) {
        float[] s = means.built(k).samples();
        float[] out = new float[s.length];
        for (int i = 0; i < s.length; i++) {
            out[i] = transform(s[i]);
        }
        return out;
    }

    /**
     * One resolution ready for correlation: samples lightly smoothed (1-2-1 binomial) and standardised (mean 0,
     * standard deviation 1 over the data), and an edge taper that rises from 0 at the border of the data to 1 a
     * few pixels inside, so that the border itself (wafer outline, raster edge) carries no weight and the
     * correlation changes smoothly as the overlap changes.
     */
    static final class Level {
        final PixelGrid grid;
        final int width;
        final int height;
        /** Standardised samples, 0 where there is no data. */
        final float[] value;
        /** Edge taper in [0, 1], 0 where there is no data. */
        final float[] weight;
        /** value × weight. */
        final float[] tapered;
        /** True where the level has data. */
        final boolean[] valid;
        /** value and weight interleaved, {v0, w0, v1, w1, …}: one memory access per neighbour when sampled. */
        final float[] valueWeight;
        final int validCount;
        /** Root-mean-square distance of the data from the wafer centre, mm. */
        final double rmsRadiusMm;
        final boolean textured;
        private float[] detail;
        private float[] detailWeight;

        private Level(PixelGrid grid, float[] value, float[] weight, float[] tapered, boolean[] valid, int validCount,
                      double rmsRadiusMm, boolean textured) {
            this.grid = grid;
            this.width = grid.width();
            this.height = grid.height();
            this.value = value;
            this.weight = weight;
            this.tapered = tapered;
            this.valid = valid;
            this.valueWeight = interleave(value, weight);
            this.validCount = validCount;
            this.rmsRadiusMm = rmsRadiusMm;
            this.textured = textured;
        }

        static Level prepare(float[] raw, PixelGrid g) {
            int w = g.width();
            int h = g.height();
            float[] smooth = binomial(raw, w, h);
            double sum = 0;
            double sum2 = 0;
            int n = 0;
            double r2 = 0;
            for (int y = 0; y < h; y++) {
                for (int x = 0; x < w; x++) {
                    float v = smooth[y * w + x];
                    if (v == v) {
                        sum += v;
                        sum2 += (double) v * v;
                        n++;
                        double xm = g.xMm(x);
                        double ym = g.yMm(y);
                        r2 += xm * xm + ym * ym;
                    }
                }
            }
            double mean = n == 0 ? 0 : sum / n;
            double var = n == 0 ? 0 : Math.max(0, sum2 / n - mean * mean);
            double sd = Math.sqrt(var);
            boolean textured = n >= 16 && sd > 1e-6 * Math.max(1, Math.abs(mean));
            float[] value = new float[w * h];
            float[] weight = taper(smooth, w, h);
            float[] tapered = new float[w * h];
            boolean[] valid = new boolean[w * h];
            for (int i = 0; i < value.length; i++) {
                float v = smooth[i];
                valid[i] = v == v;
                if (v == v && textured) {
                    value[i] = (float) ((v - mean) / sd);
                    tapered[i] = value[i] * weight[i];
                }
            }
            return new Level(g, value, weight, tapered, valid, n, n == 0 ? 0 : Math.sqrt(r2 / n), textured);
        }

        /**
         * The standardised samples minus their local mean over a box of about 2.5 % of the longer side (at least
         * 5×5 pixels), 0 where there is no data: the fine structure (grain boundaries, small clusters) without the
         * wafer-scale trends (edge zones, gradients, uneven process response). Built on first use.
         */
        float[] detail() {
            if (detail == null) {
                int r = Math.max(2, (int) Math.round(0.025 * Math.max(width, height)));
                double[] sat = new double[(width + 1) * (height + 1)];
                int[] count = new int[(width + 1) * (height + 1)];
                for (int y = 0; y < height; y++) {
                    double rowSum = 0;
                    int rowCount = 0;
                    for (int x = 0; x < width; x++) {
                        int i = y * width + x;
                        if (valid[i]) {
                            rowSum += value[i];
                            rowCount++;
                        }
                        int j = (y + 1) * (width + 1) + x + 1;
                        sat[j] = sat[j - width - 1] + rowSum;
                        count[j] = count[j - width - 1] + rowCount;
                    }
                }
                float[] d = new float[width * height];
                for (int y = 0; y < height; y++) {
                    int y0 = Math.max(0, y - r);
                    int y1 = Math.min(height, y + r + 1);
                    for (int x = 0; x < width; x++) {
                        int i = y * width + x;
                        if (weight[i] <= 0) {
                            continue;
                        }
                        int x0 = Math.max(0, x - r);
                        int x1 = Math.min(width, x + r + 1);
                        int a = y1 * (width + 1) + x1;
                        int b = y0 * (width + 1) + x1;
                        int c = y1 * (width + 1) + x0;
                        int e = y0 * (width + 1) + x0;
                        int n = count[a] - count[b] - count[c] + count[e];
                        double sum = sat[a] - sat[b] - sat[c] + sat[e];
                        d[i] = (float) (value[i] - sum / n);
                    }
                }
                detail = d;
            }
            return detail;
        }

        /** {@link #detail()} and weight interleaved like {@link #valueWeight}. */
        float[] detailWeight() {
            if (detailWeight == null) {
                detailWeight = interleave(detail(), weight);
            }
            return detailWeight;
        }

        private static float[] interleave(float[] v, float[] w) {
            float[] out = new float[2 * v.length];
            for (int i = 0; i < v.length; i++) {
                out[2 * i] = v[i];
                out[2 * i + 1] = w[i];
            }
            return out;
        }

        /**
         * NaN-aware 1-2-1 smoothing in x and y; pixels without data stay without. The first and last pixel of a
         * row, and the first and last row, have their own code instead of a test in the loops: a test that fails
         * once per row is hoisted out of a compiled loop as a check that holds for the whole loop, which then fails
         * at the row's end and has the code compiled again.
         */
        static float[] binomial(float[] s, int w, int h) {
            float[] t = new float[s.length];
            for (int y = 0; y < h; y++) {
                alongRow(s, t, y * w, w);
            }
            float[] u = new float[s.length];
            for (int y = 0; y < h; y++) {
                if (y > 0 && y < h - 1) {
                    acrossRows(t, u, y * w, w);
                } else {
                    edgeRow(t, u, y * w, w, y > 0, y < h - 1);
                }
            }
            return u;
        }

        /** The x pass over the row starting at {@code row}: neighbours left and right within the row. */
        private static void alongRow(float[] s, float[] t, int row, int w) {
            int last = row + w - 1;
            t[row] = smoothed(s, row, -1, w > 1 ? row + 1 : -1);
            for (int i = row + 1; i < last; i++) {
                t[i] = smoothed(s, i, i - 1, i + 1);
            }
            if (w > 1) {
                t[last] = smoothed(s, last, last - 1, -1);
            }
        }

        /** The y pass over a row with rows above and below. */
        private static void acrossRows(float[] t, float[] u, int row, int w) {
            for (int i = row, end = row + w; i < end; i++) {
                u[i] = smoothed(t, i, i - w, i + w);
            }
        }

        /** The y pass over the first or last row (or the only one). */
        private static void edgeRow(float[] t, float[] u, int row, int w, boolean above, boolean below) {
            for (int i = row, end = row + w; i < end; i++) {
                u[i] = smoothed(t, i, above ? i - w : -1, below ? i + w : -1);
            }
        }

        /** {@link #smooth3} at a pixel with data, NaN at one without. */
        private static float smoothed(float[] s, int i, int before, int after) {
            return s[i] == s[i] ? smooth3(s, i, before, after) : Float.NaN;
        }

        private static float smooth3(float[] s, int i, int before, int after) {
            double sum = 2.0 * s[i];
            double n = 2;
            if (before >= 0 && s[before] == s[before]) {
                sum += s[before];
                n++;
            }
            if (after >= 0 && s[after] == s[after]) {
                sum += s[after];
                n++;
            }
            return (float) (sum / n);
        }

        /**
         * max(0, 2·m − 1) with m the share of pixels with data in a (2r+1)² box (summed-area table), so 0 on the
         * border of the data and 1 once the box lies wholly inside; r ≈ 1.5 % of the longer side, at least 2.
         */
        private static float[] taper(float[] s, int w, int h) {
            int r = Math.max(2, (int) Math.round(0.015 * Math.max(w, h)));
            int[] sat = new int[(w + 1) * (h + 1)];
            for (int y = 0; y < h; y++) {
                int rowSum = 0;
                for (int x = 0; x < w; x++) {
                    rowSum += s[y * w + x] == s[y * w + x] ? 1 : 0;
                    sat[(y + 1) * (w + 1) + x + 1] = sat[y * (w + 1) + x + 1] + rowSum;
                }
            }
            float[] out = new float[w * h];
            double box = (2.0 * r + 1) * (2.0 * r + 1);
            for (int y = 0; y < h; y++) {
                int y0 = y - r;
                int y1 = y + r + 1;
                int cy0 = Math.max(0, y0);
                int cy1 = Math.min(h, y1);
                for (int x = 0; x < w; x++) {
                    int i = y * w + x;
                    if (s[i] != s[i]) {
                        continue;
                    }
                    int cx0 = Math.max(0, x - r);
                    int cx1 = Math.min(w, x + r + 1);
                    int count = sat[cy1 * (w + 1) + cx1] - sat[cy0 * (w + 1) + cx1] - sat[cy1 * (w + 1) + cx0]
                            + sat[cy0 * (w + 1) + cx0];
                    out[i] = (float) Math.max(0, 2 * count / box - 1);
                }
            }
            return out;
        }
    }
}
