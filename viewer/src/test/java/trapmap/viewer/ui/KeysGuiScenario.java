package trapmap.viewer.ui;

import static trapmap.viewer.ui.GuiScenario.find;
import static trapmap.viewer.ui.GuiScenario.onEdt;
import static trapmap.viewer.ui.GuiScenario.waitFor;

import java.awt.Component;
import java.awt.KeyboardFocusManager;
import java.awt.Robot;
import java.awt.event.KeyEvent;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import javax.swing.JComboBox;
import javax.swing.SwingUtilities;
import trapmap.physics.defect.Defect;
import trapmap.viewer.model.Analysis;
import trapmap.viewer.model.RecentFiles;
import trapmap.viewer.model.ViewerModel;

/**
 * The wafer keys of the real window (run in its own JVM by {@link ViewerWindowGuiTest}): picks {@code midgap} in the
 * Defect box, leaves the focus there, presses PageDown, PageUp, Alt+→ and Alt+← with a {@link Robot}, then PageDown
 * in the thickness field, and prints after each key the shown wafer, the analysis' defect, the box's choice and
 * whether the analysis is still the same object ({@code GUI-KEY key=… wafer=… defect=… box=… same=…}).
 */
public final class KeysGuiScenario {
    private KeysGuiScenario() {
    }

    public static void main(String[] args) throws Exception {
        try {
            ViewerWindow w = ViewerApp.show(List.of(Path.of(args[0])), RecentFiles.inMemory());
            ViewerModel m = w.model();
            waitFor("demo maps open", () -> m.size() > 2 && w.idle());
            @SuppressWarnings("unchecked")
            JComboBox<Defect> box = (JComboBox<Defect>) onEdt(() -> find(w, "defect"));
            Robot robot = new Robot();
            robot.setAutoDelay(20);
            // the injection chart of the pixel under the mouse, then a new defect: its title follows at once
            onEdt(() -> {
                m.select(1);
                w.charts().setSelectedIndex(3);
                return null;
            });
            waitFor("wafer 2 shown", () -> w.idle() && m.selected().result() != null);
            java.awt.Point centre = onEdt(() -> {
                java.awt.Point p = w.canvas().getLocationOnScreen();
                return new java.awt.Point(p.x + w.canvas().getWidth() / 2, p.y + w.canvas().getHeight() / 2);
            });
            robot.mouseMove(centre.x - 3, centre.y);
            robot.mouseMove(centre.x, centre.y);
            waitFor("a pixel probed", () -> w.lastProbe() != null && injectionTitle(w).contains("defect"));
            String before = onEdt(() -> injectionTitle(w));
            onEdt(() -> {
                for (int i = 0; i < box.getItemCount(); i++) {
                    if (box.getItemAt(i).id().equals("midgap")) {
                        box.setSelectedIndex(i);
                    }
                }
                return null;
            });
            String after = onEdt(() -> injectionTitle(w));
            System.out.println("GUI-INJECTION before=" + before + " | after=" + after);
            waitFor("midgap chosen and analysed", () -> "midgap".equals(m.analysis().defectId()) && w.idle());
            Analysis picked = onEdt(m::analysis);
            focus(w, box);
            press(robot, w, m, box, picked, "PageDown", KeyEvent.VK_PAGE_DOWN, 0);
            press(robot, w, m, box, picked, "PageUp", KeyEvent.VK_PAGE_UP, 0);
            press(robot, w, m, box, picked, "Alt+Right", KeyEvent.VK_RIGHT, KeyEvent.VK_ALT);
            press(robot, w, m, box, picked, "Alt+Left", KeyEvent.VK_LEFT, KeyEvent.VK_ALT);
            focus(w, onEdt(() -> find(w, "thickness")));
            press(robot, w, m, box, picked, "PageDown-in-thickness", KeyEvent.VK_PAGE_DOWN, 0);
            SwingUtilities.invokeAndWait(w::dispose);
            System.exit(0);
        } catch (Throwable t) {
            System.out.println("GUI-ERROR " + t);
            t.printStackTrace(System.out);
            System.exit(1);
        }
    }

    /** The subtitle of the injection chart that names the defect. */
    private static String injectionTitle(ViewerWindow w) {
        org.jfree.chart.JFreeChart c = w.charts().getSelectedIndex() == 3 ? w.openChart() : null;
        if (c != null) {
            for (Object t : c.getSubtitles()) {
                if (t instanceof org.jfree.chart.title.TextTitle tt && tt.getText().startsWith("defect")) {
                    return tt.getText();
                }
            }
        }
        return "";
    }

    private static void focus(ViewerWindow w, Component c) throws Exception {
        onEdt(() -> {
            w.toFront();
            w.requestFocus();
            c.requestFocusInWindow();
            return null;
        });
        waitFor("focus on " + c.getName(), () -> {
            if (KeyboardFocusManager.getCurrentKeyboardFocusManager().getFocusOwner() != c) {
                c.requestFocusInWindow();
                return false;
            }
            return true;
        });
    }

    private static void press(Robot robot, ViewerWindow w, ViewerModel m, JComboBox<Defect> box, Analysis picked,
                              String name, int key, int modifier) throws Exception {
        int before = onEdt(m::selectedIndex);
        if (modifier != 0) {
            robot.keyPress(modifier);
        }
        robot.keyPress(key);
        robot.keyRelease(key);
        if (modifier != 0) {
            robot.keyRelease(modifier);
        }
        robot.waitForIdle();
        try {
            waitFor("the wafer to change after " + name, () -> m.selectedIndex() != before);
        } catch (IllegalStateException timedOut) {
            // printed below as wafer unchanged
        }
        Thread.sleep(300);
        String line = onEdt(() -> String.format(Locale.ROOT, "GUI-KEY key=%s from=%d wafer=%d defect=%s box=%s"
                        + " same=%s focus=%s", name, before, m.selectedIndex(), m.analysis().defectId(),
                ((Defect) box.getSelectedItem()).id(), m.analysis() == picked,
                KeyboardFocusManager.getCurrentKeyboardFocusManager().getFocusOwner() == null ? "none"
                        : KeyboardFocusManager.getCurrentKeyboardFocusManager().getFocusOwner().getName()));
        System.out.println(line);
        System.out.flush();
    }
}
