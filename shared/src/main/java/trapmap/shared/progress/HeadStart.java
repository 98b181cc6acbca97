package trapmap.shared.progress;

import java.util.concurrent.atomic.AtomicBoolean;
import java.util.function.BooleanSupplier;
import java.util.function.Consumer;

/**
 * Work started ahead on a background (daemon) thread, such as a warm-up that has code compiled while the command
 * still reads its input; closing the handle asks the work to stop (it looks at the supplier it is given between its
 * rounds). The work must change no result the command computes.
 */
@FunctionalInterface
public interface HeadStart extends AutoCloseable {
    /** A head start that never began. */
    HeadStart NONE = () -> { };

    /** Asks the work to stop (at once, or after the round under way); never blocks. */
    @Override
    void close();

    /** Runs {@code work} on a daemon thread named {@code threadName}; the supplier says when it should stop. */
    static HeadStart start(String threadName, Consumer<BooleanSupplier> work) {
        AtomicBoolean stop = new AtomicBoolean();
        Thread t = new Thread(() -> work.accept(stop::get), threadName);
        t.setDaemon(true);
        t.start();
        return () -> stop.set(true);
    }
}
