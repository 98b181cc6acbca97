package trapmap.viewer.model;

import java.nio.file.Path;
import trapmap.physics.conversion.PhysicsSettings;
import java.util.List;
import java.util.Map;
import trapmap.physics.defect.Defect;

/**
 * What a session file holds: the open files, the selected one, the analysis (conditions, defect, quantity, display,
 * threshold, line, edge exclusion), the user-defined defects and each wafer's view.
 *
 * @param files       map files, absolute
 * @param selected    index of the selected file, -1 for none
 * @param analysis    the analysis
 * @param userDefects user-defined defects
 * @param views       view per file (absolute path → zoom and centre)
 * @param rules       the rules file that judges the wafers, absolute, or null for the quick threshold check
 * @param defectForAll the defect that replaces every rules profile's, or null
 * @param defects     per file (absolute path), the defect that replaces its profile's or the viewer's
 * @param physics     the physics settings the user chose (the {@code physics} block), or null: the rules file's
 *                    block, else the defaults
 */
public record Session(List<Path> files, int selected, Analysis analysis, List<Defect> userDefects,
                      Map<Path, ViewState> views, Path rules, String defectForAll, Map<Path, String> defects,
                      PhysicsSettings physics) {
    /** Current version of the session file format. */
    public static final int VERSION = 1;

    public Session {
        files = List.copyOf(files);
        userDefects = List.copyOf(userDefects);
        views = Map.copyOf(views);
        defects = Map.copyOf(defects);
    }

    /** A session without physics settings of its own. */
    public Session(List<Path> files, int selected, Analysis analysis, List<Defect> userDefects,
                   Map<Path, ViewState> views, Path rules, String defectForAll, Map<Path, String> defects) {
        this(files, selected, analysis, userDefects, views, rules, defectForAll, defects, null);
    }

    /** A session without a rules file or defect overrides. */
    public Session(List<Path> files, int selected, Analysis analysis, List<Defect> userDefects,
                   Map<Path, ViewState> views) {
        this(files, selected, analysis, userDefects, views, null, null, Map.of());
    }

    /** The session of a model's current state. */
    public static Session of(ViewerModel model) {
        List<Path> files = model.wafers().stream().map(ViewerModel.OpenWafer::path).toList();
        Map<Path, ViewState> views = new java.util.LinkedHashMap<>();
        for (ViewerModel.OpenWafer w : model.wafers()) {
            if (w.view() != null) {
                views.put(w.path(), w.view());
            }
        }
        Map<Path, String> defects = new java.util.LinkedHashMap<>();
        for (ViewerModel.OpenWafer w : model.wafers()) {
            if (w.defectOverride() != null) {
                defects.put(w.path(), w.defectOverride());
            }
        }
        LoadedRules rules = model.rules();
        return new Session(files, model.selectedIndex(), model.analysis(), model.defects().userDefined(), views,
                rules == null ? null : rules.file(), model.defectOverrideAll(), defects, model.physicsOverride());
    }

    /**
     * Restores this session into {@code model}: closes what is open, adds the user defects, loads the rules file,
     * opens the files (heavy), sets the analysis without an undo step, the defect overrides, the views and the
     * selection. A rules file that cannot be read leaves the quick threshold check and is one of the errors.
     *
     * @return the outcome of opening the files (and the rules)
     */
    public ViewerModel.OpenOutcome applyTo(ViewerModel model) {
        model.closeAll();
        model.defects().clearUserDefined();
        userDefects.forEach(model::addDefect);
        model.resetAnalysis(analysis);
        model.setPhysics(physics);
        List<String> errors = new java.util.ArrayList<>();
        try {
            model.setRules(rules == null ? null : LoadedRules.read(rules));
        } catch (trapmap.maps.batch.RulesException e) {
            model.setRules(null);
            errors.add(e.getMessage());
        }
        model.setDefectOverrideAll(defectForAll);
        ViewerModel.OpenOutcome opened = model.open(files);
        errors.addAll(opened.errors());
        ViewerModel.OpenOutcome o = new ViewerModel.OpenOutcome(opened.added(), errors);
        defects.forEach((f, id) -> {
            int i = model.indexOf(f);
            if (i >= 0) {
                model.setDefectOverride(i, id);
            }
        });
        for (ViewerModel.OpenWafer w : model.wafers()) {
            ViewState v = views.get(w.path());
            if (v != null) {
                w.setView(v);
            }
        }
        if (selected >= 0 && selected < files.size()) {
            int i = model.indexOf(files.get(selected));
            if (i >= 0) {
                model.select(i);
            }
        }
        return o;
    }
}
