package trapmap.maps.region;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import java.util.concurrent.ForkJoinPool;
import org.junit.jupiter.api.Test;
import trapmap.maps.geometry.RoundWafer;
import trapmap.maps.geometry.SquareWafer;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;

/**
 * The run-length labelling of {@link ThresholdRegions} against a plain 8-connected flood fill on random maps, and
 * the same regions on one thread as on several.
 */
class RunLabellingTest {

    /** Blobs of all shapes and sizes: smoothed noise, plus single pixels and diagonal chains. */
    private static float[] blobs(int w, int h, long seed) {
        Random rnd = new Random(seed);
        float[] noise = new float[w * h];
        for (int i = 0; i < noise.length; i++) {
            noise[i] = (float) rnd.nextGaussian();
        }
        float[] s = new float[w * h];
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                double sum = 0;
                for (int dy = -2; dy <= 2; dy++) {
                    for (int dx = -2; dx <= 2; dx++) {
                        int xx = Math.min(w - 1, Math.max(0, x + dx));
                        int yy = Math.min(h - 1, Math.max(0, y + dy));
                        sum += noise[yy * w + xx];
                    }
                }
                s[y * w + x] = (float) (sum / 5);
            }
        }
        for (int k = 0; k < 40; k++) {
            int x = rnd.nextInt(w - 10);
            int y = rnd.nextInt(h - 10);
            for (int d = 0; d < 8; d++) {
                s[(y + d) * w + x + d] = 9; // a diagonal chain: one region under 8-connectivity
            }
        }
        for (int i = 0; i < s.length; i += 211) {
            s[i] = Float.NaN;
        }
        return s;
    }

    /** The regions a plain breadth-first flood fill finds, seeded in index order. */
    private static List<Region> reference(float[] s, PixelGrid grid, Mask mask, RegionCriteria c, WaferShape shape) {
        int w = grid.width();
        int h = grid.height();
        boolean[] seen = new boolean[s.length];
        List<Region> out = new ArrayList<>();
        WaferShape.Prepared p = shape.prepared();
        for (int seed = 0; seed < s.length; seed++) {
            if (seen[seed] || !mask.containsIndex(seed) || !c.selects(s[seed])) {
                continue;
            }
            List<Integer> members = new ArrayList<>();
            ArrayDeque<Integer> queue = new ArrayDeque<>();
            queue.add(seed);
            seen[seed] = true;
            while (!queue.isEmpty()) {
                int i = queue.poll();
                members.add(i);
                for (int dy = -1; dy <= 1; dy++) {
                    for (int dx = -1; dx <= 1; dx++) {
                        int x = i % w + dx;
                        int y = i / w + dy;
                        int j = y * w + x;
                        if (x >= 0 && y >= 0 && x < w && y < h && !seen[j] && mask.containsIndex(j)
                                && c.selects(s[j])) {
                            seen[j] = true;
                            queue.add(j);
                        }
                    }
                }
            }
            members.sort(null);
            long sx = 0;
            long sy = 0;
            double sum = 0;
            int minX = w;
            int maxX = -1;
            int minY = h;
            int maxY = -1;
            int peakAt = members.get(0);
            double near = Double.POSITIVE_INFINITY;
            for (int i : members) {
                int x = i % w;
                int y = i / w;
                sx += x;
                sy += y;
                sum += s[i];
                minX = Math.min(minX, x);
                maxX = Math.max(maxX, x);
                minY = Math.min(minY, y);
                maxY = Math.max(maxY, y);
                if (c.morePeaked(s[i], s[peakAt])) {
                    peakAt = i;
                }
                near = Math.min(near, p.distanceToEdgeMm(grid.xMm(x), grid.yMm(y)));
            }
            int n = members.size();
            double area = n * grid.pixelAreaMm2();
            if (area < c.minAreaMm2()) {
                continue;
            }
            double cx = (double) sx / n;
            double cy = (double) sy / n;
            int[] arr = members.stream().mapToInt(Integer::intValue).toArray();
            Region.CentroidPixel at = Region.CentroidPixel.of(arr, n, w, cx, cy);
            out.add(new Region(out.size() + 1, n, area, grid.xMm(cx), grid.yMm(cy),
                    new Region.BoundsMm(grid.xMm(minX - 0.5), grid.yMm(maxY + 0.5), grid.xMm(maxX + 0.5),
                            grid.yMm(minY - 0.5)), s[peakAt], grid.xMm(peakAt % w), grid.yMm(peakAt / w), sum / n,
                    near, at.inside(), at.inside() ? grid.xMm(cx) : grid.xMm(at.nearestIndex() % w),
                    at.inside() ? grid.yMm(cy) : grid.yMm(at.nearestIndex() / w)));
        }
        return out;
    }

    @Test
    void findsTheRegionsOfAFloodFill() {
        int w = 613;
        int h = 401;
        PixelGrid grid = PixelGrid.centred(w, h, 0.25);
        float[] s = blobs(w, h, 7);
        for (WaferShape shape : List.of(RoundWafer.disk(140), new SquareWafer(120, 150, 10, 1, -2))) {
            Mask mask = shape.mask(grid, 2).and(Mask.of(w, h, i -> i % 17 != 3));
            compare(s, grid, mask, shape);
        }
    }

    private static void compare(float[] s, PixelGrid grid, Mask mask, WaferShape shape) {
        int w = grid.width();
        int h = grid.height();
        for (RegionCriteria c : List.of(RegionCriteria.above(1.2, 0), RegionCriteria.below(-1.5, 0),
                RegionCriteria.above(0.8, 2))) {
            List<Region> expected = reference(s, grid, mask, c, shape);
            List<Region> got = ThresholdRegions.find(FloatRaster.wrap(w, h, s), grid, mask, c, shape).regions();
            assertThat(got).hasSize(expected.size());
            assertThat(expected.size()).isGreaterThan(20);
            for (int k = 0; k < got.size(); k++) {
                Region a = got.get(k);
                Region b = expected.get(k);
                assertThat(a.meanValue()).isCloseTo(b.meanValue(), within(1e-12 * Math.abs(b.meanValue())));
                // everything else exactly (the mean's sum runs in another order)
                assertThat(new Region(a.id(), a.pixelCount(), a.areaMm2(), a.centroidXMm(), a.centroidYMm(),
                        a.bounds(), a.peakValue(), a.peakXMm(), a.peakYMm(), b.meanValue(), a.edgeDistanceMm(),
                        a.centroidInside(), a.positionXMm(), a.positionYMm())).isEqualTo(b);
            }
        }
    }

    @Test
    void oneThreadFindsTheSameRegionsAsSeveral() throws Exception {
        int w = 1024;
        int h = 700;
        PixelGrid grid = PixelGrid.centred(w, h, 0.1);
        FloatRaster r = FloatRaster.wrap(w, h, blobs(w, h, 19));
        RegionCriteria c = RegionCriteria.above(1.0, 0);
        ForkJoinPool one = new ForkJoinPool(1);
        ForkJoinPool four = new ForkJoinPool(4);
        try {
            RegionTable a = one.submit(() -> ThresholdRegions.find(r, grid, null, c, null)).get();
            RegionTable b = four.submit(() -> ThresholdRegions.find(r, grid, null, c, null)).get();
            assertThat(b.regions()).isEqualTo(a.regions());
            assertThat(a.regions().size()).isGreaterThan(50);
        } finally {
            one.shutdown();
            four.shutdown();
        }
    }
}
