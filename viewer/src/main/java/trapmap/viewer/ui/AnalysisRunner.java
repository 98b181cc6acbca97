package trapmap.viewer.ui;

import java.util.concurrent.CancellationException;
import java.util.concurrent.atomic.AtomicBoolean;
import javax.swing.SwingWorker;
import javax.swing.Timer;
import trapmap.viewer.model.ViewerModel;
import trapmap.viewer.ui.panels.StatusBar;

/**
 * Runs {@link ViewerModel#compute} for every open wafer in a {@link SwingWorker}, debounced after each change: the
 * selected wafer first, then the others, with progress in the status bar. A change while it runs cancels the run and
 * starts a new one; {@link #cancel()} stops it and keeps the results so far.
 */
final class AnalysisRunner {
    private final ViewerModel model;
    private final StatusBar status;
    private final Runnable finished;
    private final Timer debounce;
    private SwingWorker<Void, Void> worker;
    private AtomicBoolean cancel = new AtomicBoolean();
    private volatile boolean restartPending;

    /**
     * @param finished told on the event thread after each run (also a cancelled one)
     */
    AnalysisRunner(ViewerModel model, StatusBar status, Runnable finished) {
        this.model = model;
        this.status = status;
        this.finished = finished;
        debounce = new Timer(150, e -> start());
        debounce.setRepeats(false);
    }

    /** True when no analysis is running or waiting. */
    boolean idle() {
        return (worker == null || worker.isDone()) && !debounce.isRunning() && !restartPending;
    }

    /** Starts a run after a short pause (restarted by each further call). */
    void schedule() {
        debounce.restart();
    }

    /**
     * Stops the running (or waiting) analysis; the wafers keep the results computed so far. With nothing running or
     * waiting it does nothing and says nothing.
     *
     * @return true when an analysis was stopped
     */
    boolean cancel() {
        if (idle()) {
            return false;
        }
        debounce.stop();
        cancel.set(true);
        restartPending = false;
        status.setMessage("cancelled: some wafers show older results");
        return true;
    }

    private void start() {
        if (worker != null && !worker.isDone()) {
            cancel.set(true);
            restartPending = true;
            return;
        }
        restartPending = false;
        AtomicBoolean stop = new AtomicBoolean();
        cancel = stop;
        int n = model.size();
        if (n == 0) {
            return;
        }
        int first = Math.max(0, model.selectedIndex());
        status.setProgress(0, "0 %");
        worker = new SwingWorker<>() {
            @Override
            protected Void doInBackground() {
                try {
                    if (!model.upToDate(first)) {
                        model.compute(first, stop::get);
                    }
                    int done = 1;
                    for (int k = 0; k < n && !stop.get(); k++) {
                        if (k != first && k < model.size() && !model.upToDate(k)) {
                            model.compute(k, stop::get);
                        }
                        setProgress(Math.min(100, 100 * ++done / (n + 1)));
                    }
                } catch (CancellationException e) {
                    // a newer change or the cancel button: results so far stay
                } catch (IndexOutOfBoundsException e) {
                    // the wafers were closed meanwhile (a session being opened): the next run sees the new list
                    restartPending = true;
                }
                return null;
            }

            @Override
            protected void done() {
                status.setProgress(-1, null);
                if (restartPending) {
                    start();
                }
                finished.run();
            }
        };
        worker.addPropertyChangeListener(e -> {
            if ("progress".equals(e.getPropertyName())) {
                status.setProgress((Integer) e.getNewValue(), e.getNewValue() + " %");
            }
        });
        worker.execute();
    }
}
