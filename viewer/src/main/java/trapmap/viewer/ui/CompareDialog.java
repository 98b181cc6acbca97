package trapmap.viewer.ui;

import java.awt.BorderLayout;
import java.awt.Dimension;
import java.awt.FlowLayout;
import java.util.Locale;
import javax.swing.BorderFactory;
import javax.swing.DefaultListCellRenderer;
import javax.swing.JComboBox;
import javax.swing.JComponent;
import javax.swing.JDialog;
import javax.swing.JFrame;
import javax.swing.JLabel;
import javax.swing.JList;
import javax.swing.JPanel;
import javax.swing.KeyStroke;
import trapmap.maps.model.WaferMap;
import trapmap.physics.defect.Defect;
import trapmap.viewer.ui.compare.CompareModel;
import trapmap.viewer.ui.compare.ComparePanel;
import trapmap.viewer.model.Analysis;
import trapmap.viewer.model.DisplayedQuantity;
import trapmap.viewer.model.ViewerModel;
import trapmap.viewer.model.WaferAnalyzer;

/**
 * Two open wafers side by side: before and after a process step (compare), or in the FeB-paired and the dissociated
 * state (iron imaging). The lifetimes are compared with the conditions the main window applies; with the trap
 * density shown there, both are converted to the chosen defect first.
 */
final class CompareDialog extends JDialog {
    private static final long serialVersionUID = 1L;

    private final ViewerModel model;
    private final boolean iron;
    private final JComboBox<ViewerModel.OpenWafer> before = new JComboBox<>();
    private final JComboBox<ViewerModel.OpenWafer> after = new JComboBox<>();
    private final ComparePanel panel = new ComparePanel();
    private final JLabel problem = new JLabel(" ");
    private boolean ready;

    CompareDialog(JFrame owner, ViewerModel model, boolean iron) {
        super(owner, iron ? "Iron imaging from an FeB pair — trapmap" : "Compare — trapmap", false);
        this.model = model;
        this.iron = iron;
        setDefaultCloseOperation(DISPOSE_ON_CLOSE);
        for (ViewerModel.OpenWafer w : model.wafers()) {
            before.addItem(w);
            after.addItem(w);
        }
        DefaultListCellRenderer names = new DefaultListCellRenderer() {
            private static final long serialVersionUID = 1L;

            @Override
            public java.awt.Component getListCellRendererComponent(JList<?> list, Object value, int index,
                                                                    boolean sel, boolean focus) {
                Object shown = value instanceof ViewerModel.OpenWafer w ? w.name() : value;
                return super.getListCellRendererComponent(list, shown, index, sel, focus);
            }
        };
        before.setRenderer(names);
        after.setRenderer(names);
        choosePair();
        ready = true;
        JPanel top = new JPanel(new FlowLayout(FlowLayout.LEFT, 8, 4));
        JLabel b = new JLabel(iron ? "FeB paired (before dissociation)" : "Before");
        JLabel a = new JLabel(iron ? "Fe_i (after dissociation)" : "After");
        b.setToolTipText(iron ? "Lifetime map with the iron in FeB pairs (µs)" : "Lifetime map before the step (µs)");
        before.setToolTipText(b.getToolTipText());
        a.setToolTipText(iron ? "Lifetime map right after dissociating the pairs (µs)"
                : "Lifetime map after the step (µs); registered onto the before map");
        after.setToolTipText(a.getToolTipText());
        top.add(b);
        top.add(before);
        top.add(a);
        top.add(after);
        before.addActionListener(e -> start());
        after.addActionListener(e -> start());
        problem.setForeground(new java.awt.Color(0xD03030));
        top.add(problem);
        top.setBorder(BorderFactory.createMatteBorder(0, 0, 1, 0, javax.swing.UIManager.getColor(
                "Separator.foreground")));
        getContentPane().add(top, BorderLayout.NORTH);
        getContentPane().add(panel, BorderLayout.CENTER);
        getRootPane().registerKeyboardAction(e -> dispose(), KeyStroke.getKeyStroke("ctrl W"),
                JComponent.WHEN_IN_FOCUSED_WINDOW);
        setPreferredSize(new Dimension(Math.max(1200, owner.getWidth()), Math.max(800, owner.getHeight())));
        pack();
        setLocationRelativeTo(owner);
        ScreenFit.fit(this);
    }

    /** Picks a likely pair from the names: before/after, FeB/Fe_i state, or the selected and the next wafer. */
    private void choosePair() {
        int n = model.size();
        int sel = Math.max(0, model.selectedIndex());
        String[] keys = iron ? new String[] {"feb", "fe-i"} : new String[] {"before", "after"};
        int bi = -1;
        int ai = -1;
        for (int i = 0; i < n; i++) {
            String name = model.wafer(i).name().toLowerCase(Locale.ROOT);
            if (bi < 0 && name.contains(keys[0])) {
                bi = i;
            }
            if (ai < 0 && name.contains(keys[1])) {
                ai = i;
            }
        }
        if (bi < 0 || ai < 0) {
            bi = sel;
            ai = n > 1 ? (sel + 1) % n : sel;
        }
        if (n > 0) {
            before.setSelectedIndex(bi);
            after.setSelectedIndex(ai);
        }
    }

    /** Sends the chosen pair, with the main window's conditions applied, to the comparison. */
    void start() {
        if (!ready) {
            return;
        }
        ViewerModel.OpenWafer b = (ViewerModel.OpenWafer) before.getSelectedItem();
        ViewerModel.OpenWafer a = (ViewerModel.OpenWafer) after.getSelectedItem();
        if (b == null || a == null || b == a) {
            problem.setText("choose two different maps");
            return;
        }
        Analysis an = model.analysis();
        try {
            WaferMap bm = WaferAnalyzer.lifetime(b.map(), an.conditions());
            WaferMap am = WaferAnalyzer.lifetime(a.map(), an.conditions());
            Defect d = !iron && an.quantity() == DisplayedQuantity.TRAP_DENSITY ? model.defect() : null;
            panel.setOptions(CompareModel.Options.defaults().withDefect(d).withIron(iron)
                    .withSettings(trapmap.maps.process.ConversionSettings.of(model.physics())));
            problem.setText(" ");
            panel.setMaps(bm, am);
        } catch (RuntimeException e) {
            problem.setText(e.getMessage());
        }
    }
}
