package trapmap.viewer.ui;

import java.awt.BorderLayout;
import java.awt.Color;
import java.awt.Dimension;
import java.awt.GridLayout;
import java.awt.Rectangle;
import java.awt.datatransfer.DataFlavor;
import java.awt.event.MouseAdapter;
import java.awt.event.MouseEvent;
import java.awt.event.WindowAdapter;
import java.awt.event.WindowEvent;
import java.io.File;
import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.ExecutionException;
import javax.swing.BorderFactory;
import javax.swing.ButtonGroup;
import javax.swing.JButton;
import javax.swing.JComboBox;
import javax.swing.JComponent;
import javax.swing.JFileChooser;
import javax.swing.JFrame;
import javax.swing.JLabel;
import javax.swing.JMenuItem;
import javax.swing.JPanel;
import javax.swing.JPopupMenu;
import javax.swing.JProgressBar;
import javax.swing.JRadioButton;
import javax.swing.JScrollPane;
import javax.swing.JSpinner;
import javax.swing.JSplitPane;
import javax.swing.JTable;
import javax.swing.JTextField;
import javax.swing.KeyStroke;
import javax.swing.ListSelectionModel;
import javax.swing.Scrollable;
import javax.swing.SpinnerNumberModel;
import javax.swing.SwingConstants;
import javax.swing.SwingWorker;
import javax.swing.TransferHandler;
import javax.swing.filechooser.FileNameExtensionFilter;
import javax.swing.table.DefaultTableModel;
import org.jfree.chart.ChartMouseEvent;
import org.jfree.chart.ChartMouseListener;
import org.jfree.chart.ChartPanel;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.entity.ChartEntity;
import org.jfree.chart.entity.XYItemEntity;
import org.jfree.chart.plot.XYPlot;
import trapmap.maps.trend.Baseline;
import trapmap.maps.trend.ControlChart;
import trapmap.maps.trend.GroupYield;
import trapmap.maps.trend.TrendResult;
import trapmap.shared.error.InvalidValueException;
import trapmap.store.ResultsStore;
import trapmap.store.StoreException;
import trapmap.store.StoreFilter;
import trapmap.store.StoreQuery;
import trapmap.store.StoreTrend;
import trapmap.store.StoredPoint;
import trapmap.viewer.graphics.Labels;
import trapmap.viewer.model.StoreHistory;
import trapmap.viewer.report.TrendReport;

/**
 * The history of a results store: choose the store (a SQLite file by chooser or drop, or a {@code postgresql://}
 * address typed), the figure, the grouping and the baseline; the control charts, signals and yield of
 * {@link StoreTrend} are read off the event thread and drawn by {@link TrendReport}'s charts (the same as {@code trapmap
 * trend}'s PDF and PNG); a click on a point opens the wafer behind it in the viewer (a menu of its wafers for a point
 * of several), and the viewer window comes to the front. The queries are {@link StoreHistory} and {@link StoreTrend}; this class only shows them.
 */
final class HistoryWindow extends JFrame {
    private static final long serialVersionUID = 1L;
    private static final int CHART_HEIGHT = 300;
    private static final Color ERROR = new Color(0xB00020);
    private static final java.time.format.DateTimeFormatter TIME = java.time.format.DateTimeFormatter
            .ofPattern("yyyy-MM-dd HH:mm", Locale.ROOT).withZone(java.time.ZoneOffset.UTC);

    private final ViewerWindow window;
    private final JTextField storeField = new JTextField(42);
    private final JComboBox<String> figure = new JComboBox<>();
    private final JComboBox<String> by = new JComboBox<>();
    private final JRadioButton firstN = new JRadioButton("first", true);
    private final JSpinner count = new JSpinner(new SpinnerNumberModel(Baseline.DEFAULT_COUNT, 2, 100_000, 1));
    private final JRadioButton before = new JRadioButton("measured before");
    private final JTextField until = new JTextField(10);
    private final JTextField sinceField = new JTextField(9);
    private final JTextField untilField = new JTextField(9);
    private final JTextField profileField = new JTextField(8);
    private final JTextField lotsField = new JTextField(12);
    private final JTextField factsField = new JTextField(16);
    private final JButton chartButton = new JButton("Chart");
    private final JButton cancel = new JButton("Cancel");
    private final JButton export = new JButton("Export PNG…");
    private final JProgressBar progress = new JProgressBar();
    private final JLabel status = new JLabel(" ");
    private final JLabel caption = new JLabel(" ");
    private final ChartStack stack = new ChartStack();
    private final DefaultTableModel signals = readOnly("time (UTC)", "chart", "group", "rule", "value", "baseline");
    private final DefaultTableModel yields = readOnly("group", "wafers", "passed", "yield (%)");
    private final JTable signalTable = new JTable(signals) {
        private static final long serialVersionUID = 1L;

        @Override
        public String getToolTipText(MouseEvent e) {
            int row = rowAtPoint(e.getPoint());
            int col = columnAtPoint(e.getPoint());
            return row < 0 || col < 0 ? super.getToolTipText(e) : String.valueOf(getValueAt(row, col))
                    + "  (double-click: open the wafer(s) of this point)";
        }
    };
    private final List<ChartPanel> panels = new ArrayList<>();
    private List<StoreHistory.SignalRow> signalRows = List.of();
    private ResultsStore store;
    private String address;
    private StoreTrend.Outcome outcome;
    private JPopupMenu lastMenu;
    private StoreHistory.MapFile lastOpened;
    private int opening;
    private int charting;
    private SwingWorker<StoreTrend.Outcome, Void> chartWorker;
    /** The store read of {@link #chartWorker}, stopped by Cancel, a newer request or another store. */
    private StoreQuery chartQuery;
    private int running;
    private boolean filling;

    HistoryWindow(ViewerWindow owner) {
        // a window of its own (not owned by the viewer's): the viewer comes in front of it to show a clicked wafer
        super("History from a results store — trapmap");
        this.window = owner;
        setName("historyWindow");
        setDefaultCloseOperation(DISPOSE_ON_CLOSE);
        storeField.setName("historyStore");
        storeField.setToolTipText("A SQLite file written by 'trapmap inspect --store' (choose it or drop it here),"
                + " or postgresql://host[:port]/database (user and password from PGUSER/PGPASSWORD or ~/.pgpass);"
                + " Enter opens it");
        storeField.addActionListener(e -> openStore(storeField.getText()));
        JButton choose = new JButton("Choose…");
        choose.setToolTipText("Choose a SQLite results store file");
        choose.addActionListener(e -> chooseStore());
        JButton open = new JButton("Open");
        open.setName("historyOpen");
        open.addActionListener(e -> openStore(storeField.getText()));
        figure.setName("historyFigure");
        figure.setToolTipText("The figure charted, a column of results.csv");
        by.setName("historyBy");
        by.setToolTipText("none, lot, day (UTC), week (ISO): X-bar/R charts by subgroup; a sidecar fact (furnace_tube,"
                + " boat_slot, …): an individuals and moving-range chart per value, each with its own baseline");
        figure.addActionListener(e -> chartIfReady());
        by.addActionListener(e -> chartIfReady());
        ButtonGroup baseline = new ButtonGroup();
        baseline.add(firstN);
        baseline.add(before);
        count.setName("historyBaselineCount");
        // as wide as a count of wafers needs, not as its largest allowed value
        ((JSpinner.DefaultEditor) count.getEditor()).getTextField().setColumns(4);
        count.setToolTipText("The baseline: the first n wafers with a measured time and a value");
        until.setName("historyBaselineUntil");
        until.setToolTipText("The baseline: the wafers measured before this UTC date (2026-10-12) or time"
                + " (2026-10-12T06:00:00Z); Enter charts");
        firstN.addActionListener(e -> chartIfReady());
        before.addActionListener(e -> {
            if (!until.getText().isBlank()) {
                chartIfReady();
            } else {
                until.requestFocusInWindow();
            }
        });
        count.addChangeListener(e -> {
            if (firstN.isSelected()) {
                chartIfReady();
            }
        });
        until.addActionListener(e -> {
            before.setSelected(true);
            chartIfReady();
        });
        query(sinceField, "historySince", "Only wafers measured at or after this UTC date (2026-11-02) or time"
                + " (2026-11-02T08:00:00Z), as 'trapmap trend --since'; Enter charts");
        query(untilField, "historyUntil", "Only wafers measured on or before this UTC date (the whole day), or"
                + " before this time, as 'trapmap trend --until'; Enter charts");
        query(profileField, "historyProfile", "Only wafers judged by this rules profile, as 'trapmap trend"
                + " --profile'; Enter charts");
        query(lotsField, "historyLots", "Only wafers of these lots, separated by commas (L1, L2; a lot holding a"
                + " comma in double quotes: \"A,1\"), as 'trapmap trend --lot'; Enter charts");
        query(factsField, "historyFacts", "Only wafers whose sidecar facts have these values, NAME=VALUE separated"
                + " by commas (furnace_tube=T2, boat_slot=4; one holding a comma in double quotes:"
                + " \"recipe=B,2\"); all must hold, as 'trapmap trend --where'; Enter charts");
        cancel.setName("historyCancel");
        cancel.setToolTipText("Stop waiting for the chart being read; the charts shown stay");
        cancel.addActionListener(e -> cancelChart());
        cancel.setVisible(false);
        chartButton.setName("historyChart");
        chartButton.addActionListener(e -> chart());
        export.setName("historyExport");
        export.setToolTipText("Save the charts one below the other as one PNG (as 'trapmap trend -o trend.png')");
        export.addActionListener(e -> exportPng());
        export.setEnabled(false);
        progress.setName("historyProgress");
        progress.setIndeterminate(true);
        progress.setVisible(false);
        progress.setPreferredSize(new Dimension(120, progress.getPreferredSize().height));
        status.setName("historyStatus");
        caption.setName("historyCaption");

        JPanel storeRow = new JPanel(new WrapLayout(6, 2));
        storeRow.add(new JLabel("Store"));
        storeRow.add(storeField);
        storeRow.add(choose);
        storeRow.add(open);
        storeRow.add(progress);
        storeRow.add(cancel);
        storeRow.add(status);
        JPanel queryRow = new JPanel(new WrapLayout(6, 2));
        queryRow.add(new JLabel("Figure"));
        queryRow.add(figure);
        queryRow.add(new JLabel("  By"));
        queryRow.add(by);
        queryRow.add(new JLabel("  Baseline:"));
        queryRow.add(firstN);
        queryRow.add(count);
        queryRow.add(new JLabel("wafers"));
        queryRow.add(before);
        queryRow.add(until);
        queryRow.add(chartButton);
        queryRow.add(export);
        JPanel filterRow = new JPanel(new WrapLayout(6, 2));
        filterRow.add(new JLabel("Wafers measured since"));
        filterRow.add(sinceField);
        filterRow.add(new JLabel("until"));
        filterRow.add(untilField);
        filterRow.add(new JLabel("  profile"));
        filterRow.add(profileField);
        filterRow.add(new JLabel("  lots"));
        filterRow.add(lotsField);
        filterRow.add(new JLabel("  facts"));
        filterRow.add(factsField);
        JPanel top = new JPanel();
        top.setLayout(new javax.swing.BoxLayout(top, javax.swing.BoxLayout.Y_AXIS));
        top.add(storeRow);
        top.add(queryRow);
        top.add(filterRow);
        top.setBorder(BorderFactory.createEmptyBorder(4, 4, 2, 4));

        JScrollPane chartScroll = new JScrollPane(stack);
        chartScroll.getVerticalScrollBar().setUnitIncrement(24);
        JPanel left = new JPanel(new BorderLayout());
        caption.setBorder(BorderFactory.createEmptyBorder(2, 6, 2, 6));
        left.add(caption, BorderLayout.NORTH);
        left.add(chartScroll, BorderLayout.CENTER);
        signalTable.setName("historySignals");
        signalTable.setSelectionMode(ListSelectionModel.SINGLE_SELECTION);
        signalTable.setToolTipText("Run-rule signals (Western Electric 1956; 6 rising/falling: Nelson 1984);"
                + " double-click a row to open the wafer(s) of its point");
        signalTable.addMouseListener(new MouseAdapter() {
            @Override
            public void mouseClicked(MouseEvent e) {
                int row = signalTable.rowAtPoint(e.getPoint());
                if (e.getClickCount() == 2 && row >= 0 && row < signalRows.size() && outcome != null) {
                    StoreHistory.SignalRow s = signalRows.get(row);
                    Rectangle r = signalTable.getCellRect(row, 0, true);
                    openBehind(outcome.result().charts().get(s.chart()), s.point(), signalTable, r.x, r.y + r.height);
                }
            }
        });
        int[] widths = {130, 110, 50, 240, 95, 65};
        for (int c = 0; c < widths.length; c++) {
            signalTable.getColumnModel().getColumn(c).setPreferredWidth(widths[c]);
        }
        JTable yieldTable = new JTable(yields);
        yieldTable.setName("historyYield");
        JPanel signalPanel = titled("Signals", new JScrollPane(signalTable));
        JPanel yieldPanel = titled("Yield per group", new JScrollPane(yieldTable));
        JSplitPane right = new JSplitPane(JSplitPane.VERTICAL_SPLIT, signalPanel, yieldPanel);
        right.setResizeWeight(0.6);
        right.setPreferredSize(new Dimension(640, 600));
        JSplitPane split = new JSplitPane(JSplitPane.HORIZONTAL_SPLIT, left, right);
        split.setResizeWeight(0.6);
        getContentPane().add(top, BorderLayout.NORTH);
        // the rows wrap at the window's width: laid out again when it changes, they ask for their new height
        getContentPane().addComponentListener(new java.awt.event.ComponentAdapter() {
            @Override
            public void componentResized(java.awt.event.ComponentEvent e) {
                top.revalidate();
            }
        });
        getContentPane().add(split, BorderLayout.CENTER);
        JLabel hint = new JLabel("<html>Click a point to open its wafer's map in the viewer (a point of several"
                + " wafers offers them in a menu).<br>Caution: " + trapmap.maps.model.Caution.TEXT + "</html>");
        hint.setName("historyCaution");
        hint.setBorder(BorderFactory.createEmptyBorder(2, 6, 4, 6));
        hint.setForeground(Color.DARK_GRAY);
        getContentPane().add(hint, BorderLayout.SOUTH);

        TransferHandler drop = new StoreDrop();
        getRootPane().setTransferHandler(drop);
        storeField.setTransferHandler(drop);
        stack.setTransferHandler(drop);
        getRootPane().registerKeyboardAction(e -> dispose(), KeyStroke.getKeyStroke("ctrl W"),
                JComponent.WHEN_IN_FOCUSED_WINDOW);
        // the menu's Ctrl+H pressed here again brings this window forward; in a text field it is not a backspace
        KeyStroke again = KeyStroke.getKeyStroke(java.awt.event.KeyEvent.VK_H, WindowMenus.MENU);
        for (JTextField f : new JTextField[] {storeField, until, sinceField, untilField, profileField, lotsField,
                factsField}) {
            f.getInputMap(JComponent.WHEN_FOCUSED).put(again, "none");
        }
        getRootPane().registerKeyboardAction(e -> toFront(), again, JComponent.WHEN_IN_FOCUSED_WINDOW);
        addWindowListener(new WindowAdapter() {
            @Override
            public void windowClosed(WindowEvent e) {
                closeStore();
            }
        });
        owner.addWindowListener(new WindowAdapter() {
            @Override
            public void windowClosed(WindowEvent e) {
                dispose(); // the viewer closed: its history window goes with it
            }
        });
        setQueryEnabled(false);
        setPreferredSize(new Dimension(Math.max(1300, owner.getWidth()), Math.max(880, owner.getHeight())));
        pack();
        setLocationRelativeTo(owner);
        ScreenFit.fit(this);
        showStatus("choose a results store: a SQLite file (drop it here) or postgresql://host/database", false);
    }

    private void query(JTextField f, String name, String tip) {
        f.setName(name);
        f.setToolTipText(tip);
        f.addActionListener(e -> chartIfReady());
    }

    private static JPanel titled(String title, JComponent body) {
        JPanel p = new JPanel(new BorderLayout());
        JLabel l = new JLabel(title);
        l.setBorder(BorderFactory.createEmptyBorder(4, 6, 2, 6));
        p.add(l, BorderLayout.NORTH);
        p.add(body, BorderLayout.CENTER);
        return p;
    }

    private static DefaultTableModel readOnly(String... columns) {
        return new DefaultTableModel(columns, 0) {
            private static final long serialVersionUID = 1L;

            @Override
            public boolean isCellEditable(int row, int column) {
                return false;
            }
        };
    }

    // ---- store ----------------------------------------------------------------------------------------------

    private void chooseStore() {
        JFileChooser fc = new JFileChooser(address == null || address.contains("://") ? new File(".")
                : new File(address).getParentFile());
        fc.setFileFilter(new FileNameExtensionFilter("Results stores (.db, .sqlite, .sqlite3)", "db", "sqlite",
                "sqlite3"));
        fc.setAcceptAllFileFilterUsed(true);
        if (fc.showOpenDialog(this) == JFileChooser.APPROVE_OPTION) {
            openStore(fc.getSelectedFile().toString());
        }
    }

    /** Opens the store {@code typed} in the background, fills the figure and grouping choices, then charts. */
    void openStore(String typed) {
        storeField.setText(typed);
        String a;
        try {
            a = StoreHistory.address(typed);
        } catch (InvalidValueException e) {
            showStatus(e.getMessage(), true);
            return;
        }
        int g = ++opening;
        busy(true, "opening " + a + " …");
        new SwingWorker<ResultsStore, Void>() {
            private StoreHistory.Choices choices;

            @Override
            protected ResultsStore doInBackground() {
                ResultsStore s = ResultsStore.open(a);
                try {
                    choices = StoreHistory.choices(s);
                } catch (RuntimeException e) {
                    s.close();
                    throw e;
                }
                return s;
            }

            @Override
            protected void done() {
                busy(false, null);
                ResultsStore opened;
                try {
                    opened = get();
                } catch (InterruptedException | ExecutionException e) {
                    if (g == opening) {
                        failed("store not opened", e);
                    }
                    return;
                }
                if (g != opening) {
                    closeLater(opened); // another store was asked for meanwhile
                    return;
                }
                closeStore();
                store = opened;
                address = a;
                fill(choices);
                if (choices.figure() == null) {
                    showStatus("store " + a + " holds no wafer yet", true);
                    return;
                }
                chart();
            }
        }.execute();
    }

    private void fill(StoreHistory.Choices c) {
        filling = true;
        try {
            String oldBy = (String) by.getSelectedItem();
            figure.removeAllItems();
            c.figures().forEach(figure::addItem);
            figure.setSelectedItem(c.figure());
            by.removeAllItems();
            c.groupings().forEach(by::addItem);
            by.setSelectedItem(oldBy != null && c.groupings().contains(oldBy) ? oldBy : "lot");
        } finally {
            filling = false;
        }
        setQueryEnabled(c.figure() != null);
    }

    private void closeStore() {
        dropChart(); // its read is of this store, whose close would wait for it
        if (store != null) {
            closeLater(store);
            store = null;
        }
    }

    /** Closes {@code s} off the event thread: a query of it may still run, and closing waits for it. */
    private static void closeLater(ResultsStore s) {
        Thread t = new Thread(() -> {
            try {
                s.close();
            } catch (StoreException e) {
                // a store that was only read: nothing is lost
            }
        }, "trapmap-store-close");
        t.setDaemon(true);
        t.start();
    }

    // ---- chart ----------------------------------------------------------------------------------------------

    private void chartIfReady() {
        if (!filling && store != null && figure.getSelectedItem() != null) {
            chart();
        }
    }

    /** Reads the trend of the chosen figure, grouping and baseline in the background and shows it. */
    void chart() {
        if (store == null) {
            openStore(storeField.getText());
            return;
        }
        StoreTrend.Request request;
        try {
            Baseline b = StoreHistory.baseline((Integer) count.getValue(), before.isSelected() ? until.getText()
                    : null);
            StoreFilter f = StoreHistory.filter(sinceField.getText(), untilField.getText(), profileField.getText(),
                    lotsField.getText(), factsField.getText());
            request = new StoreTrend.Request((String) figure.getSelectedItem(), (String) by.getSelectedItem(), f, b);
        } catch (InvalidValueException e) {
            showStatus(e.getMessage(), true);
            JTextField bad = switch (e.field()) {
                case "since" -> sinceField;
                case "until" -> untilField;
                case "lot" -> lotsField;
                case "where" -> factsField;
                default -> until;
            };
            bad.requestFocusInWindow();
            return;
        }
        ResultsStore s = store;
        int g = ++charting;
        if (chartWorker != null) {
            chartWorker.cancel(false); // replaced by this request (not interrupted: the store stays usable)
        }
        stopQuery(); // its read stops, so this one does not wait behind it for the store
        StoreQuery q = new StoreQuery();
        chartQuery = q;
        busy(true, "reading " + request.figure() + " by " + request.by() + " …");
        cancel.setVisible(true);
        chartWorker = new SwingWorker<StoreTrend.Outcome, Void>() {
            @Override
            protected StoreTrend.Outcome doInBackground() {
                return StoreTrend.analyse(s, request, q);
            }

            @Override
            protected void done() {
                busy(false, null);
                if (g != charting) {
                    return; // a newer request (or another store), or Cancel, replaces this one
                }
                chartWorker = null;
                chartQuery = null;
                cancel.setVisible(false);
                try {
                    show(get());
                } catch (InterruptedException | ExecutionException e) {
                    clear();
                    failed("no chart", e);
                }
            }
        };
        chartWorker.execute();
    }

    /**
     * Stops the chart being read: its store read is cancelled (the store only read, so nothing is left half done),
     * its answer dropped, the charts shown stay, and a new request may follow at once.
     */
    void cancelChart() {
        if (chartWorker == null) {
            return;
        }
        dropChart();
        showStatus("chart request cancelled" + (outcome == null ? "" : "; the charts shown are the last ones read"),
                false);
    }

    /** Drops the chart request running, if any: its answer is not shown, its read is cancelled. */
    private void dropChart() {
        if (chartWorker != null) {
            ++charting;
            chartWorker.cancel(false); // done() follows at once; the read ends with the cancel
            chartWorker = null;
            cancel.setVisible(false);
        }
        stopQuery();
    }

    /**
     * Cancels the running chart read, if any, off the event thread (a PostgreSQL cancel asks the server over the
     * network).
     */
    private void stopQuery() {
        StoreQuery q = chartQuery;
        chartQuery = null;
        if (q != null) {
            Thread t = new Thread(q::cancel, "trapmap-store-cancel");
            t.setDaemon(true);
            t.start();
        }
    }

    /** The running chart read (tests). */
    StoreQuery chartQuery() {
        return chartQuery;
    }

    private void show(StoreTrend.Outcome o) {
        outcome = o;
        TrendResult r = o.result();
        String figureName = o.request().figure();
        String unit = TrendReport.unitOf(figureName);
        List<JFreeChart> charts = TrendReport.charts(r, new TrendReport.Caption(figureName, ""));
        stack.removeAll();
        panels.clear();
        List<ControlChart> control = r.charts();
        for (int i = 0; i < charts.size(); i++) {
            JFreeChart chart = charts.get(i);
            ChartPanel panel = new ChartPanel(chart, false);
            panel.setMinimumDrawWidth(200);
            panel.setMinimumDrawHeight(150);
            panel.setMaximumDrawWidth(4000);
            panel.setMaximumDrawHeight(4000);
            panel.setPreferredSize(new Dimension(800, CHART_HEIGHT));
            panel.setName("historyChart" + i);
            if (i < control.size()) {
                ControlChart c = control.get(i);
                XYPlot plot = chart.getXYPlot();
                plot.getRenderer().setDefaultToolTipGenerator((dataset, series, item) -> {
                    int point = pointOf(c, series, item);
                    if (point < 0) {
                        return null;
                    }
                    List<StoredPoint> behind = o.wafersBehind(c, point);
                    StringBuilder t = new StringBuilder("<html>" + c.points().get(point).label() + ": "
                            + Labels.compact(c.points().get(point).value()) + (unit.isEmpty() ? "" : " " + unit));
                    for (StoredPoint w : behind.subList(0, Math.min(8, behind.size()))) {
                        t.append("<br>").append(StoreHistory.label(w, unit));
                    }
                    return t.append(behind.size() > 8 ? "<br>…" : "").append("<br><i>click to open</i></html>")
                            .toString();
                });
                panel.addChartMouseListener(new ChartMouseListener() {
                    @Override
                    public void chartMouseClicked(ChartMouseEvent e) {
                        clicked(c, e.getEntity(), panel, e.getTrigger());
                    }

                    @Override
                    public void chartMouseMoved(ChartMouseEvent e) {
                    }
                });
            }
            panels.add(panel);
            stack.add(panel);
        }
        stack.revalidate();
        stack.repaint();
        signalRows = StoreHistory.signals(r);
        signals.setRowCount(0);
        for (StoreHistory.SignalRow s : signalRows) {
            signals.addRow(new Object[] {TIME.format(s.time()), s.title(), s.group(), (s.upward() ? "↑ " : "↓ ")
                    + s.rule(), Labels.compact(s.value()), s.inBaseline() ? "in" : "after"});
        }
        signalTable.getColumnModel().getColumn(4).setHeaderValue(unit.isEmpty() ? "value" : "value (" + unit + ")");
        signalTable.getTableHeader().repaint();
        yields.setRowCount(0);
        for (GroupYield y : r.yields()) {
            yields.addRow(new Object[] {y.group(), y.wafers(), y.passed(), String.format(Locale.ROOT, "%.1f",
                    100 * y.yield())});
        }
        caption.setText("<html><b>" + figureName + (unit.isEmpty() ? "" : " (" + unit + ")") + "</b> — "
                + o.describe().replace("&", "&amp;").replace("<", "&lt;") + "</html>");
        export.setEnabled(true);
        long late = o.lateSignals();
        showStatus(r.wafers() + " wafers; " + late + " signal(s) after the baseline", false);
    }

    private void clear() {
        outcome = null;
        stack.removeAll();
        panels.clear();
        stack.revalidate();
        stack.repaint();
        signalRows = List.of();
        signals.setRowCount(0);
        yields.setRowCount(0);
        caption.setText(" ");
        export.setEnabled(false);
    }

    /** The point of {@code c} an item of the chart's dataset stands for, -1 for the lines. */
    private static int pointOf(ControlChart c, int series, int item) {
        if (series == TrendReport.VALUES_SERIES) {
            return item;
        }
        if (series == TrendReport.SIGNALS_SERIES && item < c.signals().size()) {
            return c.signals().get(item).index();
        }
        return -1;
    }

    private void clicked(ControlChart c, ChartEntity entity, JComponent where, MouseEvent trigger) {
        if (!(entity instanceof XYItemEntity xe) || outcome == null) {
            return;
        }
        int point = pointOf(c, xe.getSeriesIndex(), xe.getItem());
        if (point >= 0) {
            openBehind(c, point, where, trigger.getX(), trigger.getY());
        }
    }

    /** Opens the one wafer behind a point, or offers the wafers behind it in a menu at ({@code x}, {@code y}). */
    private void openBehind(ControlChart c, int point, JComponent where, int x, int y) {
        List<StoredPoint> behind = outcome.wafersBehind(c, point);
        String unit = TrendReport.unitOf(outcome.request().figure());
        if (behind.size() == 1) {
            openWafer(behind.get(0));
            return;
        }
        JPopupMenu menu = new JPopupMenu();
        menu.setName("historyWafers");
        JLabel head = new JLabel(" " + c.title() + ", " + c.points().get(point).label() + ": " + behind.size()
                + " wafers");
        head.setFont(head.getFont().deriveFont(java.awt.Font.BOLD));
        menu.add(head);
        menu.addSeparator();
        for (StoredPoint w : behind) {
            JMenuItem item = new JMenuItem(StoreHistory.label(w, unit));
            item.addActionListener(e -> openWafer(w));
            menu.add(item);
        }
        lastMenu = menu;
        menu.show(where, x, y);
    }

    private void openWafer(StoredPoint w) {
        StoreHistory.MapFile f = StoreHistory.mapFile(w, address);
        lastOpened = f;
        if (!f.found()) {
            showStatus(f.problem(), true);
            window.statusBar().setMessage(f.problem());
            return;
        }
        showStatus("opening " + w.waferId() + " (" + f.path() + ") in the viewer", false);
        window.openAndShow(f.path());
    }

    // ---- export ---------------------------------------------------------------------------------------------

    private void exportPng() {
        if (outcome == null) {
            return;
        }
        JFileChooser fc = new JFileChooser(address == null || address.contains("://") ? new File(".")
                : new File(address).getParentFile());
        fc.setSelectedFile(new File("trend-" + outcome.request().figure() + ".png"));
        fc.setFileFilter(new FileNameExtensionFilter("PNG pictures (.png)", "png"));
        if (fc.showSaveDialog(this) != JFileChooser.APPROVE_OPTION) {
            return;
        }
        Path out = fc.getSelectedFile().toPath();
        if (!TrendReport.extension(out).equals("png")) {
            out = out.resolveSibling(out.getFileName() + ".png");
        }
        exportPng(out);
    }

    /** Writes the charts shown as one PNG, as {@code trapmap trend -o FILE.png} draws them. */
    void exportPng(Path out) {
        try {
            TrendReport.writePng(out, outcome.result(), new TrendReport.Caption(outcome.request().figure(),
                    "store " + address + "; " + outcome.describe()));
            showStatus("written: " + out, false);
        } catch (IOException | RuntimeException e) {
            showStatus("PNG not written: " + out + ": " + e.getMessage(), true);
        }
    }

    // ---- state ----------------------------------------------------------------------------------------------

    private void busy(boolean on, String what) {
        running += on ? 1 : -1;
        progress.setVisible(running > 0);
        if (on) {
            showStatus(what, false);
        }
    }

    private void failed(String what, Exception e) {
        Throwable t = e instanceof ExecutionException && e.getCause() != null ? e.getCause() : e;
        String msg = t.getMessage() == null ? t.toString() : t.getMessage();
        boolean known = t instanceof StoreException || t instanceof InvalidValueException;
        showStatus(known ? msg : what + ": " + msg, true);
    }

    private void showStatus(String text, boolean error) {
        status.setText(text);
        status.setToolTipText(text);
        status.setForeground(error ? ERROR : Color.DARK_GRAY);
    }

    private void setQueryEnabled(boolean on) {
        for (JComponent c : new JComponent[] {figure, by, firstN, count, before, until, sinceField, untilField,
                profileField, lotsField, factsField, chartButton}) {
            c.setEnabled(on);
        }
    }

    /** Nothing is being read. */
    boolean idle() {
        return running == 0;
    }

    /** The trend shown, or null. */
    StoreTrend.Outcome outcome() {
        return outcome;
    }

    /** The chart panels shown, in {@link TrendReport#charts} order. */
    List<ChartPanel> chartPanels() {
        return List.copyOf(panels);
    }

    /** The status line. */
    String statusText() {
        return status.getText();
    }

    /** Whether the status line tells an error. */
    boolean statusIsError() {
        return ERROR.equals(status.getForeground());
    }

    /** The last menu of wafers shown, or null. */
    JPopupMenu lastMenu() {
        return lastMenu;
    }

    /** The last wafer asked to be opened, found or not; null before. */
    StoreHistory.MapFile lastOpened() {
        return lastOpened;
    }

    /** The charts stacked one below the other, as wide as the view. */
    private static final class ChartStack extends JPanel implements Scrollable {
        private static final long serialVersionUID = 1L;

        ChartStack() {
            super(new GridLayout(0, 1, 0, 6));
            setBackground(Color.WHITE);
        }

        @Override
        public Dimension getPreferredScrollableViewportSize() {
            return new Dimension(700, 2 * CHART_HEIGHT);
        }

        @Override
        public int getScrollableUnitIncrement(Rectangle visible, int orientation, int direction) {
            return 24;
        }

        @Override
        public int getScrollableBlockIncrement(Rectangle visible, int orientation, int direction) {
            return orientation == SwingConstants.VERTICAL ? CHART_HEIGHT : visible.width;
        }

        @Override
        public boolean getScrollableTracksViewportWidth() {
            return true;
        }

        @Override
        public boolean getScrollableTracksViewportHeight() {
            return false;
        }
    }

    /** A SQLite store file dropped on the window opens it. */
    private final class StoreDrop extends TransferHandler {
        private static final long serialVersionUID = 1L;

        @Override
        public boolean canImport(TransferSupport s) {
            return s.isDataFlavorSupported(DataFlavor.javaFileListFlavor)
                    || s.isDataFlavorSupported(DataFlavor.stringFlavor);
        }

        @Override
        public boolean importData(TransferSupport s) {
            try {
                if (s.isDataFlavorSupported(DataFlavor.javaFileListFlavor)) {
                    @SuppressWarnings("unchecked")
                    List<File> files = (List<File>) s.getTransferable().getTransferData(
                            DataFlavor.javaFileListFlavor);
                    if (files.size() != 1) {
                        showStatus("drop one results store file (" + files.size() + " were dropped)", true);
                        return false;
                    }
                    openStore(files.get(0).toString());
                    return true;
                }
                String text = (String) s.getTransferable().getTransferData(DataFlavor.stringFlavor);
                openStore(text.trim());
                return true;
            } catch (Exception e) {
                showStatus("drop not understood: " + e.getMessage(), true);
                return false;
            }
        }
    }
}
