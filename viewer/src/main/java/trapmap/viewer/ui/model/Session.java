package trapmap.viewer.ui.model;

import java.nio.file.Path;
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
 */
public record Session(List<Path> files, int selected, Analysis analysis, List<Defect> userDefects,
                      Map<Path, ViewState> views) {
    /** Current version of the session file format. */
    public static final int VERSION = 1;

    public Session {
        files = List.copyOf(files);
        userDefects = List.copyOf(userDefects);
        views = Map.copyOf(views);
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
        return new Session(files, model.selectedIndex(), model.analysis(), model.defects().userDefined(), views);
    }

    /**
     * Restores this session into {@code model}: closes what is open, adds the user defects, opens the files (heavy),
     * sets the analysis without an undo step, the views and the selection.
     *
     * @return the outcome of opening the files
     */
    public ViewerModel.OpenOutcome applyTo(ViewerModel model) {
        model.closeAll();
        model.defects().clearUserDefined();
        userDefects.forEach(model::addDefect);
        model.resetAnalysis(analysis);
        ViewerModel.OpenOutcome o = model.open(files);
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
