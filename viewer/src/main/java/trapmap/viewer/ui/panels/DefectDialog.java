package trapmap.viewer.ui.panels;

import java.awt.FlowLayout;
import java.awt.Window;
import javax.swing.JComboBox;
import javax.swing.JLabel;
import javax.swing.JOptionPane;
import javax.swing.JPanel;
import javax.swing.JTextField;
import trapmap.maps.io.DefectFileException;
import trapmap.physics.defect.Defect;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.viewer.model.DefectForm;

/**
 * Asks for a user-defined defect with the fields of a defect file: id, name, level (eV from a band edge or the
 * intrinsic level) and its degeneracy factor, σ_n, σ_p, the thermal-velocity convention, the published spreads and
 * the source. {@link DefectForm} checks them as a defect file's object is checked.
 */
public final class DefectDialog {
    private static final String[] REFERENCES = {"Ev", "Ec", "Ei"};
    private static final String[] CONVENTIONS = {"fixed", "green"};

    private DefectDialog() {
    }

    /** The defect the user defined, or null when cancelled. Invalid values are explained and asked again. */
    public static Defect ask(Window owner) {
        JTextField id = new JTextField("my-defect", 14);
        JTextField name = new JTextField("user-defined level", 14);
        JComboBox<String> ref = new JComboBox<>(new String[] {"E_v + (above valence band)",
            "E_c − (below conduction band)", "E_i + (from intrinsic level)"});
        JTextField energy = new JTextField("0.40", 8);
        JTextField degeneracy = new JTextField(DefectForm.DEFAULT_DEGENERACY, 8);
        JTextField sn = new JTextField("1e-14", 8);
        JTextField sp = new JTextField("1e-15", 8);
        JComboBox<String> vth = new JComboBox<>(new String[] {"fixed (1.1e7 cm/s at 300 K)", "green (Green 1990)"});
        JTextField[] energySpread = pair();
        JTextField[] snSpread = pair();
        JTextField[] spSpread = pair();
        JTextField note = new JTextField("", 14);
        JTextField source = new JTextField("own measurement", 14);
        Form f = new Form();
        f.row("Id", id, null, "id: 1-40 lower-case letters, digits, '-', '_' or '.'; must not repeat a library id");
        f.row("Name", name, null, "name: descriptive name (empty: the id)");
        f.row("Level from", ref, null, "level.reference: band edge or intrinsic level the energy is measured from");
        f.row("Energy", energy, "eV", "level.energy_ev: level energy from the chosen reference, eV");
        f.row("Degeneracy g", degeneracy, null, "level.degeneracy: degeneracy factor of the level (no unit;"
                + " default 1, as in defect files)");
        f.row("σ_n", sn, "cm²", "sigma_n_cm2: electron capture cross-section, cm²");
        f.row("σ_p", sp, "cm²", "sigma_p_cm2: hole capture cross-section, cm²");
        f.row("v_th convention", vth, null, "vth_convention: the thermal velocities the cross-sections were"
                + " published with (default fixed, as in defect files). fixed: "
                + ThermalVelocityModel.FIXED.description() + "; green: " + ThermalVelocityModel.GREEN_1990.description());
        f.section("Published spread (empty: none)");
        f.row("Energy from–to", row(energySpread), "eV", "spread.energy_ev: [min, max] eV; must contain the energy");
        f.row("σ_n from–to", row(snSpread), "cm²", "spread.sigma_n_cm2: [min, max] cm²; must contain σ_n");
        f.row("σ_p from–to", row(spSpread), "cm²", "spread.sigma_p_cm2: [min, max] cm²; must contain σ_p");
        f.row("Spread note", note, null, "spread.note: where the spread comes from");
        f.row("Source", source, null, "source: where the parameters come from");
        while (true) {
            int ok = JOptionPane.showConfirmDialog(owner, f, "New defect", JOptionPane.OK_CANCEL_OPTION,
                    JOptionPane.PLAIN_MESSAGE);
            if (ok != JOptionPane.OK_OPTION) {
                return null;
            }
            DefectForm form = new DefectForm(id.getText(), name.getText(), REFERENCES[ref.getSelectedIndex()],
                    energy.getText(), degeneracy.getText(), sn.getText(), sp.getText(),
                    CONVENTIONS[vth.getSelectedIndex()], spread(energySpread), spread(snSpread), spread(spSpread),
                    note.getText(), source.getText());
            try {
                return form.toDefect();
            } catch (DefectFileException ex) {
                JOptionPane.showMessageDialog(owner, ex.getMessage(), "New defect", JOptionPane.WARNING_MESSAGE);
            }
        }
    }

    private static JTextField[] pair() {
        return new JTextField[] {new JTextField(7), new JTextField(7)};
    }

    private static JPanel row(JTextField[] minMax) {
        JPanel p = new JPanel(new FlowLayout(FlowLayout.LEFT, 2, 0));
        p.add(minMax[0]);
        p.add(new JLabel("–"));
        p.add(minMax[1]);
        return p;
    }

    private static DefectForm.Spread spread(JTextField[] minMax) {
        return new DefectForm.Spread(minMax[0].getText(), minMax[1].getText());
    }
}
