package trapmap.viewer.ui.panels;

import java.awt.BorderLayout;
import java.awt.Dimension;
import java.util.List;
import java.util.function.Consumer;
import javax.swing.BorderFactory;
import javax.swing.JComboBox;
import javax.swing.JComponent;
import javax.swing.JLabel;
import javax.swing.JPanel;
import javax.swing.JScrollPane;
import javax.swing.JSlider;
import javax.swing.JSpinner;
import javax.swing.JTable;
import javax.swing.JTextField;
import javax.swing.ListSelectionModel;
import javax.swing.SpinnerNumberModel;
import javax.swing.table.AbstractTableModel;
import trapmap.maps.region.Region;
import trapmap.maps.region.RegionCriteria;
import trapmap.viewer.model.Analysis;
import trapmap.viewer.model.DisplayedQuantity;
import trapmap.viewer.model.ThresholdRule;
import trapmap.viewer.model.Units;
import trapmap.viewer.model.Verdict;
import trapmap.viewer.model.ViewerModel;
import trapmap.viewer.model.WaferAnalysis;

/**
 * The threshold rule on the displayed quantity: a slider (logarithmic for quantities that span decades) with a text
 * field in the quantity's unit, above/below, smallest region, the pass limit on the flagged area, the flagged
 * fraction and the table of flagged regions (a click zooms there). In a scroll pane it follows the viewport's width and
 * fills its height where there is room (the region table takes the rest), else keeps its own height and scrolls, so
 * that on a low screen the verdict stays reachable rather than cut off.
 */
public final class ThresholdPanel extends WidthTrackingPanel {
    private static final long serialVersionUID = 1L;
    private static final int STEPS = 1000;
    private static final String OWN_TIP = "trapmap.ownTooltip";

    private final ViewerModel model;
    private final JLabel title = new JLabel();
    private final JSlider slider = new JSlider(0, STEPS, STEPS / 2);
    private final JTextField value = new JTextField(8);
    private final JLabel unit = new JLabel();
    private final JComboBox<String> side = new JComboBox<>(new String[] {"below", "above"});
    private final JSpinner minArea = new JSpinner(new SpinnerNumberModel(4.0, 0.0, 1e5, 1.0));
    private final JSpinner maxFraction = new JSpinner(new SpinnerNumberModel(2.0, 0.0, 100.0, 0.5));
    private final JLabel summary = new JLabel(" ");
    private final JLabel verdict = new JLabel(" ");
    private final JLabel caution = new JLabel("<html>Caution: " + trapmap.maps.model.Caution.TEXT + "</html>");
    private final RegionModel regions = new RegionModel();
    private final JTable table = new JTable(regions);
    private double lo = 1;
    private double hi = 1000;
    private boolean log = true;
    private boolean updating;

    /** @param zoomTo called with the region whose row was clicked */
    public ThresholdPanel(ViewerModel model, Consumer<Region> zoomTo) {
        super(new BorderLayout());
        this.model = model;
        Form f = new Form();
        f.section("Threshold");
        f.wide(title);
        slider.setName("thresholdSlider");
        slider.setToolTipText("Threshold; logarithmic steps for lifetimes and densities. The value and its unit are"
                + " in the field below");
        f.wide(slider);
        value.setName("thresholdValue");
        f.rowWithUnit("Value", value, unit, "Threshold in the displayed quantity's unit; Enter applies");
        side.setName("thresholdSide");
        f.row("Flag pixels", side, null, "Flag pixels below the threshold (lifetimes) or above it (trap densities)");
        f.row("Smallest region", minArea, "mm²", "Connected flagged groups smaller than this area are not counted, mm²");
        f.row("Pass up to", maxFraction, "%", "A wafer passes while its flagged regions cover at most this share of the"
                + " evaluated area, %");
        summary.setName("flaggedSummary");
        summary.setToolTipText("Flagged area over the evaluated area (inside the edge exclusion) and the number of"
                + " flagged regions");
        f.wide(summary);
        verdict.setName("verdict");
        verdict.setToolTipText("How the shown wafer was judged: a rules file's verdict and grade (as trapmap inspect"
                + " gives them), or the quick threshold check above, which is not a rules verdict");
        f.wide(verdict);
        // every verdict carries the caution, here as in the reports and on the command line
        caution.setName("verdictCaution");
        caution.setFont(caution.getFont().deriveFont(caution.getFont().getSize2D() - 1f));
        caution.setForeground(new java.awt.Color(0x8A5A00));
        caution.setBorder(BorderFactory.createEmptyBorder(3, 0, 0, 0));
        f.wide(caution);
        f.section("Flagged regions");
        add(f, BorderLayout.NORTH);

        table.setName("regionTable");
        table.setSelectionMode(ListSelectionModel.SINGLE_SELECTION);
        table.setAutoCreateRowSorter(true);
        table.setDefaultRenderer(Double.class, new javax.swing.table.DefaultTableCellRenderer() {
            private static final long serialVersionUID = 1L;

            @Override
            protected void setValue(Object v) {
                setHorizontalAlignment(RIGHT);
                setText(v instanceof Double d ? Units.number(d) : String.valueOf(v));
            }
        });
        table.setToolTipText("Flagged regions: area mm², centroid in wafer mm (x right, y up), peak value; click a row"
                + " to zoom there");
        TableFit.fitHeaders(table);
        table.getSelectionModel().addListSelectionListener(e -> {
            if (!e.getValueIsAdjusting() && table.getSelectedRow() >= 0) {
                zoomTo.accept(regions.rows.get(table.convertRowIndexToModel(table.getSelectedRow())));
            }
        });
        JScrollPane sp = new JScrollPane(table);
        sp.setBorder(BorderFactory.createEmptyBorder(0, 8, 8, 8));
        sp.setPreferredSize(new Dimension(260, 160));
        add(sp, BorderLayout.CENTER);

        slider.addChangeListener(e -> {
            if (updating) {
                return;
            }
            double v = fromSlider(slider.getValue());
            updating = true;
            value.setText(Units.number(v));
            updating = false;
            if (!slider.getValueIsAdjusting()) {
                setRule(model.analysis().threshold().withValue(Double.parseDouble(Units.number(v).replace("–", "0"))));
            }
        });
        value.addActionListener(e -> commitValue());
        value.addFocusListener(new java.awt.event.FocusAdapter() {
            @Override
            public void focusLost(java.awt.event.FocusEvent e) {
                commitValue();
            }
        });
        side.addActionListener(e -> {
            if (!updating) {
                setRule(model.analysis().threshold().withSide(side.getSelectedIndex() == 0
                        ? RegionCriteria.Side.BELOW : RegionCriteria.Side.ABOVE));
            }
        });
        minArea.addChangeListener(e -> {
            if (!updating) {
                setRule(model.analysis().threshold().withMinArea((Double) minArea.getValue()));
            }
        });
        maxFraction.addChangeListener(e -> {
            if (!updating) {
                setRule(model.analysis().threshold().withMaxFraction((Double) maxFraction.getValue() / 100));
            }
        });
        refresh();
    }

    private void commitValue() {
        if (updating) {
            return;
        }
        try {
            double v = Double.parseDouble(value.getText().trim());
            value.putClientProperty("JComponent.outline", null);
            setRule(model.analysis().threshold().withValue(v));
        } catch (IllegalArgumentException ex) {
            value.putClientProperty("JComponent.outline", "error");
            value.setToolTipText("'" + value.getText() + "' is not a number; give the threshold in "
                    + model.analysis().quantity().unit());
        }
    }

    /** Sets the threshold value (in the displayed quantity's unit), as typing it would. */
    public void setThreshold(double v) {
        setRule(model.analysis().threshold().withValue(v));
    }

    private void setRule(ThresholdRule r) {
        Analysis a = model.analysis();
        if (!r.equals(a.threshold())) {
            model.setAnalysis(a.withThreshold(r), "threshold");
        }
    }

    private double fromSlider(int s) {
        double t = (double) s / STEPS;
        return log ? lo * Math.pow(hi / lo, t) : lo + (hi - lo) * t;
    }

    private int toSlider(double v) {
        double t = log ? Math.log(v / lo) / Math.log(hi / lo) : (v - lo) / (hi - lo);
        if (Double.isNaN(t)) {
            t = 0.5;
        }
        return (int) Math.round(Math.max(0, Math.min(1, t)) * STEPS);
    }

    /** Shows the model's rule and the selected wafer's regions. */
    public void refresh() {
        updating = true;
        try {
            Analysis a = model.analysis();
            DisplayedQuantity q = a.quantity();
            ThresholdRule t = a.threshold();
            title.setText("on " + q.label() + (q.unit().isEmpty() ? "" : " (" + q.unit() + ")"));
            unit.setText(q.unit().isEmpty() ? "(no unit)" : q.unit());
            ViewerModel.OpenWafer w = model.selected();
            WaferAnalysis r = w == null ? null : w.result();
            log = q.logarithmic();
            if (q.isProbability()) {
                // a probability's slider spans its whole scale
                lo = 0;
                hi = 1;
            } else if (r != null && r.analysis().quantity() == q) {
                double min = r.displayedStats().min();
                double max = r.displayedStats().max();
                if (log) {
                    min = Math.max(min, max * 1e-5);
                }
                if (max > min) {
                    lo = Math.min(min, t.value());
                    hi = Math.max(max, t.value());
                    if (log && !(lo > 0)) {
                        lo = hi * 1e-5;
                    }
                }
            } else if (q == DisplayedQuantity.STATUS || q == DisplayedQuantity.OCCUPANCY) {
                lo = 0;
                hi = q == DisplayedQuantity.STATUS ? 3 : 1;
            }
            slider.setValue(toSlider(t.value()));
            if (!value.isFocusOwner()) {
                value.setText(Units.number(t.value()));
            }
            side.setSelectedIndex(t.side() == RegionCriteria.Side.BELOW ? 0 : 1);
            minArea.setValue(t.minAreaMm2());
            maxFraction.setValue(t.maxFlaggedFraction() * 100);
            boolean byRules = model.rules() != null;
            if (byRules) {
                title.setText("<html>set by " + model.rules().name() + " (the fields below are the quick check's)"
                        + "</html>");
            }
            for (JComponent c : new JComponent[] {slider, value, side, minArea, maxFraction}) {
                if (c.getClientProperty(OWN_TIP) == null) {
                    c.putClientProperty(OWN_TIP, c.getToolTipText() == null ? "" : c.getToolTipText());
                }
                c.setEnabled(!byRules);
                c.setToolTipText(byRules ? "The rules file sets the flag, the smallest region and the limits;"
                        + " File ▸ Use quick threshold check to set them here" : (String) c.getClientProperty(OWN_TIP));
            }
            if (r == null) {
                summary.setText(w == null ? "no wafer open" : w.error() != null ? w.error() : "analysing…");
                verdict.setText(byRules ? "judged by " + model.judgedBy() : Verdict.QUICK_CHECK);
                regions.set(List.of(), q.unit());
                caution.setVisible(false);
            } else {
                Verdict v = r.verdict();
                summary.setText("<html>flagged <b>" + Units.percent(r.flaggedFraction()) + "</b> of "
                        + trapmap.maps.raster.PitchPrecision.areaOfPixels(r.lifetimeStats().areaMm2(),
                                r.lifetimeStats().count()) + " mm² · "
                        + r.regions().size() + (r.regions().size() == 1 ? " region" : " regions") + "</html>");
                verdict.setText(verdictHtml(v));
                regions.set(r.regions().regions(), r.flagUnit());
                caution.setVisible(true);
            }
        } finally {
            updating = false;
        }
    }

    private static String verdictHtml(Verdict v) {
        String colour = v.pass() ? "#2E8B57" : "#D03030";
        StringBuilder b = new StringBuilder("<html><b><font color='").append(colour).append("'>")
                .append(v.rulesVerdict() ? v.headline() : Verdict.QUICK_CHECK + ": " + v.outcome())
                .append("</font></b>");
        if (v.rulesVerdict()) {
            b.append("<br>").append(v.rulesName()).append(" · profile <b>").append(v.profile()).append("</b>");
            if (v.defectId() != null) {
                b.append(" · defect ").append(v.defectId()).append(v.defectOverridden() ? " (overridden)" : "");
            }
            if (!v.failedRules().isEmpty()) {
                b.append("<br>failed: ").append(String.join(", ", v.failedRules()));
            }
            if (!v.gradedDownBy().isEmpty()) {
                b.append("<br>graded down by: ").append(String.join(", ", v.gradedDownBy()));
            }
            if (v.conditionsOverridden()) {
                b.append("<br>with conditions typed into the viewer (not the batch's)");
            }
            b.append("<br><font color='gray'>").append(v.rule()).append("</font>");
        } else {
            b.append(" <font color='gray'>(not a rules verdict)</font>");
            if (v.defectOverridden()) {
                b.append("<br>defect ").append(v.defectId()).append(" (overridden for this wafer)");
            }
            if (!v.invalidAreaWarning().isEmpty()) {
                b.append("<br><font color='#D03030'>warning: ").append(v.invalidAreaWarning()).append("</font>");
            }
        }
        if (v.invalid() != null) {
            b.append("<br><font color='gray'>invalid area ").append(v.invalid().describe()).append("</font>");
        }
        return b.append("</html>").toString();
    }

    @Override
    public boolean getScrollableTracksViewportHeight() {
        return getParent() instanceof javax.swing.JViewport v && v.getHeight() > getPreferredSize().height;
    }

    /** The verdict line as shown (HTML). */
    public String verdictText() {
        return verdict.getText();
    }

    /** The caution under the verdict, or null while no verdict is shown. */
    public String cautionText() {
        return caution.isVisible() ? caution.getText().replaceAll("<[^>]+>", "") : null;
    }

    /** Number of rows in the region table. */
    public int regionRows() {
        return regions.getRowCount();
    }

    /** The region table's rows: id, area, centroid, peak. */
    private static final class RegionModel extends AbstractTableModel {
        private static final long serialVersionUID = 1L;
        private List<Region> rows = List.of();
        private String unit = "";

        void set(List<Region> r, String u) {
            boolean header = !u.equals(unit);
            rows = r;
            unit = u;
            if (header) {
                fireTableStructureChanged();
            } else {
                fireTableDataChanged();
            }
        }

        @Override
        public int getRowCount() {
            return rows.size();
        }

        @Override
        public int getColumnCount() {
            return 5;
        }

        @Override
        public String getColumnName(int c) {
            return switch (c) {
                case 0 -> "id";
                case 1 -> "area mm²";
                case 2 -> "x mm";
                case 3 -> "y mm";
                default -> "peak" + (unit.isEmpty() ? "" : " " + unit);
            };
        }

        @Override
        public Class<?> getColumnClass(int c) {
            return c == 0 ? Integer.class : Double.class;
        }

        @Override
        public Object getValueAt(int row, int c) {
            Region g = rows.get(row);
            return switch (c) {
                case 0 -> g.id();
                case 1 -> round(g.areaMm2(), 1);
                case 2 -> round(g.centroidXMm(), 1);
                case 3 -> round(g.centroidYMm(), 1);
                default -> g.peakValue();
            };
        }

        private static double round(double v, int digits) {
            double f = Math.pow(10, digits);
            return Math.round(v * f) / f;
        }
    }
}
