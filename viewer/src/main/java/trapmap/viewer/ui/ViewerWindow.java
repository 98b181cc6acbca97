package trapmap.viewer.ui;

import java.awt.BorderLayout;
import java.awt.Component;
import java.awt.Dimension;
import java.awt.Graphics2D;
import java.awt.KeyboardFocusManager;
import java.awt.Toolkit;
import java.awt.datatransfer.DataFlavor;
import java.awt.event.ActionEvent;
import java.awt.event.InputEvent;
import java.awt.event.KeyEvent;
import java.awt.geom.Line2D;
import java.awt.image.BufferedImage;
import java.io.File;
import java.io.IOException;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.CancellationException;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.function.Consumer;
import javax.imageio.ImageIO;
import javax.swing.AbstractAction;
import javax.swing.Action;
import javax.swing.BorderFactory;
import javax.swing.ButtonGroup;
import javax.swing.JCheckBoxMenuItem;
import javax.swing.JComponent;
import javax.swing.JFileChooser;
import javax.swing.JFrame;
import javax.swing.JLabel;
import javax.swing.JMenu;
import javax.swing.JMenuBar;
import javax.swing.JMenuItem;
import javax.swing.JOptionPane;
import javax.swing.JPanel;
import javax.swing.JRadioButtonMenuItem;
import javax.swing.JScrollPane;
import javax.swing.JSplitPane;
import javax.swing.KeyStroke;
import javax.swing.SwingUtilities;
import javax.swing.SwingWorker;
import javax.swing.Timer;
import javax.swing.TransferHandler;
import javax.swing.event.MenuEvent;
import javax.swing.event.MenuListener;
import javax.swing.filechooser.FileNameExtensionFilter;
import javax.swing.text.JTextComponent;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;
import trapmap.maps.io.ColourMap;
import trapmap.maps.region.Region;
import trapmap.physics.defect.Defect;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.PixelInjection;
import trapmap.maps.profile.LineProfile;
import trapmap.maps.profile.RadialProfile;
import trapmap.viewer.report.WaferReport;
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
import trapmap.viewer.ui.model.Analysis;
import trapmap.viewer.ui.model.DisplayedQuantity;
import trapmap.viewer.ui.model.ProfileLine;
import trapmap.viewer.ui.model.RecentFiles;
import trapmap.viewer.ui.model.Session;
import trapmap.viewer.ui.model.SessionFiles;
import trapmap.viewer.ui.model.ViewState;
import trapmap.viewer.ui.model.ViewerModel;
import trapmap.viewer.ui.model.WaferAnalysis;
import trapmap.viewer.ui.panels.ChartTabs;
import trapmap.viewer.ui.panels.DefectDialog;
import trapmap.viewer.ui.panels.GalleryPanel;
import trapmap.viewer.ui.panels.PhysicsPanel;
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
    private final Timer debounce;
    private SwingWorker<Void, Void> worker;
    private AtomicBoolean cancel = new AtomicBoolean();
    private volatile boolean restartPending;
    private Path sessionFile;
    private ViewerModel.OpenWafer shownWafer;
    private WaferAnalysis shownResult;
    private MapCanvas.Probe lastProbe;
    private final List<Consumer<ViewerModel.Change>> extraListeners = new ArrayList<>();

    private final Action undo = action("Undo", KeyStroke.getKeyStroke(KeyEvent.VK_Z, MENU), e -> model().undo());
    private final Action redo = action("Redo", KeyStroke.getKeyStroke(KeyEvent.VK_Y, MENU), e -> model().redo());
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
        debounce = new Timer(150, e -> startAnalysis());
        debounce.setRepeats(false);

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
        JPanel centre = new JPanel(new BorderLayout());
        centre.add(mapTitle, BorderLayout.NORTH);
        centre.add(canvas, BorderLayout.CENTER);
        colourBarHolder.setPreferredSize(new Dimension(90, 100));
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
        JSplitPane right = new JSplitPane(JSplitPane.VERTICAL_SPLIT, physicsScroll, threshold);
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
        setJMenuBar(menus());
        keys();
        setTransferHandler(new FileDrop());
        ((JComponent) getContentPane()).setTransferHandler(new FileDrop());
        gallery.setTransferHandler(new FileDrop());

        model.addListener(c -> SwingUtilities.invokeLater(() -> changed(c)));
        setPreferredSize(new Dimension(1600, 1000));
        pack();
        SwingUtilities.invokeLater(() -> {
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
        return (worker == null || worker.isDone()) && !debounce.isRunning() && !restartPending;
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
                showSelected();
            }
            case DEFECTS -> physics.refresh();
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
            canvas.setOutline(r.shape(), r.analysis().edgeExclusionMm());
        }
        canvas.setStyle(style);
        DisplayedQuantity q = r.analysis().quantity();
        colourBar.setStyle(style);
        colourBar.setLabel(q.symbol() + (q.unit().isEmpty() ? "" : " (" + q.unit() + ")"));
        physics.showRange(range[0], range[1]);
        showCharts(r);
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
            List<String> notes = r.warnings().stream().map(x -> x.message()).sorted().toList();
            status.setMessage("caution: " + notes.get(0) + (notes.size() > 1 ? " (+" + (notes.size() - 1)
                    + " more, see tooltip)" : ""));
            status.setMessageTooltip("<html>" + String.join("<br>", notes) + "</html>");
        } else if (w.error() == null) {
            status.setMessage(r.pass() ? "pass" : "fail: flagged area above " + String.format(Locale.ROOT, "%.1f %%",
                    a.threshold().maxFlaggedFraction() * 100));
        }
    }

    /** Histogram and radial profile (computed in the background) and the line profile of the shown results. */
    private void showCharts(WaferAnalysis r) {
        double t = r.analysis().threshold().value();
        if (r != chartedResult || t != chartedThreshold) {
            chartedResult = r;
            chartedThreshold = t;
            new SwingWorker<Object[], Void>() {
                @Override
                protected Object[] doInBackground() {
                    HistogramChart.Data h = HistogramChart.compute(r.displayed(), r.mask(), t);
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

    /** The injection curve of the probed pixel, when its tab is shown. */
    private void showInjection(MapCanvas.Probe p) {
        ViewerModel.OpenWafer w = model.selected();
        Defect d = model.defect();
        if (p == null || w == null || w.result() == null || d == null || charts.getSelectedIndex() != 3) {
            return;
        }
        try {
            injectionView.show(PixelInjection.sweep(w.result().lifetime(), p.xPx(), p.yPx(), d,
                    ConversionSettings.DEFAULTS));
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
        if (r == null || r.analysis().threshold().equals(a.threshold())
                || !r.analysis().withThreshold(a.threshold()).equals(a)) {
            return;
        }
        canvas.setFlagged(MapCanvas.flag(r.displayed().raster(), r.mask(), a.threshold().value(),
                a.threshold().side() == RegionCriteria.Side.ABOVE));
    }

    // ---- analysis worker ---------------------------------------------------------------------------------

    private void scheduleAnalysis() {
        debounce.restart();
    }

    private void cancelAnalysis() {
        cancel.set(true);
        restartPending = false;
        status.setMessage("cancelled: some wafers show older results");
    }

    private void startAnalysis() {
        if (worker != null && !worker.isDone()) {
            cancel.set(true);
            restartPending = true;
            return;
        }
        restartPending = false;
        AtomicBoolean stop = new AtomicBoolean();
        cancel = stop;
        int n = model.size();
        if (n == 0) {
            return;
        }
        int first = Math.max(0, model.selectedIndex());
        status.setProgress(0, "0 %");
        worker = new SwingWorker<>() {
            @Override
            protected Void doInBackground() {
                try {
                    if (!model.upToDate(first)) {
                        model.compute(first, stop::get);
                    }
                    int done = 1;
                    for (int k = 0; k < n && !stop.get(); k++) {
                        if (k != first && k < model.size() && !model.upToDate(k)) {
                            model.compute(k, stop::get);
                        }
                        setProgress(Math.min(100, 100 * ++done / (n + 1)));
                    }
                } catch (CancellationException e) {
                    // a newer change or the cancel button: results so far stay
                } catch (IndexOutOfBoundsException e) {
                    // the wafers were closed meanwhile (a session being opened): the next run sees the new list
                    restartPending = true;
                }
                return null;
            }

            @Override
            protected void done() {
                status.setProgress(-1, null);
                if (restartPending) {
                    startAnalysis();
                }
                for (Consumer<ViewerModel.Change> l : extraListeners) {
                    l.accept(ViewerModel.Change.RESULTS);
                }
            }
        };
        worker.addPropertyChangeListener(e -> {
            if ("progress".equals(e.getPropertyName())) {
                status.setProgress((Integer) e.getNewValue(), e.getNewValue() + " %");
            }
        });
        worker.execute();
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

    // ---- menus and keys ----------------------------------------------------------------------------------

    private static Action action(String name, KeyStroke key, Consumer<ActionEvent> body) {
        AbstractAction a = new AbstractAction(name) {
            private static final long serialVersionUID = 1L;

            @Override
            public void actionPerformed(ActionEvent e) {
                body.accept(e);
            }
        };
        if (key != null) {
            a.putValue(Action.ACCELERATOR_KEY, key);
        }
        return a;
    }

    /** An action that does nothing while the user types into a text field (for plain-key shortcuts). */
    private static Action plainKey(String name, KeyStroke key, Runnable body) {
        return action(name, key, e -> {
            Component f = KeyboardFocusManager.getCurrentKeyboardFocusManager().getFocusOwner();
            if (!(f instanceof JTextComponent)) {
                body.run();
            }
        });
    }

    private JMenuItem item(Action a, String tooltip) {
        JMenuItem i = new JMenuItem(a);
        i.setToolTipText(tooltip);
        return i;
    }

    private JMenuBar menus() {
        JMenuBar bar = new JMenuBar();
        JMenu file = new JMenu("File");
        file.setMnemonic('F');
        file.add(item(action("Open…", KeyStroke.getKeyStroke(KeyEvent.VK_O, MENU), e -> chooseAndOpen()),
                "Open lifetime or PL maps (.tif, .tiff, .csv) or folders of them"));
        JMenu recentMenu = new JMenu("Open recent");
        recentMenu.addMenuListener(new MenuListener() {
            @Override
            public void menuSelected(MenuEvent e) {
                fillRecent(recentMenu);
            }

            @Override
            public void menuDeselected(MenuEvent e) {
            }

            @Override
            public void menuCanceled(MenuEvent e) {
            }
        });
        file.add(recentMenu);
        file.addSeparator();
        file.add(item(action("Open session…", null, e -> openSession()), "Restore files, conditions, defect,"
                + " thresholds, display and views from a session file"));
        file.add(item(action("Save session", KeyStroke.getKeyStroke(KeyEvent.VK_S, MENU), e -> saveSession(false)),
                "Save files, conditions, defect, thresholds, display and views as readable JSON"));
        file.add(item(action("Save session as…", KeyStroke.getKeyStroke(KeyEvent.VK_S, MENU
                | InputEvent.SHIFT_DOWN_MASK), e -> saveSession(true)), "Save the session under a new name"));
        file.addSeparator();
        file.add(item(action("Export view PNG…", KeyStroke.getKeyStroke(KeyEvent.VK_E, MENU), e -> exportView()),
                "Save the map view as shown (with flags and line) as a PNG picture"));
        file.add(item(action("Export chart PNG…", null, e -> exportChart()), "Save the chart of the open tab as PNG"));
        file.add(item(action("Export regions CSV…", null, e -> exportRegions()),
                "Save the flagged regions of the shown wafer: id, area mm², centroid mm, peak, mean"));
        file.add(item(action("Wafer report PDF…", KeyStroke.getKeyStroke(KeyEvent.VK_P, MENU), e -> report()),
                "One-page PDF of the shown wafer: map, figures, regions, conditions, caution"));
        file.addSeparator();
        file.add(item(action("Quit", KeyStroke.getKeyStroke(KeyEvent.VK_Q, MENU), e -> dispose()), "Close trapmap"));
        bar.add(file);

        JMenu edit = new JMenu("Edit");
        edit.setMnemonic('E');
        edit.add(item(undo, "Undo the last change of threshold, line or settings"));
        edit.add(item(redo, "Redo the change last undone"));
        bar.add(edit);

        JMenu view = new JMenu("View");
        view.setMnemonic('V');
        view.add(item(plainKey("Zoom in", KeyStroke.getKeyStroke(KeyEvent.VK_PLUS, 0), () -> canvas.zoomBy(1.25)),
                "Zoom in about the view centre (+; mouse wheel zooms at the cursor)"));
        view.add(item(plainKey("Zoom out", KeyStroke.getKeyStroke(KeyEvent.VK_MINUS, 0), () -> canvas.zoomBy(0.8)),
                "Zoom out about the view centre (−)"));
        view.add(item(plainKey("Fit", KeyStroke.getKeyStroke(KeyEvent.VK_0, 0), canvas::fit),
                "Show the whole map (0)"));
        view.addSeparator();
        JMenu cm = new JMenu("Colour map");
        ButtonGroup g = new ButtonGroup();
        for (ColourMap c : ColourMap.values()) {
            JRadioButtonMenuItem r = new JRadioButtonMenuItem(c.name().toLowerCase(Locale.ROOT).replace('_', '-'));
            r.addActionListener(e -> model.setAnalysis(model.analysis().withDisplay(model.analysis().display()
                    .withColours(c)), "colour map"));
            g.add(r);
            cm.add(r);
            cm.addMenuListener(new MenuListener() {
                @Override
                public void menuSelected(MenuEvent e) {
                    r.setSelected(model.analysis().display().colours() == c);
                }

                @Override
                public void menuDeselected(MenuEvent e) {
                }

                @Override
                public void menuCanceled(MenuEvent e) {
                }
            });
        }
        view.add(cm);
        logScale.addActionListener(e -> model.setAnalysis(model.analysis().withDisplay(model.analysis().display()
                .withLogarithmic(logScale.isSelected())), "log scale"));
        logScale.setToolTipText("Logarithmic colour scale");
        view.add(logScale);
        view.addSeparator();
        view.add(item(plainKey("Next wafer", KeyStroke.getKeyStroke(KeyEvent.VK_PAGE_DOWN, 0), model::next),
                "Show the next open wafer (PageDown or Alt+→)"));
        view.add(item(plainKey("Previous wafer", KeyStroke.getKeyStroke(KeyEvent.VK_PAGE_UP, 0), model::previous),
                "Show the previous open wafer (PageUp or Alt+←)"));
        view.addSeparator();
        lineTool.setAccelerator(KeyStroke.getKeyStroke(KeyEvent.VK_L, 0));
        lineTool.setToolTipText("Drag on the map to draw a profile line (L)");
        lineTool.addActionListener(e -> {
            Component f = KeyboardFocusManager.getCurrentKeyboardFocusManager().getFocusOwner();
            if (f instanceof JTextComponent && e.getModifiers() == 0 && !(e.getSource() instanceof JMenuItem
                    && ((JMenuItem) e.getSource()).isArmed())) {
                lineTool.setSelected(!lineTool.isSelected());
                return;
            }
            canvas.setLineTool(lineTool.isSelected());
            status.setMessage(lineTool.isSelected() ? "line tool: drag on the map to draw a profile line"
                    : "line tool off");
        });
        view.add(lineTool);
        bar.add(view);

        JMenu analysis = new JMenu("Analysis");
        analysis.setMnemonic('A');
        analysis.add(item(action("Compare…", KeyStroke.getKeyStroke(KeyEvent.VK_K, MENU), e -> compare(false)),
                "Two maps side by side, linked, with a difference or ratio map after registration"));
        analysis.add(item(action("Iron imaging…", KeyStroke.getKeyStroke(KeyEvent.VK_I, MENU), e -> compare(true)),
                "Interstitial iron from a pair of maps before and after FeB-pair dissociation"));
        analysis.addSeparator();
        for (DisplayedQuantity q : DisplayedQuantity.values()) {
            analysis.add(item(action("Show " + q, null, e -> model.setAnalysis(model.analysis().withQuantity(q),
                    "quantity")), "Display the " + q.label()));
        }
        bar.add(analysis);

        JMenu help = new JMenu("Help");
        help.setMnemonic('H');
        help.add(item(action("About and cautions", KeyStroke.getKeyStroke(KeyEvent.VK_F1, 0), e -> about()),
                "What the numbers mean and their limits"));
        help.add(item(action("Keyboard shortcuts", null, e -> shortcuts()), "List of keys"));
        bar.add(help);
        return bar;
    }

    private void keys() {
        JComponent root = getRootPane();
        bind(root, KeyStroke.getKeyStroke(KeyEvent.VK_EQUALS, 0), plainKey("zoom in", null, () -> canvas.zoomBy(1.25)));
        bind(root, KeyStroke.getKeyStroke(KeyEvent.VK_ADD, 0), plainKey("zoom in", null, () -> canvas.zoomBy(1.25)));
        bind(root, KeyStroke.getKeyStroke(KeyEvent.VK_PLUS, InputEvent.SHIFT_DOWN_MASK),
                plainKey("zoom in", null, () -> canvas.zoomBy(1.25)));
        bind(root, KeyStroke.getKeyStroke(KeyEvent.VK_EQUALS, InputEvent.SHIFT_DOWN_MASK),
                plainKey("zoom in", null, () -> canvas.zoomBy(1.25)));
        bind(root, KeyStroke.getKeyStroke(KeyEvent.VK_SUBTRACT, 0), plainKey("zoom out", null,
                () -> canvas.zoomBy(0.8)));
        bind(root, KeyStroke.getKeyStroke(KeyEvent.VK_NUMPAD0, 0), plainKey("fit", null, canvas::fit));
        bind(root, KeyStroke.getKeyStroke(KeyEvent.VK_RIGHT, InputEvent.ALT_DOWN_MASK), action("next", null,
                e -> model.next()));
        bind(root, KeyStroke.getKeyStroke(KeyEvent.VK_LEFT, InputEvent.ALT_DOWN_MASK), action("previous", null,
                e -> model.previous()));
        bind(root, KeyStroke.getKeyStroke(KeyEvent.VK_ESCAPE, 0), action("cancel", null, e -> cancelAnalysis()));
    }

    private static void bind(JComponent c, KeyStroke k, Action a) {
        String id = "trapmap." + k;
        c.getInputMap(JComponent.WHEN_IN_FOCUSED_WINDOW).put(k, id);
        c.getActionMap().put(id, a);
    }

    // ---- files -------------------------------------------------------------------------------------------

    /** Opens files or folders in the background; the first becomes a recent entry. */
    public void open(List<Path> paths) {
        if (paths.isEmpty()) {
            return;
        }
        status.setProgress(0, "reading");
        new SwingWorker<ViewerModel.OpenOutcome, Void>() {
            @Override
            protected ViewerModel.OpenOutcome doInBackground() {
                return model.open(paths);
            }

            @Override
            protected void done() {
                status.setProgress(-1, null);
                try {
                    ViewerModel.OpenOutcome o = get();
                    paths.forEach(p -> recent.add(p));
                    if (!o.errors().isEmpty()) {
                        status.setMessage(o.errors().size() + " file(s) not opened: " + o.errors().get(0));
                        JOptionPane.showMessageDialog(ViewerWindow.this, String.join("\n", o.errors().subList(0,
                                Math.min(10, o.errors().size()))), "Some files were not opened",
                                JOptionPane.WARNING_MESSAGE);
                    } else {
                        status.setMessage("opened " + o.added() + " map(s)");
                    }
                } catch (Exception e) {
                    error("Opening failed", e);
                }
            }
        }.execute();
    }

    private void chooseAndOpen() {
        JFileChooser fc = chooser();
        fc.setFileSelectionMode(JFileChooser.FILES_AND_DIRECTORIES);
        fc.setMultiSelectionEnabled(true);
        fc.setFileFilter(new FileNameExtensionFilter("Maps (.tif, .tiff, .csv)", "tif", "tiff", "csv"));
        if (fc.showOpenDialog(this) == JFileChooser.APPROVE_OPTION) {
            List<Path> paths = new ArrayList<>();
            for (File f : fc.getSelectedFiles()) {
                paths.add(f.toPath());
            }
            open(paths);
        }
    }

    private JFileChooser chooser() {
        ViewerModel.OpenWafer w = model.selected();
        return new JFileChooser(w == null ? new File(".") : w.path().getParent().toFile());
    }

    private void fillRecent(JMenu menu) {
        menu.removeAll();
        List<Path> list = recent.list();
        if (list.isEmpty()) {
            JMenuItem none = new JMenuItem("(none)");
            none.setEnabled(false);
            menu.add(none);
            return;
        }
        for (Path p : list) {
            JMenuItem i = new JMenuItem(p.getFileName() + "  —  " + p.getParent());
            i.setToolTipText(p.toString());
            i.addActionListener(e -> {
                if (Files.exists(p)) {
                    open(List.of(p));
                } else {
                    recent.remove(p);
                    status.setMessage(p + " no longer exists");
                }
            });
            menu.add(i);
        }
        menu.addSeparator();
        JMenuItem clear = new JMenuItem("Clear list");
        clear.addActionListener(e -> recent.clear());
        menu.add(clear);
    }

    private void openSession() {
        JFileChooser fc = chooser();
        fc.setFileFilter(new FileNameExtensionFilter("trapmap sessions (.json)", "json"));
        if (fc.showOpenDialog(this) != JFileChooser.APPROVE_OPTION) {
            return;
        }
        Path f = fc.getSelectedFile().toPath();
        loadSession(f);
    }

    /** Restores a session file in the background. */
    public void loadSession(Path f) {
        new SwingWorker<ViewerModel.OpenOutcome, Void>() {
            @Override
            protected ViewerModel.OpenOutcome doInBackground() throws IOException {
                Session s = SessionFiles.read(f);
                return s.applyTo(model);
            }

            @Override
            protected void done() {
                try {
                    ViewerModel.OpenOutcome o = get();
                    sessionFile = f;
                    status.setMessage("session " + f.getFileName() + " restored" + (o.errors().isEmpty() ? ""
                            : "; " + o.errors().size() + " file(s) missing: " + o.errors().get(0)));
                } catch (Exception e) {
                    error("Session not opened", e);
                }
            }
        }.execute();
    }

    private void saveSession(boolean ask) {
        Path f = sessionFile;
        if (ask || f == null) {
            JFileChooser fc = chooser();
            fc.setSelectedFile(new File(fc.getCurrentDirectory(), "session.trapmap.json"));
            if (fc.showSaveDialog(this) != JFileChooser.APPROVE_OPTION) {
                return;
            }
            f = fc.getSelectedFile().toPath();
        }
        try {
            SessionFiles.write(Session.of(model), f);
            sessionFile = f;
            status.setMessage("session saved to " + f);
        } catch (IOException | RuntimeException e) {
            error("Session not saved", e);
        }
    }

    private Path askSave(String name, String ext, String description) {
        JFileChooser fc = chooser();
        fc.setFileFilter(new FileNameExtensionFilter(description, ext));
        fc.setSelectedFile(new File(fc.getCurrentDirectory(), name));
        if (fc.showSaveDialog(this) != JFileChooser.APPROVE_OPTION) {
            return null;
        }
        Path p = fc.getSelectedFile().toPath();
        if (!p.getFileName().toString().toLowerCase(Locale.ROOT).endsWith("." + ext)) {
            p = p.resolveSibling(p.getFileName() + "." + ext);
        }
        return p;
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

    private void exportView() {
        ViewerModel.OpenWafer w = model.selected();
        if (w == null) {
            return;
        }
        Path p = askSave(w.name() + "-" + model.analysis().quantity().key() + ".png", "png", "PNG pictures");
        if (p == null) {
            return;
        }
        try {
            java.io.ByteArrayOutputStream out = new java.io.ByteArrayOutputStream();
            ImageIO.write(viewImage(), "png", out);
            ViewerExports.writeAtomically(p, out.toByteArray());
            status.setMessage("view saved to " + p);
        } catch (IOException e) {
            error("View not saved", e);
        }
    }

    private void exportRegions() {
        ViewerModel.OpenWafer w = model.selected();
        if (w == null || w.result() == null) {
            status.setMessage("no results to export yet");
            return;
        }
        Path p = askSave(w.name() + "-regions.csv", "csv", "CSV tables");
        if (p == null) {
            return;
        }
        try {
            ViewerExports.writeAtomically(p, ViewerExports.regionsCsv(w.result()).getBytes(StandardCharsets.UTF_8));
            status.setMessage(w.result().regions().size() + " regions saved to " + p);
        } catch (IOException e) {
            error("Regions not saved", e);
        }
    }

    private void exportChart() {
        org.jfree.chart.JFreeChart chart = switch (charts.getSelectedIndex()) {
            case 0 -> histogram.chart();
            case 1 -> lineView.chart();
            case 2 -> radialView.chart();
            default -> injectionView.chart();
        };
        ViewerModel.OpenWafer w = model.selected();
        if (chart == null || w == null) {
            status.setMessage("the open chart tab has no chart yet");
            return;
        }
        String tab = charts.getTitleAt(charts.getSelectedIndex()).toLowerCase(Locale.ROOT).replace(' ', '-');
        Path p = askSave(w.name() + "-" + tab + ".png", "png", "PNG pictures");
        if (p == null) {
            return;
        }
        try {
            ChartExport.writePng(chart, p, 1200, 700);
            status.setMessage("chart saved to " + p);
        } catch (IOException | RuntimeException e) {
            error("Chart not saved", e);
        }
    }

    private void report() {
        ViewerModel.OpenWafer w = model.selected();
        WaferAnalysis r = w == null ? null : w.result();
        if (r == null || canvas.style() == null) {
            status.setMessage("no results to report yet");
            return;
        }
        Path p = askSave(w.name() + "-report.pdf", "pdf", "PDF documents");
        if (p == null) {
            return;
        }
        WaferReport.Content page = ViewerExports.reportContent(w, r, canvas.style(), model.defects().byId(r.analysis()
                .defectId()));
        status.setProgress(0, "report");
        new SwingWorker<Void, Void>() {
            @Override
            protected Void doInBackground() throws IOException {
                WaferReport.write(page, p);
                return null;
            }

            @Override
            protected void done() {
                status.setProgress(-1, null);
                try {
                    get();
                    status.setMessage("report saved to " + p);
                } catch (Exception e) {
                    error("Report not written", e);
                }
            }
        }.execute();
    }

    private void compare(boolean iron) {
        if (model.size() < 2) {
            status.setMessage("open two maps of one wafer to " + (iron ? "image iron" : "compare them"));
            return;
        }
        CompareDialog d = new CompareDialog(this, model, iron);
        d.setVisible(true);
        d.start();
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
        JFileChooser fc = chooser();
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

    private void error(String title, Exception e) {
        Throwable t = e instanceof java.util.concurrent.ExecutionException && e.getCause() != null ? e.getCause() : e;
        String msg = t.getMessage() == null ? t.toString() : t.getMessage();
        status.setMessage(title + ": " + msg);
        JOptionPane.showMessageDialog(this, msg, title, JOptionPane.WARNING_MESSAGE);
    }

    private void about() {
        JOptionPane.showMessageDialog(this, "<html><body style='width: 420px'>"
                + "<b>trapmap</b> converts lifetime and PL maps of silicon wafers into equivalent densities of a chosen"
                + " recombination-active defect (Shockley–Read–Hall, after removing intrinsic and surface"
                + " recombination at each pixel's injection level).<br><br>"
                + "Statuses: OK converted; BELOW_LIMIT lifetime at or above the intrinsic/surface limit (the density"
                + " shown is the detection limit, an upper bound); INVALID unusable input; NO_DATA outside the"
                + " wafer.<br><br><b>Caution.</b> " + CAUTION + "</body></html>", "About trapmap",
                JOptionPane.INFORMATION_MESSAGE);
    }

    private void shortcuts() {
        JOptionPane.showMessageDialog(this, "<html><table>"
                + "<tr><td>Ctrl+O</td><td>open maps or folders</td></tr>"
                + "<tr><td>Ctrl+S</td><td>save session</td></tr>"
                + "<tr><td>Ctrl+E</td><td>export view PNG</td></tr>"
                + "<tr><td>Ctrl+P</td><td>wafer report PDF</td></tr>"
                + "<tr><td>Ctrl+Z / Ctrl+Y</td><td>undo / redo</td></tr>"
                + "<tr><td>+ / − / 0</td><td>zoom in / out / fit</td></tr>"
                + "<tr><td>PageDown / PageUp, Alt+→ / Alt+←</td><td>next / previous wafer</td></tr>"
                + "<tr><td>L</td><td>line tool</td></tr>"
                + "<tr><td>Ctrl+K / Ctrl+I</td><td>compare / iron imaging</td></tr>"
                + "<tr><td>Esc</td><td>cancel the running analysis</td></tr>"
                + "</table></html>", "Keyboard shortcuts", JOptionPane.INFORMATION_MESSAGE);
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
