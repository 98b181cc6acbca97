package trapmap.viewer.ui.panels;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import trapmap.maps.model.Caution;
import trapmap.viewer.model.ViewerModel;

/** The threshold panel states the caution wherever it states a verdict (headless: built, never shown). */
class ThresholdPanelTest {
    @Test
    void aRulesVerdictAndAQuickCheckBothCarryTheCaution() throws Exception {
        ViewerModel model = new ViewerModel();
        ThresholdPanel p = new ThresholdPanel(model, r -> { });
        assertThat(p.cautionText()).as("no wafer, no verdict").isNull();

        model.open(List.of(Path.of("..", "demo-data", "LOT-A01-W03.tif")));
        model.compute(0, () -> false);
        p.refresh();
        assertThat(p.verdictText()).contains("quick threshold check");
        assertThat(p.cautionText()).isEqualTo("Caution: " + Caution.TEXT);

        model.loadRules(Path.of("..", "demo-data", "rules-example.json"));
        model.compute(0, () -> false);
        p.refresh();
        assertThat(p.verdictText()).contains("grade");
        assertThat(p.cautionText()).isEqualTo("Caution: " + Caution.TEXT);
    }
}
