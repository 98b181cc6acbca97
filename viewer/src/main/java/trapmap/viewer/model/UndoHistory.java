package trapmap.viewer.model;

import java.util.ArrayDeque;
import java.util.Deque;

/**
 * Undo and redo over immutable states: {@link #record} stores the state being left; {@link #undo} and {@link #redo}
 * step back and forth. A new change after an undo drops the redo branch. At most {@code limit} steps are kept.
 *
 * @param <T> the state type
 */
public final class UndoHistory<T> {
    private final Deque<Entry<T>> undo = new ArrayDeque<>();
    private final Deque<Entry<T>> redo = new ArrayDeque<>();
    private final int limit;

    /** A state and the name of the change that left it, e.g. "threshold". */
    public record Entry<T>(T state, String change) {
    }

    public UndoHistory(int limit) {
        if (limit < 1) {
            throw new IllegalArgumentException("undo limit must be >= 1");
        }
        this.limit = limit;
    }

    /** Remembers {@code before}, the state a change named {@code change} is leaving. */
    public void record(T before, String change) {
        undo.push(new Entry<>(before, change));
        while (undo.size() > limit) {
            undo.removeLast();
        }
        redo.clear();
    }

    public boolean canUndo() {
        return !undo.isEmpty();
    }

    public boolean canRedo() {
        return !redo.isEmpty();
    }

    /** Name of the change {@link #undo} would revert, or null. */
    public String undoName() {
        return undo.isEmpty() ? null : undo.peek().change();
    }

    /** Name of the change {@link #redo} would repeat, or null. */
    public String redoName() {
        return redo.isEmpty() ? null : redo.peek().change();
    }

    /** The state before the last change; {@code current} becomes redoable. Null when there is nothing to undo. */
    public T undo(T current) {
        if (undo.isEmpty()) {
            return null;
        }
        Entry<T> e = undo.pop();
        redo.push(new Entry<>(current, e.change()));
        return e.state();
    }

    /** The state the last undo left; {@code current} becomes undoable again. Null when there is nothing to redo. */
    public T redo(T current) {
        if (redo.isEmpty()) {
            return null;
        }
        Entry<T> e = redo.pop();
        undo.push(new Entry<>(current, e.change()));
        return e.state();
    }

    public void clear() {
        undo.clear();
        redo.clear();
    }
}
