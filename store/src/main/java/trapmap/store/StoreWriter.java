package trapmap.store;

import java.util.Map;
import java.util.concurrent.ArrayBlockingQueue;
import java.util.concurrent.BlockingQueue;
import java.util.function.Consumer;
import java.util.regex.Pattern;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.WaferResult;

/**
 * Writes the wafers a batch tells ({@link BatchInspection#tellingWafers}) into a {@link ResultsStore} as each one
 * finishes, on a thread of its own (the batch's writer only hands the wafer over; it waits only when
 * {@value #QUEUED} wafers are waiting to be stored). Reading the map for its SHA-256 and the sidecar for its facts is
 * done on that thread too. The first failure stops the storing; {@link #close} waits for the waiting wafers and
 * throws it.
 */
public final class StoreWriter implements BatchInspection.WaferListener, AutoCloseable {
    /** Wafers that may wait to be stored. */
    static final int QUEUED = 64;
    private static final WaferResult END = WaferResult.error("", "end");

    private final ResultsStore store;
    private final String runId;
    private final Pattern lotPattern;
    private final Consumer<String> warnings;
    private final BlockingQueue<WaferResult> queue = new ArrayBlockingQueue<>(QUEUED);
    private final Thread thread;
    private volatile StoreException failure;
    private volatile int stored;
    /** Wafers handed to the writer's thread, and those it has dealt with (stored, or passed over after a failure). */
    private long handed;
    private long done;

    /**
     * Starts the writer of run {@code runId} ({@link ResultsStore#startRun}); {@code lotPattern}: the rules' lot
     * pattern, null for none; {@code warnings}: told each line about a fact that could not be used.
     */
    public StoreWriter(ResultsStore store, String runId, Pattern lotPattern, Consumer<String> warnings) {
        this.store = store;
        this.runId = runId;
        this.lotPattern = lotPattern;
        this.warnings = warnings == null ? w -> { } : warnings;
        this.thread = new Thread(this::drain, "results-store");
        this.thread.setDaemon(true);
        this.thread.start();
    }

    @Override
    public void wafer(WaferResult result, Map<String, String> row) {
        if (failure != null) {
            return;
        }
        try {
            queue.put(result);
            synchronized (this) {
                handed++; // after the put: a wafer never queued is never waited for
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt(); // the batch sees it and stops
        }
    }

    private void drain() {
        while (true) {
            WaferResult r;
            try {
                r = queue.take();
            } catch (InterruptedException e) {
                return;
            }
            if (r == END) {
                return;
            }
            try {
                if (failure != null) {
                    continue; // keep taking so that the batch never waits for a stopped writer
                }
                WaferRecord rec = WaferRecord.of(r, lotPattern);
                rec.warnings().forEach(warnings);
                store.write(runId, rec);
                stored++;
            } catch (StoreException e) {
                failure = e;
            } catch (RuntimeException e) {
                failure = new StoreException("store " + store.name() + ": wafer " + r.file() + " not written: " + e, e);
            } finally {
                synchronized (this) {
                    done++;
                    notifyAll();
                }
            }
        }
    }

    /**
     * Waits until every wafer handed over so far has been stored (the store then holds them, e.g. for a trend over
     * it), and keeps the writer open for more; throws the first failure.
     *
     * @throws InterruptedException when interrupted while waiting
     */
    public void awaitStored() throws InterruptedException {
        synchronized (this) {
            while (done < handed && thread.isAlive()) {
                wait(1000);
            }
        }
        if (failure != null) {
            throw failure;
        }
    }

    /** Wafers stored so far. */
    public int stored() {
        return stored;
    }

    /** Waits for the waiting wafers to be stored; throws the first failure. */
    @Override
    public void close() {
        try {
            queue.put(END);
            thread.join();
        } catch (InterruptedException e) {
            thread.interrupt();
            Thread.currentThread().interrupt();
        }
        if (failure != null) {
            throw failure;
        }
    }
}
