package trapmap.maps.geometry;

import java.util.BitSet;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;

/**
 * The outline of the valid data of a map, for maps that come without a wafer shape. "Valid" means not NaN; holes of
 * NaN enclosed by valid data (dead pixels, masked marks) belong to the wafer and are filled, so only NaN connected
 * to the raster border counts as "outside".
 */
public final class DataOutline {
    private DataOutline() {
    }

    /** The valid pixels of {@code raster} with enclosed holes filled. */
    public static Mask filled(FloatRaster raster) {
        return filled(Mask.valid(raster));
    }

    /**
     * {@code valid} with enclosed holes filled: every pixel that is not reachable from the raster border through
     * pixels outside {@code valid} (4-connected). Iterative; safe for any raster size.
     */
    public static Mask filled(Mask valid) {
        int w = valid.width();
        int h = valid.height();
        BitSet outside = new BitSet(w * h);
        IntQueue queue = new IntQueue(1024);
        for (int x = 0; x < w; x++) {
            seed(valid, outside, queue, x, 0);
            seed(valid, outside, queue, x, h - 1);
        }
        for (int y = 0; y < h; y++) {
            seed(valid, outside, queue, 0, y);
            seed(valid, outside, queue, w - 1, y);
        }
        while (!queue.isEmpty()) {
            int i = queue.poll();
            int x = i % w;
            int y = i / w;
            if (x > 0) {
                seed(valid, outside, queue, x - 1, y);
            }
            if (x < w - 1) {
                seed(valid, outside, queue, x + 1, y);
            }
            if (y > 0) {
                seed(valid, outside, queue, x, y - 1);
            }
            if (y < h - 1) {
                seed(valid, outside, queue, x, y + 1);
            }
        }
        return Mask.of(w, h, i -> !outside.get(i));
    }

    private static void seed(Mask valid, BitSet outside, IntQueue queue, int x, int y) {
        int i = y * valid.width() + x;
        if (!valid.containsIndex(i) && !outside.get(i)) {
            outside.set(i);
            queue.add(i);
        }
    }

    /**
     * Points on the outline of {@code inside}, in wafer coordinates (mm): for every pixel of {@code inside} and
     * every 4-neighbour that is not, the midpoint between the two pixel centres (the best unbiased estimate of
     * where the edge crosses the line joining them). Neighbours beyond the raster border give no point, so a wafer
     * cut off by the image frame is fitted on its visible rim only.
     *
     * @return {x[], y[]} in mm
     */
    public static double[][] edgePointsMm(Mask inside, PixelGrid grid) {
        int w = inside.width();
        int h = inside.height();
        DoubleList xs = new DoubleList();
        DoubleList ys = new DoubleList();
        for (int i = inside.nextIndex(0); i >= 0; i = inside.nextIndex(i + 1)) {
            int x = i % w;
            int y = i / w;
            if (x > 0 && !inside.containsIndex(i - 1)) {
                xs.add(grid.xMm(x - 0.5));
                ys.add(grid.yMm(y));
            }
            if (x < w - 1 && !inside.containsIndex(i + 1)) {
                xs.add(grid.xMm(x + 0.5));
                ys.add(grid.yMm(y));
            }
            if (y > 0 && !inside.containsIndex(i - w)) {
                xs.add(grid.xMm(x));
                ys.add(grid.yMm(y - 0.5));
            }
            if (y < h - 1 && !inside.containsIndex(i + w)) {
                xs.add(grid.xMm(x));
                ys.add(grid.yMm(y + 0.5));
            }
        }
        return new double[][] {xs.toArray(), ys.toArray()};
    }

    /**
     * Distance of every pixel centre of {@code inside} from the outline, mm: the Euclidean distance to the nearest
     * pixel centre outside (beyond the raster border counts as outside) minus half a pixel, since the edge lies
     * between the last pixel in and the first out. 0 outside.
     */
    public static float[] edgeDistanceMm(Mask inside, PixelGrid grid) {
        float[] d = DistanceTransform.distanceToOutsidePx(inside);
        float pitch = (float) grid.pitchMm();
        for (int i = 0; i < d.length; i++) {
            d[i] = d[i] > 0 ? (d[i] - 0.5f) * pitch : 0f;
        }
        return d;
    }

    /** A growable FIFO of ints (ring buffer), so flood fills need no recursion and no boxing. */
    static final class IntQueue {
        private int[] items;
        private int head;
        private int size;

        IntQueue(int capacity) {
            items = new int[Math.max(16, capacity)];
        }

        void add(int v) {
            if (size == items.length) {
                int[] bigger = new int[items.length * 2];
                for (int k = 0; k < size; k++) {
                    bigger[k] = items[(head + k) % items.length];
                }
                items = bigger;
                head = 0;
            }
            items[(head + size) % items.length] = v;
            size++;
        }

        int poll() {
            int v = items[head];
            head = (head + 1) % items.length;
            size--;
            return v;
        }

        boolean isEmpty() {
            return size == 0;
        }
    }

    /** A growable list of doubles. */
    static final class DoubleList {
        private double[] items = new double[256];
        private int size;

        void add(double v) {
            if (size == items.length) {
                items = java.util.Arrays.copyOf(items, size * 2);
            }
            items[size++] = v;
        }

        double[] toArray() {
            return java.util.Arrays.copyOf(items, size);
        }
    }
}
