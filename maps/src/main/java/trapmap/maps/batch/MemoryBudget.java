package trapmap.maps.batch;

import java.nio.file.Path;
import java.util.concurrent.Callable;
import java.util.concurrent.Semaphore;
import trapmap.maps.io.MapMemory;

/**
 * The heap shared by the workers of a batch, in MiB: before a worker reads a map it takes the map's estimated working
 * memory ({@link MapMemory#estimate} from the TIFF header, {@link MapMemory#INSPECTION_BYTES_PER_PIXEL} per pixel)
 * from the budget and gives it back when done, so that big maps run fewer at a time. The budget is
 * {@value #HEAP_SHARE} of the maximum heap less {@value #RESERVE_MIB} MiB for the rest of the program (result
 * rows, recurrence maps, the Java runtime). A map that cannot fit even alone, and a map whose inspection runs out of
 * memory anyway, give an error row naming the file, its size and the heap to try; the batch goes on.
 */
final class MemoryBudget {
    /** Share of the maximum heap the workers may hold at once. */
    static final double HEAP_SHARE = 0.7;
    /** Heap kept out of the budget, MiB. */
    static final long RESERVE_MIB = 64;
    private static final long MIB = 1L << 20;

    private final long totalMib;
    private final Semaphore permits;

    /** A budget of {@code totalBytes} (rounded down to whole MiB, at least 0). */
    MemoryBudget(long totalBytes) {
        long mib = Math.max(0, totalBytes / MIB);
        this.totalMib = Math.min(mib, Integer.MAX_VALUE);
        this.permits = new Semaphore((int) totalMib, true);
    }

    /** {@value #HEAP_SHARE} × {@code maxMemoryBytes} less {@value #RESERVE_MIB} MiB. */
    static MemoryBudget ofHeap(long maxMemoryBytes) {
        return new MemoryBudget((long) (HEAP_SHARE * maxMemoryBytes) - RESERVE_MIB * MIB);
    }

    /** The budget of this Java runtime's maximum heap ({@link Runtime#maxMemory()}). */
    static MemoryBudget ofThisHeap() {
        return ofHeap(Runtime.getRuntime().maxMemory());
    }

    long totalMib() {
        return totalMib;
    }

    /** The MiB a map of {@code size} takes from the budget (at least 1; 1 when the size is unknown). */
    static long needMib(MapMemory.Size size) {
        if (size == null) {
            return 1;
        }
        long bytes = size.workingBytes(MapMemory.INSPECTION_BYTES_PER_PIXEL);
        return Math.max(1, (bytes + MIB - 1) / MIB);
    }

    /**
     * Runs {@code work} on {@code file} once its working memory is free in the budget (waiting for other workers to
     * give theirs back). A map larger than the whole budget, or an {@link OutOfMemoryError} inside {@code work},
     * gives an error result for the file instead.
     */
    WaferResult run(Path file, Callable<WaferResult> work) throws Exception {
        return run(file, 1, work);
    }

    /**
     * As {@link #run(Path, Callable)} for a map judged with {@code maps} maps of its size at once (the levels of a
     * profile's injection stack): it takes that many maps' working memory.
     */
    WaferResult run(Path file, int maps, Callable<WaferResult> work) throws Exception {
        String name = file.toString();
        MapMemory.Size size = MapMemory.estimate(file);
        long need = needMib(size) * Math.max(1, maps);
        if (need > totalMib) {
            return WaferResult.error(name, name + ": " + (size == null ? "the map" : size.describe())
                    + (maps > 1 ? " (with the " + maps + " levels of its injection stack)" : "") + " need about "
                    + MapMemory.describeBytes(need * MIB) + " of memory, more than the batch can give one map ("
                    + MapMemory.describeBytes(totalMib * MIB) + ", " + Math.round(100 * HEAP_SHARE)
                    + " % of the maximum heap " + MapMemory.describeBytes(Runtime.getRuntime().maxMemory())
                    + " less " + RESERVE_MIB + " MB); run with JAVA_OPTS=" + heapFor(need));
        }
        permits.acquire((int) need);
        try {
            return work.call();
        } catch (OutOfMemoryError e) {
            return WaferResult.error(name, name + ": " + MapMemory.outOfMemory(name, size,
                    MapMemory.INSPECTION_BYTES_PER_PIXEL));
        } finally {
            permits.release((int) need);
        }
    }

    /** The {@code -Xmx} whose budget holds {@code needMib}, in whole GiB. */
    static String heapFor(long needMib) {
        double heapMib = (needMib + RESERVE_MIB) / HEAP_SHARE;
        return "-Xmx" + (long) Math.ceil(heapMib / 1024) + "g";
    }
}
