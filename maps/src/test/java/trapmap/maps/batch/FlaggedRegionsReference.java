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
 * The labelling of {@link FlaggedRegions} as it was written before it was split into small methods (one method of
 * twelve parameters that C2 compiled five times per batch): the reference the split one must equal exactly.
 */
final class FlaggedRegionsReference {

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
        float[] densityAt = density == null ? null : buffers.densityAt(n);
        int[] seeds = buffers.seeds(n);
        int selected = 0;
        for (int k = 0; k < count; k++) {
            float v = flag[k];
            if (criteria.selects(v)) {
                int i = indices[k];
                open[i] = true;
                at[i] = v;
                if (densityAt != null) {
                    densityAt[i] = density[k];
                }
                seeds[selected++] = i;
            }
        }
        return label(at, grid.width(), grid.height(), grid, seeds, selected, open, criteria, shape, densityAt,
                insideMm, buffers.queue(Math.max(16, n)));
    }

    /**
     * Labels the selected pixels, {@code seeds[0..selected)} in ascending order and marked in {@code open} (cleared as
     * they are labelled), each region from its first pixel in that order; {@code s} and {@code density} are read at
     * those pixels only.
     */
    private static FlaggedRegions label(float[] s, int w, int h, PixelGrid grid, int[] seeds, int selected,
                                        boolean[] open, RegionCriteria criteria, WaferShape shape, float[] density,
                                        double insideMm, int[] queue) {
        WaferShape.Prepared edge = shape == null ? null : shape.prepared();
        double pixelArea = grid.pixelAreaMm2();
        int[] offset = new int[8];
        for (int k = 0; k < 8; k++) {
            offset[k] = DY[k] * w + DX[k];
        }
        List<FlaggedRegions.FlaggedRegion> regions = new ArrayList<>();
        BitSet kept = new BitSet(w * h);
        boolean above = criteria.side() == RegionCriteria.Side.ABOVE;
        boolean bordersOnly = insideMm >= grid.pitchMm();
        for (int next = 0; next < selected; next++) {
            int seed = seeds[next];
            if (!open[seed]) {
                continue;
            }
            open[seed] = false;
            int head = 0;
            int tail = 0;
            queue[tail++] = seed;
            long sumX = 0;
            long sumY = 0;
            double sumValue = 0;
            int minX = Integer.MAX_VALUE;
            int maxX = -1;
            int minY = Integer.MAX_VALUE;
            int maxY = -1;
            int peakIndex = seed;
            double peak = s[seed];
            // breadth-first, so the pixels are summed in the same order as ThresholdRegions sums them
            while (head < tail) {
                int i = queue[head++];
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
                if (x > 0 && y > 0 && x < w - 1 && y < h - 1) {
                    for (int k = 0; k < 8; k++) {
                        int j = i + offset[k];
                        if (open[j]) {
                            open[j] = false;
                            queue[tail++] = j;
                        }
                    }
                } else {
                    for (int k = 0; k < 8; k++) {
                        int nx = x + DX[k];
                        int ny = y + DY[k];
                        if (nx >= 0 && ny >= 0 && nx < w && ny < h && open[ny * w + nx]) {
                            open[ny * w + nx] = false;
                            queue[tail++] = ny * w + nx;
                        }
                    }
                }
            }
            int size = tail;
            double area = size * pixelArea;
            if (area < criteria.minAreaMm2()) {
                continue;
            }
            double nearest = Double.POSITIVE_INFINITY;
            float[] dens = density == null ? null : new float[size];
            double peakDensity = Double.NEGATIVE_INFINITY;
            for (int k = 0; k < size; k++) {
                kept.set(queue[k]);
            }
            if (edge != null) {
                for (int k = 0; k < size; k++) {
                    int i = queue[k];
                    int y = i / w;
                    int x = i - y * w;
                    // earlier kept regions never touch this one (they would be the same 8-connected region)
                    if (bordersOnly && x > 0 && y > 0 && x < w - 1 && y < h - 1 && kept.get(i - 1)
                            && kept.get(i + 1) && kept.get(i - w) && kept.get(i + w)) {
                        continue;
                    }
                    nearest = Math.min(nearest, edge.distanceToEdgeMm(grid.xMm(x), grid.yMm(y)));
                }
            }
            for (int k = 0; k < size; k++) {
                int i = queue[k];
                if (dens != null) {
                    dens[k] = density[i];
                    if (density[i] > peakDensity) {
                        peakDensity = density[i];
                    }
                }
            }
            double medianDensity = Double.NaN;
            if (dens != null) {
                // the median MapStatistics.of gives: the type-7 P50 of the values that are not NaN
                int m = 0;
                for (float f : dens) {
                    if (f == f) {
                        dens[m++] = f;
                    }
                }
                medianDensity = MapStatistics.percentiles(dens, m, new double[] {50})[0];
                peakDensity = m == 0 ? Double.NaN : peakDensity;
            } else {
                peakDensity = Double.NaN;
            }
            double halfPx = 0.5;
            Region.BoundsMm bounds = new Region.BoundsMm(grid.xMm(minX - halfPx), grid.yMm(maxY + halfPx),
                    grid.xMm(maxX + halfPx), grid.yMm(minY - halfPx));
            double cx = (double) sumX / size;
            double cy = (double) sumY / size;
            Region.CentroidPixel at = Region.CentroidPixel.of(queue, size, w, cx, cy);
            Region r = new Region(regions.size() + 1, size, area, grid.xMm(cx), grid.yMm(cy), bounds, peak,
                    grid.xMm(peakIndex % w), grid.yMm(peakIndex / w), sumValue / size,
                    edge == null ? Double.NaN : nearest, at.inside(),
                    at.inside() ? grid.xMm(cx) : grid.xMm(at.nearestIndex() % w),
                    at.inside() ? grid.yMm(cy) : grid.yMm(at.nearestIndex() / w));
            regions.add(new FlaggedRegions.FlaggedRegion(r, peakDensity, medianDensity));
        }
        return new FlaggedRegions(regions, kept);
    }
}
