package trapmap.viewer.ui;

import java.awt.Rectangle;
import java.awt.event.MouseEvent;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import javax.swing.JComboBox;
import javax.swing.JTable;
import javax.swing.SwingUtilities;
import trapmap.viewer.model.RecentFiles;
import trapmap.viewer.model.StackIdentification;
import trapmap.viewer.model.ViewerModel;
import trapmap.viewer.ui.canvas.MapCanvas;

/**
 * The identification dialog on a display (run in its own JVM by {@link ViewerWindowGuiTest}): opens a folder of maps
 * of one wafer at several injection levels, chooses Analysis ▸ Identify defect from injection levels…, waits for the
 * background run, then clicks the map and chooses every layer, and prints what the dialog shows:
 * {@code GUI-IDENTIFY levels=3 legend=N regions=R …}, {@code GUI-CLICK …}, {@code GUI-LAYER …}.
 */
public final class IdentifyGuiScenario {
    private IdentifyGuiScenario() {
    }

    public static void main(String[] args) throws Exception {
        Path folder = Path.of(args[0]);
        try {
            ViewerWindow w = ViewerApp.show(List.of(folder), RecentFiles.inMemory());
            ViewerModel m = w.model();
            GuiScenario.waitFor("the maps opened", () -> m.size() == 3 && w.idle());
            GuiScenario.onEdt(() -> {
                GuiScenario.findMenuItem(w.getJMenuBar(), "Identify defect from injection levels…").doClick();
                return null;
            });
            GuiScenario.waitFor("the identification finished", () -> w.identifyDialog() != null
                    && w.identifyDialog().worker() != null && w.identifyDialog().worker().isDone()
                    && w.identifyDialog().shown() != null);
            IdentifyDialog d = GuiScenario.onEdt(w::identifyDialog);
            String head = GuiScenario.onEdt(() -> {
                JTable legend = (JTable) GuiScenario.find(d.getContentPane(), "legendTable");
                JTable regions = (JTable) GuiScenario.find(d.getContentPane(), "regionTable");
                StringBuilder rows = new StringBuilder();
                for (int r = 0; r < regions.getRowCount(); r++) {
                    rows.append(r == 0 ? "" : ";").append(regions.getValueAt(r, 4)).append('/').append(regions.getValueAt(r, 9));
                }
                return String.format(Locale.ROOT, "GUI-IDENTIFY levels=%d legend=%d first=%s regions=%d shown=%s"
                        + " fitSeries=%d rows=%s", d.levels(), legend.getRowCount(), legend.getValueAt(0, 2),
                        regions.getRowCount(), d.shown().title(), d.fitChartForTest().getXYPlot().getDataset(1)
                        .getSeriesCount(), rows);
            });
            System.out.println(head);
            // a click on the map: the move tells the canvas the pixel, the click shows that pixel's curves
            String click = GuiScenario.onEdt(() -> {
                MapCanvas c = (MapCanvas) GuiScenario.find(d.getContentPane(), "identificationMap");
                Rectangle b = c.getBounds();
                int x = b.width / 2 - b.width / 8;
                int y = b.height / 2 - b.height / 8;
                final MapCanvas.Probe[] seen = new MapCanvas.Probe[1];
                c.dispatchEvent(new MouseEvent(c, MouseEvent.MOUSE_MOVED, System.currentTimeMillis(), 0, x, y, 0,
                        false));
                c.dispatchEvent(new MouseEvent(c, MouseEvent.MOUSE_CLICKED, System.currentTimeMillis(), 0, x, y, 1,
                        false, MouseEvent.BUTTON1));
                seen[0] = d.hoveredForTest();
                return String.format(Locale.ROOT, "GUI-CLICK px=%d,%d shown=%s", seen[0].xPx(), seen[0].yPx(),
                        d.shown().title());
            });
            System.out.println(click);
            for (StackIdentification.Layer l : StackIdentification.Layer.values()) {
                String line = GuiScenario.onEdt(() -> {
                    @SuppressWarnings("unchecked")
                    JComboBox<StackIdentification.Layer> box = (JComboBox<StackIdentification.Layer>) GuiScenario
                            .find(d.getContentPane(), "layer");
                    box.setSelectedItem(l);
                    MapCanvas c = (MapCanvas) GuiScenario.find(d.getContentPane(), "identificationMap");
                    return "GUI-LAYER " + l.name() + " quantity=" + c.map().quantity().key();
                });
                System.out.println(line);
            }
            // a second run, cancelled at once: the dialog says so, Identify is offered again, the result stays
            // (a disabled button ignores doClick: wait until the first run has offered Identify again)
            GuiScenario.waitFor("Identify offered again", () -> GuiScenario.find(d.getContentPane(), "identify")
                    .isEnabled());
            GuiScenario.onEdt(() -> {
                // doClick(0): the plain doClick() holds the button down for 68 ms, time enough for a small run
                // to finish before Cancel is pressed
                ((javax.swing.JButton) GuiScenario.find(d.getContentPane(), "identify")).doClick(0);
                ((javax.swing.JButton) GuiScenario.find(d.getContentPane(), "cancelIdentify")).doClick(0);
                return null;
            });
            GuiScenario.waitFor("the cancelled run ended", () -> d.worker().isDone());
            Thread.sleep(300);
            String cancelled = GuiScenario.onEdt(() -> String.format(Locale.ROOT, "GUI-CANCEL phase=%s identify=%s"
                    + " cancel=%s progress=%s", ((javax.swing.JLabel) GuiScenario.find(d.getContentPane(),
                    "identifyPhase")).getText(), GuiScenario.find(d.getContentPane(), "identify").isEnabled(),
                    GuiScenario.find(d.getContentPane(), "cancelIdentify").isEnabled(),
                    GuiScenario.find(d.getContentPane(), "identifyProgress").isVisible()));
            System.out.println(cancelled);
            System.out.flush();
            SwingUtilities.invokeAndWait(() -> {
                d.dispose();
                w.dispose();
            });
            System.exit(0);
        } catch (Throwable t) {
            System.out.println("GUI-ERROR " + t);
            t.printStackTrace(System.out);
            System.exit(1);
        }
    }
}
