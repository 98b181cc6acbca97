package trapmap.store;

import java.sql.SQLException;
import java.sql.Statement;

/**
 * A handle on one read of a store that another thread may stop ({@link #cancel}): the statement running for it is
 * cancelled ({@link Statement#cancel()}: SQLite interrupts it, PostgreSQL asks the server to end it), and the read
 * ends with {@link Cancelled} instead of running on to its end. A store read only reads, so a cancelled read leaves
 * the store as it was; its connection is usable by the next read at once.
 *
 * <p>A handle is for one read; a cancelled one stays cancelled (a read given it ends at once).
 */
public final class StoreQuery {
    private boolean cancelled;
    private Statement running;

    /** Thrown by a read whose handle was {@linkplain #cancel cancelled}. */
    public static final class Cancelled extends RuntimeException {
        private static final long serialVersionUID = 1L;

        Cancelled(String what) {
            super(what + ": cancelled");
        }
    }

    /**
     * Stops the read: from any thread, returns once the statement running for it (if any) has been told to end. The
     * statement is cancelled while this handle is held, so that a cancel never reaches a later statement of the
     * same connection.
     */
    public synchronized void cancel() {
        cancelled = true;
        if (running != null) {
            try {
                running.cancel();
            } catch (SQLException e) {
                // the read ends anyway: it checks the flag between rows
            }
        }
    }

    /** Whether {@link #cancel} was called. */
    public synchronized boolean cancelled() {
        return cancelled;
    }

    /** Throws {@link Cancelled} naming {@code what} when cancelled. */
    void check(String what) {
        if (cancelled()) {
            throw new Cancelled(what);
        }
    }

    /** {@code s} is about to run for this read (throws when already cancelled). */
    synchronized void start(Statement s, String what) {
        if (cancelled) {
            throw new Cancelled(what);
        }
        running = s;
    }

    /** The statement of {@link #start} has ended (waits for a cancel under way). */
    synchronized void end() {
        running = null;
    }
}
