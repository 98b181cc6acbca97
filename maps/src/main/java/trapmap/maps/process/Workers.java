package trapmap.maps.process;

import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicReference;

/**
 * Runs the workers of a whole-map pass (conversions, exceedance maps, identification): the first on the calling
 * thread, the others on threads of their own.
 */
public final class Workers {
    private Workers() {
    }

    /**
     * Runs {@code tasks[0]} on this thread and every other on a daemon thread named {@code name + index}, waits for
     * all of them and returns the first failure the tasks recorded in {@code failure} (null when none). An interrupt
     * while waiting is recorded there too (the tasks end at their next step) and kept as this thread's status.
     */
    public static Throwable runAll(List<? extends Runnable> tasks, String name, AtomicReference<Throwable> failure) {
        List<Thread> started = new ArrayList<>();
        for (int t = 1; t < tasks.size(); t++) {
            Thread th = new Thread(tasks.get(t), name + t);
            th.setDaemon(true);
            th.start();
            started.add(th);
        }
        tasks.get(0).run();
        boolean interrupted = false;
        for (Thread th : started) {
            while (true) {
                try {
                    th.join();
                    break;
                } catch (InterruptedException e) {
                    interrupted = true;
                    failure.compareAndSet(null, e);
                }
            }
        }
        if (interrupted) {
            Thread.currentThread().interrupt();
        }
        return failure.get();
    }

    /**
     * Throws {@code f}, the failure {@link #runAll} returned: a runtime exception or an error as it is, any other
     * (an interrupt) wrapped in an {@link IllegalStateException} with {@code message}; nothing when it is null.
     */
    public static void rethrow(Throwable f, String message) {
        if (f instanceof RuntimeException e) {
            throw e;
        } else if (f instanceof Error e) {
            throw e;
        } else if (f != null) {
            throw new IllegalStateException(message, f);
        }
    }
}
