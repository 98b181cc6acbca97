package trapmap.viewer.model;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import trapmap.maps.trend.Baseline;
import trapmap.maps.trend.ChartPoint;
import trapmap.maps.trend.ControlChart;
import trapmap.maps.trend.Signal;
import trapmap.maps.trend.TrendResult;
import trapmap.shared.error.InvalidValueException;
import trapmap.store.ResultsStore;
import trapmap.store.StoreFilter;
import trapmap.store.StoreTrend;
import trapmap.store.StoredPoint;

/**
 * What the viewer's history window asks of a results store, without any UI: which store an address names, the
 * figures and groupings the store offers, the baseline typed, the trend (through {@link StoreTrend}, the one path from
 * a store to the control charts that {@code trapmap trend} takes too), the signals as rows, and the map file of a
 * stored wafer when it is still there.
 */
public final class StoreHistory {
    /** The groupings every store offers, before its sidecar facts: {@code none}, {@code lot}, {@code day}, {@code week}. */
    public static final List<String> FIXED_GROUPINGS = List.of("none", "lot", "day", "week");
    /** The figure chosen first when the store has it: the median trap density. */
    public static final String PREFERRED_FIGURE = "trap_density_p50_cm3";
    /** Facts that are not groupings: the lot (already a grouping) and the measured time (the time axis). */
    static final Set<String> NOT_GROUPINGS = Set.of("lot", "measured_at");

    private StoreHistory() {
    }

    /**
     * The address to open for what the user gave: {@code postgresql://…} (or {@code jdbc:postgresql://…}) as it is, a
     * file path (or {@code jdbc:sqlite:PATH}) only when the file exists, so that looking at a store never makes an
     * empty one.
     *
     * @throws InvalidValueException (field {@code store}) when nothing is given, or the file does not exist or is a
     *                               folder
     */
    public static String address(String typed) {
        String s = typed == null ? "" : typed.trim();
        if (s.isEmpty()) {
            throw new InvalidValueException("store", "", "give a results store: a SQLite file (made by 'trapmap"
                    + " inspect --store') or postgresql://host[:port]/database");
        }
        String bare = s.startsWith("jdbc:") ? s.substring("jdbc:".length()) : s;
        if (bare.startsWith("postgresql://")) {
            return s;
        }
        if (bare.startsWith("sqlite:")) {
            bare = bare.substring("sqlite:".length());
        }
        Path file = Path.of(bare).toAbsolutePath().normalize();
        if (Files.isDirectory(file)) {
            throw new InvalidValueException("store", "", "store " + file + " is a folder; give a SQLite file made by"
                    + " 'trapmap inspect --store'");
        }
        if (!Files.isRegularFile(file)) {
            throw new InvalidValueException("store", "", "store " + file + " does not exist; give a SQLite file made"
                    + " by 'trapmap inspect --store' or postgresql://host[:port]/database");
        }
        return file.toString();
    }

    /**
     * What a store offers to chart.
     *
     * @param figures   the figures present, sorted
     * @param groupings {@link #FIXED_GROUPINGS}, then the sidecar facts present (sorted) but the lot and time
     * @param figure    the figure to show first: {@value #PREFERRED_FIGURE} when present, else the first; null when the
     *                  store holds no figure
     */
    public record Choices(List<String> figures, List<String> groupings, String figure) {
        public Choices {
            figures = List.copyOf(figures);
            groupings = List.copyOf(groupings);
        }
    }

    /** The choices of {@code store} ({@link ResultsStore#figures}, {@link ResultsStore#attributeNames}). */
    public static Choices choices(ResultsStore store) {
        List<String> figures = store.figures();
        Set<String> groupings = new LinkedHashSet<>(FIXED_GROUPINGS);
        for (String a : store.attributeNames()) {
            if (!NOT_GROUPINGS.contains(a)) {
                groupings.add(a);
            }
        }
        String first = figures.contains(PREFERRED_FIGURE) ? PREFERRED_FIGURE : figures.isEmpty() ? null
                : figures.get(0);
        return new Choices(figures, new ArrayList<>(groupings), first);
    }

    /**
     * The baseline: the first {@code count} wafers, or (when {@code untilText} is not blank) the wafers measured
     * before that UTC date ({@code 2026-10-12}, its start) or time ({@code 2026-10-12T06:00:00Z}), as {@code trapmap
     * trend --baseline / --baseline-until} take them.
     *
     * @throws InvalidValueException (field {@code baseline}) for a count below 2 or a date that is none
     */
    public static Baseline baseline(int count, String untilText) {
        if (untilText == null || untilText.isBlank()) {
            return Baseline.first(count);
        }
        return Baseline.before(StoreFilter.time("baseline", untilText));
    }

    /**
     * The wafers to chart, from the window's compact fields, read by {@link StoreFilter#parse} as {@code trapmap trend
     * --since/--until/--profile/--lot/--where} reads its options (the same rules and messages, without the dashes):
     * {@code since} and {@code until} a UTC date or time (an until date takes that whole day), {@code lots} separated
     * by commas, {@code facts} {@code NAME=VALUE} separated by commas, all of which must hold; an item holding a comma
     * in double quotes ({@link StoreFilter#items}: {@code L1, "A,1"}). Blank fields take all.
     *
     * @throws InvalidValueException (field {@code since}, {@code until}, {@code lot} or {@code where}) in one line
     *                               naming the field
     */
    public static StoreFilter filter(String since, String until, String profile, String lots, String facts) {
        return StoreFilter.parse(since, until, profile, lots == null ? List.of() : List.of(lots),
                facts == null ? List.of() : List.of(facts), "");
    }

    /**
     * One signal as the window lists it.
     *
     * @param chart      index of the chart in {@link TrendResult#charts()}
     * @param point      index of the point that completes the pattern
     * @param time       that point's time
     * @param title      the chart's title ("individuals (X) of T2")
     * @param group      the point's group
     * @param rule       the rule in words
     * @param upward     above the centre (or rising)
     * @param value      the point's value, in the figure's unit
     * @param inBaseline whether the point lies in the baseline period
     */
    public record SignalRow(int chart, int point, Instant time, String title, String group, String rule,
                            boolean upward, double value, boolean inBaseline) {
    }

    /** Every signal of every chart, in the charts' order and then by point (as {@code trend} lists them). */
    public static List<SignalRow> signals(TrendResult r) {
        List<SignalRow> out = new ArrayList<>();
        List<ControlChart> charts = r.charts();
        for (int c = 0; c < charts.size(); c++) {
            ControlChart chart = charts.get(c);
            for (Signal s : chart.signals()) {
                ChartPoint p = chart.points().get(s.index());
                out.add(new SignalRow(c, s.index(), p.time(), chart.title(), p.label(), s.rule().description(),
                        s.upward(), p.value(), p.baseline()));
            }
        }
        return out;
    }

    /**
     * Where a stored wafer's map is now.
     *
     * @param wafer   the stored wafer
     * @param path    its map file when found, else null
     * @param problem why it cannot be opened (null when found), naming the wafer and the file
     */
    public record MapFile(StoredPoint wafer, Path path, String problem) {
        public boolean found() {
            return path != null;
        }
    }

    /**
     * The map file of {@code wafer}: the file as the run gave it (absolute, or relative to the folder the viewer
     * runs in), else relative to the folder of the SQLite store {@code address}; a file no longer there is a
     * problem that names the wafer and the places looked at.
     */
    public static MapFile mapFile(StoredPoint wafer, String address) {
        List<Path> tried = new ArrayList<>();
        Path given;
        try {
            given = Path.of(wafer.file());
        } catch (java.nio.file.InvalidPathException e) {
            return new MapFile(wafer, null, "wafer " + wafer.waferId() + ": its stored file name '" + wafer.file()
                    + "' is not a path here");
        }
        tried.add(given.toAbsolutePath().normalize());
        if (!given.isAbsolute() && address != null && !address.contains("://")) {
            Path dir = Path.of(address).toAbsolutePath().getParent();
            if (dir != null) {
                tried.add(dir.resolve(given).normalize());
            }
        }
        for (Path p : tried) {
            if (Files.isRegularFile(p)) {
                return new MapFile(wafer, p, null);
            }
        }
        return new MapFile(wafer, null, "wafer " + wafer.waferId() + ": its map " + wafer.file()
                + " is no longer there" + (tried.size() > 1 ? " (looked in " + tried.get(0).getParent() + " and "
                + tried.get(1).getParent() + ")" : "") + "; it was moved or deleted after the run that stored it");
    }

    /** A stored wafer in one line for a menu: id, measured time, value with {@code unit}, verdict. */
    public static String label(StoredPoint w, String unit) {
        String v = Double.isFinite(w.value()) ? String.format(Locale.ROOT, "%.3g", w.value())
                + (unit == null || unit.isEmpty() ? "" : " " + unit) : "no value";
        return w.waferId() + "  ·  " + w.time() + (w.measured() ? "" : " (stored)") + "  ·  " + v + "  ·  "
                + w.verdict();
    }
}
