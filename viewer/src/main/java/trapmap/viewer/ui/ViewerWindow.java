package trapmap.viewer.ui;

import java.awt.BorderLayout;
import java.awt.Dimension;
import java.awt.Graphics2D;
import java.awt.Toolkit;
import java.awt.datatransfer.DataFlavor;
import java.awt.event.KeyEvent;
import java.awt.geom.Line2D;
import java.awt.image.BufferedImage;
import java.io.File;
import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.function.Consumer;
import javax.swing.Action;
import javax.swing.BorderFactory;
import javax.swing.JCheckBoxMenuItem;
import javax.swing.JComponent;
import javax.swing.JFileChooser;
import javax.swing.JFrame;
import javax.swing.JLabel;
import javax.swing.JOptionPane;
import javax.swing.JPanel;
import javax.swing.JScrollPane;
import javax.swing.JSplitPane;
import javax.swing.KeyStroke;
import javax.swing.SwingUtilities;
import javax.swing.SwingWorker;
import javax.swing.TransferHandler;
import javax.swing.filechooser.FileNameExtensionFilter;
import trapmap.maps.region.Region;
import trapmap.physics.defect.Defect;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.PixelInjection;
import trapmap.maps.profile.LineProfile;
import trapmap.maps.profile.RadialProfile;
import trapmap.viewer.ui.canvas.ColourBar;
import trapmap.viewer.graphics.DisplayStyle;
import trapmap.viewer.graphics.ChartExport;
import trapmap.viewer.graphics.HistogramChart;
import trapmap.viewer.ui.charts.HistogramView;
import trapmap.viewer.ui.charts.InjectionCurveView;
import trapmap.viewer.ui.charts.LineProfileView;
import trapmap.viewer.ui.charts.RadialProfileView;
import trapmap.maps.region.RegionCriteria;
import trapmap.viewer.ui.canvas.MapCanvas;
import trapmap.viewer.model.Analysis;
import trapmap.viewer.model.DisplayedQuantity;
import trapmap.viewer.model.ProfileLine;
import trapmap.viewer.model.RecentFiles;
import trapmap.viewer.model.ViewState;
import trapmap.viewer.model.ViewerModel;
import trapmap.viewer.model.WaferAnalysis;
import trapmap.viewer.ui.panels.ChartTabs;
import trapmap.viewer.ui.panels.DefectDialog;
import trapmap.viewer.ui.panels.GalleryPanel;
import trapmap.viewer.ui.panels.PhysicsPanel;
import trapmap.viewer.model.ExceedanceLayer;
import trapmap.viewer.ui.panels.StatusBar;
import trapmap.viewer.ui.panels.ThresholdPanel;

/**
 * The main window: gallery of open wafers on the left, the map with its colour bar in the centre above the chart
 * tabs, conditions and threshold on the right, status bar below. All conversion and analysis runs in a
 * {@link SwingWorker}, debounced after each change, with progress and cancel in the status bar.
 */
public final class ViewerWindow extends JFrame {
    private static final long serialVersionUID = 1L;
    /** The caution shown wherever results drive decisions. */
    public static final String CAUTION = trapmap.maps.model.Caution.TEXT;
    private static final int MENU = Toolkit.getDefaultToolkit().getMenuShortcutKeyMaskEx();

    private final ViewerModel model;
    private final RecentFiles recent;
    private final MapCanvas canvas = new MapCanvas();
    private final JPanel colourBarHolder = new JPanel(new BorderLayout());
    private final ColourBar colourBar = new ColourBar();
    private final HistogramView histogram = new HistogramView();
    private final LineProfileView lineView = new LineProfileView();
    private final RadialProfileView radialView = new RadialProfileView();
    private final InjectionCurveView injectionView = new InjectionCurveView();
    private WaferAnalysis chartedResult;
    private double chartedThreshold = Double.NaN;
    private LineProfile chartedLine;
    private final GalleryPanel gallery;
    private final PhysicsPanel physics;
    private final ThresholdPanel threshold;
    private final ChartTabs charts;
    private final StatusBar status;
    private final JLabel mapTitle = new JLabel(" ");
    private final AnalysisRunner runner;
    private final SessionController sessions;
    private final ExportController exports;
    private ViewerModel.OpenWafer shownWafer;
    private WaferAnalysis shownResult;
    private MapCanvas.Probe lastProbe;
    private IdentifyDialog identifyDialog;
    private HistoryWindow historyWindow;
    private java.util.List<Object> injectionKey;
    private final List<Consumer<ViewerModel.Change>> extraListeners = new ArrayList<>();

    private final Action undo = WindowMenus.action("Undo", KeyStroke.getKeyStroke(KeyEvent.VK_Z, WindowMenus.MENU), e -> model().undo());
    private final Action redo = WindowMenus.action("Redo", KeyStroke.getKeyStroke(KeyEvent.VK_Y, WindowMenus.MENU), e -> model().redo());
    private final JCheckBoxMenuItem lineTool = new JCheckBoxMenuItem("Line tool");
    private final JCheckBoxMenuItem logScale = new JCheckBoxMenuItem("Log scale");

    public ViewerWindow(ViewerModel model, RecentFiles recent) {
        super("trapmap");
        this.model = model;
        this.recent = recent;
        setDefaultCloseOperation(JFrame.DISPOSE_ON_CLOSE);
        gallery = new GalleryPanel(model);
        physics = new PhysicsPanel(model, this::newDefect, this::loadDefects);
        threshold = new ThresholdPanel(model, this::zoomToRegion);
        charts = new ChartTabs(model);
        status = new StatusBar(this::cancelAnalysis);
        runner = new AnalysisRunner(model, status, () -> {
            for (Consumer<ViewerModel.Change> l : extraListeners) {
                l.accept(ViewerModel.Change.RESULTS);
            }
        });
        sessions = new SessionController(this, model, recent, status);
        exports = new ExportController(this, model, canvas, charts, status);

        canvas.setName("mapCanvas");
        canvas.setToolTipText(null);
        canvas.onProbe(this::probe);
        canvas.onLineDrawn(this::lineDrawn);
        canvas.viewport().addListener(v -> {
            ViewerModel.OpenWafer w = model.selected();
            if (w != null && w == shownWafer) {
                w.setView(new ViewState(v.zoom(), v.centreX(), v.centreY()));
            }
        });
        mapTitle.setBorder(BorderFactory.createEmptyBorder(4, 8, 4, 8));
        mapTitle.setFont(mapTitle.getFont().deriveFont(java.awt.Font.BOLD));
        // a label's minimum width is its text's: a long title would hold the side panel narrower than it is asked to be
        mapTitle.setMinimumSize(new Dimension(0, mapTitle.getPreferredSize().height));
        JPanel centre = new JPanel(new BorderLayout());
        centre.add(mapTitle, BorderLayout.NORTH);
        centre.add(canvas, BorderLayout.CENTER);
        centre.add(colourBarHolder, BorderLayout.EAST);

        JSplitPane centreSplit = new JSplitPane(JSplitPane.VERTICAL_SPLIT, centre, charts);
        centreSplit.setResizeWeight(0.72);
        centreSplit.setBorder(null);
        charts.setPreferredSize(new Dimension(600, 250));
        charts.setMinimumSize(new Dimension(200, 120));

        JScrollPane physicsScroll = new JScrollPane(physics);
        physicsScroll.setBorder(BorderFactory.createEmptyBorder());
        physicsScroll.getVerticalScrollBar().setUnitIncrement(16);
        physicsScroll.setHorizontalScrollBarPolicy(JScrollPane.HORIZONTAL_SCROLLBAR_NEVER);
        JScrollPane thresholdScroll = new JScrollPane(threshold);
        thresholdScroll.setBorder(BorderFactory.createEmptyBorder());
        thresholdScroll.getVerticalScrollBar().setUnitIncrement(16);
        thresholdScroll.setHorizontalScrollBarPolicy(JScrollPane.HORIZONTAL_SCROLLBAR_NEVER);
        JSplitPane right = new JSplitPane(JSplitPane.VERTICAL_SPLIT, physicsScroll, thresholdScroll);
        right.setResizeWeight(0.55);
        right.setBorder(null);
        right.setPreferredSize(new Dimension(400, 600));
        right.setMinimumSize(new Dimension(300, 200));

        JSplitPane inner = new JSplitPane(JSplitPane.HORIZONTAL_SPLIT, centreSplit, right);
        inner.setResizeWeight(1);
        inner.setBorder(null);
        JSplitPane outer = new JSplitPane(JSplitPane.HORIZONTAL_SPLIT, gallery, inner);
        outer.setResizeWeight(0);
        outer.setBorder(null);
        getContentPane().add(outer, BorderLayout.CENTER);
        getContentPane().add(status, BorderLayout.SOUTH);
        canvas.setFlagOverlay(recent.flagOverlay());
        WindowMenus menus = new WindowMenus(this, model, canvas, sessions, exports, undo, redo, lineTool, logScale);
        setJMenuBar(menus.menus());
        menus.keys();
        setTransferHandler(new FileDrop());
        ((JComponent) getContentPane()).setTransferHandler(new FileDrop());
        gallery.setTransferHandler(new FileDrop());

        model.addListener(c -> SwingUtilities.invokeLater(() -> changed(c)));
        setPreferredSize(new Dimension(1600, 1000));
        pack();
        gallery.setMinimumSize(new Dimension(180, 100));
        SwingUtilities.invokeLater(() -> {
            // on a narrow screen the side columns give up some of their width so that the map keeps room
            int[] sides = ScreenFit.sideWidths(outer.getWidth());
            outer.setDividerLocation(sides[0]);
            outer.validate(); // the inner pane takes its width before its divider is placed
            inner.setDividerLocation(Math.max(0, inner.getWidth() - sides[1] - inner.getDividerSize()));
            centreSplit.setDividerLocation(0.72);
            right.setDividerLocation(0.6);
        });
        colourBar.setName("colourBar");
        setColourBar(colourBar);
        charts.setChart(0, histogram);
        charts.setChart(1, lineView);
        charts.setChart(2, radialView);
        charts.setChart(3, injectionView);
        charts.addChangeListener(e -> {
            if (charts.getSelectedIndex() == 3) {
                showInjection(lastProbe);
            }
        });
        updateTitle();
        updateUndo();
    }

    public ViewerModel model() {
        return model;
    }

    public MapCanvas canvas() {
        return canvas;
    }

    public ThresholdPanel thresholdPanel() {
        return threshold;
    }

    public ChartTabs charts() {
        return charts;
    }

    /** Draws flagged pixels as {@code o} says and remembers it for the next start. */
    void setFlagOverlay(trapmap.viewer.model.FlagOverlay o) {
        canvas.setFlagOverlay(o);
        recent.setFlagOverlay(o);
        statusBar().setMessage("flagged pixels: " + o.mode().label() + ", opacity "
                + Math.round(100 * o.opacity()) + " %");
    }

    /** Puts the colour bar beside the map. */
    public void setColourBar(JComponent bar) {
        colourBarHolder.removeAll();
        colourBarHolder.add(bar, BorderLayout.CENTER);
        colourBarHolder.revalidate();
    }

    /** Also tells {@code l} about model changes, on the event thread, after the window has updated. */
    public void addChangeListener(Consumer<ViewerModel.Change> l) {
        extraListeners.add(l);
    }

    /** True when no analysis is running or waiting. */
    public boolean idle() {
        return runner.idle();
    }

    /** Opens files or folders in the background; the first becomes a recent entry. */
    public void open(List<Path> paths) {
        sessions.open(paths);
    }

    /** Restores a session file in the background. */
    public void loadSession(Path f) {
        sessions.loadSession(f);
    }

    ExportController exports() {
        return exports;
    }

    SessionController sessions() {
        return sessions;
    }

    StatusBar statusBar() {
        return status;
    }

    /** The chart of the open chart tab, or null when it has none yet. */
    org.jfree.chart.JFreeChart openChart() {
        return switch (charts.getSelectedIndex()) {
            case 0 -> histogram.chart();
            case 1 -> lineView.chart();
            case 2 -> radialView.chart();
            default -> injectionView.chart();
        };
    }

    private void scheduleAnalysis() {
        runner.schedule();
    }

    void cancelAnalysis() {
        runner.cancel();
    }

    // ---- model changes -----------------------------------------------------------------------------------

    private void changed(ViewerModel.Change c) {
        switch (c) {
            case WAFERS -> {
                gallery.refresh();
                updateTitle();
                scheduleAnalysis();
            }
            case SELECTION -> {
                gallery.refresh();
                physics.refresh();
                threshold.refresh();
                updateTitle();
                showSelected();
                scheduleAnalysis();
            }
            case ANALYSIS -> {
                physics.refresh();
                threshold.refresh();
                logScale.setSelected(model.analysis().display().logarithmic());
                showSelected();
                previewThreshold();
                scheduleAnalysis();
                updateUndo();
            }
            case RESULTS -> {
                gallery.refresh();
                threshold.refresh();
                physics.showDefectInfo();
                showSelected();
            }
            case DEFECTS -> physics.refresh();
            case RULES -> {
                gallery.refresh();
                threshold.refresh();
                physics.showDefectInfo();
                updateTitle();
                scheduleAnalysis();
            }
        }
        for (Consumer<ViewerModel.Change> l : extraListeners) {
            l.accept(c);
        }
    }

    private void updateTitle() {
        ViewerModel.OpenWafer w = model.selected();
        setTitle(w == null ? "trapmap" : "trapmap — " + w.path().getFileName());
        String pos = w == null ? "" : "  (" + (model.selectedIndex() + 1) + " of " + model.size() + ")";
        mapTitle.setText(w == null ? "Open maps with File ▸ Open… (Ctrl+O) or drop files or folders here"
                : w.name() + pos);
    }

    private void updateUndo() {
        undo.setEnabled(model.canUndo());
        redo.setEnabled(model.canRedo());
        undo.putValue(Action.NAME, model.canUndo() ? "Undo " + model.undoName() : "Undo");
        redo.putValue(Action.NAME, model.canRedo() ? "Redo " + model.redoName() : "Redo");
    }

    /** Puts the selected wafer's latest results on the canvas. */
    private void showSelected() {
        ViewerModel.OpenWafer w = model.selected();
        if (w == null) {
            canvas.setMap(null);
            shownWafer = null;
            shownResult = null;
            return;
        }
        WaferAnalysis r = w.result();
        boolean newWafer = w != shownWafer;
        if (r == null) {
            if (newWafer && w.error() != null) {
                canvas.setMap(null);
                status.setMessage(w.error());
            }
            return;
        }
        Analysis a = model.analysis();
        double[] range = ViewerModel.range(r, a.display());
        boolean log = a.display().logarithmic() && r.analysis().quantity().logarithmic() && range[0] > 0;
        DisplayStyle style = new DisplayStyle(a.display().colours(), log, range[0], range[1]);
        if (r != shownResult) {
            canvas.setMap(r.displayed());
            canvas.setFlagged(r.flagged());
            canvas.setOutline(r.shape(), r.edgeExclusionMm());
        }
        canvas.setStyle(style);
        DisplayedQuantity q = r.analysis().quantity();
        colourBar.setStyle(style);
        colourBar.setLabel(q.isProbability() ? ExceedanceLayer.legend(r.exceedanceSettings())
                : q.symbol() + (q.unit().isEmpty() ? "" : " (" + q.unit() + ")"));
        physics.showRange(range[0], range[1]);
        showCharts(r);
        if (lastProbe != null && lastProbe.xPx() < r.lifetime().width() && lastProbe.yPx() < r.lifetime().height()
                && !injectionCurrent(w)) {
            // a new defect, wafer or physics redraws the curve (and its title) without waiting for the mouse
            showInjection(lastProbe);
        }
        ProfileLine l = a.line();
        canvas.setLine(l == null ? null : new Line2D.Double(l.x0Mm(), l.y0Mm(), l.x1Mm(), l.y1Mm()));
        if (l != null) {
            charts.showBandWidth(l.bandWidthMm());
        }
        if (newWafer) {
            shownWafer = w;
            ViewState v = w.view();
            if (v != null) {
                canvas.viewport().set(v.zoom(), v.centreXPx(), v.centreYPx());
            } else {
                canvas.fit();
            }
        }
        shownResult = r;
        status.setFrameMillis(canvas.lastFrameMillis());
        if (!r.warnings().isEmpty()) {
            // per-pixel cautions name how many pixels they concern (counted by the conversion)
            List<String> notes = r.conversion() != null ? r.conversion().warningNotes()
                    : r.warnings().stream().map(x -> x.message()).sorted().toList();
            status.setMessage(r.verdict().headlineWithWarning() + " — caution: " + notes.get(0) + (notes.size() > 1 ? " (+"
                    + (notes.size() - 1) + " more, see tooltip)" : ""));
            status.setMessageTooltip("<html>" + r.verdict().basis() + "<br>" + String.join("<br>", notes)
                    + "</html>");
        } else if (w.error() == null) {
            status.setMessage(r.verdict().headlineWithWarning() + " — " + r.verdict().basis());
            status.setMessageTooltip(null);
        }
    }

    /** Histogram and radial profile (computed in the background) and the line profile of the shown results. */
    private void showCharts(WaferAnalysis r) {
        double t = r.flagThreshold();
        if (r != chartedResult || Double.compare(t, chartedThreshold) != 0) {
            chartedResult = r;
            chartedThreshold = t;
            new SwingWorker<Object[], Void>() {
                @Override
                protected Object[] doInBackground() {
                    HistogramChart.Data h = HistogramChart.compute(r.displayed(), r.mask(), t).withAreas(
                            r.verdict().invalid(), r.verdict().figures().getOrDefault("below_limit_area_fraction",
                                    Double.NaN));
                    RadialProfile rp = RadialProfile.of(r.displayed(), r.mask(), Math.max(1.0,
                            2 * r.displayed().grid().pitchMm()));
                    double[] spread = RadialProfileView.ringStandardDeviations(r.displayed(), r.mask(), rp);
                    return new Object[] {h, rp, spread};
                }

                @Override
                protected void done() {
                    try {
                        Object[] o = get();
                        if (chartedResult == r) {
                            histogram.show((HistogramChart.Data) o[0]);
                            radialView.show((RadialProfile) o[1], r.displayed().quantity(), (double[]) o[2]);
                        }
                    } catch (Exception e) {
                        status.setMessage("charts: " + e.getMessage());
                    }
                }
            }.execute();
        }
        LineProfile lp = model.lineProfile();
        if (lp != null && (chartedLine == null || lp.lengthMm() != chartedLine.lengthMm()
                || lp.bandWidthMm() != chartedLine.bandWidthMm() || lp.xMm(0) != chartedLine.xMm(0)
                || r != chartedResult)) {
            lineView.show(lp, r.displayed().quantity());
        }
        chartedLine = lp;
    }

    /** True when the injection chart shows the probed pixel of {@code w} with the chosen defect and physics. */
    private boolean injectionCurrent(ViewerModel.OpenWafer w) {
        Defect d = model.defect();
        return d != null && java.util.Objects.equals(injectionKey, java.util.List.of(w, lastProbe, d,
                model.physics()));
    }

    /** The injection curve of the probed pixel, when its tab is shown. */
    private void showInjection(MapCanvas.Probe p) {
        ViewerModel.OpenWafer w = model.selected();
        Defect d = model.defect();
        if (p == null || w == null || w.result() == null || d == null || charts.getSelectedIndex() != 3) {
            return;
        }
        try {
            injectionView.show(PixelInjection.sweep(w.result().lifetime(), p.xPx(), p.yPx(), d,
                    ConversionSettings.of(model.physics())));
            injectionKey = java.util.List.of(w, p, d, model.physics());
        } catch (RuntimeException e) {
            status.setMessage("injection curve: " + e.getMessage());
        }
    }

    /**
     * A threshold edit shows the pixels beyond the new value at once (every such pixel, before the smallest-region
     * filter); the regions, the table and the figures follow when the analysis has run.
     */
    private void previewThreshold() {
        ViewerModel.OpenWafer w = model.selected();
        WaferAnalysis r = w == null ? null : w.result();
        Analysis a = model.analysis();
        if (r == null || r.verdict().rulesVerdict() || r.analysis().threshold().equals(a.threshold())
                || !r.analysis().withThreshold(a.threshold()).equals(a)) {
            return;
        }
        canvas.setFlagged(MapCanvas.flag(r.displayed().raster(), r.mask(), a.threshold().value(),
                a.threshold().side() == RegionCriteria.Side.ABOVE));
    }

    // ---- canvas callbacks --------------------------------------------------------------------------------

    private void probe(MapCanvas.Probe p) {
        lastProbe = p;
        if (p == null) {
            status.setReadout("");
            return;
        }
        try {
            var r = model.probe(p.xPx(), p.yPx());
            status.setReadout(r == null ? "" : r.describe());
            showInjection(p);
        } catch (RuntimeException e) {
            status.setReadout("x " + p.xMm() + " mm, y " + p.yMm() + " mm: " + e.getMessage());
        }
        status.setFrameMillis(canvas.lastFrameMillis());
    }

    /** The pixel last under the cursor, or null. */
    public MapCanvas.Probe lastProbe() {
        return lastProbe;
    }

    private void lineDrawn(Line2D mm) {
        if (mm == null || mm.getP1().equals(mm.getP2())) {
            return;
        }
        model.setAnalysis(model.analysis().withLine(new ProfileLine(mm.getX1(), mm.getY1(), mm.getX2(), mm.getY2(),
                charts.bandWidthMm())), "line");
        charts.setSelectedIndex(1);
    }

    private void zoomToRegion(Region r) {
        Region.BoundsMm b = r.bounds();
        double pad = Math.max(5, 0.5 * Math.max(b.widthMm(), b.heightMm()));
        canvas.zoomToMm(b.minXMm() - pad, b.minYMm() - pad, b.maxXMm() + pad, b.maxYMm() + pad);
        status.setMessage(String.format(Locale.ROOT, "region %d: %.1f mm² at (%.1f, %.1f) mm", r.id(), r.areaMm2(),
                r.centroidXMm(), r.centroidYMm()));
    }

    /** The map view as shown, as a picture (canvas and colour bar side by side). */
    public BufferedImage viewImage() {
        int w = Math.max(1, canvas.getWidth());
        int h = Math.max(1, canvas.getHeight());
        int bw = colourBarHolder.getWidth();
        BufferedImage img = new BufferedImage(w + bw, h, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = img.createGraphics();
        g.setColor(canvas.getBackground() == null ? java.awt.Color.WHITE : java.awt.Color.WHITE);
        g.fillRect(0, 0, w + bw, h);
        canvas.paint(g);
        if (bw > 0) {
            Graphics2D g2 = (Graphics2D) g.create(w, 0, bw, h);
            colourBarHolder.paint(g2);
            g2.dispose();
        }
        g.dispose();
        return img;
    }

    /** Edits the settings of the probability of exceeding N* (Analysis ▸ Exceedance settings…). */
    void editExceedance() {
        physics.editExceedance();
    }

    void compare(boolean iron) {
        if (model.size() < 2) {
            status.setMessage("open two maps of one wafer to " + (iron ? "image iron" : "compare them"));
            return;
        }
        CompareDialog d = new CompareDialog(this, model, iron);
        d.setVisible(true);
        d.start();
    }

    /** Opens the defect identification from injection levels for the shown wafer (and its other levels). */
    void identify() {
        if (model.selected() == null) {
            status.setMessage("open the maps of one wafer at two or more injection levels to identify the defect");
            return;
        }
        identifyDialog = new IdentifyDialog(this, model);
        identifyDialog.setVisible(true);
        if (identifyDialog.levels() >= 2) {
            identifyDialog.start();
        }
    }

    /**
     * Opens (or brings forward) the history window over a results store; with {@code store} not null, opens that
     * store in it.
     */
    void history(String store) {
        if (historyWindow == null || !historyWindow.isDisplayable()) {
            historyWindow = new HistoryWindow(this);
        }
        historyWindow.setVisible(true);
        historyWindow.toFront();
        if (store != null) {
            historyWindow.openStore(store);
        }
    }

    /** The last history window opened (null before), for tests. */
    HistoryWindow historyWindow() {
        return historyWindow;
    }

    /** Opens the map {@code file} (when not open yet) and shows it, bringing this window forward. */
    void openAndShow(Path file) {
        sessions.open(List.of(file), () -> {
            int i = model.indexOf(file);
            if (i >= 0) {
                model.select(i);
                status.setMessage("showing " + model.wafer(i).name() + " from the results store");
            }
            toFront();
        });
    }

    /** The last identification dialog opened (null before), for tests. */
    IdentifyDialog identifyDialog() {
        return identifyDialog;
    }

    private void newDefect() {
        Defect d = DefectDialog.ask(this);
        if (d == null) {
            return;
        }
        try {
            model.addDefect(d);
            model.setAnalysis(model.analysis().withDefect(d.id()), "defect");
        } catch (IllegalArgumentException e) {
            error("Defect not added", e);
        }
    }

    private void loadDefects() {
        JFileChooser fc = sessions.chooser();
        fc.setFileFilter(new FileNameExtensionFilter("Defect files (.json)", "json"));
        if (fc.showOpenDialog(this) != JFileChooser.APPROVE_OPTION) {
            return;
        }
        try {
            List<Defect> added = model.addDefectFile(fc.getSelectedFile().toPath());
            status.setMessage("added " + added.size() + " defect(s): " + added.stream().map(Defect::id).toList());
            if (!added.isEmpty()) {
                model.setAnalysis(model.analysis().withDefect(added.get(0).id()), "defect");
            }
        } catch (IOException | IllegalArgumentException e) {
            error("Defects not loaded", e);
        }
    }

    void error(String title, Exception e) {
        Throwable t = e instanceof java.util.concurrent.ExecutionException && e.getCause() != null ? e.getCause() : e;
        String msg = t.getMessage() == null ? t.toString() : t.getMessage();
        status.setMessage(title + ": " + msg);
        JOptionPane.showMessageDialog(this, msg, title, JOptionPane.WARNING_MESSAGE);
    }

    /** Opens files and folders dropped on the window. */
    private final class FileDrop extends TransferHandler {
        private static final long serialVersionUID = 1L;

        @Override
        public boolean canImport(TransferSupport s) {
            return s.isDataFlavorSupported(DataFlavor.javaFileListFlavor);
        }

        @Override
        public boolean importData(TransferSupport s) {
            try {
                @SuppressWarnings("unchecked")
                List<File> files = (List<File>) s.getTransferable().getTransferData(DataFlavor.javaFileListFlavor);
                open(files.stream().map(File::toPath).toList());
                return true;
            } catch (Exception e) {
                status.setMessage("drop not understood: " + e.getMessage());
                return false;
            }
        }
    }
}
