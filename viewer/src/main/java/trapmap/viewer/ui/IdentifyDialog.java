package trapmap.viewer.ui;

import java.awt.BorderLayout;
import java.awt.Color;
import java.awt.Component;
import java.awt.Dimension;
import java.awt.FlowLayout;
import java.awt.event.MouseAdapter;
import java.awt.event.MouseEvent;
import java.io.File;
import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import javax.swing.BorderFactory;
import javax.swing.DefaultListModel;
import javax.swing.JButton;
import javax.swing.JCheckBox;
import javax.swing.JComboBox;
import javax.swing.JComponent;
import javax.swing.JDialog;
import javax.swing.JFileChooser;
import javax.swing.JFrame;
import javax.swing.JLabel;
import javax.swing.JList;
import javax.swing.JPanel;
import javax.swing.JProgressBar;
import javax.swing.JScrollPane;
import javax.swing.JSpinner;
import javax.swing.JSplitPane;
import javax.swing.JTabbedPane;
import javax.swing.JTable;
import javax.swing.JTextArea;
import javax.swing.KeyStroke;
import javax.swing.ListSelectionModel;
import javax.swing.SpinnerNumberModel;
import javax.swing.SwingWorker;
import javax.swing.table.DefaultTableCellRenderer;
import javax.swing.table.DefaultTableModel;
import trapmap.maps.io.ColourMap;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.spectroscopy.DefectIdentification;
import trapmap.maps.spectroscopy.IdentificationResult;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.spectroscopy.CandidateFit;
import trapmap.physics.spectroscopy.RankingStatus;
import trapmap.viewer.graphics.AutoStyle;
import trapmap.viewer.graphics.Categories;
import trapmap.viewer.graphics.ChartExport;
import trapmap.viewer.graphics.DisplayStyle;
import trapmap.viewer.graphics.Labels;
import trapmap.viewer.model.ConditionOverrides;
import trapmap.viewer.model.StackIdentification;
import trapmap.viewer.model.StackIdentification.Layer;
import trapmap.viewer.model.ViewerModel;
import trapmap.viewer.ui.canvas.ColourBar;
import trapmap.viewer.ui.canvas.MapCanvas;
import trapmap.viewer.ui.charts.IdentificationChartsView;

/**
 * Defect identification from maps of one wafer at several injection levels: the levels (open maps and files), the
 * block size and pixel noise, a run in the background with progress, then the result layers on a map (best defect,
 * runner-up, χ², χ² ratio, status, N_t, regions) with the legend, region, candidate and registration tables, and the
 * two identification charts of the clicked pixel or the chosen region. The computation is
 * {@link StackIdentification} (maps and physics modules); this class only shows it.
 */
final class IdentifyDialog extends JDialog {
    private static final long serialVersionUID = 1L;
    /** The style of the categorical layers: required by the canvas, unused by its colours (the categories give them). */
    private static final DisplayStyle CATEGORY_SCALE = new DisplayStyle(ColourMap.BLUE_YELLOW, false, 0, 1);

    private final ViewerWindow window;
    private final ViewerModel model;
    private final DefaultListModel<StackIdentification.Input> inputs = new DefaultListModel<>();
    private final JList<StackIdentification.Input> inputList = new JList<>(inputs);
    private final JSpinner block = new JSpinner(new SpinnerNumberModel(1, 1, DefectIdentification.MAX_BLOCK_PX, 1));
    private final JSpinner noise = new JSpinner(new SpinnerNumberModel(3.0, 0.1, 50.0, 0.5));
    private final JCheckBox register = new JCheckBox("Register levels", true);
    private final JButton run = new JButton("Identify");
    private final JButton cancel = new JButton("Cancel");
    private final JProgressBar progress = new JProgressBar();
    private final JLabel phase = new JLabel(" ");
    private final JComboBox<Layer> layer = new JComboBox<>(Layer.values());
    private final MapCanvas canvas = new MapCanvas();
    private final ColourBar bar = new ColourBar();
    private final JLabel readout = new JLabel("<html> <br> </html>");
    private final JLabel layerKey = new JLabel(" ");
    private final DefaultTableModel legend = table("index", "colour", "defect", "name", "pixels");
    private final DefaultTableModel regions = table("region", "pixels", "usable px", "area (mm²)", "best", "N_t (cm⁻³)",
            "95 % bounds (cm⁻³)", "χ²", "p", "status", "DPSS");
    private final DefaultTableModel candidates = table("rank", "defect", "N_t (cm⁻³)", "95 % bounds (cm⁻³)", "χ²",
            "ν", "p", "note");
    private final JTable regionTable = new JTable(regions);
    private final JTextArea registration = new JTextArea(4, 40);
    private final JLabel caution = new JLabel("<html>" + cautionText().replace(". Caution: ", ".<br>Caution: ")
            + "</html>"); // two lines: one would be cut off on a laptop screen
    private final JLabel probeTitle = new JLabel("click the map or choose a region to see its curves");
    private final IdentificationChartsView charts = new IdentificationChartsView();
    private IdentificationResult result;
    private StackIdentification.Probe shown;
    private MapCanvas.Probe hovered;
    private SwingWorker<IdentificationResult, Step> worker;

    /** One progress report of the engine: rows of blocks done of all (total 0: a phase without a count). */
    private record Step(long done, long total, String message) {
    }

    IdentifyDialog(ViewerWindow owner, ViewerModel model) {
        super(owner, "Identify defect from injection levels — trapmap", false);
        this.window = owner;
        this.model = model;
        setDefaultCloseOperation(DISPOSE_ON_CLOSE);
        setName("identifyDialog");
        for (ViewerModel.OpenWafer w : preselected(model)) {
            inputs.addElement(StackIdentification.open(w.name(), w.map(), model.analysis().conditions()));
        }
        inputList.setCellRenderer(new javax.swing.DefaultListCellRenderer() {
            private static final long serialVersionUID = 1L;

            @Override
            public Component getListCellRendererComponent(JList<?> list, Object value, int index, boolean sel,
                                                          boolean focus) {
                Object shown = value instanceof StackIdentification.Input in ? levelText(in) : value;
                return super.getListCellRendererComponent(list, shown, index, sel, focus);
            }
        });
        inputList.setVisibleRowCount(4);
        inputList.setToolTipText("The maps of one wafer at different injection levels (Δn in cm⁻³ or G in"
                + " cm⁻³ s⁻¹ from each map's sidecar); the first is the reference the others are registered onto");
        JButton add = new JButton("Add files…");
        add.setToolTipText("Add map files: one per level, or one multi-page file whose sidecar gives each page's"
                + " injection_cm3 or generation_cm3_s");
        add.addActionListener(e -> addFiles());
        JButton remove = new JButton("Remove");
        remove.addActionListener(e -> inputList.getSelectedValuesList().forEach(inputs::removeElement));
        block.setToolTipText("Side of the square blocks ranked as one curve, px (1: every pixel)");
        noise.setToolTipText("Relative standard uncertainty of one pixel's lifetime at each level, %");
        block.setName("blockPx");
        noise.setName("noisePercent");
        run.setName("identify");
        run.addActionListener(e -> start());
        cancel.setName("cancelIdentify");
        phase.setName("identifyPhase");
        progress.setName("identifyProgress");
        cancel.setToolTipText("Stop the running identification (its partial result is dropped)");
        cancel.addActionListener(e -> cancelRun());
        cancel.setEnabled(false);
        progress.setIndeterminate(false);
        progress.setStringPainted(true);
        progress.setVisible(false);

        JPanel buttons = new JPanel(new FlowLayout(FlowLayout.LEFT, 6, 2));
        buttons.add(add);
        buttons.add(remove);
        buttons.add(new JLabel("Block"));
        buttons.add(block);
        buttons.add(new JLabel("px   Pixel noise"));
        buttons.add(noise);
        buttons.add(new JLabel("%"));
        register.setToolTipText("Place every level onto the first with the registration of Compare (off: the maps"
                + " already lie on one grid)");
        register.setName("register");
        buttons.add(register);
        buttons.add(run);
        buttons.add(cancel);
        buttons.add(progress);
        buttons.add(phase);
        JPanel top = new JPanel(new BorderLayout(6, 2));
        top.add(new JScrollPane(inputList), BorderLayout.CENTER);
        top.add(buttons, BorderLayout.SOUTH);
        top.setBorder(BorderFactory.createEmptyBorder(4, 6, 4, 6));

        layer.setName("layer");
        layer.setToolTipText("Result map shown");
        layer.addActionListener(e -> showLayer());
        canvas.setName("identificationMap");
        canvas.onProbe(p -> {
            hovered = p;
            readout.setText(readout(p));
        });
        canvas.addMouseListener(new MouseAdapter() {
            @Override
            public void mouseClicked(MouseEvent e) {
                if (hovered != null && result != null) {
                    probePixel(hovered.xPx(), hovered.yPx());
                }
            }
        });
        JPanel mapPanel = new JPanel(new BorderLayout(4, 4));
        JPanel layerRow = new JPanel(new FlowLayout(FlowLayout.LEFT, 6, 2));
        layerRow.add(new JLabel("Layer"));
        layerRow.add(layer);
        layerKey.setName("layerKey");
        layerKey.setBorder(BorderFactory.createEmptyBorder(0, 6, 2, 6));
        JPanel layerHead = new JPanel(new BorderLayout());
        layerHead.add(layerRow, BorderLayout.NORTH);
        layerHead.add(layerKey, BorderLayout.SOUTH);
        mapPanel.add(layerHead, BorderLayout.NORTH);
        mapPanel.add(canvas, BorderLayout.CENTER);
        mapPanel.add(bar, BorderLayout.EAST);
        mapPanel.add(readout, BorderLayout.SOUTH);

        JTable legendTable = new JTable(legend);
        legendTable.setName("legendTable");
        legendTable.getColumnModel().getColumn(1).setCellRenderer(new Swatch());
        int[] widths = {50, 60, 110, 300, 80};
        for (int c = 0; c < widths.length; c++) {
            legendTable.getColumnModel().getColumn(c).setPreferredWidth(widths[c]);
        }
        regionTable.setName("regionTable");
        regionTable.setSelectionMode(ListSelectionModel.SINGLE_SELECTION);
        regionTable.getSelectionModel().addListSelectionListener(e -> {
            int row = regionTable.getSelectedRow();
            if (!e.getValueIsAdjusting() && row >= 0 && result != null) {
                probeRegion((Integer) regions.getValueAt(row, 0));
            }
        });
        JTable candidateTable = new JTable(candidates);
        candidateTable.setName("candidateTable");
        registration.setEditable(false);
        JTabbedPane tables = new JTabbedPane();
        tables.addTab("Legend", new JScrollPane(legendTable));
        tables.addTab("Regions", new JScrollPane(regionTable));
        tables.addTab("Candidates", new JScrollPane(candidateTable));
        tables.addTab("Registration", new JScrollPane(registration));
        tables.setToolTipTextAt(0, "Legend of the defect index maps: index, defect, pixels a single defect explains");
        tables.setToolTipTextAt(1, "Regions (low first-level τ_SRH): ranking and DPSS of each region's mean curve;"
                + " choose one to see its curves");
        tables.setToolTipTextAt(2, "Every candidate of the shown curve with N_t, 95 % bounds, χ², ν and p");

        JSplitPane upper = new JSplitPane(JSplitPane.HORIZONTAL_SPLIT, mapPanel, tables);
        upper.setResizeWeight(0.45);
        JButton export = new JButton("Export charts PNG…");
        export.setToolTipText("Save both charts of the shown curve as PNG pictures");
        export.addActionListener(e -> exportCharts());
        JPanel chartHead = new JPanel(new BorderLayout(6, 0));
        chartHead.add(probeTitle, BorderLayout.CENTER);
        chartHead.add(export, BorderLayout.EAST);
        JPanel lower = new JPanel(new BorderLayout());
        lower.add(chartHead, BorderLayout.NORTH);
        lower.add(charts, BorderLayout.CENTER);
        JSplitPane split = new JSplitPane(JSplitPane.VERTICAL_SPLIT, upper, lower);
        split.setResizeWeight(0.5);
        getContentPane().add(top, BorderLayout.NORTH);
        getContentPane().add(split, BorderLayout.CENTER);
        // the ranking names a defect and its N_t: it carries the command line's note and the caution
        caution.setName("identifyCaution");
        caution.setForeground(new java.awt.Color(0x8A5A00));
        caution.setBorder(BorderFactory.createEmptyBorder(3, 8, 3, 8));
        getContentPane().add(caution, BorderLayout.SOUTH);
        getRootPane().registerKeyboardAction(e -> dispose(), KeyStroke.getKeyStroke("ctrl W"),
                JComponent.WHEN_IN_FOCUSED_WINDOW);
        setPreferredSize(new Dimension(Math.max(1280, owner.getWidth()), Math.max(900, owner.getHeight())));
        pack();
        setLocationRelativeTo(owner);
        if (ScreenFit.fit(this)) {
            // a low screen: the charts keep room enough to be read, the map and tables above give it up
            javax.swing.SwingUtilities.invokeLater(() -> split.setDividerLocation(chartDivider(split.getHeight(),
                    split.getDividerLocation())));
        }
    }

    /**
     * Where the divider between the map and tables (above) and the charts (below) goes in a split pane {@code height}
     * px high whose divider lies at {@code at}: where it is when the charts keep 320 px, else as low as leaves them
     * 320 px, but no higher than 40 % of the height.
     */
    static int chartDivider(int height, int at) {
        return height - at >= 320 ? at : Math.max((int) (0.4 * height), height - 320);
    }

    /** The line under the dialog: the identification is a hint, and the densities carry the caution. */
    static String cautionText() {
        String hint = trapmap.maps.spectroscopy.DefectIdentification.HINT;
        return Character.toUpperCase(hint.charAt(0)) + hint.substring(1) + ". Caution: "
                + trapmap.maps.model.Caution.TEXT;
    }

    /** Number of levels listed. */
    int levels() {
        return inputs.size();
    }

    /** The selected open wafer and the other open maps of the same wafer id. */
    static List<ViewerModel.OpenWafer> preselected(ViewerModel model) {
        List<ViewerModel.OpenWafer> out = new ArrayList<>();
        ViewerModel.OpenWafer sel = model.selected();
        if (sel == null) {
            return out;
        }
        out.add(sel);
        String id = sel.map().waferId();
        for (ViewerModel.OpenWafer w : model.wafers()) {
            if (w != sel && id != null && !id.isBlank() && id.equals(w.map().waferId())) {
                out.add(w);
            }
        }
        return out;
    }

    private static String levelText(StackIdentification.Input in) {
        var c = in.map().conditions();
        String level = c.injectionPerCm3() != null ? "Δn " + Labels.number(c.injectionPerCm3()) + " cm⁻³"
                : c.generationPerCm3PerS() != null ? "G " + Labels.number(c.generationPerCm3PerS()) + " cm⁻³ s⁻¹"
                : "no injection level or generation rate";
        return in.name() + " — " + level;
    }

    private static DefaultTableModel table(String... columns) {
        return new DefaultTableModel(columns, 0) {
            private static final long serialVersionUID = 1L;

            @Override
            public boolean isCellEditable(int row, int column) {
                return false;
            }
        };
    }

    private void addFiles() {
        JFileChooser fc = window.sessions().chooser();
        fc.setMultiSelectionEnabled(true);
        if (fc.showOpenDialog(this) != JFileChooser.APPROVE_OPTION) {
            return;
        }
        List<Path> files = new ArrayList<>();
        for (File f : fc.getSelectedFiles()) {
            files.add(f.toPath());
        }
        // the maps are read off the event thread (a large TIFF takes a while); the list grows when they are read
        ConditionOverrides window = model.analysis().conditions();
        phase.setForeground(Color.DARK_GRAY);
        phase.setText("reading " + files.size() + (files.size() == 1 ? " map…" : " maps…"));
        new SwingWorker<List<StackIdentification.Input>, Void>() {
            @Override
            protected List<StackIdentification.Input> doInBackground() throws IOException {
                return StackIdentification.read(files, window);
            }

            @Override
            protected void done() {
                try {
                    for (StackIdentification.Input in : get()) {
                        inputs.addElement(in);
                    }
                    phase.setText(" ");
                } catch (java.util.concurrent.ExecutionException e) {
                    phase.setText(e.getCause().getMessage());
                    phase.setForeground(new Color(0xD03030));
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                }
            }
        }.execute();
    }

    /** Runs the identification off the Event Dispatch Thread. */
    void start() {
        if (worker != null && !worker.isDone()) {
            return;
        }
        List<StackIdentification.Input> in = new ArrayList<>();
        for (int i = 0; i < inputs.size(); i++) {
            in.add(inputs.get(i));
        }
        List<Defect> cands = DefectLibrary.all();
        StackIdentification.Request req;
        try {
            DefectIdentification.Options opts = DefectIdentification.Options.DEFAULTS
                    .withBlock((Integer) block.getValue()).withNoise((Double) noise.getValue() / 100.0)
                    .withThreads(Math.max(1, Runtime.getRuntime().availableProcessors()));
            req = new StackIdentification.Request(in, ConversionSettings.of(model.physics()), cands, opts,
                    register.isSelected());
        } catch (RuntimeException e) {
            fail(e);
            return;
        }
        run.setEnabled(false);
        cancel.setEnabled(true);
        progress.setVisible(true);
        progress.setIndeterminate(true);
        progress.setString("");
        phase.setForeground(Color.DARK_GRAY);
        worker = new SwingWorker<>() {
            @Override
            protected IdentificationResult doInBackground() {
                return StackIdentification.run(req, (done, total, message) -> publish(new Step(done, total,
                        message)));
            }

            @Override
            protected void process(List<Step> chunks) {
                if (isCancelled()) {
                    return;
                }
                Step s = chunks.get(chunks.size() - 1);
                phase.setText(s.message() + "…");
                if (s.total() > 0) {
                    progress.setIndeterminate(false);
                    progress.setMaximum((int) Math.min(Integer.MAX_VALUE, s.total()));
                    progress.setValue((int) Math.min(Integer.MAX_VALUE, s.done()));
                    progress.setString(s.done() + " / " + s.total() + " rows");
                } else {
                    progress.setIndeterminate(true);
                    progress.setString("");
                }
            }

            @Override
            protected void done() {
                run.setEnabled(true);
                cancel.setEnabled(false);
                progress.setIndeterminate(false);
                progress.setVisible(false);
                if (isCancelled()) {
                    phase.setForeground(Color.DARK_GRAY);
                    phase.setText("identification cancelled");
                    return;
                }
                try {
                    show(get());
                } catch (java.util.concurrent.ExecutionException e) {
                    if (e.getCause() instanceof java.util.concurrent.CancellationException) {
                        phase.setForeground(Color.DARK_GRAY);
                        phase.setText("identification cancelled");
                    } else {
                        fail(e.getCause() instanceof Exception x ? x : e);
                    }
                } catch (InterruptedException | java.util.concurrent.CancellationException e) {
                    phase.setText("identification cancelled");
                }
            }
        };
        worker.execute();
    }

    /** Stops the running identification: interrupts its thread, which the engine checks after every row. */
    void cancelRun() {
        if (worker != null && !worker.isDone()) {
            worker.cancel(true);
        }
    }

    private void fail(Exception e) {
        phase.setForeground(new Color(0xD03030));
        phase.setText(e.getMessage() == null ? e.toString() : e.getMessage());
    }

    /** The worker that runs (or ran) the identification, for tests. */
    SwingWorker<IdentificationResult, ?> worker() {
        return worker;
    }

    private void show(IdentificationResult r) {
        result = r;
        int[] counts = r.statusCounts();
        phase.setForeground(Color.DARK_GRAY);
        phase.setText(String.format(Locale.ROOT, "%d px ranked: %d OK, %d below limit at some levels, %d no single"
                + " defect, %d too few levels; %d regions", r.rankedPixels(), counts[RankingStatus.OK.ordinal()],
                counts[RankingStatus.BELOW_LIMIT.ordinal()], counts[RankingStatus.NO_SINGLE_DEFECT.ordinal()],
                counts[RankingStatus.TOO_FEW_LEVELS.ordinal()], r.regions().size()));
        legend.setRowCount(0);
        Categories indexColours = StackIdentification.categories(Layer.BEST, r);
        for (IdentificationResult.LegendEntry e : r.legend()) {
            legend.addRow(new Object[] {e.index(), new Color(indexColours.of(e.index()).rgb()), e.defectId(),
                e.name(), e.pixelCount()});
        }
        // the two greys of pixels without an identified defect, with their pixel counts
        Categories.Category undecided = indexColours.of(StackIdentification.NO_SINGLE_DEFECT_VALUE);
        Categories.Category tooFew = indexColours.of(StackIdentification.TOO_FEW_LEVELS_VALUE);
        legend.addRow(new Object[] {"–", new Color(undecided.rgb()), undecided.label(), "no library defect fits alone",
            counts[RankingStatus.NO_SINGLE_DEFECT.ordinal()]});
        legend.addRow(new Object[] {"–", new Color(tooFew.rgb()), tooFew.label(), "fewer than two usable levels",
            counts[RankingStatus.TOO_FEW_LEVELS.ordinal()]});
        regions.setRowCount(0);
        for (StackIdentification.RegionRow row : StackIdentification.regionRows(r)) {
            regions.addRow(new Object[] {row.id(), row.pixels(), row.pixelsUsed(), Labels.number(row.areaMm2()),
                row.best(), Labels.number(row.ntPerCm3()), Labels.number(row.lowerPerCm3()) + " – "
                + Labels.number(row.upperPerCm3()), Labels.compact(row.chiSquared()), Labels.compact(row.pValue()),
                row.status(), row.dpss()});
        }
        registration.setText(String.join("\n", StackIdentification.registrationLines(r)));
        showLayer();
        canvas.fit();
        if (!r.regions().isEmpty()) {
            regionTable.setRowSelectionInterval(0, 0);
        }
    }

    private void showLayer() {
        if (result == null) {
            return;
        }
        Layer l = (Layer) layer.getSelectedItem();
        WaferMap m = StackIdentification.displayMap(l, result);
        Categories cats = StackIdentification.categories(l, result);
        DisplayStyle style = cats != null ? CATEGORY_SCALE : styleOrNull(m);
        layerKey.setText(StackIdentification.layerKey(l, result));
        layerKey.setToolTipText(layerKey.getText());
        canvas.setMap(m);
        canvas.setStyle(style, cats);
        bar.setStyle(style);
        bar.setCategories(cats);
        bar.setLabel(l.label());
    }

    private static DisplayStyle styleOrNull(WaferMap m) {
        try {
            return AutoStyle.of(m);
        } catch (RuntimeException e) {
            return CATEGORY_SCALE;
        }
    }

    private String readout(MapCanvas.Probe p) {
        if (p == null || result == null) {
            return "<html> <br> </html>";
        }
        int i = p.yPx() * result.width() + p.xPx();
        String s = String.format(Locale.ROOT, "(%d, %d) px, x %.2f mm, y %.2f mm: ", p.xPx(), p.yPx(), p.xMm(),
                p.yMm());
        s += "best " + StackIdentification.defectText(result, result.bestIndex()[i]) + ", runner-up "
                + StackIdentification.defectText(result, result.runnerUpIndex()[i]) + "<br>χ² "
                + Labels.compact(result.chiSquared()[i]) + ", N_t " + Labels.number(result.bestDensityCm3()[i])
                + " cm⁻³, " + StackIdentification.statusText(result.status()[i]);
        int region = result.regionAt(p.xPx(), p.yPx());
        return "<html>" + (region > 0 ? s + ", region " + region : s) + " (click: its curves)</html>";
    }

    private void probePixel(int col, int row) {
        StackIdentification.Probe p = StackIdentification.pixel(result, col, row);
        if (p == null) {
            probeTitle.setText(String.format(Locale.ROOT, "pixel (%d, %d) has no data", col, row));
            return;
        }
        showProbe(p);
    }

    private void probeRegion(int id) {
        StackIdentification.Probe p = StackIdentification.region(result, id);
        if (p == null) {
            probeTitle.setText("region " + id + " has no pixel with data");
            return;
        }
        showProbe(p);
    }

    private void showProbe(StackIdentification.Probe p) {
        shown = p;
        probeTitle.setText(p.title() + " — " + p.summary());
        charts.show(p.fits(), p.dpss());
        candidates.setRowCount(0);
        int rank = 0;
        for (CandidateFit f : p.ranking().candidates()) {
            candidates.addRow(new Object[] {f.fitted() ? ++rank : "–", f.id(), Labels.number(f.ntPerCm3()),
                f.fitted() ? Labels.number(f.lowerPerCm3()) + " – " + Labels.number(f.upperPerCm3()) : "",
                Labels.compact(f.chiSquared()), f.fitted() ? f.degreesOfFreedom() : "", Labels.compact(f.pValue()),
                Labels.prose(f.reason())});
        }
    }

    /** The lifetime chart shown, for tests. */
    org.jfree.chart.JFreeChart fitChartForTest() {
        return charts.fitChart();
    }

    /** The pixel under the cursor (null when none), for tests. */
    MapCanvas.Probe hoveredForTest() {
        return hovered;
    }

    /** The curve the charts show (null before the first probe), for tests. */
    StackIdentification.Probe shown() {
        return shown;
    }

    private void exportCharts() {
        if (shown == null) {
            phase.setText("no curve shown yet: click the map or choose a region");
            return;
        }
        JFileChooser fc = window.sessions().chooser();
        String base = shown.title().replaceAll("[^A-Za-z0-9]+", "-").replaceAll("-+$", "");
        fc.setSelectedFile(new File(fc.getCurrentDirectory(), base + "-fit.png"));
        if (fc.showSaveDialog(this) != JFileChooser.APPROVE_OPTION) {
            return;
        }
        Path fit = fc.getSelectedFile().toPath();
        String name = fit.getFileName().toString();
        if (!name.toLowerCase(Locale.ROOT).endsWith(".png")) {
            fit = fit.resolveSibling(name + ".png");
        }
        String stem = fit.getFileName().toString().replaceAll("(?i)(-fit)?\\.png$", "");
        Path dpss = fit.resolveSibling(stem + "-dpss.png");
        try {
            ChartExport.writePng(charts.fitChart(), fit, 1200, 700);
            ChartExport.writePng(charts.dpssChart(), dpss, 1200, 700);
            phase.setText("charts saved to " + fit + " and " + dpss);
        } catch (IOException | RuntimeException e) {
            fail(e);
        }
    }

    /** A table cell drawn in its category colour (the legend also names the defect: never colour alone). */
    private static final class Swatch extends DefaultTableCellRenderer {
        private static final long serialVersionUID = 1L;

        @Override
        public Component getTableCellRendererComponent(JTable t, Object value, boolean sel, boolean focus, int row,
                                                       int col) {
            super.getTableCellRendererComponent(t, "", sel, focus, row, col);
            setBackground(value instanceof Color c ? c : t.getBackground());
            return this;
        }
    }

    @Override
    public void dispose() {
        cancelRun();
        super.dispose();
    }
}
