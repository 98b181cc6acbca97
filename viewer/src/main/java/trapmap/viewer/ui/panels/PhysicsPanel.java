package trapmap.viewer.ui.panels;

import java.util.Locale;
import javax.swing.DefaultComboBoxModel;
import javax.swing.DefaultListCellRenderer;
import javax.swing.JButton;
import javax.swing.JCheckBox;
import javax.swing.JComboBox;
import javax.swing.JList;
import javax.swing.JPanel;
import javax.swing.JSpinner;
import javax.swing.JTextArea;
import javax.swing.JTextField;
import javax.swing.SpinnerNumberModel;
import javax.swing.Timer;
import javax.swing.UIManager;
import javax.swing.event.DocumentEvent;
import javax.swing.event.DocumentListener;
import trapmap.maps.io.ColourMap;
import trapmap.maps.model.MeasurementConditions;
import trapmap.physics.defect.Defect;
import trapmap.physics.material.DopingText;
import trapmap.viewer.model.Analysis;
import trapmap.viewer.model.ConditionFields;
import trapmap.viewer.model.ConditionOverrides;
import trapmap.viewer.model.DisplaySettings;
import trapmap.viewer.model.DisplayedQuantity;
import trapmap.viewer.model.Units;
import trapmap.viewer.model.ViewerModel;

/**
 * Measurement conditions, defect, displayed quantity, edge exclusion and colour scale. An empty condition field keeps
 * each map's sidecar value (shown greyed as the placeholder); a typed value replaces it for every open map. Edits
 * apply after a short pause (debounced) and go on the undo history.
 */
public final class PhysicsPanel extends WidthTrackingPanel {
    private static final long serialVersionUID = 1L;
    private static final String SIDECAR = "empty = the map's sidecar value";

    private final ViewerModel model;
    private final JComboBox<String> dopingType = new JComboBox<>(new String[] {"p", "n"});
    private final JTextField dopingValue = new JTextField(8);
    private final JComboBox<String> dopingUnit = new JComboBox<>(new String[] {"Ω·cm", "cm⁻³"});
    private final JTextField thickness = new JTextField(8);
    private final JTextField temperature = new JTextField(8);
    private final JComboBox<String> excitation = new JComboBox<>(new String[] {"injection Δn", "generation G"});
    private final JTextField excitationValue = new JTextField(8);
    private final javax.swing.JLabel excitationUnit = new javax.swing.JLabel("cm⁻³");
    private final JTextField srv = new JTextField(8);
    private final JComboBox<Defect> defect = new JComboBox<>();
    private final JTextArea defectInfo = new JTextArea(5, 20);
    private final JComboBox<DisplayedQuantity> quantity = new JComboBox<>(DisplayedQuantity.values());
    private final JSpinner edge = new JSpinner(new SpinnerNumberModel(2.0, 0.0, 50.0, 0.5));
    private final JComboBox<ColourMap> colours = new JComboBox<>(ColourMap.values());
    private final JCheckBox log = new JCheckBox("log scale");
    private final JCheckBox auto = new JCheckBox("auto range");
    private final JTextField low = new JTextField(7);
    private final JTextField high = new JTextField(7);
    private final javax.swing.JLabel lowUnit = new javax.swing.JLabel();
    private final javax.swing.JLabel highUnit = new javax.swing.JLabel();
    private final JTextArea exceedanceInfo = new JTextArea(3, 20);
    private final Timer debounce;
    private final java.util.Map<JTextField, String> plainTips = new java.util.HashMap<>();
    private boolean updating;

    /**
     * @param model     the model
     * @param newDefect opens the user-defined defect dialog
     * @param loadDefects opens a defect JSON file
     */
    public PhysicsPanel(ViewerModel model, Runnable newDefect, Runnable loadDefects) {
        this.model = model;
        setLayout(new java.awt.BorderLayout());
        debounce = new Timer(400, e -> commitConditions());
        debounce.setRepeats(false);
        Form f = new Form();
        f.section("Measurement conditions");
        JPanel doping = new JPanel(new java.awt.BorderLayout(4, 0));
        doping.add(dopingType, java.awt.BorderLayout.WEST);
        // a narrow side panel lays the form out at its minimum sizes: the value must stay wide enough to read
        dopingValue.setMinimumSize(new java.awt.Dimension(64, dopingValue.getPreferredSize().height));
        dopingType.putClientProperty("JComponent.minimumWidth", 0); // "p" or "n": no wider than it needs
        doping.add(dopingValue, java.awt.BorderLayout.CENTER);
        doping.add(dopingUnit, java.awt.BorderLayout.EAST);
        String dopingTip = "Type and net doping: a resistivity in Ω·cm (converted by ASTM F723 at 23 °C) or a density"
                + " in cm⁻³; " + SIDECAR;
        dopingType.setToolTipText("Conductivity type: p (acceptors) or n (donors)");
        dopingUnit.setToolTipText("Unit of the doping value: Ω·cm (resistivity) or cm⁻³ (net density)");
        f.row("Doping", doping, null, dopingTip);
        f.row("Thickness", thickness, "µm", "Wafer thickness, µm (needed for the surface term); " + SIDECAR);
        f.row("Temperature", temperature, "K", "Sample temperature during the measurement, K; " + SIDECAR);
        excitation.setToolTipText("Fixed injection level Δn (cm⁻³) or steady-state generation rate G (cm⁻³ s⁻¹;"
                + " each pixel's Δn = G·τ)");
        f.row("Excitation", excitation, null, excitation.getToolTipText());
        f.rowWithUnit(" ", excitationValue, excitationUnit, "Δn in cm⁻³ or G in cm⁻³ s⁻¹; " + SIDECAR);
        f.row("Surface SRV", srv, "cm/s", "Surface recombination velocity of both surfaces, cm/s (Sproul"
                + " approximation); " + SIDECAR);

        f.section("Defect and quantity");
        defect.setRenderer(new DefaultListCellRenderer() {
            private static final long serialVersionUID = 1L;

            @Override
            public java.awt.Component getListCellRendererComponent(JList<?> list, Object value, int index,
                                                                    boolean sel, boolean focus) {
                Object shown = value instanceof Defect d ? d.id() + " — " + d.name() : value;
                return super.getListCellRendererComponent(list, shown, index, sel, focus);
            }
        });
        defect.setName("defect");
        f.row("Defect", defect, null, "Defect whose equivalent density each pixel is converted to; its level,"
                + " capture cross-sections (cm²) and source are shown below");
        defectInfo.setEditable(false);
        stayPut(defectInfo);
        defectInfo.setLineWrap(true);
        defectInfo.setWrapStyleWord(true);
        defectInfo.setOpaque(false);
        defectInfo.setFont(UIManager.getFont("Label.font").deriveFont(11f));
        defectInfo.setToolTipText("Parameters of the chosen defect and their literature source");
        f.wide(defectInfo);
        JPanel buttons = new JPanel(new java.awt.FlowLayout(java.awt.FlowLayout.LEFT, 0, 0));
        JButton add = new JButton("New defect…");
        add.setToolTipText("Define a defect by its level (eV) and capture cross-sections (cm²)");
        add.addActionListener(e -> newDefect.run());
        JButton load = new JButton("Load file…");
        load.setToolTipText("Read user-defined defects from a JSON defect file");
        load.addActionListener(e -> loadDefects.run());
        buttons.add(add);
        buttons.add(javax.swing.Box.createHorizontalStrut(6));
        buttons.add(load);
        f.wide(buttons);
        quantity.setName("quantity");
        f.row("Show", quantity, null, "Displayed quantity: effective lifetime (µs), trap density (cm⁻³), occupancy"
                + " f_t, SRH lifetime (µs), pixel status or the probability (0–1) that N_t exceeds N*");
        f.row("Edge exclusion", edge, "mm", "Band along the fitted wafer edge left out of statistics and regions, mm");

        f.section("Probability of exceeding N*");
        exceedanceInfo.setName("exceedanceInfo");
        exceedanceInfo.setEditable(false);
        stayPut(exceedanceInfo);
        exceedanceInfo.setLineWrap(true);
        exceedanceInfo.setWrapStyleWord(true);
        exceedanceInfo.setOpaque(false);
        exceedanceInfo.setFont(UIManager.getFont("Label.font").deriveFont(11f));
        exceedanceInfo.setToolTipText("Threshold N* (cm⁻³), Monte Carlo samples and seed, and the standard"
                + " uncertainties the probability map and the readout's P(N_t > N*) and 5–95 % range of N_t use");
        f.wide(exceedanceInfo);
        JButton exceedance = new JButton("Exceedance settings…");
        exceedance.setName("exceedanceSettings");
        exceedance.setToolTipText("Edit N* (cm⁻³), samples, seed and the uncertainties of doping, thickness, SRV, Δn (%),"
                + " temperature (K) and lifetime (%)");
        exceedance.addActionListener(e -> editExceedance());
        f.wide(exceedance);

        f.section("Colour scale");
        colours.setRenderer(new DefaultListCellRenderer() {
            private static final long serialVersionUID = 1L;

            @Override
            public java.awt.Component getListCellRendererComponent(JList<?> list, Object value, int index,
                                                                    boolean sel, boolean focus) {
                Object shown = value instanceof ColourMap c ? c.name().toLowerCase(Locale.ROOT).replace('_', '-')
                        : value;
                return super.getListCellRendererComponent(list, shown, index, sel, focus);
            }
        });
        f.row("Colours", colours, null, "Colour map of the view");
        JPanel checks = new JPanel(new java.awt.FlowLayout(java.awt.FlowLayout.LEFT, 0, 0));
        log.setToolTipText("Logarithmic colour scale (suits lifetimes and densities that span decades)");
        auto.setToolTipText("Range from the 1st to the 99th percentile of the shown wafer inside the edge exclusion");
        checks.add(log);
        checks.add(javax.swing.Box.createHorizontalStrut(10));
        checks.add(auto);
        f.wide(checks);
        f.rowWithUnit("Low", low, lowUnit, "Lower end of the colour range, in the displayed quantity's unit (auto range:"
                + " the value in use)");
        f.rowWithUnit("High", high, highUnit, "Upper end of the colour range, in the displayed quantity's unit (auto range:"
                + " the value in use)");
        f.end();
        add(f, java.awt.BorderLayout.CENTER);

        DocumentListener typing = new DocumentListener() {
            @Override
            public void insertUpdate(DocumentEvent e) {
                changed();
            }

            @Override
            public void removeUpdate(DocumentEvent e) {
                changed();
            }

            @Override
            public void changedUpdate(DocumentEvent e) {
                changed();
            }
        };
        for (JTextField t : new JTextField[] {dopingValue, thickness, temperature, excitationValue, srv}) {
            t.getDocument().addDocumentListener(typing);
            plainTips.put(t, t.getToolTipText());
        }
        dopingType.addActionListener(e -> changed());
        dopingUnit.addActionListener(e -> changed());
        excitation.addActionListener(e -> {
            excitationUnit.setText(excitation.getSelectedIndex() == 0 ? "cm⁻³" : "cm⁻³ s⁻¹");
            changed();
        });
        defect.addActionListener(e -> {
            if (!updating && defect.getSelectedItem() instanceof Defect d) {
                model.setAnalysis(model.analysis().withDefect(d.id()), "defect");
            }
        });
        quantity.addActionListener(e -> {
            if (!updating && quantity.getSelectedItem() instanceof DisplayedQuantity q) {
                apply(a -> a.withQuantity(q), "quantity");
            }
        });
        edge.addChangeListener(e -> {
            if (!updating) {
                model.setAnalysis(model.analysis().withEdgeExclusion((Double) edge.getValue()), "edge exclusion");
            }
        });
        colours.addActionListener(e -> display(d -> d.withColours((ColourMap) colours.getSelectedItem())));
        log.addActionListener(e -> display(d -> d.withLogarithmic(log.isSelected())));
        auto.addActionListener(e -> {
            low.setEnabled(!auto.isSelected());
            high.setEnabled(!auto.isSelected());
            if (!auto.isSelected()) {
                commitRange();
            } else {
                display(d -> d.withAutoRange(d.lowPercent(), d.highPercent()));
            }
        });
        low.addActionListener(e -> commitRange());
        high.addActionListener(e -> commitRange());
        refresh();
    }

    /** Asks for the exceedance settings and applies them (one undo step). */
    public void editExceedance() {
        trapmap.viewer.model.ExceedanceSettings s = ExceedanceDialog.ask(
                javax.swing.SwingUtilities.getWindowAncestor(this), model.analysis().exceedance());
        if (s != null) {
            apply(a -> a.withExceedance(s), "exceedance settings");
        }
    }

    private void apply(java.util.function.UnaryOperator<Analysis> change, String name) {
        try {
            model.setAnalysis(change.apply(model.analysis()), name);
        } catch (IllegalArgumentException ex) {
            javax.swing.JOptionPane.showMessageDialog(this, ex.getMessage(), "trapmap",
                    javax.swing.JOptionPane.WARNING_MESSAGE);
            refresh();
        }
    }

    private void display(java.util.function.UnaryOperator<DisplaySettings> change) {
        if (!updating) {
            apply(a -> a.withDisplay(change.apply(a.display())), "display");
        }
    }

    private void commitRange() {
        if (updating) {
            return;
        }
        try {
            double lo = Double.parseDouble(low.getText().trim());
            double hi = Double.parseDouble(high.getText().trim());
            mark(low, true);
            mark(high, true);
            apply(a -> a.withDisplay(a.display().withManualRange(lo, hi)), "display");
        } catch (NumberFormatException ex) {
            mark(low, isNumber(low.getText()));
            mark(high, isNumber(high.getText()));
        }
    }

    private static boolean isNumber(String s) {
        try {
            Double.parseDouble(s.trim());
            return true;
        } catch (NumberFormatException e) {
            return false;
        }
    }

    private void changed() {
        if (!updating) {
            debounce.restart();
        }
    }

    /**
     * Reads the condition fields ({@link ConditionFields} checks each one): a bad field gets a red outline and its
     * message as tooltip; a valid or cleared one gets its plain look and tooltip back, whatever the other fields hold.
     */
    void commitConditions() {
        ConditionFields.Outcome o = fields().check();
        showMarks(o);
        if (o.overrides() != null) {
            model.setAnalysis(model.analysis().withConditions(o.overrides()), "conditions");
        }
    }

    private void showMarks(ConditionFields.Outcome o) {
        for (ConditionFields.Field f : ConditionFields.Field.values()) {
            JTextField t = field(f);
            String error = o.error(f);
            mark(t, error == null);
            t.setToolTipText(error == null ? plainTips.get(t) : error);
        }
    }

    /** The condition fields as typed. */
    ConditionFields fields() {
        return new ConditionFields(String.valueOf(dopingType.getSelectedItem()), dopingValue.getText(),
                dopingUnit.getSelectedIndex() == 0, thickness.getText(), temperature.getText(),
                excitation.getSelectedIndex() == 1, excitationValue.getText(), srv.getText());
    }

    private JTextField field(ConditionFields.Field f) {
        return switch (f) {
            case DOPING -> dopingValue;
            case THICKNESS -> thickness;
            case TEMPERATURE -> temperature;
            case EXCITATION -> excitationValue;
            case SRV -> srv;
        };
    }

    /** True when the field has the error outline (for tests and the status of the form). */
    static boolean marked(JTextField t) {
        return "error".equals(t.getClientProperty("JComponent.outline"));
    }

    private static void mark(JTextField t, boolean ok) {
        t.putClientProperty("JComponent.outline", ok ? null : "error");
    }

    /** Shows the model's analysis and the selected map's sidecar values; never triggers a change. */
    public void refresh() {
        updating = true;
        try {
            Analysis a = model.analysis();
            ConditionOverrides c = a.conditions();
            ViewerModel.OpenWafer w = model.selected();
            MeasurementConditions side = w == null ? MeasurementConditions.UNKNOWN : w.map().conditions();
            thickness.setName("thickness");
            temperature.setName("temperature");
            excitationValue.setName("excitation");
            srv.setName("surface recombination velocity");
            dopingValue.setName("doping");
            DopingText given = c.parsedDoping();
            if (given != null) {
                dopingType.setSelectedItem(given.doping().type().name().toLowerCase(Locale.ROOT));
                boolean ohm = given.fromResistivity();
                dopingUnit.setSelectedIndex(ohm ? 0 : 1);
                setIfDifferent(dopingValue, Double.toString(ohm ? given.resistivityOhmCm()
                        : given.doping().densityPerCm3()));
            } else {
                setIfDifferent(dopingValue, "");
                if (side.doping() != null) {
                    dopingType.setSelectedItem(side.doping().type().name().substring(0, 1).toLowerCase(Locale.ROOT));
                }
            }
            placeholder(dopingValue, side.doping() == null ? "unknown" : side.doping().type().name().substring(0, 1)
                    .toLowerCase(Locale.ROOT) + " " + Units.number(side.doping().resistivityOhmCm()) + " Ω·cm");
            setIfDifferent(thickness, text(c.thicknessUm()));
            placeholder(thickness, side.thicknessUm() == null ? "unknown" : Units.number(side.thicknessUm()));
            setIfDifferent(temperature, text(c.temperatureK()));
            placeholder(temperature, side.temperatureK() == null ? "300" : Units.number(side.temperatureK()));
            if (c.injectionPerCm3() != null || c.generationPerCm3PerS() != null) {
                excitation.setSelectedIndex(c.injectionPerCm3() != null ? 0 : 1);
                setIfDifferent(excitationValue, text(c.injectionPerCm3() != null ? c.injectionPerCm3()
                        : c.generationPerCm3PerS()));
            } else {
                setIfDifferent(excitationValue, "");
            }
            excitationUnit.setText(excitation.getSelectedIndex() == 0 ? "cm⁻³" : "cm⁻³ s⁻¹");
            placeholder(excitationValue, side.injectionPerCm3() != null ? "Δn " + Units.number(side.injectionPerCm3())
                    : side.generationPerCm3PerS() != null ? "G " + Units.number(side.generationPerCm3PerS())
                    : "unknown");
            setIfDifferent(srv, text(c.srvCmPerS()));
            placeholder(srv, side.srvCmPerS() == null ? "ideal" : Units.number(side.srvCmPerS()));
            showMarks(fields().check());

            DefaultComboBoxModel<Defect> dm = new DefaultComboBoxModel<>();
            model.defects().all().forEach(dm::addElement);
            defect.setModel(dm);
            Defect chosen = model.defect();
            defect.setSelectedItem(chosen);
            showDefectInfo();
            quantity.setSelectedItem(a.quantity());
            edge.setValue(a.edgeExclusionMm());
            DisplaySettings d = a.display();
            colours.setSelectedItem(d.colours());
            log.setSelected(d.logarithmic());
            auto.setSelected(d.autoRange());
            low.setEnabled(!d.autoRange());
            high.setEnabled(!d.autoRange());
            String unit = a.quantity().unit();
            lowUnit.setText(unit);
            highUnit.setText(unit);
            if (!d.autoRange()) {
                setIfDifferent(low, Units.number(d.low()));
                setIfDifferent(high, Units.number(d.high()));
            }
        } finally {
            updating = false;
        }
    }


    /** Shows the range actually used (auto range) in the low/high fields. */
    public void showRange(double lo, double hi) {
        if (model.analysis().display().autoRange()) {
            updating = true;
            low.setText(Units.number(lo));
            high.setText(Units.number(hi));
            updating = false;
        }
    }

    private static void setIfDifferent(JTextField t, String s) {
        if (!t.getText().trim().equals(s)) {
            t.setText(s);
        }
    }

    private static void placeholder(JTextField t, String s) {
        t.putClientProperty("JTextField.placeholderText", s);
        t.repaint();
    }

    private static String text(Double v) {
        return v == null ? "" : (v == Math.rint(v) && Math.abs(v) < 1e6 ? Long.toString(v.longValue())
                : Double.toString(v));
    }

    /**
     * The info box: the chosen defect, or with a rules file the defect the shown wafer was judged with (its
     * profile's, or an override), which the choice above does not change.
     */
    public void showDefectInfo() {
        ViewerModel.OpenWafer w = model.selected();
        edge.setEnabled(model.rules() == null);
        edge.setToolTipText(model.rules() == null
                ? "Band along the fitted wafer edge left out of statistics and regions, mm"
                : "The rules file gives the edge exclusion: " + Units.number(model.rules().rules().edgeExclusionMm())
                + " mm");
        trapmap.viewer.model.WaferAnalysis shown = w == null ? null : w.result();
        trapmap.viewer.model.ExceedanceSettings own = model.analysis().exceedance();
        trapmap.viewer.model.ExceedanceSettings used = shown == null ? own : shown.exceedanceSettings();
        exceedanceInfo.setText(used.equals(own) ? describe(own) : "this wafer: the rules flag's, " + describe(used)
                + "\n(yours: " + own.describe() + ")");
        if (model.rules() == null) {
            defectInfo.setText(describe(model.defect()) + (w != null && w.defectOverride() != null
                    ? "\nthis wafer: " + w.defectOverride() + " (overridden)" : ""));
            return;
        }
        trapmap.viewer.model.WaferAnalysis r = w == null ? null : w.result();
        if (r == null) {
            defectInfo.setText("Rules " + model.rules().name() + ": each wafer is converted with its profile's"
                    + " defect.");
            return;
        }
        Defect judged = model.defectOf(r);
        defectInfo.setText("Rules " + model.rules().name() + ": this wafer is converted with "
                + (judged == null ? "no defect" : judged.id()) + " (profile " + r.verdict().profile()
                + (r.verdict().defectOverridden() ? ", overridden" : "") + "); the choice above applies only where a"
                + " profile names no defect.\n" + (judged == null ? "" : describe(judged)));
    }

    /** N*, samples, seed and the uncertainties, for the info box. */
    public static String describe(trapmap.viewer.model.ExceedanceSettings s) {
        var u = s.uncertainty();
        return String.format(Locale.ROOT, "%s%nuncertainty: doping %s %%, thickness %s %%, SRV %s %%, Δn %s %%,"
                + " T %s K, lifetime %s %%", s.describe(), Units.number(u.dopingRelative() * 100),
                Units.number(u.thicknessRelative() * 100), Units.number(u.srvRelative() * 100),
                Units.number(u.injectionRelative() * 100), Units.number(u.temperatureK()),
                Units.number(u.lifetimeRelative() * 100));
    }

    /** Level, cross-sections, ratio and source of a defect, for the info box and the help. */
    public static String describe(Defect d) {
        if (d == null) {
            return "no defect: only the lifetime is shown";
        }
        return String.format(Locale.ROOT, "level %s%nσ_n %s cm², σ_p %s cm² (k = %s)%nsource: %s",
                d.level(), Units.number(d.electronCrossSectionCm2()), Units.number(d.holeCrossSectionCm2()),
                Units.number(d.captureRatio()), d.source());
    }


    /**
     * Keeps a read-only text's caret where it is when the text is replaced: a caret that follows the new text to its
     * end scrolls the side panel down to it, so the panel would open, and jump at every wafer, scrolled past the
     * doping and thickness fields.
     */
    private static void stayPut(JTextArea t) {
        ((javax.swing.text.DefaultCaret) t.getCaret()).setUpdatePolicy(javax.swing.text.DefaultCaret.NEVER_UPDATE);
    }
}
