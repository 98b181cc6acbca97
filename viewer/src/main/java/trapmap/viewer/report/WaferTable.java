package trapmap.viewer.report;

import java.io.IOException;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import trapmap.maps.batch.Rules;
import trapmap.viewer.graphics.Labels;

/**
 * Every wafer of the batch, one row each in the order of {@code results.csv}, over as many pages as it takes: id,
 * profile, verdict, grade, failed rules (or the reason of an error), the key figures and the worst region (the flagged
 * region behind the verdict, {@code worst_region_…} of {@code results.csv}).
 */
final class WaferTable {
    static final String[] HEADER = {"wafer", "profile", "verdict", "grade", "failed rules", "lifetime, harm. mean",
        "trap density P95", "flagged area", "worst region"};

    /** What the worst region is and what is given of it. */
    static final String WORST_REGION = "the flagged region behind the verdict (else the largest): area, position"
            + " (wafer mm: the centroid, or the region's pixel nearest it, as for a ring) and peak in the flag's unit";

    private WaferTable() {
    }

    static void draw(ReportFlow flow, BatchContent c) throws IOException {
        ReportFlow.Table table = start(flow, c.rows().size());
        Map<String, Integer> named = new HashMap<>();
        for (BatchContent.Row r : c.rows()) {
            named.merge(r.name(), 1, Integer::sum);
        }
        for (BatchContent.Row r : c.rows()) {
            table.row(row(named.get(r.name()) > 1 ? fileName(r) : r.name(), BatchContent.profile(c.rules(),
                    r.profile()), r));
        }
        table.end();
    }

    /** The part's title and its paragraph on a new page, for a table of {@code wafers} rows: the table to fill. */
    static ReportFlow.Table start(ReportFlow flow, int wafers) throws IOException {
        flow.part("Every wafer");
        flow.paragraph("All " + wafers + " wafers in the order of results.csv. Lifetime in " + Typeset.US
                + "; trap density in " + Typeset.PER_CM3 + " of the defect named (the profile's); flagged area as a"
                + " share of the evaluated area;"
                + " worst region: " + WORST_REGION + ".",
                PdfPage.REGULAR, 8);
        float[] w = {70, 54, 32, 28, 100, 42, 62, 36, 99};
        return flow.table(w, new boolean[] {false, false, false, false, false, true, true, true, false}, HEADER, 7);
    }

    /** The wafer id, or the file name when several rows carry that id (two states of one wafer). */
    static String name(BatchContent c, BatchContent.Row r) {
        long same = c.rows().stream().filter(o -> o.name().equals(r.name())).count();
        return same > 1 ? fileName(r) : r.name();
    }

    /** {@link #name(BatchContent, BatchContent.Row)} of any row of {@code c}, its ids counted once. */
    static java.util.function.Function<BatchContent.Row, String> names(BatchContent c) {
        Map<String, Integer> named = new HashMap<>();
        for (BatchContent.Row r : c.rows()) {
            named.merge(r.name(), 1, Integer::sum);
        }
        return r -> named.getOrDefault(r.name(), 0) > 1 ? fileName(r) : r.name();
    }

    private static String fileName(BatchContent.Row r) {
        return java.nio.file.Path.of(r.file()).getFileName().toString();
    }

    /** The position of the worst region, "(x, y)" in mm to 0.1 mm. */
    static String position(BatchContent.Row r) {
        return String.format(java.util.Locale.ROOT, "(%.1f, %.1f)", r.worstXMm(), r.worstYMm()).replace("-0.0", "0.0");
    }

    static String[] row(BatchContent c, BatchContent.Row r) {
        return row(name(c, r), c.profile(r.profile()), r);
    }

    /** The cells of {@code r} named {@code name}, judged by profile {@code p} (null: unknown). */
    static String[] row(String name, Rules.Profile p, BatchContent.Row r) {
        if (!r.inspected()) {
            return new String[] {name, "", "error", "", r.error().isEmpty() ? "no reason given" : r.error(), "",
                "", "", ""};
        }
        double nt = r.figure("trap_density_p95_cm3");
        String region = "none";
        if (Double.isFinite(r.worstAreaMm2())) {
            String unit = p == null ? "" : p.flag().regionUnit();
            region = Labels.number(r.worstAreaMm2()) + " " + Typeset.MM2 + " at " + position(r) + ", peak "
                    + Labels.number(r.worstPeak(), unit);
        }
        return new String[] {name, r.profile(), r.status(), r.grade(), String.join(", ", r.failed().stream().map(trapmap.maps.batch.Figure::readable).toList()),
            Labels.number(r.figure("harmonic_mean_lifetime_us")),
            Double.isNaN(nt) ? "" : Labels.number(nt) + (r.defect().isEmpty() ? "" : " " + r.defect()),
            Labels.percent(r.figure("flagged_area_fraction")), region};
    }
}
