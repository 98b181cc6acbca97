package trapmap.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import trapmap.maps.trend.Baseline;
import trapmap.maps.trend.ChartPoint;
import trapmap.maps.trend.ControlChart;
import trapmap.maps.trend.GroupYield;
import trapmap.maps.trend.ParetoEntry;
import trapmap.maps.trend.Signal;
import trapmap.maps.trend.TrendResult;
import trapmap.maps.trend.TrendTables;
import trapmap.shared.error.InvalidValueException;
import trapmap.store.ResultsStore;
import trapmap.store.StoreException;
import trapmap.store.StoreTrend;
import trapmap.viewer.report.TrendReport;

/**
 * {@code trapmap trend --store S --figure F -o trend.pdf|png|csv}: control charts of one figure over time from a
 * results store, with the run-rule signals, the yield per group and the Pareto of failed rules. The computation is
 * {@link StoreTrend} (over {@code trapmap.maps.trend}); this class converts the options and writes.
 */
@Command(name = "trend", version = TrapmapCommand.VERSION, mixinStandardHelpOptions = true, sortOptions = false,
        usageHelpAutoWidth = true,
        header = "Draws control charts of one figure over time from a results store.",
        description = {
            "Reads every wafer of the store (written by 'inspect --store') with its value of FIGURE and draws, in"
                + " order of the measured time (the sidecar's measured_at), the individuals and moving-range chart"
                + " and, by the groups of --by, the subgroup mean and range chart (lot, day, week) or, for a sidecar"
                + " fact, an individuals and moving-range chart per value with its own baseline; centre line and 3-sigma limits"
                + " come from a baseline period (Montgomery, Introduction to Statistical Quality Control, ch. 6)."
                + " Signals: 1 point beyond 3 sigma, 2 of 3 beyond 2 sigma, 4 of 5 beyond 1 sigma (same side),"
                + " 8 in a row on one side (Western Electric handbook, 1956), 6 in a row rising or falling"
                + " (Nelson 1984). Also the yield per group and the Pareto of failed rules.",
            "Wafers without a measured time or without a value of FIGURE are left out of the charts (counted) but"
                + " count for the yield and the Pareto; a time is never invented.",
            ""},
        footer = {"", "Output by extension: .pdf (charts, signals, caution), .png (the charts one below the other),"
                + " .csv (NAME.csv the chart points with limits and signals, NAME-yield.csv, NAME-pareto.csv).",
            "Exit codes: 0 done, no signal after the baseline; 1 done, at least one signal after the baseline;"
                + " 2 invalid input (one line on stderr names the option), or the store cannot be read; 3 internal"
                + " error, or the output could not be written; 5 the charts could not be drawn: this Java runtime"
                + " lacks font libraries or fonts (one line names what and the packages to install)."})
final class TrendCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Mixin
    StoreQueryOptions query = new StoreQueryOptions();

    @Option(names = "--figure", required = true, paramLabel = "<figure>",
            description = "The figure charted, a column of results.csv, e.g. trap_density_p50_cm3.")
    String figure;

    @Option(names = "--by", paramLabel = "<grouping>", defaultValue = "lot",
            description = "The subgroups: lot, day (UTC), week (ISO), none (X-bar/R charts by subgroup), or the name"
                    + " of a sidecar fact such as furnace_tube or boat_slot (one individuals/moving-range chart per"
                    + " value, each with its own baseline) (default: ${DEFAULT-VALUE}).")
    String by;

    @Option(names = "--baseline", paramLabel = "<n>",
            description = "The baseline: the first n wafers with a measured time and a value (a group belongs to it"
                    + " when all its wafers do); default " + Baseline.DEFAULT_COUNT + ".")
    Integer baselineCount;

    @Option(names = "--baseline-until", paramLabel = "<date>",
            description = "The baseline: the wafers measured before this UTC date or time (a group belongs to it"
                    + " when all its wafers do); instead of --baseline.")
    String baselineUntil;

    @Option(names = {"-o", "--out", "--output"}, required = true, paramLabel = "<FILE>",
            description = "The output: trend.pdf, trend.png or trend.csv.")
    Path out;

    @Option(names = "--json", description = "Also print one JSON object: the charts with limits, the signals, the"
            + " yield per group and the Pareto.")
    boolean json;

    @Override
    public Integer call() throws IOException {
        String ext = TrendReport.extension(out);
        if (!List.of("pdf", "png", "csv").contains(ext)) {
            throw new InputException("-o " + out + " must name a .pdf, .png or .csv file");
        }
        if (baselineCount != null && baselineUntil != null) {
            throw new InputException("--baseline and --baseline-until exclude each other: give one");
        }
        if (baselineCount != null && baselineCount < 2) {
            throw new InputException("--baseline must be at least 2 wafers, the fewest that give a spread (got "
                    + baselineCount + ")");
        }
        Baseline baseline = baselineUntil != null ? Baseline.before(time("--baseline-until", baselineUntil))
                : Baseline.first(baselineCount == null ? Baseline.DEFAULT_COUNT : baselineCount);
        StoreTrend.Request request = new StoreTrend.Request(figure, by, query.filter(), baseline);
        StoreTrend.Outcome outcome;
        try (ResultsStore s = ResultsStore.open(query.existingStore())) {
            List<String> figures = s.figures();
            if (!figures.isEmpty() && !figures.contains(figure)) {
                throw new InputException("--figure " + figure + " is not a figure of the store; it holds "
                        + String.join(", ", figures));
            }
            StoreQueryOptions.requireKnownGrouping(s, by);
            outcome = StoreTrend.analyse(s, request);
        } catch (StoreException e) {
            throw new InputException("--store " + Flags.storeProblem(e.getMessage()));
        } catch (InvalidValueException e) {
            String flag = switch (e.field()) {
                case "store" -> "--store";
                case "by" -> "--by";
                default -> baselineUntil != null ? "--baseline-until" : "--baseline";
            };
            throw new InputException(flag + ("--store".equals(flag) ? " " : ": ") + e.getMessage());
        }
        TrendResult r = outcome.result();
        String subtitle = "store " + query.store + "; " + outcome.describe();
        TrendReport.Caption caption = new TrendReport.Caption(figure, subtitle);
        boolean drawn = true;
        if (ext.equals("csv")) {
            try {
                TrendTables.write(out, r);
            } catch (IOException e) {
                throw MapInput.cannotWrite(out, e);
            }
        } else {
            Pictures pictures = Pictures.start();
            String name = out.getFileName().toString();
            drawn = pictures.run(name, () -> {
                try {
                    if (ext.equals("pdf")) {
                        TrendReport.writePdf(out, r, caption);
                    } else {
                        TrendReport.writePng(out, r, caption);
                    }
                } catch (IOException e) { // drawn: only the file could not be written
                    throw MapInput.cannotWrite(out, e);
                }
            });
            if (!drawn) {
                PrintWriter err = spec.commandLine().getErr();
                err.println(spec.qualifiedName() + ": " + pictures.line().orElse(name + " was not made"));
                err.flush();
            }
        }
        long late = outcome.lateSignals();
        PrintWriter o = spec.commandLine().getOut();
        if (json) {
            o.println(Output.json(json(r, subtitle, baseline)));
        } else {
            o.println(subtitle);
            for (String line : TrendReport.signalLines(r)) {
                o.println("  " + line);
            }
            o.println(late + " signal(s) after the baseline" + (drawn ? "; written: " + out : "; nothing written"));
        }
        o.flush();
        if (!drawn) {
            return Exit.REPORT_MISSING;
        }
        return late > 0 ? Exit.TREND_SIGNALS : Exit.OK;
    }

    /** A UTC date (its start) or an ISO-8601 instant. */
    static Instant time(String flag, String text) {
        try {
            return trapmap.store.StoreFilter.time(flag, text);
        } catch (InvalidValueException e) {
            throw new InputException(e.getMessage(), e);
        }
    }

    private static Map<String, Object> json(TrendResult r, String subtitle, Baseline baseline) {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("source", subtitle);
        m.put("baseline", baseline.describe());
        m.put("wafers", r.wafers());
        m.put("without_measured_time", r.withoutTime());
        m.put("without_value", r.withoutValue());
        List<Map<String, Object>> charts = new ArrayList<>();
        for (ControlChart c : r.charts()) {
            Map<String, Object> cm = new LinkedHashMap<>();
            cm.put("chart", c.kind().name().toLowerCase(java.util.Locale.ROOT));
            if (c.kind().perGroup()) {
                cm.put("group", c.points().get(0).label());
            }
            cm.put("sigma_hat", Output.num(c.sigmaHat()));
            List<Map<String, Object>> pts = new ArrayList<>();
            for (ChartPoint p : c.points()) {
                Map<String, Object> pm = new LinkedHashMap<>();
                pm.put("time", p.time().toString());
                pm.put("group", p.label());
                pm.put("wafers", p.size());
                pm.put("value", Output.num(p.value()));
                pm.put("centre", Output.num(p.centre()));
                pm.put("lower_limit", Output.num(p.lower()));
                pm.put("upper_limit", Output.num(p.upper()));
                pm.put("baseline", p.baseline());
                pts.add(pm);
            }
            cm.put("points", pts);
            List<Map<String, Object>> sig = new ArrayList<>();
            for (Signal s : c.signals()) {
                Map<String, Object> sm = new LinkedHashMap<>();
                ChartPoint p = c.points().get(s.index());
                sm.put("rule", s.rule().name().toLowerCase(java.util.Locale.ROOT));
                sm.put("description", s.rule().description());
                sm.put("index", s.index());
                sm.put("first_index", s.firstIndex());
                sm.put("direction", s.upward() ? "up" : "down");
                sm.put("time", p.time().toString());
                sm.put("group", p.label());
                sm.put("after_baseline", !p.baseline());
                sig.add(sm);
            }
            cm.put("signals", sig);
            charts.add(cm);
        }
        m.put("charts", charts);
        List<Map<String, Object>> ys = new ArrayList<>();
        for (GroupYield y : r.yields()) {
            ys.add(new LinkedHashMap<>(Map.of("group", y.group(), "wafers", y.wafers(), "passed", y.passed(),
                    "yield", y.yield())));
        }
        m.put("yield", ys);
        List<Map<String, Object>> ps = new ArrayList<>();
        for (ParetoEntry p : r.pareto()) {
            Map<String, Object> pm = new LinkedHashMap<>();
            pm.put("rule", p.rule());
            pm.put("failures", p.failures());
            pm.put("share", p.share());
            pm.put("cumulative_share", p.cumulativeShare());
            ps.add(pm);
        }
        m.put("pareto", ps);
        return m;
    }
}
