package trapmap.viewer.model;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.function.BooleanSupplier;
import java.util.stream.Stream;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.maps.profile.LineProfile;
import trapmap.maps.raster.PixelGrid;
import trapmap.maps.stats.MapStatistics;
import trapmap.maps.stats.StatisticsRequest;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.Defect;

/**
 * The viewer's state without any Swing: the open wafers, which one is selected, the {@link Analysis} with its undo
 * history, the user-defined defects, the rules file that judges the wafers (or none: the quick threshold check), the
 * defect overrides, and the derived results per wafer with their {@link Verdict}.
 *
 * <p>Threads: {@link #open} and {@link #compute} are heavy and meant to run off the event thread; everything else is
 * cheap. Listeners are told on the thread that made the change (a Swing view re-posts to the event thread).
 */
public final class ViewerModel {
    /** What changed. */
    public enum Change { WAFERS, SELECTION, ANALYSIS, RESULTS, DEFECTS, RULES }

    /** Told after each change. */
    public interface Listener {
        void modelChanged(Change change);
    }

    /** One open wafer: its file and map, and the latest results. */
    public static final class OpenWafer {
        private final Path path;
        private final WaferMap map;
        private volatile WaferAnalysis result;
        private volatile String error;
        private volatile ViewState view;
        private volatile String defectOverride;
        private volatile Object resultKey;

        OpenWafer(Path path, WaferMap map) {
            this.path = path;
            this.map = map;
        }

        public Path path() {
            return path;
        }

        /** The map as read (sidecar conditions, no overrides). */
        public WaferMap map() {
            return map;
        }

        /** File name without extension. */
        public String name() {
            String n = path.getFileName().toString();
            int dot = n.lastIndexOf('.');
            return dot > 0 ? n.substring(0, dot) : n;
        }

        /** The latest results (possibly for older settings; see {@link ViewerModel#upToDate}), or null. */
        public WaferAnalysis result() {
            return result;
        }

        /** Why the latest analysis failed, or null. */
        public String error() {
            return error;
        }

        public ViewState view() {
            return view;
        }

        public void setView(ViewState v) {
            this.view = v;
        }

        /** The defect chosen for this wafer alone, replacing the rules profile's or the viewer's, or null. */
        public String defectOverride() {
            return defectOverride;
        }
    }

    /** The outcome of {@link #open}: wafers added and one line per file that could not be read. */
    public record OpenOutcome(int added, List<String> errors) {
    }

    private final List<OpenWafer> wafers = new CopyOnWriteArrayList<>();
    private final List<Listener> listeners = new CopyOnWriteArrayList<>();
    private final UndoHistory<Analysis> history = new UndoHistory<>(200);
    private final DefectChoices defects = new DefectChoices();
    private volatile int selected = -1;
    private volatile Analysis analysis = Analysis.DEFAULT;
    private volatile LoadedRules rules;
    /** The rules that judge: {@link #rules} with {@link #physicsOverride} applied (null without rules). */
    private volatile LoadedRules judging;
    /** Physics settings chosen by the user (view --physics, a session's block), or null: the rules' or defaults. */
    private volatile PhysicsSettings physicsOverride;
    private volatile String defectOverrideAll;

    public void addListener(Listener l) {
        listeners.add(l);
    }

    public void removeListener(Listener l) {
        listeners.remove(l);
    }

    private void fire(Change c) {
        for (Listener l : listeners) {
            l.modelChanged(c);
        }
    }

    // ---- files -------------------------------------------------------------------------------------------

    /**
     * The map files among {@code paths}: files as given (a {@code .json} sidecar is taken for its map when one is
     * beside it), folders by their {@code .tif}, {@code .tiff} and {@code .csv} files in name order.
     */
    public static List<Path> mapFiles(List<Path> paths) throws IOException {
        List<Path> out = new ArrayList<>();
        for (Path p : paths) {
            if (Files.isDirectory(p)) {
                try (Stream<Path> s = Files.list(p)) {
                    s.filter(f -> Files.isRegularFile(f) && isMapName(f)).sorted().forEach(out::add);
                }
            } else {
                out.add(p);
            }
        }
        return out;
    }

    private static boolean isMapName(Path f) {
        String n = f.getFileName().toString().toLowerCase(Locale.ROOT);
        return n.endsWith(".tif") || n.endsWith(".tiff") || n.endsWith(".csv");
    }

    /**
     * Reads the maps of {@code paths} (files or folders) and adds them; a file already open is not read again.
     * Selects the first added wafer when none was selected. Heavy: call off the event thread.
     */
    public OpenOutcome open(List<Path> paths) {
        List<String> errors = new ArrayList<>();
        List<Path> files;
        try {
            files = mapFiles(paths);
        } catch (IOException e) {
            return new OpenOutcome(0, List.of("cannot list " + paths + ": " + e.getMessage()));
        }
        int added = 0;
        for (Path f : files) {
            Path abs = f.toAbsolutePath().normalize();
            if (indexOf(abs) >= 0) {
                continue;
            }
            try {
                wafers.add(new OpenWafer(abs, MapFiles.readSingle(abs)));
                added++;
            } catch (IOException | RuntimeException e) {
                errors.add(e.getMessage() == null ? f + ": " + e : e.getMessage());
            }
        }
        if (files.isEmpty()) {
            errors.add("no map files (.tif, .tiff, .csv) in " + paths);
        }
        if (added > 0) {
            fire(Change.WAFERS);
            if (selected < 0) {
                select(0);
            }
        }
        return new OpenOutcome(added, errors);
    }

    /** Index of the wafer read from {@code path}, or -1. */
    public int indexOf(Path path) {
        Path abs = path.toAbsolutePath().normalize();
        for (int i = 0; i < wafers.size(); i++) {
            if (wafers.get(i).path().equals(abs)) {
                return i;
            }
        }
        return -1;
    }

    public List<OpenWafer> wafers() {
        return Collections.unmodifiableList(wafers);
    }

    public int size() {
        return wafers.size();
    }

    public OpenWafer wafer(int i) {
        return wafers.get(i);
    }

    /** Closes every wafer. */
    public void closeAll() {
        wafers.clear();
        selected = -1;
        fire(Change.WAFERS);
        fire(Change.SELECTION);
    }

    // ---- selection ---------------------------------------------------------------------------------------

    /** Index of the selected wafer, -1 when none is open. */
    public int selectedIndex() {
        return selected;
    }

    /** The selected wafer, or null. */
    public OpenWafer selected() {
        int s = selected;
        return s < 0 || s >= wafers.size() ? null : wafers.get(s);
    }

    public void select(int i) {
        if (i < 0 || i >= wafers.size()) {
            throw new IndexOutOfBoundsException("wafer " + i + " of " + wafers.size());
        }
        if (i != selected) {
            selected = i;
            fire(Change.SELECTION);
        }
    }

    /** Selects the next wafer (wrapping round); false when fewer than two are open. */
    public boolean next() {
        return step(1);
    }

    /** Selects the previous wafer (wrapping round); false when fewer than two are open. */
    public boolean previous() {
        return step(-1);
    }

    private boolean step(int d) {
        int n = wafers.size();
        if (n < 2) {
            return false;
        }
        select(Math.floorMod(selected + d, n));
        return true;
    }

    // ---- analysis and history ----------------------------------------------------------------------------

    public Analysis analysis() {
        return analysis;
    }

    /**
     * Changes the analysis; the previous one goes on the undo history under {@code change} ("threshold",
     * "line", "conditions", …). No effect when equal.
     */
    public void setAnalysis(Analysis a, String change) {
        if (a.equals(analysis)) {
            return;
        }
        history.record(analysis, change);
        analysis = a;
        fire(Change.ANALYSIS);
    }

    /** Replaces the analysis without an undo step (a session being loaded). */
    public void resetAnalysis(Analysis a) {
        analysis = a;
        history.clear();
        fire(Change.ANALYSIS);
    }

    public boolean canUndo() {
        return history.canUndo();
    }

    public boolean canRedo() {
        return history.canRedo();
    }

    public String undoName() {
        return history.undoName();
    }

    public String redoName() {
        return history.redoName();
    }

    public boolean undo() {
        Analysis a = history.undo(analysis);
        if (a == null) {
            return false;
        }
        analysis = a;
        fire(Change.ANALYSIS);
        return true;
    }

    public boolean redo() {
        Analysis a = history.redo(analysis);
        if (a == null) {
            return false;
        }
        analysis = a;
        fire(Change.ANALYSIS);
        return true;
    }

    // ---- defects -----------------------------------------------------------------------------------------

    public DefectChoices defects() {
        return defects;
    }

    /** Adds a user-defined defect and tells the listeners. */
    public void addDefect(Defect d) {
        defects.add(d);
        fire(Change.DEFECTS);
    }

    /** Reads and adds the defects of a JSON file. */
    public List<Defect> addDefectFile(Path file) throws IOException {
        List<Defect> added = defects.addFile(file);
        fire(Change.DEFECTS);
        return added;
    }

    /** The defect a wafer's results were converted with, or null when they hold no conversion. */
    public Defect defectOf(WaferAnalysis r) {
        return r == null || r.conversion() == null ? null : defects.byId(r.conversion().defectId());
    }

    /** The defect of the current analysis, or null. */
    public Defect defect() {
        return defects.byId(analysis.defectId());
    }

    // ---- rules and defect overrides ----------------------------------------------------------------------

    /** The rules file that judges the open wafers, or null: then the quick threshold check judges them. */
    public LoadedRules rules() {
        return rules;
    }

    /**
     * Judges every open wafer by a rules file from now on (each converted with its profile's defect unless
     * overridden). Checks the whole file first; on error nothing changes.
     *
     * @throws trapmap.maps.batch.RulesException naming the file and the field when it is not valid
     */
    public LoadedRules loadRules(Path file) throws trapmap.maps.batch.RulesException {
        setRules(LoadedRules.read(file));
        return rules;
    }

    /** Uses {@code r} (null: the quick threshold check) and tells the listeners. */
    public void setRules(LoadedRules r) {
        rules = r;
        judging = r == null || physicsOverride == null ? r : r.withPhysics(physicsOverride);
        fire(Change.RULES);
    }

    /**
     * The physics settings every wafer is converted with: the user's ({@link #setPhysics}), else the rules file's
     * physics block, else the defaults.
     */
    public PhysicsSettings physics() {
        PhysicsSettings o = physicsOverride;
        if (o != null) {
            return o;
        }
        LoadedRules r = rules;
        return r != null ? r.rules().physics() : PhysicsSettings.DEFAULTS;
    }

    /** The physics settings the user chose, or null when the rules' block or the defaults apply. */
    public PhysicsSettings physicsOverride() {
        return physicsOverride;
    }

    /**
     * Converts with {@code p} from now on (null: the rules file's block, else the defaults); with a rules file they
     * replace its physics block, as {@code trapmap inspect --physics} does.
     */
    public void setPhysics(PhysicsSettings p) {
        physicsOverride = p;
        LoadedRules r = rules;
        judging = r == null || p == null ? r : r.withPhysics(p);
        fire(Change.RULES);
    }

    /**
     * Converts with a physics settings file from now on ({@link #setPhysics}) and draws the probability of exceeding
     * N* with its {@code uncertainty} block (uncertainties, samples, seed; without the block the documented
     * defaults), as {@code convert --physics} does. Checks the whole file first; on error nothing changes.
     *
     * @param undoable true: the new uncertainties are one undo step of the analysis (a file the user loads); false:
     *                 they replace the analysis's without one (the file the viewer starts with)
     * @throws trapmap.shared.error.InvalidValueException naming the file, the field and its unit
     */
    public PhysicsSettings loadPhysics(Path file, boolean undoable) {
        PhysicsSettings p = trapmap.maps.io.PhysicsSettingsFile.read(file);
        trapmap.maps.io.UncertaintySettings u = trapmap.maps.io.PhysicsSettingsFile.readUncertainty(file);
        setPhysics(p);
        Analysis a = analysis.withExceedance(analysis.exceedance().withDrawn(u));
        if (undoable) {
            setAnalysis(a, "uncertainty of physics settings");
        } else {
            resetAnalysis(a);
        }
        return p;
    }

    /** The defect that replaces every wafer's (the rules profile's, or the viewer's), or null for none. */
    public String defectOverrideAll() {
        return defectOverrideAll;
    }

    /**
     * Judges every wafer with defect {@code id} instead of its rules profile's (null: each profile's own again). With
     * no rules file the viewer's defect choice already applies to all wafers.
     */
    public void setDefectOverrideAll(String id) {
        requireDefect(id);
        defectOverrideAll = id;
        fire(Change.RULES);
    }

    /** Judges wafer {@code i} with defect {@code id} (null: no override for it). */
    public void setDefectOverride(int i, String id) {
        requireDefect(id);
        wafers.get(i).defectOverride = id;
        fire(Change.RULES);
    }

    private void requireDefect(String id) {
        if (id != null && defects.byId(id) == null) {
            throw new IllegalArgumentException("unknown defect '" + id + "'; choose a library defect with absolute"
                    + " cross-sections or add one (these have them: " + String.join(", ", defects.all().stream()
                    .map(Defect::id).toList()) + ")");
        }
    }

    /** The defect override in force for a wafer: its own, else (with rules) the one for all wafers; or null. */
    public String overrideFor(OpenWafer w) {
        String own = w.defectOverride;
        return own != null ? own : rules != null ? defectOverrideAll : null;
    }

    /**
     * Counts of the open wafers by their latest verdict.
     *
     * @param pass    wafers that pass
     * @param fail    wafers that fail
     * @param pending wafers not judged yet or that could not be analysed
     */
    public record Tally(int pass, int fail, int pending) {
    }

    /** The open wafers counted by their latest verdict. */
    public Tally tally() {
        int pass = 0;
        int fail = 0;
        for (OpenWafer w : wafers) {
            WaferAnalysis r = w.result;
            if (r == null) {
                continue;
            }
            if (r.pass()) {
                pass++;
            } else {
                fail++;
            }
        }
        return new Tally(pass, fail, wafers.size() - pass - fail);
    }

    /** What judges the wafers, as shown on screen: the rules file's name, or the quick threshold check. */
    public String judgedBy() {
        LoadedRules r = rules;
        return r == null ? Verdict.QUICK_CHECK + " (no rules file)" : "rules " + r.name();
    }

    /** What a wafer's results depend on besides the analysis: the rules and the defect override. */
    private record ResultKey(LoadedRules rules, String override, PhysicsSettings physics) {
    }

    private Analysis effectiveAnalysis(OpenWafer w) {
        String o = overrideFor(w);
        return rules == null && o != null ? analysis.withDefect(o) : analysis;
    }

    // ---- results -----------------------------------------------------------------------------------------

    /** True when wafer {@code i} has results for the current settings (display and line aside). */
    public boolean upToDate(int i) {
        OpenWafer w = wafers.get(i);
        WaferAnalysis r = w.result;
        return r != null && r.analysis().sameResults(effectiveAnalysis(w))
                && new ResultKey(judging, overrideFor(w), physics()).equals(w.resultKey);
    }

    /**
     * Computes wafer {@code i}'s results for the current settings (reusing the conversion when only the threshold,
     * quantity or edge exclusion changed), stores them and tells the listeners. Heavy: call off the event thread.
     *
     * @return the results, or null when the analysis failed (the reason is in {@link OpenWafer#error()})
     * @throws java.util.concurrent.CancellationException when {@code cancelled} turned true
     */
    public WaferAnalysis compute(int i, BooleanSupplier cancelled) {
        OpenWafer w = wafers.get(i);
        LoadedRules lr = judging;
        String override = overrideFor(w);
        PhysicsSettings physics = physics();
        ResultKey key = new ResultKey(lr, override, physics);
        Analysis a = lr == null && override != null ? analysis.withDefect(override) : analysis;
        WaferAnalysis old = w.result;
        if (old != null && old.analysis().sameResults(a) && key.equals(w.resultKey)) {
            return old;
        }
        try {
            Defect d = defects.byId(a.defectId());
            if (a.defectId() != null && d == null) {
                throw new IllegalArgumentException("unknown defect '" + a.defectId() + "'");
            }
            WaferAnalysis r;
            if (lr != null) {
                r = WaferAnalyzer.judge(w.path.toString(), w.map, a, lr,
                        override == null ? null : defects.byId(override), d, old, cancelled);
            } else {
                r = WaferAnalyzer.analyse(w.map, a, d, old, cancelled, physics);
                if (override != null) {
                    r = r.withVerdict(r.verdict().withDefectOverridden());
                }
            }
            w.result = r;
            w.resultKey = key;
            w.error = null;
            fire(Change.RESULTS);
            return r;
        } catch (java.util.concurrent.CancellationException e) {
            throw e;
        } catch (RuntimeException e) {
            w.result = null;
            w.error = w.path.getFileName() + ": " + (e.getMessage() == null ? e.toString() : e.getMessage());
            fire(Change.RESULTS);
            return null;
        }
    }

    /** Computes every wafer that is not up to date; stops quietly when cancelled. Heavy. */
    public void computeAll(BooleanSupplier cancelled, java.util.function.IntConsumer done) {
        for (int i = 0; i < wafers.size(); i++) {
            if (cancelled.getAsBoolean()) {
                return;
            }
            if (!upToDate(i)) {
                compute(i, cancelled);
            }
            done.accept(i);
        }
    }

    /**
     * The colour range for a wafer's results under the current display settings, in the displayed quantity's
     * unit: the manual range, or the chosen percentiles over the evaluated area. On a log scale the low end is kept
     * above zero (at most four decades below the high end).
     */
    public static double[] range(WaferAnalysis r, DisplaySettings d) {
        double lo;
        double hi;
        if (d.autoRange() && r.analysis().quantity().isProbability()) {
            // a probability is coloured on its whole scale, so that wafers compare by colour
            lo = 0;
            hi = 1;
        } else if (d.autoRange()) {
            MapStatistics s = r.displayedStats();
            if (!has(s, d.lowPercent()) || !has(s, d.highPercent())) {
                s = MapStatistics.of(r.displayed(), r.mask(), StatisticsRequest.of(
                        new double[] {d.lowPercent(), d.highPercent()}));
            }
            lo = s.percentile(d.lowPercent());
            hi = s.percentile(d.highPercent());
        } else {
            lo = d.low();
            hi = d.high();
        }
        if (Double.isNaN(lo) || Double.isNaN(hi)) {
            lo = 0;
            hi = 1;
        }
        if (d.logarithmic()) {
            if (!(hi > 0)) {
                hi = 1;
            }
            if (!(lo > 0) || lo < hi * 1e-4) {
                lo = Math.max(lo, hi * 1e-4);
            }
        }
        if (!(hi > lo)) {
            double pad = lo == 0 ? 1 : Math.abs(lo) * 0.01;
            hi = lo + pad;
            if (d.logarithmic()) {
                lo = hi / 1.02 / 1.02;
            }
        }
        return new double[] {lo, hi};
    }

    private static boolean has(MapStatistics s, double percent) {
        return percent == 50 || s.percentiles().stream().anyMatch(p -> p.percent() == percent);
    }

    /** Line profile of the selected wafer's displayed map along the current line, or null. */
    public LineProfile lineProfile() {
        OpenWafer w = selected();
        ProfileLine l = analysis.line();
        if (w == null || l == null || w.result == null) {
            return null;
        }
        WaferMap m = w.result.displayed();
        return LineProfile.of(m, l.x0Mm(), l.y0Mm(), l.x1Mm(), l.y1Mm(), l.bandWidthMm());
    }

    /**
     * The readout of pixel ({@code xPx}, {@code yPx}) of the selected wafer: the displayed value and, with a defect,
     * the single-pixel conversion of its lifetime by {@link TrapDensityConverter} (the kernel the map conversion
     * uses). Null when no results are there or the pixel lies outside the map.
     */
    public PixelReadout probe(int xPx, int yPx) {
        OpenWafer w = selected();
        if (w == null || w.result == null) {
            return null;
        }
        WaferAnalysis r = w.result;
        PixelGrid g = r.lifetime().grid();
        if (xPx < 0 || yPx < 0 || xPx >= g.width() || yPx >= g.height()) {
            return null;
        }
        double tau = r.lifetime().raster().get(xPx, yPx);
        double shown = r.displayed().raster().get(xPx, yPx);
        Defect d = defects.byId(r.analysis().defectId());
        trapmap.physics.conversion.PixelResult px = null;
        if (d != null && d.hasAbsoluteCrossSections() && !Double.isNaN(tau)) {
            px = converter(r, d).convert(tau);
        }
        return new PixelReadout(g.xMm(xPx), g.yMm(yPx), r.analysis().quantity(), shown, tau, px,
                exceedanceAt(r.exceedance(), tau));
    }

    /** The probability and quantiles of a pixel measured at {@code tau} µs, or null without a prepared layer. */
    static PixelReadout.Exceedance exceedanceAt(ExceedanceLayer layer, double tau) {
        if (layer == null) {
            return null;
        }
        double threshold = layer.settings().thresholdPerCm3();
        if (!layer.available()) {
            return new PixelReadout.Exceedance(threshold, Double.NaN, Double.NaN, Double.NaN,
                    layer.unavailableReason());
        }
        return new PixelReadout.Exceedance(threshold, layer.probabilityAt(tau),
                layer.quantileAt(tau, ExceedanceSettings.LOW_QUANTILE),
                layer.quantileAt(tau, ExceedanceSettings.HIGH_QUANTILE), null);
    }

    private WaferAnalysis convFor;
    private TrapDensityConverter converter;

    private synchronized TrapDensityConverter converter(WaferAnalysis r, Defect d) {
        if (convFor != r || converter == null || !converter.defect().equals(d)) {
            converter = new TrapDensityConverter(MapConversion.physicsConditions(r.lifetime().conditions(),
                    ConversionSettings.of(r.conversion() != null ? r.conversion().physics() : physics())), d);
            convFor = r;
        }
        return converter;
    }
}
