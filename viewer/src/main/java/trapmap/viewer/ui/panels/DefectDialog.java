package trapmap.viewer.ui.panels;

import java.awt.Window;
import javax.swing.JComboBox;
import javax.swing.JOptionPane;
import javax.swing.JTextField;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.TrapLevel;
import trapmap.physics.material.ThermalVelocityModel;

/** Asks for a user-defined defect: id, name, level (eV from a band edge or the intrinsic level), σ_n, σ_p, source. */
public final class DefectDialog {
    private DefectDialog() {
    }

    /** The defect the user defined, or null when cancelled. Invalid values are explained and asked again. */
    public static Defect ask(Window owner) {
        JTextField id = new JTextField("my-defect", 14);
        JTextField name = new JTextField("user-defined level", 14);
        JComboBox<String> ref = new JComboBox<>(new String[] {"E_v + (above valence band)",
            "E_c − (below conduction band)", "E_i + (from intrinsic level)"});
        JTextField energy = new JTextField("0.40", 8);
        JTextField sn = new JTextField("1e-14", 8);
        JTextField sp = new JTextField("1e-15", 8);
        JTextField source = new JTextField("own measurement", 14);
        Form f = new Form();
        f.row("Id", id, null, "1-40 lower-case letters, digits, '-', '_' or '.'; must not repeat a library id");
        f.row("Name", name, null, "Descriptive name");
        f.row("Level from", ref, null, "Band edge or intrinsic level the energy is measured from");
        f.row("Energy", energy, "eV", "Level energy from the chosen reference, eV");
        f.row("σ_n", sn, "cm²", "Electron capture cross-section, cm²");
        f.row("σ_p", sp, "cm²", "Hole capture cross-section, cm²");
        f.row("Source", source, null, "Where the parameters come from");
        while (true) {
            int ok = JOptionPane.showConfirmDialog(owner, f, "New defect", JOptionPane.OK_CANCEL_OPTION,
                    JOptionPane.PLAIN_MESSAGE);
            if (ok != JOptionPane.OK_OPTION) {
                return null;
            }
            try {
                double e = Double.parseDouble(energy.getText().trim());
                TrapLevel level = switch (ref.getSelectedIndex()) {
                    case 0 -> TrapLevel.aboveValenceBand(e);
                    case 1 -> TrapLevel.belowConductionBand(e);
                    default -> TrapLevel.fromIntrinsic(e);
                };
                return Defect.of(id.getText().trim(), name.getText().trim(), level,
                        Double.parseDouble(sn.getText().trim()), Double.parseDouble(sp.getText().trim()),
                        ThermalVelocityModel.FIXED, source.getText().trim(), null);
            } catch (NumberFormatException ex) {
                JOptionPane.showMessageDialog(owner, "Energy (eV) and cross-sections (cm²) must be numbers: "
                        + ex.getMessage(), "New defect", JOptionPane.WARNING_MESSAGE);
            } catch (IllegalArgumentException ex) {
                JOptionPane.showMessageDialog(owner, ex.getMessage(), "New defect", JOptionPane.WARNING_MESSAGE);
            }
        }
    }
}
