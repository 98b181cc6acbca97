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
}
