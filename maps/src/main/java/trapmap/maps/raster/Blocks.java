package trapmap.maps.raster;

import java.util.function.IntConsumer;
import java.util.stream.IntStream;

/**
 * Work over a large raster split into a fixed number of blocks that run on the common fork-join pool (all cores).
 * The blocks depend on the data size only, never on the number of threads, so a caller that keeps one partial result
 * per block and combines them in block order gets the same result, floating-point sums included, on any machine.
 */
public final class Blocks {
    /** Below this many items the work runs on the calling thread: starting tasks would cost more than it saves. */
    public static final int PARALLEL_FROM = 1 << 17;

    private Blocks() {
    }

    /** Number of blocks of {@code size} items each (the last one shorter) that cover {@code n} items. */
    public static int count(long n, int size) {
        return (int) ((n + size - 1) / size);
    }

    /**
     * Runs {@code body} for every block 0..blocks-1, in parallel when {@code items} (the work in all, for the
     * threshold only) is large. The body must touch only its own block's output.
     */
    public static void run(int blocks, long items, IntConsumer body) {
        if (blocks <= 1 || items < PARALLEL_FROM) {
            for (int b = 0; b < blocks; b++) {
                body.accept(b);
            }
        } else {
            IntStream.range(0, blocks).parallel().forEach(body);
        }
    }
}
