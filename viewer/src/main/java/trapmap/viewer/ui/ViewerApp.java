package trapmap.viewer.ui;

import com.formdev.flatlaf.FlatLightLaf;
import java.awt.GraphicsEnvironment;
import java.awt.event.WindowAdapter;
import java.awt.event.WindowEvent;
import java.lang.reflect.InvocationTargetException;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.atomic.AtomicReference;
import javax.swing.SwingUtilities;
import javax.swing.ToolTipManager;
import trapmap.maps.batch.RulesException;
import trapmap.viewer.model.RecentFiles;
import trapmap.viewer.model.ViewerModel;

/** Starts the desktop viewer. The command line reaches it through {@link #open} and {@link #displayAvailable}. */
public final class ViewerApp {
    /** Preferences node of the recent-files list. */
    static final String PREFERENCES = "trapmap/viewer";

    private ViewerApp() {
    }

    /**
     * True when windows can be shown: AWT is not headless and the display answers (a DISPLAY naming a server that
     * is gone counts as no display).
     */
    public static boolean displayAvailable() {
        if (GraphicsEnvironment.isHeadless()) {
            return false;
        }
        try {
            return GraphicsEnvironment.getLocalGraphicsEnvironment().getScreenDevices().length > 0;
        } catch (java.awt.AWTError | java.awt.HeadlessException | UnsatisfiedLinkError e) {
            return false;
        }
    }

    /**
     * Opens the viewer on {@code files} (maps or folders, or one session {@code .json} file) and returns when its
     * window is closed.
     *
     * @throws java.awt.HeadlessException when there is no display
     */
    public static void open(List<Path> files) throws InterruptedException {
        open(files, null);
    }

    /**
     * As {@link #open(List)}, judging the wafers by the rules file {@code rules} (null: the quick threshold check).
     *
     * @throws IllegalArgumentException when the rules file is not valid (the message names the file and the field)
     */
    public static void open(List<Path> files, Path rules) throws InterruptedException {
        open(files, rules, null);
    }

    /**
     * As {@link #open(List, Path)}, converting with the physics settings file {@code physics} (null: the rules
     * file's block, else the defaults).
     *
     * @throws IllegalArgumentException when the rules or physics file is not valid (the message names the field)
     */
    public static void open(List<Path> files, Path rules, Path physics) throws InterruptedException {
        open(files, rules, physics, null);
    }

    /**
     * As {@link #open(List, Path, Path)}, with the history window open on the results store {@code store} (a SQLite
     * file or {@code postgresql://…}; null: none).
     */
    public static void open(List<Path> files, Path rules, Path physics, String store) throws InterruptedException {
        CountDownLatch closed = new CountDownLatch(1);
        ViewerWindow w = show(files, null, rules, physics);
        if (store != null) {
            SwingUtilities.invokeLater(() -> w.history(store));
        }
        w.addWindowListener(new WindowAdapter() {
            @Override
            public void windowClosed(WindowEvent e) {
                closed.countDown();
            }
        });
        if (!w.isDisplayable()) {
            closed.countDown();
        }
        closed.await();
    }

    /** Shows a new viewer window on {@code files} and returns it at once (created on the event thread). */
    public static ViewerWindow show(List<Path> files) {
        return show(files, null);
    }

    /**
     * Shows a new viewer window on {@code files} with its recent-files list in {@code recent} (null: the user's
     * preferences) and returns it at once.
     */
    public static ViewerWindow show(List<Path> files, RecentFiles recent) {
        return show(files, recent, null);
    }

    /**
     * As {@link #show(List, RecentFiles)}, judging the wafers by the rules file {@code rules} (null: the quick
     * threshold check).
     *
     * @throws IllegalArgumentException when the rules file is not valid
     */
    public static ViewerWindow show(List<Path> files, RecentFiles recent, Path rules) {
        return show(files, recent, rules, null);
    }

    /** As {@link #show(List, RecentFiles, Path)}, converting with the physics settings file {@code physics}. */
    public static ViewerWindow show(List<Path> files, RecentFiles recent, Path rules, Path physics) {
        ViewerModel model = new ViewerModel();
        if (physics != null) {
            model.loadPhysics(physics, false);
        }
        if (rules != null) {
            try {
                model.loadRules(rules);
            } catch (RulesException e) {
                throw new IllegalArgumentException(e.getMessage(), e);
            }
        }
        AtomicReference<ViewerWindow> ref = new AtomicReference<>();
        Runnable create = () -> {
            FlatLightLaf.setup();
            ToolTipManager.sharedInstance().setDismissDelay(20_000);
            ViewerWindow w = new ViewerWindow(model, recent != null ? recent
                    : RecentFiles.inPreferences(PREFERENCES));
            if (ScreenFit.fit(w)) {
                // a laptop screen: the whole screen rather than a window that reaches past its edges
                w.setExtendedState(java.awt.Frame.MAXIMIZED_BOTH);
            } else {
                w.setLocationByPlatform(true);
            }
            w.setVisible(true);
            w.toFront();
            w.canvas().setFocusable(true);
            w.canvas().requestFocusInWindow();
            if (files.size() == 1 && files.get(0).getFileName().toString().toLowerCase(java.util.Locale.ROOT)
                    .endsWith(".json")) {
                w.loadSession(files.get(0));
            } else {
                w.open(files);
            }
            ref.set(w);
        };
        if (SwingUtilities.isEventDispatchThread()) {
            create.run();
        } else {
            try {
                SwingUtilities.invokeAndWait(create);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                throw new IllegalStateException("interrupted while opening the viewer", e);
            } catch (InvocationTargetException e) {
                Throwable t = e.getCause();
                if (t instanceof RuntimeException r) {
                    throw r;
                }
                if (t instanceof Error err) {
                    throw err;
                }
                throw new IllegalStateException(t);
            }
        }
        return ref.get();
    }

    /** {@code java -cp trapmap.jar trapmap.viewer.ui.ViewerApp FILES…}: the viewer alone. */
    public static void main(String[] args) throws InterruptedException {
        open(java.util.Arrays.stream(args).map(Path::of).toList());
        System.exit(0);
    }
}
