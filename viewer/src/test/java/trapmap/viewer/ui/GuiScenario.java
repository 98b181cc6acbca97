package trapmap.viewer.ui;

import java.awt.Component;
import java.awt.Container;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import java.util.concurrent.atomic.AtomicReference;
import javax.swing.JLabel;
import javax.swing.JTextField;
import javax.swing.SwingUtilities;
import trapmap.maps.region.RegionCriteria;
import trapmap.maps.region.ThresholdRegions;
import trapmap.viewer.model.RecentFiles;
import trapmap.viewer.model.ViewerModel;
import trapmap.viewer.model.WaferAnalysis;

/**
 * The real window on a display (run in its own JVM by {@link ViewerWindowGuiTest}): opens the demonstration folder,
 * selects one wafer, types a threshold into the threshold field, waits for the analysis and prints the number of
 * rows of the region table beside the count {@link ThresholdRegions} gives for that threshold:
 * {@code GUI-RESULT wafers=17 table=N expected=N model=N threshold=120.0 …}. Exit status 0 when it got that far.
 */
public final class GuiScenario {
    private GuiScenario() {
    }

    public static void main(String[] args) throws Exception {
        Path demo = Path.of(args[0]);
        double threshold = Double.parseDouble(args[1]);
        String waferName = args[2];
        RecentFiles recent = RecentFiles.inMemory();
        try {
            ViewerWindow w = ViewerApp.show(List.of(demo), recent);
            ViewerModel m = w.model();
            waitFor("all demo maps analysed", () -> m.size() > 0 && w.idle() && allUpToDate(m));

            onEdt(() -> {
                m.select(indexOf(m, waferName));
                JTextField field = (JTextField) find(w, "thresholdValue");
                field.setText(String.format(Locale.ROOT, "%s", threshold));
                field.postActionEvent();
                return null;
            });
            waitFor("the new threshold analysed", () -> w.idle() && m.selected() != null
                    && m.upToDate(m.selectedIndex()) && m.selected().result().analysis().threshold().value()
                    == threshold);
            int table = onEdt(() -> w.thresholdPanel().regionRows());
            int colours = onEdt(() -> {
                java.awt.image.BufferedImage img = w.viewImage();
                java.util.Set<Integer> seen = new java.util.HashSet<>();
                for (int y = 0; y < img.getHeight(); y += 4) {
                    for (int x = 0; x < img.getWidth(); x += 4) {
                        seen.add(img.getRGB(x, y));
                    }
                }
                return seen.size();
            });
            System.out.printf(Locale.ROOT, "GUI-VIEW colours=%d%n", colours);
            String summary = onEdt(() -> ((JLabel) find(w, "flaggedSummary")).getText());
            String verdict = onEdt(() -> w.thresholdPanel().verdictText());
            String title = onEdt(w::getTitle);
            WaferAnalysis r = m.selected().result();
            int expected = ThresholdRegions.find(r.lifetime(), r.mask(), RegionCriteria.below(threshold,
                    r.analysis().threshold().minAreaMm2()), r.shape()).size();
            // Edit ▸ Undo through the menu item: back to the default threshold, and the table follows
            double before = onEdt(() -> {
                javax.swing.JMenuItem undo = findMenuItem(w.getJMenuBar(), "Undo threshold");
                undo.doClick();
                return m.analysis().threshold().value();
            });
            waitFor("the undone threshold analysed", () -> w.idle() && m.upToDate(m.selectedIndex())
                    && w.thresholdPanel().regionRows() == m.selected().result().regions().size());
            int undoneRows = onEdt(() -> w.thresholdPanel().regionRows());
            System.out.printf(Locale.ROOT, "GUI-UNDO threshold=%s table=%d model=%d%n", before, undoneRows,
                    m.selected().result().regions().size());
            System.out.printf(Locale.ROOT, "GUI-RESULT wafers=%d table=%d expected=%d model=%d threshold=%s"
                    + " fraction=%.6f title=%s summary=%s verdict=%s%n", m.size(), table, expected,
                    r.regions().size(), r.analysis().threshold().value(), r.flaggedFraction(), title,
                    summary.replaceAll("<[^>]+>", ""),
                    verdict.replaceAll("<[^>]+>", " ").replaceAll("\\s+", " ").trim());
            System.out.flush();
            SwingUtilities.invokeAndWait(w::dispose);
            System.exit(0);
        } catch (Throwable t) {
            System.out.println("GUI-ERROR " + t);
            t.printStackTrace(System.out);
            System.exit(1);
        }
    }

    /** The menu item of {@code bar} with the text {@code text}. */
    static javax.swing.JMenuItem findMenuItem(javax.swing.JMenuBar bar, String text) {
        for (int i = 0; i < bar.getMenuCount(); i++) {
            javax.swing.JMenu menu = bar.getMenu(i);
            for (int k = 0; k < menu.getItemCount(); k++) {
                javax.swing.JMenuItem item = menu.getItem(k);
                if (item != null && text.equals(item.getText())) {
                    return item;
                }
            }
        }
        throw new IllegalStateException("no menu item '" + text + "'");
    }

    private static boolean allUpToDate(ViewerModel m) {
        for (int i = 0; i < m.size(); i++) {
            if (!m.upToDate(i) && m.wafer(i).error() == null) {
                return false;
            }
        }
        return true;
    }

    private static int indexOf(ViewerModel m, String name) {
        for (int i = 0; i < m.size(); i++) {
            if (m.wafer(i).name().equals(name)) {
                return i;
            }
        }
        throw new IllegalStateException("no wafer " + name + " open");
    }

    static Component find(Container c, String name) {
        for (Component k : c.getComponents()) {
            if (name.equals(k.getName())) {
                return k;
            }
            if (k instanceof Container kc) {
                Component f = find(kc, name);
                if (f != null) {
                    return f;
                }
            }
        }
        return null;
    }

    static <T> T onEdt(Callable<T> body) throws Exception {
        AtomicReference<T> out = new AtomicReference<>();
        AtomicReference<Exception> fail = new AtomicReference<>();
        SwingUtilities.invokeAndWait(() -> {
            try {
                out.set(body.call());
            } catch (Exception e) {
                fail.set(e);
            }
        });
        if (fail.get() != null) {
            throw fail.get();
        }
        return out.get();
    }

    static void waitFor(String what, Callable<Boolean> condition) throws Exception {
        long end = System.nanoTime() + 60_000_000_000L;
        while (System.nanoTime() < end) {
            if (onEdt(condition)) {
                return;
            }
            Thread.sleep(100);
        }
        throw new IllegalStateException("timed out waiting for " + what);
    }
}
