package trapmap.maps.region;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.BitSet;
import java.util.List;
import trapmap.maps.geometry.DataOutline;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.check.Checks;

/**
 * Connected regions above or below a threshold: the pixels inside a mask whose value lies strictly beyond the
 * threshold, grouped by 8-connectivity (diagonal neighbours join), then filtered by area. The flood fill runs on an
 * explicit queue, so a region of any size (a whole 16-megapixel map) needs no recursion; the pixels are visited once
 * and the per-region sums are gathered on the way, without a label image.
 */
public final class ThresholdRegions {
    private static final int[] DX = {-1, 0, 1, -1, 1, -1, 0, 1};
    private static final int[] DY = {-1, -1, -1, 0, 0, 1, 1, 1};

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
        BitSet open = new BitSet(s.length);
        for (int i = 0; i < s.length; i++) {
            if ((mask == null || mask.containsIndex(i)) && criteria.selects(s[i])) {
                open.set(i);
            }
        }
        EdgeDistance edge = shape != null ? new ShapeEdge(shape.prepared(), grid)
                : new OutlineEdge(DataOutline.edgeDistanceMm(DataOutline.filled(raster), grid));
        double pixelArea = grid.pixelAreaMm2();
        int[] offset = new int[8];
        for (int k = 0; k < 8; k++) {
            offset[k] = DY[k] * w + DX[k];
        }
        List<Region> regions = new ArrayList<>();
        IntQueue queue = new IntQueue(1024);
        int[] members = new int[1024];
        for (int seed = open.nextSetBit(0); seed >= 0; seed = open.nextSetBit(seed + 1)) {
            open.clear(seed);
            queue.add(seed);
            long count = 0;
            long sumX = 0;
            long sumY = 0;
            double sumValue = 0;
            int minX = Integer.MAX_VALUE;
            int maxX = -1;
            int minY = Integer.MAX_VALUE;
            int maxY = -1;
            int peakIndex = seed;
            double peak = s[seed];
            double nearest = Double.POSITIVE_INFINITY;
            while (!queue.isEmpty()) {
                int i = queue.poll();
                int y = i / w;
                int x = i - y * w;
                double v = s[i];
                if (count == members.length) {
                    members = Arrays.copyOf(members, members.length * 2);
                }
                members[(int) count] = i;
                count++;
                sumX += x;
                sumY += y;
                sumValue += v;
                minX = Math.min(minX, x);
                maxX = Math.max(maxX, x);
                minY = Math.min(minY, y);
                maxY = Math.max(maxY, y);
                if (criteria.morePeaked(v, peak) || v == peak && i < peakIndex) {
                    peak = v;
                    peakIndex = i;
                }
                nearest = Math.min(nearest, edge.mm(i, x, y));
                if (x > 0 && y > 0 && x < w - 1 && y < h - 1) {
                    for (int k = 0; k < 8; k++) {
                        int j = i + offset[k];
                        if (open.get(j)) {
                            open.clear(j);
                            queue.add(j);
                        }
                    }
                } else {
                    for (int k = 0; k < 8; k++) {
                        int nx = x + DX[k];
                        int ny = y + DY[k];
                        if (nx >= 0 && ny >= 0 && nx < w && ny < h) {
                            int j = ny * w + nx;
                            if (open.get(j)) {
                                open.clear(j);
                                queue.add(j);
                            }
                        }
                    }
                }
            }
            double area = count * pixelArea;
            if (area < criteria.minAreaMm2()) {
                continue;
            }
            double halfPx = 0.5;
            Region.BoundsMm bounds = new Region.BoundsMm(grid.xMm(minX - halfPx), grid.yMm(maxY + halfPx),
                    grid.xMm(maxX + halfPx), grid.yMm(minY - halfPx));
            double cx = (double) sumX / count;
            double cy = (double) sumY / count;
            Region.CentroidPixel at = Region.CentroidPixel.of(members, (int) count, w, cx, cy);
            regions.add(new Region(regions.size() + 1, (int) count, area, grid.xMm(cx), grid.yMm(cy), bounds, peak,
                    grid.xMm(peakIndex % w), grid.yMm(peakIndex / w), sumValue / count, nearest, at.inside(),
                    at.inside() ? grid.xMm(cx) : grid.xMm(at.nearestIndex() % w),
                    at.inside() ? grid.yMm(cy) : grid.yMm(at.nearestIndex() / w)));
        }
        return new RegionTable(regions, criteria, shape != null ? RegionTable.EdgeReference.WAFER_SHAPE
                : RegionTable.EdgeReference.DATA_OUTLINE);
    }

    /** Distance of a pixel centre from the wafer edge, mm. */
    private interface EdgeDistance {
        double mm(int index, int x, int y);
    }

    private record ShapeEdge(WaferShape.Prepared shape, PixelGrid grid) implements EdgeDistance {
        @Override
        public double mm(int index, int x, int y) {
            return shape.distanceToEdgeMm(grid.xMm(x), grid.yMm(y));
        }
    }

    private record OutlineEdge(float[] distanceMm) implements EdgeDistance {
        @Override
        public double mm(int index, int x, int y) {
            return distanceMm[index];
        }
    }

    /** A growable FIFO of ints (ring buffer). */
    private static final class IntQueue {
        private int[] items;
        private int head;
        private int size;

        IntQueue(int capacity) {
            items = new int[capacity];
        }

        void add(int v) {
            if (size == items.length) {
                int[] bigger = new int[items.length * 2];
                int tail = items.length - head;
                System.arraycopy(items, head, bigger, 0, tail);
                System.arraycopy(items, 0, bigger, tail, head);
                items = bigger;
                head = 0;
            }
            int at = head + size;
            items[at < items.length ? at : at - items.length] = v;
            size++;
        }

        int poll() {
            int v = items[head];
            head = head + 1 == items.length ? 0 : head + 1;
            size--;
            return v;
        }

        boolean isEmpty() {
            return size == 0;
        }
    }
}
