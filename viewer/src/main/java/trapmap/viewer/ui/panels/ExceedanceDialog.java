package trapmap.viewer.ui.panels;

import java.awt.Window;
import java.util.EnumMap;
import java.util.Map;
import javax.swing.JButton;
import javax.swing.JOptionPane;
import javax.swing.JTextField;
import trapmap.viewer.model.ExceedanceForm;
import trapmap.viewer.model.ExceedanceSettings;

/**
 * Asks for the settings of the probability of exceeding N*: the threshold N* (cm⁻³), the Monte Carlo samples and
 * seed, and the standard uncertainties of the conditions and the lifetime (relative ones in %, the temperature's in
 * K), with a button that restores the documented defaults. {@link ExceedanceForm} checks every field.
 */
public final class ExceedanceDialog {
    private ExceedanceDialog() {
    }

    private static final Map<ExceedanceForm.Field, String> TIPS = Map.of(
            ExceedanceForm.Field.THRESHOLD, "Threshold density N*, cm⁻³: the map shows P(N_t > N*)",
            ExceedanceForm.Field.SAMPLES, "Monte Carlo samples (16 to " + ExceedanceSettings.MAX_SAMPLES
                    + "); a probability's standard error is at most 0.5/√samples",
            ExceedanceForm.Field.SEED, "Seed of the draws: the same seed gives the same map",
            ExceedanceForm.Field.DOPING, "Relative standard uncertainty of the net doping, % (default 5 %)",
            ExceedanceForm.Field.THICKNESS, "Relative standard uncertainty of the thickness, % (default 2 %)",
            ExceedanceForm.Field.SRV, "Relative standard uncertainty of the surface recombination velocity, %"
                    + " (default 50 %)",
            ExceedanceForm.Field.INJECTION, "Relative standard uncertainty of the injection level Δn, % (default"
                    + " 10 %)",
            ExceedanceForm.Field.TEMPERATURE, "Standard uncertainty of the temperature, K (default 1 K)",
            ExceedanceForm.Field.LIFETIME, "Relative noise of each measured lifetime, % (default 3 %)");

    /** The settings the user confirmed, or null when cancelled. Invalid values are explained and asked again. */
    public static ExceedanceSettings ask(Window owner, ExceedanceSettings current) {
        Map<ExceedanceForm.Field, JTextField> fields = new EnumMap<>(ExceedanceForm.Field.class);
        ExceedanceForm start = ExceedanceForm.of(current);
        Form f = new Form();
        f.section("Probability of exceeding N*");
        for (ExceedanceForm.Field k : ExceedanceForm.Field.values()) {
            if (k == ExceedanceForm.Field.DOPING) {
                f.section("Standard uncertainties (0: fixed at the nominal value)");
            }
            JTextField t = new JTextField(start.text(k), 9);
            t.setName(k.name().toLowerCase(java.util.Locale.ROOT));
            fields.put(k, t);
            f.row(label(k), t, k.unit().isEmpty() ? null : k.unit(), TIPS.get(k));
        }
        JButton defaults = new JButton("Documented defaults");
        defaults.setToolTipText("Uncertainties of a routine measurement: doping 5 %, thickness 2 %, SRV 50 %, Δn 10 %,"
                + " temperature 1 K, lifetime 3 % (N*, samples and seed stay)");
        defaults.addActionListener(e -> {
            ExceedanceForm d = ExceedanceForm.of(ExceedanceSettings.DEFAULT);
            for (ExceedanceForm.Field k : ExceedanceForm.Field.values()) {
                if (k.ordinal() >= ExceedanceForm.Field.DOPING.ordinal()) {
                    fields.get(k).setText(d.text(k));
                }
            }
        });
        f.wide(defaults);
        f.end();
        while (true) {
            int ok = JOptionPane.showConfirmDialog(owner, f, "Exceedance and uncertainties",
                    JOptionPane.OK_CANCEL_OPTION, JOptionPane.PLAIN_MESSAGE);
            if (ok != JOptionPane.OK_OPTION) {
                return null;
            }
            ExceedanceForm form = new ExceedanceForm();
            fields.forEach((k, t) -> form.set(k, t.getText()));
            ExceedanceForm.Outcome o = form.check();
            fields.forEach((k, t) -> t.putClientProperty("JComponent.outline", o.error(k) == null ? null : "error"));
            if (o.settings() != null) {
                return o.settings();
            }
            JOptionPane.showMessageDialog(owner, String.join("\n", o.errors().values()),
                    "Exceedance and uncertainties", JOptionPane.WARNING_MESSAGE);
        }
    }

    private static String label(ExceedanceForm.Field k) {
        return switch (k) {
            case THRESHOLD -> "N*";
            case SAMPLES -> "Samples";
            case SEED -> "Seed";
            case DOPING -> "Doping";
            case THICKNESS -> "Thickness";
            case SRV -> "Surface SRV";
            case INJECTION -> "Injection Δn";
            case TEMPERATURE -> "Temperature";
            case LIFETIME -> "Lifetime noise";
        };
    }
}
