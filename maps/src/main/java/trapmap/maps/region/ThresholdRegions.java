package trapmap.maps.region;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import trapmap.maps.geometry.DataOutline;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.Blocks;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.check.Checks;

/**
 * Connected regions above or below a threshold: the pixels inside a mask whose value lies strictly beyond the
 * threshold, grouped by 8-connectivity (diagonal neighbours join), then filtered by area. Run-length labelling: bands
 * of rows are scanned in parallel into runs (horizontal stretches of selected pixels) with their sums, the runs are
 * joined across rows by union-find, and each region's figures are added up over its runs in raster order. No label
 * image and no recursion; a region is numbered by its first pixel in raster order, and its figures do not depend on
 * the number of threads.
 */
public final class ThresholdRegions {
    private ThresholdRegions() {
    }

    /** Regions of a map; see {@link #find(FloatRaster, PixelGrid, Mask, RegionCriteria, WaferShape)}. */
    public static RegionTable find(WaferMap map, Mask mask, RegionCriteria criteria, WaferShape shape) {
        Checks.notNull(map, "map");
        return find(map.raster(), map.grid(), mask, criteria, shape);
    }

    /**
     * Regions of {@code raster}.
     *
     * @param mask     pixels that may belong to a region (null: all); NaN pixels never do
     * @param criteria threshold, side and minimum area
     * @param shape    wafer outline for the edge distances; null measures them to the outline of the valid data
     * @throws IllegalArgumentException when the sizes of raster, grid and mask differ
     */
    public static RegionTable find(FloatRaster raster, PixelGrid grid, Mask mask, RegionCriteria criteria,
                                   WaferShape shape) {
        Checks.notNull(raster, "raster");
        Checks.notNull(grid, "grid");
        Checks.notNull(criteria, "criteria");
        int w = raster.width();
        int h = raster.height();
        if (grid.width() != w || grid.height() != h) {
            throw new IllegalArgumentException("grid " + grid.width() + "x" + grid.height() + " does not match raster "
                    + w + "x" + h);
        }
        if (mask != null && (mask.width() != w || mask.height() != h)) {
            throw new IllegalArgumentException("mask " + mask.width() + "x" + mask.height() + " does not match raster "
                    + w + "x" + h);
        }
        float[] s = raster.samples();
        long[] words = mask == null ? null : mask.words();
        EdgeDistance edge = shape != null ? new ShapeEdge(shape.prepared(), grid)
                : new OutlineEdge(DataOutline.edgeDistanceMm(DataOutline.filled(raster), grid));
        Runs runs = Runs.of(s, w, h, words, criteria, edge);
        int[] root = runs.components();
        int m = runs.size;

        // per component (indexed by its root, the first run in raster order), sums over its runs in raster order
        long[] count = new long[m];
        long[] sumX = new long[m];
        long[] sumY = new long[m];
        double[] sumValue = new double[m];
        int[] minX = new int[m];
        int[] maxX = new int[m];
        int[] minY = new int[m];
        int[] maxY = new int[m];
        int[] peakIndex = new int[m];
        double[] peak = new double[m];
        double[] nearest = new double[m];
        for (int r = 0; r < m; r++) {
            int c = root[r];
            int y = runs.y[r];
            int x0 = runs.x0[r];
            int x1 = runs.x1[r];
            long len = x1 - x0 + 1;
            if (c == r) {
                minX[c] = x0;
                maxX[c] = x1;
                minY[c] = y;
                peak[c] = runs.peak[r];
                peakIndex[c] = runs.peakIndex[r];
                nearest[c] = runs.nearest[r];
            } else {
                minX[c] = Math.min(minX[c], x0);
                maxX[c] = Math.max(maxX[c], x1);
                double v = runs.peak[r];
                if (criteria.morePeaked(v, peak[c]) || v == peak[c] && runs.peakIndex[r] < peakIndex[c]) {
                    peak[c] = v;
                    peakIndex[c] = runs.peakIndex[r];
                }
                nearest[c] = Math.min(nearest[c], runs.nearest[r]);
            }
            maxY[c] = y;
            count[c] += len;
            sumX[c] += (x0 + x1) * len / 2;
            sumY[c] += y * len;
            sumValue[c] += runs.sum[r];
        }
        double pixelArea = grid.pixelAreaMm2();
        // the pixel nearest the centroid of each kept component (ties: the lower index): on a run, the pixel next to
        // the centroid's column on either side
        int[] best = new int[m];
        double[] bestD = new double[m];
        Arrays.fill(best, -1);
        for (int r = 0; r < m; r++) {
            int c = root[r];
            if (count[c] * pixelArea < criteria.minAreaMm2()) {
                continue;
            }
            double cx = (double) sumX[c] / count[c];
            double cy = (double) sumY[c] / count[c];
            double dy = runs.y[r] - cy;
            int lo = (int) Math.max(runs.x0[r], Math.min(runs.x1[r], Math.floor(cx)));
            int hi = (int) Math.max(runs.x0[r], Math.min(runs.x1[r], Math.ceil(cx)));
            for (int x = lo; x <= hi; x++) {
                double dx = x - cx;
                double d = dx * dx + dy * dy;
                int i = runs.y[r] * w + x;
                if (best[c] < 0 || d < bestD[c] || d == bestD[c] && i < best[c]) {
                    bestD[c] = d;
                    best[c] = i;
                }
            }
        }
        List<Region> regions = new ArrayList<>();
        for (int c = 0; c < m; c++) {
            if (root[c] != c) {
                continue;
            }
            double area = count[c] * pixelArea;
            if (area < criteria.minAreaMm2()) {
                continue;
            }
            double halfPx = 0.5;
            Region.BoundsMm bounds = new Region.BoundsMm(grid.xMm(minX[c] - halfPx), grid.yMm(maxY[c] + halfPx),
                    grid.xMm(maxX[c] + halfPx), grid.yMm(minY[c] - halfPx));
            double cx = (double) sumX[c] / count[c];
            double cy = (double) sumY[c] / count[c];
            int at = best[c];
            int atY = at / w;
            boolean inside = Math.abs(at - atY * w - cx) <= 0.5 && Math.abs(atY - cy) <= 0.5;
            regions.add(new Region(regions.size() + 1, (int) count[c], area, grid.xMm(cx), grid.yMm(cy), bounds,
                    peak[c], grid.xMm(peakIndex[c] % w), grid.yMm(peakIndex[c] / w), sumValue[c] / count[c],
                    nearest[c], inside, inside ? grid.xMm(cx) : grid.xMm(at % w),
                    inside ? grid.yMm(cy) : grid.yMm(atY)));
        }
        return new RegionTable(regions, criteria, shape != null ? RegionTable.EdgeReference.WAFER_SHAPE
                : RegionTable.EdgeReference.DATA_OUTLINE);
    }

    /**
     * The runs of selected pixels (horizontal stretches of pixels in the mask beyond the threshold), in raster order,
     * each with the sum of its values (in index order), its peak and its least edge distance. Bands of rows are
     * scanned in parallel and joined in order, so the runs and their sums do not depend on the number of threads.
     */
    private static final class Runs {
        int size;
        int[] y;
        int[] x0;
        int[] x1;
        double[] sum;
        double[] peak;
        int[] peakIndex;
        double[] nearest;
        /** First run of each row, and of the row after the last. */
        int[] rowStart;

        Runs(int capacity) {
            y = new int[capacity];
            x0 = new int[capacity];
            x1 = new int[capacity];
            sum = new double[capacity];
            peak = new double[capacity];
            peakIndex = new int[capacity];
            nearest = new double[capacity];
        }

        /**
         * Adds the run of the selected pixels x0..x1 of row y (whose first pixel has index {@code row}), with the sum
         * of its values in index order, its first most extreme value and its least edge distance.
         */
        void add(int y, int x0, int x1, int row, float[] s, RegionCriteria criteria, EdgeDistance edge) {
            double sum = 0;
            double peak = s[row + x0];
            int peakIndex = row + x0;
            for (int i = row + x0, e = row + x1; i <= e; i++) {
                double v = s[i];
                sum += v;
                if (criteria.morePeaked(v, peak)) {
                    peak = v;
                    peakIndex = i;
                }
            }
            add(y, x0, x1, sum, peak, peakIndex, edge.leastOnRow(row, x0, x1, y));
        }

        void add(int ry, int a, int b, double s, double p, int pi, double near) {
            if (size == y.length) {
                int c = Math.max(16, size * 2);
                y = Arrays.copyOf(y, c);
                x0 = Arrays.copyOf(x0, c);
                x1 = Arrays.copyOf(x1, c);
                sum = Arrays.copyOf(sum, c);
                peak = Arrays.copyOf(peak, c);
                peakIndex = Arrays.copyOf(peakIndex, c);
                nearest = Arrays.copyOf(nearest, c);
            }
            y[size] = ry;
            x0[size] = a;
            x1[size] = b;
            sum[size] = s;
            peak[size] = p;
            peakIndex[size] = pi;
            nearest[size] = near;
            size++;
        }

        static Runs of(float[] s, int w, int h, long[] words, RegionCriteria criteria, EdgeDistance edge) {
            int rowsPerBand = Math.max(1, Mask.BLOCK_PX / w);
            int bands = Blocks.count(h, rowsPerBand);
            Runs[] band = new Runs[bands];
            Blocks.run(bands, (long) w * h, b -> {
                Runs out = new Runs(64);
                long[] selected = new long[Blocks.count(w, 64)];
                for (int y = b * rowsPerBand, ye = Math.min(h, (b + 1) * rowsPerBand); y < ye; y++) {
                    int row = y * w;
                    if (!selectedOnRow(s, row, w, words, criteria, selected)) {
                        continue;
                    }
                    for (int x = nextSet(selected, 0, w); x < w; ) {
                        int end = nextClear(selected, x, w);
                        out.add(y, x, end - 1, row, s, criteria, edge);
                        x = nextSet(selected, end, w);
                    }
                }
                band[b] = out;
            });
            int total = 0;
            for (Runs r : band) {
                total += r.size;
            }
            Runs all = new Runs(total);
            for (Runs r : band) {
                System.arraycopy(r.y, 0, all.y, all.size, r.size);
                System.arraycopy(r.x0, 0, all.x0, all.size, r.size);
                System.arraycopy(r.x1, 0, all.x1, all.size, r.size);
                System.arraycopy(r.sum, 0, all.sum, all.size, r.size);
                System.arraycopy(r.peak, 0, all.peak, all.size, r.size);
                System.arraycopy(r.peakIndex, 0, all.peakIndex, all.size, r.size);
                System.arraycopy(r.nearest, 0, all.nearest, all.size, r.size);
                all.size += r.size;
            }
            all.rowStart = new int[h + 1];
            for (int r = 0, row = 0; row <= h; row++) {
                while (r < all.size && all.y[r] < row) {
                    r++;
                }
                all.rowStart[row] = r;
            }
            return all;
        }

        /**
         * Sets bit x of {@code selected} (x % 64 of word x / 64) for each pixel x of the row starting at index
         * {@code row} that is in the mask {@code words} (null: all) and selected by the criteria, 64 pixels at a time
         * (words of the mask without a pixel of the row are skipped); false when no pixel of the row is selected.
         */
        private static boolean selectedOnRow(float[] s, int row, int w, long[] words, RegionCriteria criteria,
                                             long[] selected) {
            boolean above = criteria.side() == RegionCriteria.Side.ABOVE;
            double t = criteria.threshold();
            long any = 0;
            for (int k = 0; k < selected.length; k++) {
                int from = row + (k << 6);
                int len = Math.min(64, w - (k << 6));
                long inMask = words == null ? -1L : maskBits(words, from);
                if (len < 64) {
                    inMask &= (1L << len) - 1;
                }
                long bits = 0;
                if (inMask != 0) {
                    bits = (above ? beyondAbove(s, from, len, t) : beyondBelow(s, from, len, t)) & inMask;
                }
                selected[k] = bits;
                any |= bits;
            }
            return any != 0;
        }

        /** The 64 bits of the mask {@code words} from pixel {@code from} on (bits past the last word clear). */
        private static long maskBits(long[] words, int from) {
            int wi = from >>> 6;
            int shift = from & 63;
            long bits = words[wi] >>> shift;
            if (shift != 0 && wi + 1 < words.length) {
                bits |= words[wi + 1] << (64 - shift);
            }
            return bits;
        }

        /** Bit j set for each of s[from..from+len) above t. */
        private static long beyondAbove(float[] s, int from, int len, double t) {
            long bits = 0;
            for (int j = 0; j < len; j++) {
                bits |= (s[from + j] > t ? 1L : 0L) << j;
            }
            return bits;
        }

        /** Bit j set for each of s[from..from+len) below t. */
        private static long beyondBelow(float[] s, int from, int len, double t) {
            long bits = 0;
            for (int j = 0; j < len; j++) {
                bits |= (s[from + j] < t ? 1L : 0L) << j;
            }
            return bits;
        }

        /** The first set bit at or after {@code from} below {@code limit}, or {@code limit}. */
        private static int nextSet(long[] bits, int from, int limit) {
            int k = from >>> 6;
            if (k >= bits.length) {
                return limit;
            }
            long word = bits[k] & (-1L << from);
            while (word == 0) {
                if (++k == bits.length) {
                    return limit;
                }
                word = bits[k];
            }
            return Math.min(limit, (k << 6) + Long.numberOfTrailingZeros(word));
        }

        /** The first clear bit at or after {@code from} below {@code limit}, or {@code limit}. */
        private static int nextClear(long[] bits, int from, int limit) {
            int k = from >>> 6;
            if (k >= bits.length) {
                return limit;
            }
            long word = ~bits[k] & (-1L << from);
            while (word == 0) {
                if (++k == bits.length) {
                    return limit;
                }
                word = ~bits[k];
            }
            return Math.min(limit, (k << 6) + Long.numberOfTrailingZeros(word));
        }

        /**
         * The component of every run under 8-connectivity (a run touches the runs of the row above whose columns
         * overlap its own widened by one), as the index of the component's first run in raster order.
         */
        int[] components() {
            int[] parent = new int[size];
            for (int r = 0; r < size; r++) {
                parent[r] = r;
            }
            for (int row = 1; row < rowStart.length - 1; row++) {
                int above = rowStart[row - 1];
                int aboveEnd = rowStart[row];
                for (int r = rowStart[row], end = rowStart[row + 1]; r < end; r++) {
                    // runs above that end left of this one's reach can be skipped for the later runs of this row too
                    while (above < aboveEnd && x1[above] < x0[r] - 1) {
                        above++;
                    }
                    for (int a = above; a < aboveEnd && x0[a] <= x1[r] + 1; a++) {
                        union(parent, a, r);
                    }
                }
            }
            for (int r = 0; r < size; r++) {
                parent[r] = parent[parent[r]];
            }
            return parent;
        }

        /** Joins the components of a and b; the root is the lower run index. */
        private static void union(int[] parent, int a, int b) {
            int ra = find(parent, a);
            int rb = find(parent, b);
            if (ra < rb) {
                parent[rb] = ra;
            } else if (rb < ra) {
                parent[ra] = rb;
            }
        }

        private static int find(int[] parent, int a) {
            while (parent[a] != a) {
                parent[a] = parent[parent[a]];
                a = parent[a];
            }
            return a;
        }
    }

    /** Distance of a pixel centre from the wafer edge, mm. */
    private interface EdgeDistance {
        /** The least distance of the pixels x0..x1 of row y (whose first pixel has index {@code row}). */
        double leastOnRow(int row, int x0, int x1, int y);
    }

    /**
     * Distances to a wafer shape's outline, which change by at most one pitch from a pixel to the next: after an
     * exact distance d, the next ⌊(d − least so far − margin) / pitch⌋ pixels cannot hold a smaller one and are
     * skipped. The margin of 1e-6 mm keeps rounding from skipping a pixel whose computed distance would be the least.
     */
    private record ShapeEdge(WaferShape.Prepared shape, PixelGrid grid) implements EdgeDistance {
        @Override
        public double leastOnRow(int row, int x0, int x1, int y) {
            double yMm = grid.yMm(y);
            double pitch = grid.pitchMm();
            double first = shape.distanceToEdgeMm(grid.xMm(x0), yMm);
            double least = Math.min(first, shape.distanceToEdgeMm(grid.xMm(x1), yMm));
            double last = first;
            int lastX = x0;
            for (int x = x0 + 1; x < x1; ) {
                double free = (last - least - 1e-6) / pitch;
                if (free >= x - lastX) {
                    x = lastX + (int) Math.min(x1 - lastX, (long) free) + 1;
                    continue;
                }
                last = shape.distanceToEdgeMm(grid.xMm(x), yMm);
                lastX = x;
                least = Math.min(least, last);
                x++;
            }
            return least;
        }
    }

    private record OutlineEdge(float[] distanceMm) implements EdgeDistance {
        @Override
        public double leastOnRow(int row, int x0, int x1, int y) {
            double least = Double.POSITIVE_INFINITY;
            for (int x = x0; x <= x1; x++) {
                least = Math.min(least, distanceMm[row + x]);
            }
            return least;
        }
    }
}
