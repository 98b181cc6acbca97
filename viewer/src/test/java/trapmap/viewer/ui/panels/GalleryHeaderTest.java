package trapmap.viewer.ui.panels;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

/** The gallery's header counts the open wafers in words that agree with the number; its cards keep to their lines. */
class GalleryHeaderTest {
    @Test
    void oneWaferIsSingular() {
        assertThat(GalleryPanel.waferCount(1)).isEqualTo("1 wafer");
        assertThat(GalleryPanel.waferCount(0)).isEqualTo("0 wafers");
        assertThat(GalleryPanel.waferCount(17)).isEqualTo("17 wafers");
    }

    @Test
    @SuppressWarnings("unchecked")
    void aVerdictTooLongForANarrowCardStaysOnItsLineInsteadOfRunningIntoTheNext() throws Exception {
        trapmap.viewer.model.ViewerModel model = new trapmap.viewer.model.ViewerModel();
        java.nio.file.Path rules = java.nio.file.Path.of("..", "demo-data", "rules-example.json");
        model.open(java.util.List.of(java.nio.file.Path.of("..", "demo-data", "LOT-A01-W03.tif")));
        model.loadRules(rules);
        model.compute(0, () -> false);
        GalleryPanel g = new GalleryPanel(model);
        javax.swing.JList<trapmap.viewer.model.ViewerModel.OpenWafer> list = (javax.swing.JList<
                trapmap.viewer.model.ViewerModel.OpenWafer>) find(g, "gallery");
        java.awt.Container card = (java.awt.Container) list.getCellRenderer().getListCellRendererComponent(list,
                model.wafer(0), 0, false, false);
        card.setSize(180, 86); // the narrowest gallery
        card.doLayout();
        javax.swing.JLabel verdict = null;
        for (java.awt.Component c : card.getComponents()) {
            if (c instanceof javax.swing.JLabel l && l.getText().contains("grade")) {
                verdict = l;
            }
        }
        assertThat(verdict).as("verdict line").isNotNull();
        javax.swing.text.View html = (javax.swing.text.View) verdict.getClientProperty("html");
        html.setSize(10_000, 0);
        assertThat(html.getPreferredSpan(javax.swing.text.View.X_AXIS)).as("verdict wider than the card")
                .isGreaterThan(verdict.getWidth());
        html.setSize(verdict.getWidth(), 0);
        assertThat(html.getPreferredSpan(javax.swing.text.View.Y_AXIS)).as("lines of the verdict, px")
                .isLessThanOrEqualTo(verdict.getHeight());
    }

    private static java.awt.Component find(java.awt.Container c, String name) {
        for (java.awt.Component k : c.getComponents()) {
            if (name.equals(k.getName())) {
                return k;
            }
            if (k instanceof java.awt.Container kc) {
                java.awt.Component f = find(kc, name);
                if (f != null) {
                    return f;
                }
            }
        }
        return null;
    }
}
