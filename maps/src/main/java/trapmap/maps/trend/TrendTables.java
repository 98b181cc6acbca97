package trapmap.maps.trend;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Collectors;
import trapmap.maps.io.TableFiles;

/**
 * A trend as CSV tables: {@code NAME.csv} holds every chart point (one row per chart and point, with its centre line,
 * limits, baseline flag and the rules that fire there), {@code NAME-yield.csv} the yield per group and
 * {@code NAME-pareto.csv} the failed rules. Each is written atomically.
 */
public final class TrendTables {
    public static final List<String> POINT_HEADER = List.of("chart", "index", "time", "group", "wafers", "value",
            "centre", "lower_limit", "upper_limit", "baseline", "signals");
    public static final List<String> YIELD_HEADER = List.of("group", "wafers", "passed", "yield");
    public static final List<String> PARETO_HEADER = List.of("rule", "failures", "share", "cumulative_share");

    private TrendTables() {
    }

    /** The chart rows: chart kind (lower case), index in the chart, time (ISO-8601 UTC), … , signals ("; "). */
    public static List<List<Object>> pointRows(TrendResult r) {
        List<List<Object>> rows = new ArrayList<>();
        for (ControlChart c : r.charts()) {
            List<ChartPoint> pts = c.points();
            for (int i = 0; i < pts.size(); i++) {
                ChartPoint p = pts.get(i);
                int index = i;
                String signals = c.signals().stream().filter(s -> s.index() == index)
                        .map(s -> s.rule().description()).collect(Collectors.joining("; "));
                rows.add(List.of(c.kind().name().toLowerCase(java.util.Locale.ROOT), i, p.time().toString(),
                        p.label(), p.size(), Double.isNaN(p.value()) ? "" : p.value(), p.centre(), p.lower(),
                        p.upper(), p.baseline(), signals));
            }
        }
        return rows;
    }

    public static List<List<Object>> yieldRows(TrendResult r) {
        return r.yields().stream().map(y -> List.<Object>of(y.group(), y.wafers(), y.passed(), y.yield())).toList();
    }

    public static List<List<Object>> paretoRows(TrendResult r) {
        return r.pareto().stream()
                .map(p -> List.<Object>of(p.rule(), p.failures(), p.share(), p.cumulativeShare())).toList();
    }

    /** Writes the three tables beside {@code csv} (which names the points table); returns the files written. */
    public static List<Path> write(Path csv, TrendResult r) throws IOException {
        String name = csv.getFileName().toString();
        String stem = name.toLowerCase(java.util.Locale.ROOT).endsWith(".csv") ? name.substring(0, name.length() - 4)
                : name;
        Path yields = csv.resolveSibling(stem + "-yield.csv");
        Path pareto = csv.resolveSibling(stem + "-pareto.csv");
        TableFiles.writeCsv(csv, POINT_HEADER, pointRows(r));
        TableFiles.writeCsv(yields, YIELD_HEADER, yieldRows(r));
        TableFiles.writeCsv(pareto, PARETO_HEADER, paretoRows(r));
        return List.of(csv, yields, pareto);
    }
}
