package trapmap.maps.batch;

import java.util.ArrayList;
import java.util.BitSet;
import java.util.List;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.maps.region.Region;
import trapmap.maps.region.RegionCriteria;
import trapmap.maps.stats.MapStatistics;

/**
 * The flagged regions of one wafer in a single labelling pass: the same regions, in the same order and with the same
 * figures, as {@link trapmap.maps.region.ThresholdRegions#find} with a wafer shape (8-connected pixels strictly beyond
 * the threshold inside the mask, kept from the minimum area on), plus the pixels of the kept regions (for the
 * footprint and the thumbnail) and each region's trap density (peak and median) when a trap-density map is given.
 *
 * @param regions the kept regions, numbered in scan order from the top row
 * @param pixels  the pixels of the kept regions
 */
public record FlaggedRegions(List<FlaggedRegion> regions, BitSet pixels) {

    /**
     * One flagged region with its trap density.
     *
     * @param region            position, area and the flagged quantity's peak and mean
     * @param peakDensityCm3    largest trap density in the region, cm^-3 (NaN without a trap-density map)
     * @param medianDensityCm3  median trap density of the region, cm^-3 (NaN without a trap-density map)
     */
    public record FlaggedRegion(Region region, double peakDensityCm3, double medianDensityCm3) {
    }

    public FlaggedRegions {
        regions = List.copyOf(regions);
    }

    /** Total area of the kept regions, mm². */
    public double totalAreaMm2() {
        return regions.stream().mapToDouble(r -> r.region().areaMm2()).sum();
    }

    /** The region of largest area (the first such in scan order), or null when there is none. */
    public FlaggedRegion largest() {
        FlaggedRegion best = null;
        for (FlaggedRegion r : regions) {
            if (best == null || r.region().areaMm2() > best.region().areaMm2()) {
                best = r;
            }
        }
        return best;
    }

    /**
     * Pixels per call of the loops over a region's pixels, which are split into calls of at most this many: a loop
     * that runs long in one call is compiled while it runs (on-stack replacement) and then again as a whole method;
     * short calls reach HotSpot's call-count threshold before the loop-count one (the ratio of the two is about 66,
     * with the JVM's default thresholds and with those the launcher sets for batches), so that the method is mostly
     * compiled once, at its call; either way what is compiled is the small method, not the labelling around it.
     */
    static final int CHUNK = 64;

    private static final int[] DX = {-1, 0, 1, -1, 1, -1, 0, 1};
    private static final int[] DY = {-1, -1, -1, 0, 0, 1, 1, 1};

    /**
     * The flagged regions of {@code raster} among the pixels of {@code mask}, without trap densities: the pixels the
     * batch flags for the same criteria.
     */
    public static FlaggedRegions find(FloatRaster raster, PixelGrid grid, Mask mask, RegionCriteria criteria,
                                      WaferShape shape) {
        int[] indices = new int[mask.count()];
        int n = 0;
        for (int i = mask.nextIndex(0); i >= 0; i = mask.nextIndex(i + 1)) {
            indices[n++] = i;
        }
        return find(raster, grid, indices, n, criteria, shape, null);
    }

    /**
     * Labels the flagged pixels of {@code raster}.
     *
     * @param indices pixels that may be flagged, ascending: {@code indices[0..count)}
     * @param shape   wafer outline for the edge distances, or null (edge distances NaN)
     * @param density trap-density samples of the same grid, or null
     */
    public static FlaggedRegions find(FloatRaster raster, PixelGrid grid, int[] indices, int count,
                                      RegionCriteria criteria, WaferShape shape, float[] density) {
        return find(raster, grid, indices, count, criteria, shape, density, Double.NEGATIVE_INFINITY);
    }

    /**
     * As {@link #find(FloatRaster, PixelGrid, int[], int, RegionCriteria, WaferShape, float[])}, for pixels known to
     * lie at least {@code insideMm} inside {@code shape}. When that is at least one pitch, a region's distance to the
     * edge is taken over its border pixels only (those with a 4-neighbour outside the region): the distance d to the
     * outline is the distance to a nearest outline point q, and the 4-neighbour one step towards q along the larger
     * component of q − p (at least d/√2 &gt; pitch/2) is strictly closer to q, so a pixel whose four neighbours are in
     * the region is never the nearest. The result is the same; only fewer distances are computed.
     */
    public static FlaggedRegions find(FloatRaster raster, PixelGrid grid, int[] indices, int count,
                                      RegionCriteria criteria, WaferShape shape, float[] density, double insideMm) {
        float[] s = raster.samples();
        boolean[] open = new boolean[s.length];
        int[] seeds = new int[count];
        int selected = 0;
        for (int k = 0; k < count; k++) {
            int i = indices[k];
            if (criteria.selects(s[i])) {
                open[i] = true;
                seeds[selected++] = i;
            }
        }
        return label(s, raster.width(), raster.height(), grid, seeds, selected, open, criteria, shape, density,
                insideMm, new int[Math.max(16, selected)]);
    }

    /**
     * As {@link #find(FloatRaster, PixelGrid, int[], int, RegionCriteria, WaferShape, float[], double)} from the
     * flagged quantity and the trap density (null: none) packed in index order, {@code flag[k]} and
     * {@code density[k]} being the values of pixel {@code indices[k]}, with the working arrays of {@code buffers}:
     * the values of the selected pixels are placed at their pixels in map-sized buffers, and only those are read.
     */
    static FlaggedRegions findPacked(float[] flag, float[] density, PixelGrid grid, int[] indices, int count,
                                     RegionCriteria criteria, WaferShape shape, double insideMm,
                                     InspectionBuffers buffers) {
        int n = grid.width() * grid.height();
        boolean[] open = buffers.open(n);
        float[] at = buffers.flagAt(n);
        // the flag on the trap density reads the same values as the densities: one map-sized array for both
        float[] densityAt = density == null ? null : density == flag ? at : buffers.densityAt(n);
        int[] seeds = buffers.seeds(n);
        int selected = criteria.side() == RegionCriteria.Side.ABOVE
                ? selectAbove(flag, count, criteria.threshold(), seeds)
                : selectBelow(flag, count, criteria.threshold(), seeds);
        for (int q = 0; q < selected; q += CHUNK) {
            place(flag, density, indices, seeds, q, Math.min(selected, q + CHUNK), open, at, densityAt);
        }
        return label(at, grid.width(), grid.height(), grid, seeds, selected, open, criteria, shape, densityAt,
                insideMm, buffers.queue(Math.max(16, n)));
    }

    /**
     * Places the selected pixels {@code seeds[from..to)} (positions k in the packed values) at their pixels
     * {@code indices[k]}: opens them, copies their values into the map-sized buffers, and replaces each position by
     * its pixel index.
     */
    private static void place(float[] flag, float[] density, int[] indices, int[] seeds, int from, int to,
                              boolean[] open, float[] at, float[] densityAt) {
        for (int q = from; q < to; q++) {
            int k = seeds[q];
            int i = indices[k];
            open[i] = true;
            at[i] = flag[k];
            if (densityAt != null && densityAt != at) {
                densityAt[i] = density[k];
            }
            seeds[q] = i;
        }
    }

    /**
     * The positions k of the values {@code flag[0..count)} strictly above {@code threshold}, ascending, into
     * {@code positions}; returns how many. Without a branch per value (every position is written, and the count
     * grows by one where the value is selected); the comparison of {@link RegionCriteria#selects}.
     */
    private static int selectAbove(float[] flag, int count, double threshold, int[] positions) {
        int n = 0;
        for (int k = 0; k < count; k++) {
            positions[n] = k;
            n += (double) flag[k] > threshold ? 1 : 0;
        }
        return n;
    }

    /** As {@link #selectAbove} for the values strictly below {@code threshold}. */
    private static int selectBelow(float[] flag, int count, double threshold, int[] positions) {
        int n = 0;
        for (int k = 0; k < count; k++) {
            positions[n] = k;
            n += (double) flag[k] < threshold ? 1 : 0;
        }
        return n;
    }

    /**
     * Labels the selected pixels, {@code seeds[0..selected)} in ascending order and marked in {@code open} (cleared as
     * they are labelled), each region from its first pixel in that order; {@code s} and {@code density} are read at
     * those pixels only.
     *
     * <p>The work is split into small methods, each with one loop: finding the next unlabelled seed, growing a region,
     * and the figures of a kept region. A batch calls this once per wafer with long loops, so HotSpot compiles what
     * runs long while it runs (on-stack replacement): one large method of all of it was compiled by C2 five times a
     * batch (each loop separately, and again when a class first used at a region that is kept was not yet loaded), at
     * about 0.2 s of compiler CPU each; the small methods are compiled once each, cheaply.
     */
    private static FlaggedRegions label(float[] s, int w, int h, PixelGrid grid, int[] seeds, int selected,
                                        boolean[] open, RegionCriteria criteria, WaferShape shape, float[] density,
                                        double insideMm, int[] queue) {
        Labelling l = new Labelling(s, w, h, grid, open, queue, criteria, shape, density, insideMm);
        int next = 0;
        while ((next = nextOpen(seeds, next, selected, open)) < selected) {
            int size = l.grow(seeds[next++]);
            if (!(size * l.pixelArea < criteria.minAreaMm2())) {
                l.keep(size);
            }
        }
        return new FlaggedRegions(l.regions, l.kept);
    }

    /** The first k in [{@code from}, {@code selected}) whose seed is still open, or {@code selected}. */
    private static int nextOpen(int[] seeds, int from, int selected, boolean[] open) {
        int k = from;
        while (k < selected && !open[seeds[k]]) {
            k++;
        }
        return k;
    }

    /** One labelling: the inputs, the queue of the region being grown, and the regions kept so far. */
    private static final class Labelling {
        final float[] s;
        final int w;
        final int h;
        final PixelGrid grid;
        final boolean[] open;
        /** The pixels of the region grown last, in the order they were reached (breadth-first). */
        final int[] queue;
        final boolean above;
        final WaferShape.Prepared edge;
        final double centreXMm;
        final double centreYMm;
        /** Working arrays of {@link #nearestEdgeMm}: the pixels that may be nearest, and their least distances. */
        int[] candidates = new int[64];
        double[] lowest = new double[64];
        final float[] density;
        final boolean bordersOnly;
        final double pixelArea;
        final int[] offset = new int[8];
        final List<FlaggedRegion> regions = new ArrayList<>();
        final BitSet kept;

        Labelling(float[] s, int w, int h, PixelGrid grid, boolean[] open, int[] queue, RegionCriteria criteria,
                  WaferShape shape, float[] density, double insideMm) {
            this.s = s;
            this.w = w;
            this.h = h;
            this.grid = grid;
            this.open = open;
            this.queue = queue;
            this.above = criteria.side() == RegionCriteria.Side.ABOVE;
            this.edge = shape == null ? null : shape.prepared();
            this.centreXMm = shape == null ? 0 : shape.centreXMm();
            this.centreYMm = shape == null ? 0 : shape.centreYMm();
            this.density = density;
            this.bordersOnly = insideMm >= grid.pitchMm();
            this.pixelArea = grid.pixelAreaMm2();
            this.kept = new BitSet(w * h);
            for (int k = 0; k < 8; k++) {
                offset[k] = DY[k] * w + DX[k];
            }
        }

        /**
         * Grows the region of {@code seed} breadth-first over the open pixels (8-connected) into the queue, clearing
         * them in {@code open}; returns its pixel count. Breadth-first, so that the pixels are summed in the same
         * order as ThresholdRegions sums them.
         */
        int grow(int seed) {
            boolean[] open = this.open;
            int[] queue = this.queue;
            int[] offset = this.offset;
            int w = this.w;
            int h = this.h;
            open[seed] = false;
            queue[0] = seed;
            int tail = 1;
            for (int head = 0; head < tail; head++) {
                int i = queue[head];
                int y = i / w;
                int x = i - y * w;
                if (x > 0 && y > 0 && x < w - 1 && y < h - 1) {
                    for (int k = 0; k < 8; k++) {
                        int j = i + offset[k];
                        if (open[j]) {
                            open[j] = false;
                            queue[tail++] = j;
                        }
                    }
                } else {
                    tail = growAtBorder(x, y, tail);
                }
            }
            return tail;
        }

        /** The open neighbours of the pixel (x, y) on the raster's border, queued from {@code tail}; the new tail. */
        private int growAtBorder(int x, int y, int tail) {
            for (int k = 0; k < 8; k++) {
                int nx = x + DX[k];
                int ny = y + DY[k];
                if (nx >= 0 && ny >= 0 && nx < w && ny < h && open[ny * w + nx]) {
                    open[ny * w + nx] = false;
                    queue[tail++] = ny * w + nx;
                }
            }
            return tail;
        }

        /** Keeps the region in {@code queue[0..size)}: its pixels and its figures. */
        void keep(int size) {
            for (int k = 0; k < size; k += CHUNK) {
                markKept(k, Math.min(size, k + CHUNK));
            }
            double nearest = edge == null ? Double.NaN : nearestEdgeMm(size);
            double[] densities = density == null ? null : densities(size);
            regions.add(new FlaggedRegion(region(size, nearest), densities == null ? Double.NaN : densities[0],
                    densities == null ? Double.NaN : densities[1]));
        }

        /** Sums, bounds and peak of {@link #region} so far (the pixels before the current chunk). */
        private long sumX;
        private long sumY;
        private double sumValue;
        private int minX;
        private int maxX;
        private int minY;
        private int maxY;
        private int peakIndex;
        private double peak;

        /** Adds the queued pixels {@code queue[from..to)} to the sums, bounds and peak of {@link #region}. */
        private void sums(int from, int to) {
            long sumX = this.sumX;
            long sumY = this.sumY;
            double sumValue = this.sumValue;
            int minX = this.minX;
            int maxX = this.maxX;
            int minY = this.minY;
            int maxY = this.maxY;
            int peakIndex = this.peakIndex;
            double peak = this.peak;
            for (int k = from; k < to; k++) {
                int i = queue[k];
                int y = i / w;
                int x = i - y * w;
                double v = s[i];
                sumX += x;
                sumY += y;
                sumValue += v;
                minX = Math.min(minX, x);
                maxX = Math.max(maxX, x);
                minY = Math.min(minY, y);
                maxY = Math.max(maxY, y);
                if ((above ? v > peak : v < peak) || v == peak && i < peakIndex) {
                    peak = v;
                    peakIndex = i;
                }
            }
            this.sumX = sumX;
            this.sumY = sumY;
            this.sumValue = sumValue;
            this.minX = minX;
            this.maxX = maxX;
            this.minY = minY;
            this.maxY = maxY;
            this.peakIndex = peakIndex;
            this.peak = peak;
        }

        /**
         * The values of {@code values} at the queued pixels {@code queue[from..to)} that are not NaN, into
         * {@code into} from {@code n}; returns the new count.
         */
        private int valuesOf(float[] values, int from, int to, float[] into, int n) {
            for (int k = from; k < to; k++) {
                float f = values[queue[k]];
                into[n] = f;
                n += f == f ? 1 : 0;
            }
            return n;
        }

        /** The first largest of {@code values[from..to)} (none NaN), or −∞ when the range is empty. */
        private static float largest(float[] values, int from, int to) {
            float top = Float.NEGATIVE_INFINITY;
            for (int k = from; k < to; k++) {
                if (values[k] > top) {
                    top = values[k];
                }
            }
            return top;
        }

        /** Adds the queued pixels {@code queue[from..to)} to {@link #kept}. */
        private void markKept(int from, int to) {
            for (int k = from; k < to; k++) {
                kept.set(queue[k]);
            }
        }

        /** The region's figures: centroid, bounds, peak (the first pixel in index order of equal peaks) and mean. */
        private Region region(int size, double nearestEdgeMm) {
            sumX = 0;
            sumY = 0;
            sumValue = 0;
            minX = Integer.MAX_VALUE;
            maxX = -1;
            minY = Integer.MAX_VALUE;
            maxY = -1;
            peakIndex = queue[0];
            peak = s[peakIndex];
            for (int k = 0; k < size; k += CHUNK) {
                sums(k, Math.min(size, k + CHUNK));
            }
            double halfPx = 0.5;
            Region.BoundsMm bounds = new Region.BoundsMm(grid.xMm(minX - halfPx), grid.yMm(maxY + halfPx),
                    grid.xMm(maxX + halfPx), grid.yMm(minY - halfPx));
            double cx = (double) sumX / size;
            double cy = (double) sumY / size;
            Region.CentroidPixel at = Region.CentroidPixel.of(queue, size, w, cx, cy);
            return new Region(regions.size() + 1, size, size * pixelArea, grid.xMm(cx), grid.yMm(cy), bounds, peak,
                    grid.xMm(peakIndex % w), grid.yMm(peakIndex / w), sumValue / size, nearestEdgeMm, at.inside(),
                    at.inside() ? grid.xMm(cx) : grid.xMm(at.nearestIndex() % w),
                    at.inside() ? grid.yMm(cy) : grid.yMm(at.nearestIndex() / w));
        }

        /**
         * The region's distance to the wafer's edge, mm: the least over its pixels, or over its border pixels only
         * when the pixels lie at least a pitch inside (see {@link #find(FloatRaster, PixelGrid, int[], int,
         * RegionCriteria, WaferShape, float[], double)}). Called after the region's pixels were added to
         * {@code kept}; earlier kept regions never touch this one (they would be the same 8-connected region). The
         * least is that of the exact distances ({@link WaferShape.Prepared#distanceToEdgeMm}); the exact one is
         * computed only for pixels whose near distance less its error bound is at most the least near distance plus
         * its error bound.
         */
        private double nearestEdgeMm(int size) {
            // first the near distances of the pixels that may be nearest, each with the least its exact distance can
            // be; the least exact distance is at most the least near distance plus its error bound, so only pixels
            // whose least possible distance is no more than that need the exact distance (hypot)
            if (candidates.length < size) {
                candidates = new int[Math.max(size, 2 * candidates.length)];
                lowest = new double[candidates.length];
            }
            m = 0;
            upper = Double.POSITIVE_INFINITY;
            exactly = false;
            for (int k = 0; k < size; k += CHUNK) {
                nearDistances(k, Math.min(size, k + CHUNK));
            }
            return exactDistance();
        }

        /** Pixels per call of the loops over a region's pixels (see {@link #CHUNK}). */
        private static final int CHUNK = FlaggedRegions.CHUNK;
        /** Candidates of {@link #nearestEdgeMm} so far: {@code candidates[0..m)}. */
        private int m;
        /** Least near distance plus its error bound so far, mm. */
        private double upper;
        /** True once a near distance was NaN (no bound): every candidate's exact distance is taken. */
        private boolean exactly;

        /** The candidates among the queued pixels {@code queue[from..to)}, with their least possible distances. */
        private void nearDistances(int from, int to) {
            int[] candidates = this.candidates;
            double[] lowest = this.lowest;
            int m = this.m;
            double upper = this.upper;
            boolean exactly = this.exactly;
            for (int k = from; k < to; k++) {
                int i = queue[k];
                int y = i / w;
                int x = i - y * w;
                if (bordersOnly && x > 0 && y > 0 && x < w - 1 && y < h - 1 && kept.get(i - 1)
                        && kept.get(i + 1) && kept.get(i - w) && kept.get(i + w)) {
                    continue;
                }
                double xMm = grid.xMm(x);
                double yMm = grid.yMm(y);
                double error = edge.nearDistanceErrorMm(Math.abs(xMm - centreXMm) + Math.abs(yMm - centreYMm));
                double near = edge.nearDistanceToEdgeMm(xMm, yMm);
                exactly |= near != near; // NaN: no bound, every candidate's exact distance is taken
                upper = Math.min(upper, near + error);
                candidates[m] = i;
                lowest[m++] = near - error;
            }
            this.m = m;
            this.upper = upper;
            this.exactly = exactly;
        }

        /** The least exact distance of the candidates that may be nearest, mm. */
        private double exactDistance() {
            double nearest = Double.POSITIVE_INFINITY;
            for (int c = 0; c < m; c++) {
                if (exactly || lowest[c] <= upper) {
                    int i = candidates[c];
                    int y = i / w;
                    nearest = Math.min(nearest, edge.distanceToEdgeMm(grid.xMm(i - y * w), grid.yMm(y)));
                }
            }
            return nearest;
        }

        /**
         * The region's peak and median trap density, cm^-3: the largest value and the median MapStatistics.of gives
         * (the type-7 P50 of the values that are not NaN); both NaN when every value is NaN.
         */
        private double[] densities(int size) {
            float[] dens = new float[size];
            int m = 0;
            for (int k = 0; k < size; k += CHUNK) {
                m = valuesOf(density, k, Math.min(size, k + CHUNK), dens, m);
            }
            double peakDensity = Double.NEGATIVE_INFINITY;
            for (int k = 0; k < m; k += CHUNK) {
                double top = largest(dens, k, Math.min(m, k + CHUNK));
                if (top > peakDensity) {
                    peakDensity = top;
                }
            }
            if (m == 0) {
                return new double[] {Double.NaN, Double.NaN};
            }
            return new double[] {peakDensity, MapStatistics.percentiles(dens, m, new double[] {50})[0]};
        }
    }
}
