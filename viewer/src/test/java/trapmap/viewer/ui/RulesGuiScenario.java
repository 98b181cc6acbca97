package trapmap.viewer.ui;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import javax.swing.JLabel;
import javax.swing.SwingUtilities;
import trapmap.viewer.model.RecentFiles;
import trapmap.viewer.model.Verdict;
import trapmap.viewer.model.ViewerModel;

/**
 * The real window judging by a rules file (run in its own JVM by {@link ViewerWindowGuiTest}): opens the
 * demonstration folder with {@code --rules}, waits for every wafer, prints one line per wafer with the verdict the
 * window holds ({@code GUI-VERDICT file=… status=… grade=… profile=… defect=…}), the gallery's header and, for the
 * wafer named in the arguments, the threshold panel's verdict text; then writes that wafer's report as Ctrl+P does.
 */
public final class RulesGuiScenario {
    private RulesGuiScenario() {
    }

    public static void main(String[] args) throws Exception {
        Path demo = Path.of(args[0]);
        Path rules = Path.of(args[1]);
        String waferName = args[2];
        Path pdf = Path.of(args[3]);
        RecentFiles recent = RecentFiles.inMemory();
        try {
            ViewerWindow w = ViewerApp.show(List.of(demo), recent, rules);
            ViewerModel m = w.model();
            GuiScenario.waitFor("all demo maps judged", () -> m.size() > 0 && w.idle() && allUpToDate(m));
            for (ViewerModel.OpenWafer o : m.wafers()) {
                Verdict v = o.result().verdict();
                System.out.printf(Locale.ROOT, "GUI-VERDICT file=%s status=%s grade=%s profile=%s defect=%s"
                        + " rules=%s%n", o.path().getFileName(), v.outcome(), v.grade(), v.profile(), v.defectId(),
                        v.rulesVerdict());
            }
            int index = -1;
            for (int i = 0; i < m.size(); i++) {
                if (m.wafer(i).name().equals(waferName)) {
                    index = i;
                }
            }
            int selected = index;
            GuiScenario.onEdt(() -> {
                m.select(selected);
                return null;
            });
            GuiScenario.waitFor("the wafer shown", () -> w.idle() && w.canvas().style() != null
                    && m.selectedIndex() == selected);
            String header = GuiScenario.onEdt(() -> ((JLabel) GuiScenario.find(w, "galleryHeader")).getText());
            String verdict = GuiScenario.onEdt(() -> w.thresholdPanel().verdictText());
            System.out.println("GUI-GALLERY " + header.replaceAll("<[^>]+>", " ").replaceAll("\\s+", " ").trim());
            System.out.println("GUI-PANEL " + verdict.replaceAll("<[^>]+>", " ").replaceAll("\\s+", " ").trim());
            GuiScenario.onEdt(() -> {
                w.exports().writeReport(pdf);
                return null;
            });
            GuiScenario.waitFor("the report written", () -> Files.isRegularFile(pdf));
            System.out.println("GUI-REPORT " + pdf);
            System.out.flush();
            SwingUtilities.invokeAndWait(w::dispose);
            System.exit(0);
        } catch (Throwable t) {
            System.out.println("GUI-ERROR " + t);
            t.printStackTrace(System.out);
            System.exit(1);
        }
    }

    private static boolean allUpToDate(ViewerModel m) {
        for (int i = 0; i < m.size(); i++) {
            if (!m.upToDate(i) || m.wafer(i).result() == null) {
                return false;
            }
        }
        return true;
    }
}
