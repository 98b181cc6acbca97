package trapmap.viewer.ui;

import java.awt.Component;
import java.awt.event.MouseEvent;
import java.awt.geom.Point2D;
import java.awt.geom.Rectangle2D;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import javax.swing.JComboBox;
import javax.swing.JMenuItem;
import javax.swing.JPopupMenu;
import javax.swing.JTable;
import javax.swing.JTextField;
import org.jfree.chart.ChartPanel;
import org.jfree.chart.entity.ChartEntity;
import org.jfree.chart.entity.EntityCollection;
import org.jfree.chart.entity.XYItemEntity;
import trapmap.viewer.model.RecentFiles;
import trapmap.viewer.model.ViewerModel;

/**
 * The history window on a display (run in its own JVM by {@link ViewerWindowGuiTest}): opens an empty viewer, chooses
 * Analysis ▸ History from a results store…, types the store and presses Enter, waits for the charts, then clicks
 * points of the drawn charts as a user would and prints what happened: {@code GUI-HISTORY …}, {@code GUI-OPENED …},
 * {@code GUI-MENU …}, {@code GUI-MISSING …}, {@code GUI-TUBES …}, {@code GUI-EXPORT …}.
 * Arguments: the store, the individuals point to click, the subgroup point whose menu to use and the item to choose
 * in it, the individuals point whose map is gone, and a PNG to export to.
 */
public final class HistoryGuiScenario {
    private HistoryGuiScenario() {
    }

    public static void main(String[] args) throws Exception {
        String store = args[0];
        int single = Integer.parseInt(args[1]);
        int subgroup = Integer.parseInt(args[2]);
        int item = Integer.parseInt(args[3]);
        int gone = Integer.parseInt(args[4]);
        Path png = Path.of(args[5]);
        try {
            ViewerWindow w = ViewerApp.show(List.of(), RecentFiles.inMemory());
            ViewerModel m = w.model();
            GuiScenario.onEdt(() -> {
                GuiScenario.findMenuItem(w.getJMenuBar(), "History from a results store…").doClick();
                return null;
            });
            HistoryWindow d = GuiScenario.onEdt(w::historyWindow);
            // a store that is not there: told at once, in red, and not made
            String missingStore = store + ".missing";
            System.out.println(GuiScenario.onEdt(() -> {
                JTextField field = (JTextField) GuiScenario.find(d.getContentPane(), "historyStore");
                field.setText(missingStore);
                field.postActionEvent();
                return "GUI-NOSTORE error=" + d.statusIsError() + " made=" + java.nio.file.Files.exists(
                        Path.of(missingStore)) + " status=" + d.statusText();
            }));
            GuiScenario.onEdt(() -> {
                JTextField field = (JTextField) GuiScenario.find(d.getContentPane(), "historyStore");
                field.setText(store);
                field.postActionEvent();
                return null;
            });
            GuiScenario.waitFor("the charts", () -> d.idle() && d.outcome() != null && painted(d, 0));
            String head = GuiScenario.onEdt(() -> {
                JComboBox<?> figures = (JComboBox<?>) GuiScenario.find(d.getContentPane(), "historyFigure");
                JComboBox<?> by = (JComboBox<?>) GuiScenario.find(d.getContentPane(), "historyBy");
                JTable signals = (JTable) GuiScenario.find(d.getContentPane(), "historySignals");
                JTable yields = (JTable) GuiScenario.find(d.getContentPane(), "historyYield");
                return String.format(Locale.ROOT, "GUI-HISTORY figures=%s figure=%s by=%s groupings=%s charts=%d"
                        + " signals=%d yields=%d status=%s", items(figures), figures.getSelectedItem(),
                        by.getSelectedItem(), items(by), d.chartPanels().size(), signals.getRowCount(),
                        yields.getRowCount(), d.statusText());
            });
            System.out.println(head);

            // a click on a point of the individuals chart opens that wafer in the viewer and shows it
            click(d, 0, single);
            GuiScenario.waitFor("the clicked wafer shown", () -> m.selected() != null && w.idle());
            System.out.println(GuiScenario.onEdt(() -> "GUI-OPENED point=" + single + " shown=" + m.selected().path().getFileName()
                    + " open=" + m.size() + " status=" + d.statusText()));

            // a subgroup point offers its wafers in a menu; choosing one opens it
            int mean = GuiScenario.onEdt(() -> chartIndex(d, "subgroup mean (X-bar)"));
            click(d, mean, subgroup);
            GuiScenario.waitFor("the menu of the subgroup's wafers", () -> d.lastMenu() != null
                    && d.lastMenu().isVisible());
            String menu = GuiScenario.onEdt(() -> {
                List<String> labels = new ArrayList<>();
                for (Component c : d.lastMenu().getComponents()) {
                    if (c instanceof JMenuItem mi) {
                        labels.add(mi.getText().split("  ")[0]);
                    }
                }
                return "GUI-MENU point=" + subgroup + " wafers=" + String.join(",", labels);
            });
            System.out.println(menu);
            String chosen = GuiScenario.onEdt(() -> {
                JPopupMenu pm = d.lastMenu();
                List<JMenuItem> its = new ArrayList<>();
                for (Component c : pm.getComponents()) {
                    if (c instanceof JMenuItem mi) {
                        its.add(mi);
                    }
                }
                its.get(item).doClick();
                return its.get(item).getText().split("  ")[0];
            });
            GuiScenario.waitFor("the chosen wafer shown", () -> d.lastOpened() != null && d.lastOpened().found()
                    && m.selected() != null && m.selected().path().equals(d.lastOpened().path()) && w.idle());
            System.out.println(GuiScenario.onEdt(() -> "GUI-CHOSEN wafer=" + chosen + " shown=" + m.selected().path().getFileName()
                    + " open=" + m.size()));

            // a wafer whose map is gone: a clear message, nothing opened
            int before = GuiScenario.onEdt(m::size);
            click(d, 0, gone);
            GuiScenario.waitFor("the message", () -> d.lastOpened() != null && !d.lastOpened().found());
            System.out.println(GuiScenario.onEdt(() -> "GUI-MISSING point=" + gone + " error=" + d.statusIsError()
                    + " opened=" + (m.size() - before) + " status=" + d.statusText()));

            // another grouping: one individuals and moving-range chart per tube
            GuiScenario.onEdt(() -> {
                @SuppressWarnings("unchecked")
                JComboBox<String> by = (JComboBox<String>) GuiScenario.find(d.getContentPane(), "historyBy");
                by.setSelectedItem("furnace_tube");
                return null;
            });
            GuiScenario.waitFor("the charts per tube", () -> d.idle() && d.outcome() != null
                    && d.outcome().request().by().equals("furnace_tube") && painted(d, 0));
            System.out.println(GuiScenario.onEdt(() -> {
                List<String> titles = new ArrayList<>();
                for (ChartPanel p : d.chartPanels()) {
                    titles.add(p.getChart().getTitle().getText().split(":")[0]);
                }
                return "GUI-TUBES charts=" + String.join(";", titles);
            }));
            GuiScenario.onEdt(() -> {
                d.exportPng(png);
                return null;
            });
            System.out.println(GuiScenario.onEdt(() -> "GUI-EXPORT status=" + d.statusText()));

            // a fact typed in the query fields: only those wafers are charted
            int allWafers = GuiScenario.onEdt(() -> d.outcome().result().wafers());
            GuiScenario.onEdt(() -> {
                JTextField facts = (JTextField) GuiScenario.find(d.getContentPane(), "historyFacts");
                facts.setText("furnace_tube=T2");
                facts.postActionEvent();
                return null;
            });
            GuiScenario.waitFor("the charts of tube T2", () -> d.idle() && d.outcome() != null
                    && !d.outcome().request().filter().attributes().isEmpty() && painted(d, 0));
            System.out.println(GuiScenario.onEdt(() -> "GUI-FILTER wafers=" + allWafers + "->"
                    + d.outcome().result().wafers() + " charts=" + d.chartPanels().size() + " status="
                    + d.statusText()));
            // a fact that is no NAME=VALUE: the command's message, the charts shown stay
            System.out.println(GuiScenario.onEdt(() -> {
                JTextField facts = (JTextField) GuiScenario.find(d.getContentPane(), "historyFacts");
                facts.setText("furnace_tube=T2, boat_slot");
                facts.postActionEvent();
                return "GUI-BADFILTER error=" + d.statusIsError() + " idle=" + d.idle() + " wafers="
                        + d.outcome().result().wafers() + " status=" + d.statusText();
            }));
            // Cancel beside the progress bar stops a running request's store read; the charts shown stay
            trapmap.store.StoreQuery[] read = new trapmap.store.StoreQuery[1];
            System.out.println(GuiScenario.onEdt(() -> {
                JTextField facts = (JTextField) GuiScenario.find(d.getContentPane(), "historyFacts");
                facts.setText("");
                d.chart();
                read[0] = d.chartQuery();
                java.awt.Component cancel = GuiScenario.find(d.getContentPane(), "historyCancel");
                boolean shown = cancel.isVisible();
                ((javax.swing.JButton) cancel).doClick();
                return "GUI-CANCELCHART shown=" + shown + " after=" + cancel.isVisible() + " status="
                        + d.statusText();
            }));
            GuiScenario.waitFor("the request dropped", d::idle);
            GuiScenario.waitFor("the read cancelled", read[0]::cancelled);
            Thread.sleep(500);
            System.out.println(GuiScenario.onEdt(() -> "GUI-AFTERCANCEL idle=" + d.idle() + " wafers="
                    + d.outcome().result().wafers() + " filter=" + d.outcome().request().filter().describe()
                    + " readCancelled=" + read[0].cancelled() + " running=" + (d.chartQuery() != null)));
            // a new request at once after the cancel: read and shown in full
            GuiScenario.onEdt(() -> {
                JTextField lots = (JTextField) GuiScenario.find(d.getContentPane(), "historyLots");
                lots.setText("L1, \"L3\"");
                lots.postActionEvent();
                return null;
            });
            GuiScenario.waitFor("the charts of lots L1 and L3", () -> d.idle() && d.outcome() != null
                    && !d.outcome().request().filter().lots().isEmpty());
            System.out.println(GuiScenario.onEdt(() -> "GUI-NEWAFTERCANCEL wafers=" + d.outcome().result().wafers()
                    + " filter=" + d.outcome().request().filter().describe() + " running=" + (d.chartQuery() != null)));
            System.out.flush();
            javax.swing.SwingUtilities.invokeAndWait(() -> {
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

    private static String items(JComboBox<?> box) {
        List<String> out = new ArrayList<>();
        for (int i = 0; i < box.getItemCount(); i++) {
            out.add(String.valueOf(box.getItemAt(i)));
        }
        return String.join(",", out);
    }

    private static int chartIndex(HistoryWindow d, String title) {
        List<ChartPanel> panels = d.chartPanels();
        for (int i = 0; i < panels.size(); i++) {
            if (panels.get(i).getChart().getTitle().getText().startsWith(title + ":")) {
                return i;
            }
        }
        throw new IllegalStateException("no chart " + title);
    }

    /** Whether chart {@code i} has been drawn (its points are entities to click). */
    private static boolean painted(HistoryWindow d, int i) {
        List<ChartPanel> panels = d.chartPanels();
        if (panels.size() <= i) {
            return false;
        }
        EntityCollection e = panels.get(i).getChartRenderingInfo().getEntityCollection();
        return e != null && e.getEntityCount() > 0;
    }

    /** Scrolls chart {@code chart} into view, waits until it is drawn and clicks its point {@code point}. */
    private static void click(HistoryWindow d, int chart, int point) throws Exception {
        GuiScenario.onEdt(() -> {
            ChartPanel p = d.chartPanels().get(chart);
            p.scrollRectToVisible(new java.awt.Rectangle(0, 0, p.getWidth(), p.getHeight()));
            return null;
        });
        GuiScenario.waitFor("chart " + chart + " drawn", () -> painted(d, chart) && entity(d, chart, point) != null);
        GuiScenario.onEdt(() -> {
            ChartPanel p = d.chartPanels().get(chart);
            Rectangle2D b = entity(d, chart, point).getArea().getBounds2D();
            Point2D at = p.translateJava2DToScreen(new Point2D.Double(b.getCenterX(), b.getCenterY()));
            int x = (int) Math.round(at.getX());
            int y = (int) Math.round(at.getY());
            long now = System.currentTimeMillis();
            p.dispatchEvent(new MouseEvent(p, MouseEvent.MOUSE_MOVED, now, 0, x, y, 0, false));
            p.dispatchEvent(new MouseEvent(p, MouseEvent.MOUSE_PRESSED, now, MouseEvent.BUTTON1_DOWN_MASK, x, y, 1,
                    false, MouseEvent.BUTTON1));
            p.dispatchEvent(new MouseEvent(p, MouseEvent.MOUSE_RELEASED, now, 0, x, y, 1, false,
                    MouseEvent.BUTTON1));
            p.dispatchEvent(new MouseEvent(p, MouseEvent.MOUSE_CLICKED, now, 0, x, y, 1, false, MouseEvent.BUTTON1));
            return null;
        });
    }

    /** The drawn point {@code point} (series of the values) of chart {@code chart}, or null. */
    private static ChartEntity entity(HistoryWindow d, int chart, int point) {
        EntityCollection all = d.chartPanels().get(chart).getChartRenderingInfo().getEntityCollection();
        for (int i = 0; i < all.getEntityCount(); i++) {
            if (all.getEntity(i) instanceof XYItemEntity e && e.getSeriesIndex() == 0 && e.getItem() == point) {
                return e;
            }
        }
        return null;
    }
}
