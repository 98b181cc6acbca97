package trapmap.shared.progress;

/**
 * Receives progress of a long job. Called on the worker thread; implementations must be cheap and must not block.
 * No threads and no Swing here: the viewer adapts this to a progress bar, the command line to stderr lines.
 */
@FunctionalInterface
public interface ProgressListener {
    /** A listener that ignores everything. */
    ProgressListener NONE = (done, total, message) -> { };

    /**
     * @param done    units of work finished so far
     * @param total   units of work in all (0 when unknown)
     * @param message short human-readable description of the current step
     */
    void progress(long done, long total, String message);
}
