package trapmap.viewer.ui.compare;

import java.awt.BasicStroke;
import java.awt.BorderLayout;
import java.awt.Color;
import java.awt.Component;
import java.awt.Dimension;
import java.awt.Graphics;
import java.awt.Graphics2D;
import java.awt.GridLayout;
import java.awt.RenderingHints;
import java.awt.event.ActionEvent;
import java.awt.event.InputEvent;
import java.awt.event.KeyEvent;
import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.CancellationException;
import java.util.concurrent.ExecutionException;
import java.util.function.Consumer;
import javax.swing.AbstractAction;
import javax.swing.BorderFactory;
import javax.swing.JButton;
import javax.swing.JCheckBox;
import javax.swing.JComboBox;
import javax.swing.JComponent;
import javax.swing.JFileChooser;
import javax.swing.JLabel;
import javax.swing.JLayer;
import javax.swing.JPanel;
import javax.swing.JProgressBar;
import javax.swing.JScrollPane;
import javax.swing.JTable;
import javax.swing.JTextArea;
import javax.swing.JToolBar;
import javax.swing.KeyStroke;
import javax.swing.SwingWorker;
import javax.swing.plaf.LayerUI;
import javax.swing.table.DefaultTableModel;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.IronMapping;
import trapmap.maps.raster.PixelGrid;
import trapmap.viewer.report.WaferReport;
import trapmap.viewer.ui.canvas.ColourBar;
import trapmap.viewer.ui.panels.TableFit;
import trapmap.viewer.ui.canvas.MapCanvas;
import trapmap.viewer.ui.canvas.Viewport;
import trapmap.viewer.graphics.AutoStyle;
import trapmap.viewer.graphics.Labels;

/**
 * Before and after maps of one wafer side by side with a third view (difference, ratio, relative change,
 * reduction or interstitial iron), all three sharing one {@link Viewport} so that they zoom and pan together; the
 * position under the cursor on any of them is marked with a crosshair on all three and its values are shown below.
 * Beside them: the registration found and the paired statistics with units, the iron method's caution and the
 * general caution. The comparison ({@link CompareModel#compute}) runs in a {@link SwingWorker} with progress and
 * cancel.
 *
 * <p>Keys: Ctrl+Enter compares again, Escape cancels, Ctrl+1 … Ctrl+5 choose the third view; on a map, + / − zoom
 * and 0 fits (all three follow).
 */
public class ComparePanel extends JPanel {
    private final Viewport viewport = new Viewport();
    private final MapCanvas beforeCanvas = new MapCanvas(viewport);
    private final MapCanvas afterCanvas = new MapCanvas(viewport);
    private final MapCanvas derivedCanvas = new MapCanvas(viewport);
    private final Crosshair crosshair = new Crosshair();
    /** Colour scale of the before and after maps (one scale for both, so that colours compare). */
    private final ColourBar pairBar = new ColourBar();
    private final ColourBar derivedBar = new ColourBar();
    private final JLabel beforeTitle = title("before", "");
    private final JLabel afterTitle = title("after (registered)", "");
    private final JLabel derivedTitle = title("", "");
    private final JComboBox<CompareModel.View> view = new JComboBox<>(CompareModel.View.values());
    private final JCheckBox register = new JCheckBox("Register", true);
    private final JCheckBox iron = new JCheckBox("Fe_i from FeB pair");
    private final JButton compareButton = new JButton("Compare");
    private final JButton cancelButton = new JButton("Cancel");
    private final JButton exportButton = new JButton("Export…");
    private final JProgressBar progress = new JProgressBar(0, 100);
    private final JLabel status = new JLabel(" ");
    private final DefaultTableModel table = new DefaultTableModel(new Object[] {"figure", "value", "unit"}, 0) {
        @Override
        public boolean isCellEditable(int r, int c) {
            return false;
        }
    };
    private final JTable statisticsTable = new JTable(table) {
        @Override
        public String getToolTipText(java.awt.event.MouseEvent e) {
            int r = rowAtPoint(e.getPoint());
            int c = columnAtPoint(e.getPoint());
            Object v = r < 0 || c < 0 ? null : getValueAt(r, c);
            return v == null || v.toString().isEmpty() ? null : v.toString(); // the whole text of a cut cell
        }
    };
    private final JTextArea cautions = new JTextArea();
    /** The statistics and cautions beside the maps; as wide as the widest row needs, within limits. */
    private final JPanel side;
    /** Width of the side panel, pixels: at least this, at most {@link #SIDE_MAX}. */
    private static final int SIDE_MIN = 350;
    private static final int SIDE_MAX = 560;
    private WaferMap before;
    private WaferMap after;
    private CompareModel.Options options = CompareModel.Options.defaults();
    private CompareModel.Result result;
    private SwingWorker<CompareModel.Result, Void> worker;
    private Consumer<CompareModel.Result> resultListener = r -> { };

    public ComparePanel() {
        super(new BorderLayout(6, 6));
        JToolBar bar = new JToolBar();
        bar.setFloatable(false);
        bar.add(new JLabel("Third view: "));
        view.setToolTipText("Map shown on the right (Ctrl+1 … Ctrl+6)");
        view.setMaximumSize(new Dimension(290, 28));
        bar.add(view);
        bar.addSeparator();
        register.setToolTipText("Find how the after map lies on the before map (mirror, quarter turns, small turn,"
                + " shift in mm) from the data");
        iron.setToolTipText("Interstitial iron [Fe_i] (cm⁻³) from lifetimes before (FeB paired) and after (FeB"
                + " dissociated), p-type, one fixed injection");
        bar.add(register);
        bar.add(iron);
        bar.addSeparator();
        compareButton.setToolTipText("Compare (Ctrl+Enter)");
        cancelButton.setToolTipText("Cancel the comparison (Escape)");
        cancelButton.setEnabled(false);
        bar.add(compareButton);
        bar.add(cancelButton);
        exportButton.setToolTipText("Write the maps (TIFF with metadata and CSV) and the statistics table (CSV) into a"
                + " folder");
        exportButton.setEnabled(false);
        bar.add(exportButton);
        bar.addSeparator();
        progress.setMaximumSize(new Dimension(160, 18));
        progress.setStringPainted(true);
        progress.setString("");
        bar.add(progress);
        add(bar, BorderLayout.NORTH);

        JPanel maps = new JPanel(new GridLayout(1, 3, 6, 0));
        maps.add(titled(beforeTitle, beforeCanvas, null));
        maps.add(titled(afterTitle, afterCanvas, pairBar));
        maps.add(titled(derivedTitle, derivedCanvas, derivedBar));
        add(maps, BorderLayout.CENTER);

        JTable t = statisticsTable;
        t.setFillsViewportHeight(true);
        t.getColumnModel().getColumn(0).setPreferredWidth(190);
        t.getColumnModel().getColumn(1).setPreferredWidth(90);
        t.getColumnModel().getColumn(2).setPreferredWidth(45);
        cautions.setEditable(false);
        cautions.setLineWrap(true);
        cautions.setWrapStyleWord(true);
        cautions.setRows(6);
        cautions.setBackground(new Color(0xFFF4E0));
        cautions.setBorder(BorderFactory.createEmptyBorder(4, 6, 4, 6));
        side = new JPanel(new BorderLayout(0, 6));
        side.add(new JScrollPane(t), BorderLayout.CENTER);
        side.add(cautions, BorderLayout.SOUTH);
        side.setPreferredSize(new Dimension(350, 400));
        add(side, BorderLayout.EAST);
        add(status, BorderLayout.SOUTH);

        for (MapCanvas c : List.of(beforeCanvas, afterCanvas, derivedCanvas)) {
            c.onProbe(this::probed);
        }
        view.addActionListener(e -> showDerived());
        compareButton.addActionListener(e -> compare());
        cancelButton.addActionListener(e -> cancel());
        exportButton.addActionListener(e -> chooseExportFolder());
        iron.addActionListener(e -> {
            if (iron.isSelected()) {
                view.setSelectedItem(CompareModel.View.IRON);
            }
        });
        keys();
        showCautions();
    }

    private static JLabel title(String head, String detail) {
        JLabel l = new JLabel();
        l.setBorder(BorderFactory.createEmptyBorder(2, 4, 2, 4));
        setTitle(l, head, detail);
        return l;
    }

    /**
     * A map's title on two lines (what it is; the wafer and quantity, or why there is no map), so that it fits the
     * narrow column of each map; the tooltip holds it on one line.
     */
    private static void setTitle(JLabel l, String head, String detail) {
        l.setText("<html>" + html(head) + "<br>" + (detail.isEmpty() ? "&nbsp;" : html(detail)) + "</html>");
        l.setToolTipText(detail.isEmpty() ? head : head + ": " + detail);
    }

    private static String html(String t) {
        return t.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;");
    }

    private JComponent titled(JLabel title, MapCanvas canvas, ColourBar bar) {
        JPanel p = new JPanel(new BorderLayout());
        p.add(title, BorderLayout.NORTH);
        p.add(new JLayer<>(canvas, crosshair), BorderLayout.CENTER);
        if (bar != null) {
            p.add(bar, BorderLayout.EAST);
        }
        p.setPreferredSize(new Dimension(300, 320));
        return p;
    }

    private void keys() {
        bind(KeyStroke.getKeyStroke(KeyEvent.VK_ENTER, InputEvent.CTRL_DOWN_MASK), "compare", this::compare);
        bind(KeyStroke.getKeyStroke(KeyEvent.VK_ESCAPE, 0), "cancel", this::cancel);
        CompareModel.View[] views = CompareModel.View.values();
        for (int i = 0; i < views.length; i++) {
            CompareModel.View v = views[i];
            bind(KeyStroke.getKeyStroke(KeyEvent.VK_1 + i, InputEvent.CTRL_DOWN_MASK), "view-" + v.name(),
                    () -> view.setSelectedItem(v));
        }
    }

    private void bind(KeyStroke k, String name, Runnable r) {
        getInputMap(WHEN_IN_FOCUSED_WINDOW).put(k, name);
        getActionMap().put(name, new AbstractAction() {
            @Override
            public void actionPerformed(ActionEvent e) {
                r.run();
            }
        });
    }

    /** The shared zoom and pan of the three maps. */
    public Viewport viewport() {
        return viewport;
    }

    /** Told on the Event Dispatch Thread when a comparison finishes. */
    public void onResult(Consumer<CompareModel.Result> l) {
        resultListener = l == null ? r -> { } : l;
    }

    public CompareModel.Result result() {
        return result;
    }

    /** Compare options (conversion defect, tolerance, turn range); the check boxes override register and iron. */
    public void setOptions(CompareModel.Options o) {
        this.options = o == null ? CompareModel.Options.defaults() : o;
        register.setSelected(options.register());
        iron.setSelected(options.iron());
        if (options.iron()) {
            view.setSelectedItem(CompareModel.View.IRON);
        }
    }

    /** Chooses the third view. */
    public void setView(CompareModel.View v) {
        view.setSelectedItem(v);
    }

    /** The third view shown. */
    public CompareModel.View view() {
        return (CompareModel.View) view.getSelectedItem();
    }

    /** Shows a pair and starts comparing it (null clears). */
    public void setMaps(WaferMap beforeMap, WaferMap afterMap) {
        this.before = beforeMap;
        this.after = afterMap;
        this.result = null;
        exportButton.setEnabled(false);
        beforeCanvas.setMap(beforeMap);
        afterCanvas.setMap(null);
        derivedCanvas.setMap(null);
        table.setRowCount(0);
        pairBar.setStyle(null);
        derivedBar.setStyle(null);
        if (beforeMap != null) {
            beforeCanvas.setStyle(AutoStyle.of(beforeMap));
            pairBar.setStyle(beforeCanvas.style());
            pairBar.setLabel(Labels.unit(beforeMap.quantity()));
            setTitle(beforeTitle, "before", name(beforeMap));
            beforeCanvas.fit();
        }
        if (beforeMap != null && afterMap != null) {
            compare();
        }
    }

    private static String name(WaferMap m) {
        return (m.waferId().isEmpty() ? "" : m.waferId() + ", ") + Labels.axis(m.quantity());
    }

    /** Starts (or restarts) the comparison on a worker thread. */
    public void compare() {
        if (before == null || after == null) {
            status.setText("Open a before and an after map to compare.");
            return;
        }
        cancel();
        CompareModel.Options o = options.withRegistration(register.isSelected()).withIron(iron.isSelected());
        WaferMap b = before;
        WaferMap a = after;
        progress.setValue(0);
        progress.setString("comparing…");
        compareButton.setEnabled(false);
        cancelButton.setEnabled(true);
        status.setText("Registering and comparing " + b.waferId() + "…");
        SwingWorker<CompareModel.Result, Void> w = new SwingWorker<>() {
            @Override
            protected CompareModel.Result doInBackground() {
                return CompareModel.compute(b, a, o, (done, total, message) -> {
                    if (total > 0) {
                        setProgress((int) Math.min(100, 100 * done / total));
                    }
                });
            }

            @Override
            protected void done() {
                if (worker != this) {
                    return;
                }
                worker = null;
                compareButton.setEnabled(true);
                cancelButton.setEnabled(false);
                try {
                    show(get());
                    progress.setValue(100);
                    progress.setString("done");
                } catch (CancellationException e) {
                    progress.setString("cancelled");
                    status.setText("Comparison cancelled.");
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                } catch (ExecutionException e) {
                    Throwable cause = e.getCause();
                    progress.setString("failed");
                    status.setText("Cannot compare: " + (cause instanceof CancellationException ? "cancelled"
                            : cause.getMessage()));
                    status.setForeground(new Color(0xB00020));
                }
            }
        };
        w.addPropertyChangeListener(e -> {
            if ("progress".equals(e.getPropertyName())) {
                progress.setValue((Integer) e.getNewValue());
            }
        });
        status.setForeground(getForeground());
        worker = w;
        w.execute();
    }

    private void chooseExportFolder() {
        if (result == null) {
            return;
        }
        JFileChooser chooser = new JFileChooser();
        chooser.setDialogTitle("Export maps and statistics into folder");
        chooser.setFileSelectionMode(JFileChooser.DIRECTORIES_ONLY);
        if (chooser.showSaveDialog(this) == JFileChooser.APPROVE_OPTION) {
            export(chooser.getSelectedFile().toPath());
        }
    }

    /**
     * Writes the shown maps and statistics into {@code folder} ({@link CompareExports}); the status line says what was
     * written or why not.
     *
     * @return the files written (empty when there is no result or writing failed)
     */
    public List<Path> export(Path folder) {
        if (result == null) {
            return List.of();
        }
        try {
            List<Path> files = CompareExports.write(result, folder, CompareExports.baseName(result));
            status.setForeground(getForeground());
            status.setText("Wrote " + files.size() + " files to " + folder + ".");
            return files;
        } catch (IOException | RuntimeException e) {
            status.setForeground(new Color(0xB00020));
            status.setText("Cannot export to " + folder + ": " + e.getMessage());
            return List.of();
        }
    }

    /** Cancels a running comparison. */
    public void cancel() {
        SwingWorker<CompareModel.Result, Void> w = worker;
        if (w != null) {
            worker = null;
            w.cancel(true);
            compareButton.setEnabled(true);
            cancelButton.setEnabled(false);
            progress.setString("cancelled");
            status.setText("Comparison cancelled.");
        }
    }

    private void show(CompareModel.Result r) {
        this.result = r;
        beforeCanvas.setMap(r.before());
        beforeCanvas.setStyle(AutoStyle.common(r.before(), r.after()));
        setTitle(beforeTitle, "before", name(r.before()));
        afterCanvas.setMap(r.after());
        afterCanvas.setStyle(beforeCanvas.style()); // one scale for both, so colours compare
        pairBar.setStyle(beforeCanvas.style());
        pairBar.setLabel(Labels.unit(r.before().quantity()));
        setTitle(afterTitle, "after, registered", name(r.after()));
        table.setRowCount(0);
        for (String[] row : r.statisticsRows()) {
            table.addRow(row);
        }
        int need = TableFit.fitContent(statisticsTable) + 24; // scroll bar and border
        side.setPreferredSize(new Dimension(Math.max(SIDE_MIN, Math.min(SIDE_MAX, need)), 400));
        side.revalidate();
        showDerived();
        showCautions();
        beforeCanvas.fit();
        status.setText(r.placementLine() + (r.warnings().isEmpty() ? ""
                : "; " + r.warnings().size() + " warning" + (r.warnings().size() == 1 ? "" : "s") + ": "
                        + r.warnings().get(0)) + ".");
        status.setForeground(r.warnings().isEmpty() ? getForeground() : new Color(0xB00020));
        exportButton.setEnabled(true);
        resultListener.accept(r);
    }

    private void showDerived() {
        CompareModel.View v = (CompareModel.View) view.getSelectedItem();
        WaferMap m = result == null || v == null ? null : result.derived(v);
        derivedCanvas.setMap(m);
        derivedBar.setStyle(m == null ? null : AutoStyle.of(m));
        if (m != null) {
            derivedCanvas.setStyle(derivedBar.style());
            String u = m.quantity().isFraction() ? "%" : Labels.unit(result.unit(v));
            derivedBar.setPercent(m.quantity().isFraction());
            derivedBar.setLabel(u);
            setTitle(derivedTitle, v.toString(), u.isEmpty() ? "" : "(" + u + ")");
        } else {
            String why = v == null ? "" : result == null ? "not computed yet"
                    : v == CompareModel.View.IRON || v == CompareModel.View.IRON_STATUS
                    ? "tick 'Fe_i from FeB pair' and compare" : "only for density maps";
            setTitle(derivedTitle, v == null ? "" : v.toString(), why);
        }
    }

    private void showCautions() {
        StringBuilder s = new StringBuilder();
        if (result != null) {
            for (String w : result.warnings()) {
                s.append("Warning: ").append(w).append("\n");
            }
            if (!result.warnings().isEmpty()) {
                s.append('\n');
            }
        }
        if (result != null && result.iron() != null) {
            IronMapping.Result fe = result.iron();
            if (fe.nearCrossover()) {
                s.append("Iron: the injection ").append(Labels.number(fe.injectionPerCm3())).append(" cm⁻³ lies within"
                        + " a factor 2 of the Fe_i/FeB crossover (").append(Labels.number(fe.crossoverPerCm3()))
                        .append(" cm⁻³): the iron signal vanishes there. ");
            }
            s.append("Iron: ").append(CompareModel.IRON_CAUTION).append("\n\n");
        }
        s.append("Caution: ").append(WaferReport.CAUTION);
        cautions.setText(s.toString());
    }

    private void probed(MapCanvas.Probe p) {
        if (p == null || before == null) {
            crosshair.at(Double.NaN, Double.NaN);
            return;
        }
        crosshair.at(p.xMm(), p.yMm());
        repaint();
        if (result == null) {
            status.setText(String.format(Locale.ROOT, "x = %s mm, y = %s mm: before %s", Labels.number(p.xMm()),
                    Labels.number(p.yMm()), Labels.number(p.value(), before.quantity().unit())));
            return;
        }
        CompareModel.View v = (CompareModel.View) view.getSelectedItem();
        CompareModel.Probe q = result.probe(p.xMm(), p.yMm(), v);
        String unit = result.before().quantity().unit();
        status.setText(String.format(Locale.ROOT, "x = %s mm, y = %s mm: before %s, after %s, %s %s",
                Labels.number(q.xMm()), Labels.number(q.yMm()), Labels.number(q.before(), unit),
                Labels.number(q.after(), unit), v, Labels.number(q.derived(), result.unit(v))));
    }

    /** Draws a crosshair at one wafer position on each canvas (all three show the before map's grid). */
    private final class Crosshair extends LayerUI<MapCanvas> {
        private double xMm = Double.NaN;
        private double yMm = Double.NaN;

        void at(double x, double y) {
            xMm = x;
            yMm = y;
            ComparePanel.this.repaint();
        }

        @Override
        public void paint(Graphics g, JComponent c) {
            super.paint(g, c);
            @SuppressWarnings("unchecked")
            MapCanvas canvas = ((JLayer<MapCanvas>) c).getView();
            WaferMap m = canvas.map();
            if (m == null || Double.isNaN(xMm)) {
                return;
            }
            PixelGrid grid = m.grid();
            Viewport v = canvas.viewport();
            // Viewport: the map pixel coordinate at the view centre, 0 = left edge of the first pixel
            double sx = c.getWidth() / 2.0 + (grid.xPx(xMm) + 0.5 - v.centreX()) * v.zoom();
            double sy = c.getHeight() / 2.0 + (grid.yPx(yMm) + 0.5 - v.centreY()) * v.zoom();
            Graphics2D g2 = (Graphics2D) g.create();
            try {
                g2.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
                for (Color col : new Color[] {new Color(0, 0, 0, 140), Color.WHITE}) {
                    g2.setColor(col);
                    g2.setStroke(new BasicStroke(col == Color.WHITE ? 1f : 3f));
                    g2.drawLine((int) sx - 10, (int) sy, (int) sx - 3, (int) sy);
                    g2.drawLine((int) sx + 3, (int) sy, (int) sx + 10, (int) sy);
                    g2.drawLine((int) sx, (int) sy - 10, (int) sx, (int) sy - 3);
                    g2.drawLine((int) sx, (int) sy + 3, (int) sx, (int) sy + 10);
                }
            } finally {
                g2.dispose();
            }
        }
    }

    /** For tests and previews: the canvases, left to right. */
    List<Component> canvases() {
        return List.of(beforeCanvas, afterCanvas, derivedCanvas);
    }
}
