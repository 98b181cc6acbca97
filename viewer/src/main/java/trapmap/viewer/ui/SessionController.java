package trapmap.viewer.ui;

import java.io.File;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import javax.swing.JFileChooser;
import javax.swing.JMenu;
import javax.swing.JMenuItem;
import javax.swing.JOptionPane;
import javax.swing.SwingWorker;
import javax.swing.filechooser.FileNameExtensionFilter;
import trapmap.maps.batch.RulesException;
import trapmap.physics.defect.Defect;
import trapmap.viewer.model.LoadedRules;
import trapmap.viewer.model.RecentFiles;
import trapmap.viewer.model.Session;
import trapmap.viewer.model.SessionFiles;
import trapmap.viewer.model.ViewerModel;
import trapmap.viewer.ui.panels.StatusBar;

/**
 * The window's files: opening maps and folders (dialog, recent list, drops), and opening and saving sessions. Reading
 * runs in the background; the model does the work.
 */
final class SessionController {
    private final ViewerWindow window;
    private final ViewerModel model;
    private final RecentFiles recent;
    private final StatusBar status;
    private Path sessionFile;

    SessionController(ViewerWindow window, ViewerModel model, RecentFiles recent, StatusBar status) {
        this.window = window;
        this.model = model;
        this.recent = recent;
        this.status = status;
    }

    /** Opens files or folders in the background; the first becomes a recent entry. */
    void open(List<Path> paths) {
        open(paths, null);
    }

    /** As {@link #open(List)}, then runs {@code then} on the event thread when the files are read (null: nothing). */
    void open(List<Path> paths, Runnable then) {
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
                        JOptionPane.showMessageDialog(window, String.join("\n", o.errors().subList(0,
                                Math.min(10, o.errors().size()))), "Some files were not opened",
                                JOptionPane.WARNING_MESSAGE);
                    } else {
                        status.setMessage("opened " + o.added() + " map(s)");
                    }
                } catch (Exception e) {
                    window.error("Opening failed", e);
                }
                if (then != null) {
                    then.run();
                }
            }
        }.execute();
    }

    void chooseAndOpen() {
        JFileChooser fc = chooser();
        fc.setFileSelectionMode(JFileChooser.FILES_AND_DIRECTORIES);
        fc.setMultiSelectionEnabled(true);
        fc.setFileFilter(new FileNameExtensionFilter("Maps (.tif, .tiff, .csv)", "tif", "tiff", "csv"));
        if (fc.showOpenDialog(window) == JFileChooser.APPROVE_OPTION) {
            List<Path> paths = new ArrayList<>();
            for (File f : fc.getSelectedFiles()) {
                paths.add(f.toPath());
            }
            open(paths);
        }
    }

    JFileChooser chooser() {
        ViewerModel.OpenWafer w = model.selected();
        return new JFileChooser(w == null ? new File(".") : w.path().getParent().toFile());
    }

    void fillRecent(JMenu menu) {
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

    void openSession() {
        JFileChooser fc = chooser();
        fc.setFileFilter(new FileNameExtensionFilter("trapmap sessions (.json)", "json"));
        if (fc.showOpenDialog(window) != JFileChooser.APPROVE_OPTION) {
            return;
        }
        Path f = fc.getSelectedFile().toPath();
        loadSession(f);
    }

    /** Restores a session file in the background. */
    void loadSession(Path f) {
        new SwingWorker<ViewerModel.OpenOutcome, Void>() {
            @Override
            protected ViewerModel.OpenOutcome doInBackground() throws IOException {
                return SessionFiles.open(f, model);
            }

            @Override
            protected void done() {
                try {
                    ViewerModel.OpenOutcome o = get();
                    sessionFile = f;
                    status.setMessage("session " + f.getFileName() + " restored" + (o.errors().isEmpty() ? ""
                            : "; " + o.errors().size() + " file(s) missing: " + o.errors().get(0)));
                } catch (Exception e) {
                    window.error("Session not opened", e);
                }
            }
        }.execute();
    }

    void saveSession(boolean ask) {
        Path f = sessionFile;
        if (ask || f == null) {
            JFileChooser fc = chooser();
            fc.setSelectedFile(new File(fc.getCurrentDirectory(), "session.trapmap.json"));
            if (fc.showSaveDialog(window) != JFileChooser.APPROVE_OPTION) {
                return;
            }
            f = fc.getSelectedFile().toPath();
        }
        try {
            SessionFiles.write(Session.of(model), f);
            sessionFile = f;
            status.setMessage("session saved to " + f);
        } catch (IOException | RuntimeException e) {
            window.error("Session not saved", e);
        }
    }

    /** Asks for a rules file and judges the open wafers by it. */
    void chooseRules() {
        JFileChooser fc = chooser();
        fc.setFileFilter(new FileNameExtensionFilter("Rules files (.json)", "json"));
        if (fc.showOpenDialog(window) == JFileChooser.APPROVE_OPTION) {
            loadRules(fc.getSelectedFile().toPath());
        }
    }

    /** Judges the open wafers by the rules of {@code file}; a file that is not valid changes nothing. */
    void loadRules(Path file) {
        try {
            LoadedRules r = model.loadRules(file);
            status.setMessage("judging by " + r.name() + " (" + r.rules().allProfiles().size() + " profiles)");
        } catch (RulesException | RuntimeException e) {
            window.error("Rules not loaded", e);
        }
    }

    /** Asks for a physics settings file and converts every wafer with it. */
    void choosePhysics() {
        JFileChooser fc = chooser();
        fc.setFileFilter(new FileNameExtensionFilter("Physics settings (.json)", "json"));
        if (fc.showOpenDialog(window) == JFileChooser.APPROVE_OPTION) {
            try {
                model.loadPhysics(fc.getSelectedFile().toPath(), true);
                status.setMessage("physics settings: " + model.physics().oneLine());
            } catch (RuntimeException e) {
                window.error("Physics settings not loaded", e);
            }
        }
    }

    /** Converts with {@code p} (null: the rules file's block, else the defaults). */
    void usePhysics(trapmap.physics.conversion.PhysicsSettings p) {
        model.setPhysics(p);
        status.setMessage("physics settings: " + model.physics().oneLine());
    }

    /** Drops the rules file: the quick threshold check judges again. */
    void useQuickCheck() {
        model.setRules(null);
        status.setMessage("no rules file: " + trapmap.viewer.model.Verdict.QUICK_CHECK + " (not a rules verdict)");
    }

    /**
     * Asks for a defect that replaces the rules profile's (or the viewer's) for the shown wafer ({@code all}
     * false) or for every wafer; "(none)" removes the override.
     */
    void chooseDefectOverride(boolean all) {
        ViewerModel.OpenWafer w = model.selected();
        if (!all && w == null) {
            status.setMessage("open a wafer first");
            return;
        }
        List<String> ids = new ArrayList<>();
        ids.add(NO_OVERRIDE);
        model.defects().all().stream().filter(Defect::hasAbsoluteCrossSections).forEach(d -> ids.add(d.id()));
        String current = all ? model.defectOverrideAll() : w.defectOverride();
        Object choice = JOptionPane.showInputDialog(window, all
                ? "Defect for every wafer, instead of each rules profile's:"
                : "Defect for " + w.name() + ", instead of " + (model.rules() != null ? "its rules profile's"
                : "the one chosen for all wafers") + ":", all ? "Override defect for all wafers"
                : "Override defect for this wafer", JOptionPane.QUESTION_MESSAGE, null, ids.toArray(),
                current == null ? NO_OVERRIDE : current);
        if (choice == null) {
            return;
        }
        String id = NO_OVERRIDE.equals(choice) ? null : choice.toString();
        try {
            if (all) {
                if (model.rules() == null && id != null) {
                    model.setAnalysis(model.analysis().withDefect(id), "defect");
                } else {
                    model.setDefectOverrideAll(id);
                }
            } else {
                model.setDefectOverride(model.selectedIndex(), id);
            }
            status.setMessage(id == null ? "defect override removed" : "judged with an overridden defect: " + id);
        } catch (IllegalArgumentException e) {
            window.error("Defect not overridden", e);
        }
    }

    /** Removes every defect override. */
    void clearDefectOverrides() {
        for (int i = 0; i < model.size(); i++) {
            if (model.wafer(i).defectOverride() != null) {
                model.setDefectOverride(i, null);
            }
        }
        if (model.defectOverrideAll() != null) {
            model.setDefectOverrideAll(null);
        }
        status.setMessage("defect overrides removed");
    }

    private static final String NO_OVERRIDE = "(none: the profile's defect)";
}
