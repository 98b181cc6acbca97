package trapmap.maps.batch;

import trapmap.maps.stats.RankBuckets;

/**
 * The working arrays of one wafer's inspection, kept by one worker from wafer to wafer so that a batch of equal-sized
 * maps allocates them once instead of several map-sized arrays per wafer (less allocation and garbage collection,
 * flat memory). Not thread-safe: one per worker. Every array has exactly the map's number of pixels (the conversion
 * takes whole arrays); a map of another size replaces them, and a map of more than {@link #KEPT_PIXELS} pixels gets
 * arrays of its own that are dropped after it, so that a worker never holds more than a small map's working memory
 * between wafers (the batch's {@link MemoryBudget} plans each map's memory as if nothing were kept).
 *
 * <p>Which parts of an array hold data is tracked by the inspection, never by the array: every array is written
 * before it is read, for each wafer ({@code open} is cleared to false over the map's pixels
 * first), so nothing of one wafer reaches the next; the tests inspect different maps in sequence, a small one after a
 * large one, and compare with fresh buffers.
 */
public final class InspectionBuffers {
    /** Largest map, pixels, whose arrays a worker keeps for the next wafer (about 2 Mpx, some 40 MB). */
    static final int KEPT_PIXELS = 1 << 21;

    private final Slot<boolean[]> open = new Slot<>(boolean[]::new);
    private final Slot<int[]> indices = new Slot<>(int[]::new);
    private final Slot<int[]> queue = new Slot<>(int[]::new);
    private final Slot<int[]> seeds = new Slot<>(int[]::new);
    private final Slot<float[]> life = new Slot<>(float[]::new);
    private final Slot<float[]> density = new Slot<>(float[]::new);
    private final Slot<float[]> judged = new Slot<>(float[]::new);
    private final Slot<float[]> densitySample = new Slot<>(float[]::new);
    private final Slot<float[]> flagAt = new Slot<>(float[]::new);
    private final Slot<float[]> densityAt = new Slot<>(float[]::new);
    private final Slot<byte[]> status = new Slot<>(byte[]::new);
    private final RankBuckets lifeBuckets = new RankBuckets();
    private final RankBuckets densityBuckets = new RankBuckets();

    /** Empty buffers; they grow with the first map. */
    public InspectionBuffers() {
    }

    /** {@code n} per-pixel flags, all false (pixels still to be labelled). */
    boolean[] open(int n) {
        return cleared(open.get(n));
    }

    /** {@code n} pixel indices. */
    int[] indices(int n) {
        return indices.get(n);
    }

    /** {@code n} pixel indices of region seeds. */
    int[] seeds(int n) {
        return seeds.get(n);
    }

    /** {@code n} queued pixel indices. */
    int[] queue(int n) {
        return queue.get(n);
    }

    /** {@code n} packed lifetimes. */
    float[] life(int n) {
        return life.get(n);
    }

    /** {@code n} packed trap densities as converted. */
    float[] density(int n) {
        return density.get(n);
    }

    /** {@code n} packed trap densities as judged. */
    float[] judged(int n) {
        return judged.get(n);
    }

    /** {@code n} trap densities to rank. */
    float[] densitySample(int n) {
        return densitySample.get(n);
    }

    /** The flagged quantity at {@code n} pixels. */
    float[] flagAt(int n) {
        return flagAt.get(n);
    }

    /** The trap density at {@code n} pixels. */
    float[] densityAt(int n) {
        return densityAt.get(n);
    }

    /** {@code n} conversion statuses. */
    byte[] status(int n) {
        return status.get(n);
    }

    /** The radix bucket counts of the evaluated lifetimes (cleared by whoever counts them). */
    RankBuckets lifeBuckets() {
        return lifeBuckets;
    }

    /** The radix bucket counts of the trap densities to rank (cleared by whoever counts them). */
    RankBuckets densityBuckets() {
        return densityBuckets;
    }

    private static boolean[] cleared(boolean[] a) {
        java.util.Arrays.fill(a, false);
        return a;
    }

    /**
     * One kept array: the one of the last map when it has {@code n} elements, else a new one, which is kept for the
     * next wafer when it has at most {@link #KEPT_PIXELS} elements (a larger one is dropped after its map).
     */
    private static final class Slot<A> {
        private final java.util.function.IntFunction<A> make;
        private A kept;

        Slot(java.util.function.IntFunction<A> make) {
            this.make = make;
            this.kept = make.apply(0);
        }

        A get(int n) {
            A a = java.lang.reflect.Array.getLength(kept) == n ? kept : make.apply(n);
            if (n <= KEPT_PIXELS) {
                kept = a;
            }
            return a;
        }
    }
}
