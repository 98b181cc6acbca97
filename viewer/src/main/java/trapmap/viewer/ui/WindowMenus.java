package trapmap.viewer.ui;

import java.awt.Component;
import java.awt.KeyboardFocusManager;
import java.awt.Toolkit;
import java.awt.event.ActionEvent;
import java.awt.event.InputEvent;
import java.awt.event.KeyEvent;
import java.util.Locale;
import java.util.function.Consumer;
import javax.swing.AbstractAction;
import javax.swing.Action;
import javax.swing.ButtonGroup;
import javax.swing.JCheckBoxMenuItem;
import javax.swing.JComponent;
import javax.swing.JMenu;
import javax.swing.JMenuBar;
import javax.swing.JMenuItem;
import javax.swing.JOptionPane;
import javax.swing.JRadioButtonMenuItem;
import javax.swing.KeyStroke;
import javax.swing.event.MenuEvent;
import javax.swing.event.MenuListener;
import javax.swing.text.JTextComponent;
import trapmap.maps.io.ColourMap;
import trapmap.viewer.ui.canvas.MapCanvas;
import trapmap.viewer.model.DisplayedQuantity;
import trapmap.viewer.model.FlagOverlay;
import trapmap.viewer.model.ViewerModel;

/** The window's menu bar, its keyboard shortcuts, and the about and shortcut dialogs. */
final class WindowMenus {
    static final int MENU = Toolkit.getDefaultToolkit().getMenuShortcutKeyMaskEx();

    private final ViewerWindow window;
    private final ViewerModel model;
    private final MapCanvas canvas;
    private final SessionController sessions;
    private final ExportController exports;
    private final Action undo;
    private final Action redo;
    private final JCheckBoxMenuItem lineTool;
    private final JCheckBoxMenuItem logScale;

    WindowMenus(ViewerWindow window, ViewerModel model, MapCanvas canvas, SessionController sessions,
                ExportController exports, Action undo, Action redo, JCheckBoxMenuItem lineTool,
                JCheckBoxMenuItem logScale) {
        this.window = window;
        this.model = model;
        this.canvas = canvas;
        this.sessions = sessions;
        this.exports = exports;
        this.undo = undo;
        this.redo = redo;
        this.lineTool = lineTool;
        this.logScale = logScale;
    }

    static Action action(String name, KeyStroke key, Consumer<ActionEvent> body) {
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

    /**
     * View ▸ Flagged pixels: outline, fill or off (O cycles them), and the opacity; the choice is kept in the
     * preferences by the window.
     */
    private JMenu flagOverlayMenu() {
        JMenu m = new JMenu("Flagged pixels");
        m.setToolTipText("How flagged pixels are drawn over the map");
        ButtonGroup modes = new ButtonGroup();
        java.util.Map<FlagOverlay.Mode, JRadioButtonMenuItem> modeItems = new java.util.EnumMap<>(
                FlagOverlay.Mode.class);
        for (FlagOverlay.Mode mode : FlagOverlay.Mode.values()) {
            JRadioButtonMenuItem r = new JRadioButtonMenuItem(mode.label());
            r.setToolTipText(switch (mode) {
                case OUTLINE -> "Draw the edge of the flagged regions; the data inside stays visible";
                case FILL -> "Cover the flagged pixels with a translucent fill";
                case OFF -> "Do not mark flagged pixels on the map";
            });
            r.addActionListener(e -> window.setFlagOverlay(canvas.flagOverlay().withMode(mode)));
            modes.add(r);
            m.add(r);
            modeItems.put(mode, r);
        }
        m.add(item(plainKey("Next overlay mode", KeyStroke.getKeyStroke(KeyEvent.VK_O, 0),
                () -> window.setFlagOverlay(canvas.flagOverlay().next())), "Outline → fill → off (O)"));
        m.addSeparator();
        JMenu opacity = new JMenu("Opacity");
        ButtonGroup opacities = new ButtonGroup();
        java.util.Map<Double, JRadioButtonMenuItem> opacityItems = new java.util.HashMap<>();
        for (double o : FlagOverlay.OPACITIES) {
            JRadioButtonMenuItem r = new JRadioButtonMenuItem(Math.round(100 * o) + " %");
            r.addActionListener(e -> window.setFlagOverlay(canvas.flagOverlay().withOpacity(o)));
            opacities.add(r);
            opacity.add(r);
            opacityItems.put(o, r);
        }
        m.add(opacity);
        m.addMenuListener(new MenuListener() {
            @Override
            public void menuSelected(MenuEvent e) {
                FlagOverlay now = canvas.flagOverlay();
                modeItems.get(now.mode()).setSelected(true);
                JRadioButtonMenuItem o = opacityItems.get(now.opacity());
                if (o != null) {
                    o.setSelected(true);
                } else {
                    opacities.clearSelection();
                }
            }

            @Override
            public void menuDeselected(MenuEvent e) {
            }

            @Override
            public void menuCanceled(MenuEvent e) {
            }
        });
        return m;
    }

    JMenuBar menus() {
        JMenuBar bar = new JMenuBar();
        JMenu file = new JMenu("File");
        file.setMnemonic('F');
        file.add(item(action("Open…", KeyStroke.getKeyStroke(KeyEvent.VK_O, MENU), e -> sessions.chooseAndOpen()),
                "Open lifetime or PL maps (.tif, .tiff, .csv) or folders of them"));
        JMenu recentMenu = new JMenu("Open recent");
        recentMenu.addMenuListener(new MenuListener() {
            @Override
            public void menuSelected(MenuEvent e) {
                sessions.fillRecent(recentMenu);
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
        file.add(item(action("Open session…", null, e -> sessions.openSession()), "Restore files, conditions, defect,"
                + " thresholds, display and views from a session file"));
        file.add(item(action("Save session", KeyStroke.getKeyStroke(KeyEvent.VK_S, MENU), e -> sessions.saveSession(false)),
                "Save files, conditions, defect, thresholds, display and views as readable JSON"));
        file.add(item(action("Save session as…", KeyStroke.getKeyStroke(KeyEvent.VK_S, MENU
                | InputEvent.SHIFT_DOWN_MASK), e -> sessions.saveSession(true)), "Save the session under a new name"));
        file.addSeparator();
        file.add(item(action("Load rules…", KeyStroke.getKeyStroke(KeyEvent.VK_R, MENU), e -> sessions.chooseRules()),
                "Judge every open wafer by a rules file (as trapmap inspect does): profile, defect, verdict, grade"));
        file.add(item(action("Use quick threshold check", null, e -> sessions.useQuickCheck()),
                "Drop the rules file: the threshold panel's own rule judges the wafers (not a rules verdict)"));
        file.add(item(action("Load physics settings…", null, e -> sessions.choosePhysics()),
                "Convert every wafer with a physics settings file (as --physics does; replaces the rules file's block)"));
        file.add(item(action("Use default physics settings", null, e -> sessions.usePhysics(null)),
                "Convert with the rules file's physics block, else the default models"));
        file.addSeparator();
        file.add(item(action("Export view PNG…", KeyStroke.getKeyStroke(KeyEvent.VK_E, MENU), e -> exports.exportView()),
                "Save the map view as shown (with flags and line) as a PNG picture"));
        file.add(item(action("Export chart PNG…", null, e -> exports.exportChart()), "Save the chart of the open tab as PNG"));
        file.add(item(action("Export map TIFF/CSV…", null, e -> exports.exportMap()),
                "Save the shown (converted) map: TIFF with its metadata and history, or CSV x_mm,y_mm,value"));
        file.add(item(action("Export statistics CSV…", null, e -> exports.exportStatistics()),
                "Save the statistics of the shown wafer with its verdict and judged figures as CSV"));
        file.add(item(action("Export regions CSV…", null, e -> exports.exportRegions()),
                "Save the flagged regions of the shown wafer: id, area mm², centroid mm, peak, mean"));
        file.add(item(action("Wafer report PDF…", KeyStroke.getKeyStroke(KeyEvent.VK_P, MENU), e -> exports.report()),
                "One-page PDF of the shown wafer: map, figures, regions, conditions, caution"));
        file.addSeparator();
        file.add(item(action("Quit", KeyStroke.getKeyStroke(KeyEvent.VK_Q, MENU), e -> window.dispose()), "Close trapmap"));
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
        view.add(flagOverlayMenu());
        logScale.addActionListener(e -> model.setAnalysis(model.analysis().withDisplay(model.analysis().display()
                .withLogarithmic(logScale.isSelected())), "log scale"));
        logScale.setToolTipText("Logarithmic colour scale");
        view.add(logScale);
        view.addSeparator();
        view.add(item(action("Next wafer", KeyStroke.getKeyStroke(KeyEvent.VK_PAGE_DOWN, 0), e -> model.next()),
                "Show the next open wafer (PageDown or Alt+→)"));
        view.add(item(action("Previous wafer", KeyStroke.getKeyStroke(KeyEvent.VK_PAGE_UP, 0), e -> model.previous()),
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
            window.statusBar().setMessage(lineTool.isSelected() ? "line tool: drag on the map to draw a profile line"
                    : "line tool off");
        });
        view.add(lineTool);
        bar.add(view);

        JMenu analysis = new JMenu("Analysis");
        analysis.setMnemonic('A');
        analysis.add(item(action("Compare…", KeyStroke.getKeyStroke(KeyEvent.VK_K, MENU), e -> window.compare(false)),
                "Two maps side by side, linked, with a difference or ratio map after registration"));
        analysis.add(item(action("Iron imaging…", KeyStroke.getKeyStroke(KeyEvent.VK_I, MENU), e -> window.compare(true)),
                "Interstitial iron from a pair of maps before and after FeB-pair dissociation"));
        analysis.add(item(action("Identify defect from injection levels…", KeyStroke.getKeyStroke(KeyEvent.VK_D,
                MENU), e -> window.identify()), "Rank the library defects per pixel and region from maps of one wafer"
                + " at several injection levels, with the lifetime fits and the DPSS"));
        analysis.add(item(action("History from a results store…", KeyStroke.getKeyStroke(KeyEvent.VK_H, MENU),
                e -> window.history(null)), "Control charts of a figure over the wafers of a results store (as"
                + " trapmap trend), with the signals and the yield; click a point to open its wafer's map"));
        analysis.addSeparator();
        analysis.add(item(action("Exceedance settings…", KeyStroke.getKeyStroke(KeyEvent.VK_U, MENU),
                e -> window.editExceedance()), "Threshold N* (cm⁻³), samples, seed and the uncertainties of the"
                + " probability of exceeding N*"));
        analysis.addSeparator();
        analysis.add(item(action("Override defect for this wafer…", null, e -> sessions.chooseDefectOverride(false)),
                "Convert and judge the shown wafer with another defect than its rules profile's"));
        analysis.add(item(action("Override defect for all wafers…", null, e -> sessions.chooseDefectOverride(true)),
                "Convert and judge every wafer with one defect instead of each rules profile's"));
        analysis.add(item(action("Clear defect overrides", null, e -> sessions.clearDefectOverrides()),
                "Each wafer judged with its rules profile's defect again"));
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

    void keys() {
        JComponent root = window.getRootPane();
        bind(root, KeyStroke.getKeyStroke(KeyEvent.VK_EQUALS, 0), plainKey("zoom in", null, () -> canvas.zoomBy(1.25)));
        bind(root, KeyStroke.getKeyStroke(KeyEvent.VK_ADD, 0), plainKey("zoom in", null, () -> canvas.zoomBy(1.25)));
        bind(root, KeyStroke.getKeyStroke(KeyEvent.VK_PLUS, InputEvent.SHIFT_DOWN_MASK),
                plainKey("zoom in", null, () -> canvas.zoomBy(1.25)));
        bind(root, KeyStroke.getKeyStroke(KeyEvent.VK_EQUALS, InputEvent.SHIFT_DOWN_MASK),
                plainKey("zoom in", null, () -> canvas.zoomBy(1.25)));
        bind(root, KeyStroke.getKeyStroke(KeyEvent.VK_SUBTRACT, 0), plainKey("zoom out", null,
                () -> canvas.zoomBy(0.8)));
        bind(root, KeyStroke.getKeyStroke(KeyEvent.VK_NUMPAD0, 0), plainKey("fit", null, canvas::fit));
        // PageDown / PageUp and Alt+→ / Alt+← go to the next / previous wafer whichever component has the focus
        WaferKeys.install(window, model);
        bind(root, KeyStroke.getKeyStroke(KeyEvent.VK_ESCAPE, 0), action("cancel", null, e -> window.cancelAnalysis()));
    }

    private static void bind(JComponent c, KeyStroke k, Action a) {
        String id = "trapmap." + k;
        c.getInputMap(JComponent.WHEN_IN_FOCUSED_WINDOW).put(k, id);
        c.getActionMap().put(id, a);
    }


    void about() {
        JOptionPane.showMessageDialog(window, AboutText.html(), "About trapmap", JOptionPane.INFORMATION_MESSAGE);
    }

    void shortcuts() {
        JOptionPane.showMessageDialog(window, "<html><table>"
                + "<tr><td>Ctrl+O</td><td>open maps or folders</td></tr>"
                + "<tr><td>Ctrl+S</td><td>save session</td></tr>"
                + "<tr><td>Ctrl+E</td><td>export view PNG</td></tr>"
                + "<tr><td>Ctrl+P</td><td>wafer report PDF</td></tr>"
                + "<tr><td>Ctrl+Z / Ctrl+Y</td><td>undo / redo</td></tr>"
                + "<tr><td>+ / − / 0</td><td>zoom in / out / fit</td></tr>"
                + "<tr><td>PageDown / PageUp, Alt+→ / Alt+←</td><td>next / previous wafer</td></tr>"
                + "<tr><td>L</td><td>line tool</td></tr>"
                + "<tr><td>Ctrl+K / Ctrl+I</td><td>compare / iron imaging</td></tr>"
                + "<tr><td>Ctrl+D</td><td>identify the defect from injection levels</td></tr>"
                + "<tr><td>Ctrl+H</td><td>history from a results store: control charts, signals, yield</td></tr>"
                + "<tr><td>Ctrl+U</td><td>exceedance settings (N*, samples, uncertainties)</td></tr>"
                + "<tr><td>Esc</td><td>cancel the running analysis</td></tr>"
                + "</table></html>", "Keyboard shortcuts", JOptionPane.INFORMATION_MESSAGE);
    }
}
