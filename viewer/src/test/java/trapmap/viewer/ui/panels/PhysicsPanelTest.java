package trapmap.viewer.ui.panels;

import static org.assertj.core.api.Assertions.assertThat;

import javax.swing.JTextField;
import org.junit.jupiter.api.Test;
import trapmap.viewer.model.ViewerModel;

/** The conditions form's marks, headless (the panel is built but never shown). */
class PhysicsPanelTest {
    private static JTextField named(java.awt.Container c, String name) {
        for (java.awt.Component k : c.getComponents()) {
            if (k instanceof JTextField t && name.equals(t.getName())) {
                return t;
            }
            if (k instanceof java.awt.Container kc) {
                JTextField f = named(kc, name);
                if (f != null) {
                    return f;
                }
            }
        }
        return null;
    }

    @Test
    void aClearedFieldLosesItsRedOutlineAndErrorTooltipWhileAnotherBadFieldKeepsThem() {
        ViewerModel model = new ViewerModel();
        PhysicsPanel p = new PhysicsPanel(model, () -> { }, () -> { });
        JTextField thickness = named(p, "thickness");
        JTextField temperature = named(p, "temperature");
        String plainThicknessTip = thickness.getToolTipText();
        String plainTemperatureTip = temperature.getToolTipText();
        assertThat(plainThicknessTip).contains("µm");

        thickness.setText("0");
        temperature.setText("x");
        p.commitConditions();
        assertThat(PhysicsPanel.marked(thickness)).isTrue();
        assertThat(PhysicsPanel.marked(temperature)).isTrue();
        assertThat(temperature.getToolTipText()).isEqualTo("temperature: 'x' is not a number (K)");

        thickness.setText("");
        p.commitConditions();
        assertThat(PhysicsPanel.marked(thickness)).as("cleared thickness").isFalse();
        assertThat(thickness.getToolTipText()).isEqualTo(plainThicknessTip);
        assertThat(PhysicsPanel.marked(temperature)).as("temperature still 'x'").isTrue();

        temperature.setText("");
        p.commitConditions();
        assertThat(PhysicsPanel.marked(temperature)).isFalse();
        assertThat(temperature.getToolTipText()).isEqualTo(plainTemperatureTip).doesNotContain("not a number");

        thickness.setText("175");
        p.commitConditions();
        assertThat(model.analysis().conditions().thicknessUm()).isEqualTo(175.0);
        assertThat(PhysicsPanel.marked(thickness)).isFalse();
    }

    private static javax.swing.JTextArea area(java.awt.Container c, String name) {
        for (java.awt.Component k : c.getComponents()) {
            if (k instanceof javax.swing.JTextArea t && name.equals(t.getName())) {
                return t;
            }
            if (k instanceof java.awt.Container kc) {
                javax.swing.JTextArea f = area(kc, name);
                if (f != null) {
                    return f;
                }
            }
        }
        return null;
    }

    @Test
    void exceedanceBoxShowsTheSettingsInUseWithUnits(@org.junit.jupiter.api.io.TempDir java.nio.file.Path dir)
            throws Exception {
        ViewerModel model = new ViewerModel();
        PhysicsPanel p = new PhysicsPanel(model, () -> { }, () -> { });
        javax.swing.JTextArea info = area(p, "exceedanceInfo");
        p.showDefectInfo();
        assertThat(info.getText()).isEqualTo("N* 3e11 cm⁻³, 10000 samples, seed 1\nuncertainty: doping 5 %,"
                + " thickness 2 %, SRV 50 %, Δn 10 %, T 1 K, lifetime 3 %");
        // a rules flag with a confidence draws with its own N* and the rules' uncertainties: the box says so
        java.nio.file.Path rules = dir.resolve("r.json");
        java.nio.file.Files.writeString(rules, "{\"defect\": \"fe-i\", \"flag\": {\"quantity\": \"trap-density\","
                + " \"threshold\": 2e11, \"confidence\": 0.9}, \"physics\": {\"uncertainty\": {\"samples\": 500}}}");
        model.open(java.util.List.of(java.nio.file.Path.of("..", "demo-data", "LOT-A01-W03.tif")));
        model.loadRules(rules);
        model.compute(0, () -> false);
        p.showDefectInfo();
        assertThat(info.getText()).startsWith("this wafer: the rules flag's, N* 2e11 cm⁻³, 500 samples, seed 1")
                .endsWith("(yours: N* 3e11 cm⁻³, 10000 samples, seed 1)");
    }

    private static void layOut(java.awt.Component c) {
        if (c instanceof java.awt.Container k) {
            k.doLayout();
            for (java.awt.Component child : k.getComponents()) {
                layOut(child);
            }
        }
    }

    @Test
    void newDefectAndExceedanceTextsLeaveTheScrolledPanelAtItsTop() throws Exception {
        ViewerModel model = new ViewerModel();
        PhysicsPanel p = new PhysicsPanel(model, () -> { }, () -> { });
        javax.swing.JScrollPane sp = new javax.swing.JScrollPane(p);
        sp.setSize(400, 300); // shorter than the panel, as in the window's side panel
        layOut(sp);
        layOut(sp);
        assertThat(p.getHeight()).as("panel taller than its viewport").isGreaterThan(300);
        javax.swing.SwingUtilities.invokeAndWait(() -> {
            model.open(java.util.List.of(java.nio.file.Path.of("..", "demo-data", "LOT-A01-W03.tif")));
            p.refresh();
            p.showDefectInfo();
        });
        javax.swing.SwingUtilities.invokeAndWait(() -> { }); // carets move on the event thread, later
        assertThat(sp.getViewport().getViewPosition().y).as("scrolled down by").isZero();
    }
}
