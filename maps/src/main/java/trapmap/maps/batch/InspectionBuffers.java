package trapmap.maps.batch;

/**
 * The working arrays of one wafer's inspection, kept by one worker from wafer to wafer so that a batch of equal-sized
 * maps allocates them once instead of several map-sized arrays per wafer (less allocation and garbage collection,
 * flat memory). Not thread-safe: one per worker. Every array has exactly the map's number of pixels (the conversion
 * takes whole arrays); a map of another size replaces them, and a map of more than {@link #KEPT_PIXELS} pixels gets
 * arrays of its own that are dropped after it, so that a worker never holds more than a small map's working memory
 * between wafers (the batch's {@link MemoryBudget} plans each map's memory as if nothing were kept).
 *
 * <p>Which parts of an array hold data is tracked by the inspection, never by the array: every array is written
 * before it is read, for each wafer ({@code evaluated} and {@code open} are cleared to false over the map's pixels
 * first), so nothing of one wafer reaches the next; the tests inspect different maps in sequence, a small one after a
 * large one, and compare with fresh buffers.
 */
public final class InspectionBuffers {
    /** Largest map, pixels, whose arrays a worker keeps for the next wafer (about 2 Mpx, some 40 MB). */
    static final int KEPT_PIXELS = 1 << 21;

    private boolean[] evaluated = new boolean[0];
    private boolean[] open = new boolean[0];
    private int[] indices = new int[0];
    private int[] queue = new int[0];
    private int[] seeds = new int[0];
    private float[] life = new float[0];
    private float[] density = new float[0];
    private float[] judged = new float[0];
    private float[] densitySample = new float[0];
    private float[] flagAt = new float[0];
    private float[] densityAt = new float[0];
    private byte[] status = new byte[0];

    /** Empty buffers; they grow with the first map. */
    public InspectionBuffers() {
    }

    /** {@code n} per-pixel flags, all false (the evaluated pixels). */
    boolean[] evaluated(int n) {
        boolean[] a = cleared(evaluated, n);
        evaluated = keep(n) ? a : evaluated;
        return a;
    }

    /** {@code n} per-pixel flags, all false (pixels still to be labelled). */
    boolean[] open(int n) {
        boolean[] a = cleared(open, n);
        open = keep(n) ? a : open;
        return a;
    }

    /** {@code n} pixel indices. */
    int[] indices(int n) {
        int[] a = indices.length == n ? indices : new int[n];
        indices = keep(n) ? a : indices;
        return a;
    }

    /** {@code n} pixel indices of region seeds. */
    int[] seeds(int n) {
        int[] a = seeds.length == n ? seeds : new int[n];
        seeds = keep(n) ? a : seeds;
        return a;
    }

    /** {@code n} queued pixel indices. */
    int[] queue(int n) {
        int[] a = queue.length == n ? queue : new int[n];
        queue = keep(n) ? a : queue;
        return a;
    }

    /** {@code n} packed lifetimes. */
    float[] life(int n) {
        float[] a = sized(life, n);
        life = keep(n) ? a : life;
        return a;
    }

    /** {@code n} packed trap densities as converted. */
    float[] density(int n) {
        float[] a = sized(density, n);
        density = keep(n) ? a : density;
        return a;
    }

    /** {@code n} packed trap densities as judged. */
    float[] judged(int n) {
        float[] a = sized(judged, n);
        judged = keep(n) ? a : judged;
        return a;
    }

    /** {@code n} trap densities to rank. */
    float[] densitySample(int n) {
        float[] a = sized(densitySample, n);
        densitySample = keep(n) ? a : densitySample;
        return a;
    }

    /** The flagged quantity at {@code n} pixels. */
    float[] flagAt(int n) {
        float[] a = sized(flagAt, n);
        flagAt = keep(n) ? a : flagAt;
        return a;
    }

    /** The trap density at {@code n} pixels. */
    float[] densityAt(int n) {
        float[] a = sized(densityAt, n);
        densityAt = keep(n) ? a : densityAt;
        return a;
    }

    /** {@code n} conversion statuses. */
    byte[] status(int n) {
        byte[] a = status.length == n ? status : new byte[n];
        status = keep(n) ? a : status;
        return a;
    }

    private static boolean keep(int n) {
        return n <= KEPT_PIXELS;
    }

    private static float[] sized(float[] a, int n) {
        return a.length == n ? a : new float[n];
    }

    /** {@code a} with all its flags false when it has {@code n} of them, else a new array of {@code n}. */
    private static boolean[] cleared(boolean[] a, int n) {
        if (a.length != n) {
            return new boolean[n];
        }
        java.util.Arrays.fill(a, false);
        return a;
    }
}
