package trapmap.viewer.report;

import java.io.IOException;
import java.util.ArrayList;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeMap;
import trapmap.maps.batch.Figure;
import trapmap.maps.batch.Rules;
import trapmap.viewer.graphics.ChartExport;
import trapmap.viewer.graphics.Labels;

/**
 * One section per profile that judged wafers: which wafers, the defect, the flag, the limits and grades, the
 * outcome, and the distribution of each figure over the profile's wafers with the profile's limits (a histogram per
 * figure; a table of the values when the profile judged fewer than {@value #HISTOGRAM_FROM} wafers).
 */
final class ProfileSection {
    /** Fewest wafers shown as histograms; fewer are listed with their values. */
    static final int HISTOGRAM_FROM = 5;
    /** Wafer names listed in the section; the wafer table has them all. */
    static final int NAMES_SHOWN = 40;
    /** Wafers a values table has columns for. */
    static final int VALUE_COLUMNS = 4;
    private static final float CHART_H = 112;

    private ProfileSection() {
    }

    static void drawAll(ReportFlow flow, BatchContent c) throws IOException {
        boolean first = true;
        for (Map.Entry<String, List<BatchContent.Row>> e : c.byProfile().entrySet()) {
            if (first) {
                flow.section("Criteria and distributions per profile", 260);
                first = false;
            }
            draw(flow, c, e.getKey(), e.getValue());
        }
    }

    static void draw(ReportFlow flow, BatchContent c, String name, List<BatchContent.Row> rows) throws IOException {
        Rules.Profile p = c.profile(name);
        String defect = p == null ? String.join(", ", rows.stream().map(BatchContent.Row::defect)
                .filter(d -> !d.isEmpty()).distinct().toList()) : p.defectId() == null ? "" : p.defectId();
        flow.heading("Profile " + (name.isEmpty() ? "(none)" : name) + ": " + rows.size() + " wafer"
                + (rows.size() == 1 ? "" : "s") + (defect.isEmpty() ? "" : ", defect " + defect), 120);
        if (p == null) {
            flow.paragraph("The rules were not given to the report: the criteria of this profile are not shown.",
                    PdfPage.REGULAR, 8.5f);
        } else {
            flow.paragraph("Judges: " + Criteria.judges(p) + ". Flagged: " + Criteria.flag(p) + ".",
                    PdfPage.REGULAR, 8.5f);
            List<String[]> limits = new ArrayList<>();
            for (Rules.Limit l : p.limits()) {
                limits.add(new String[] {l.figure().what(), Criteria.limit(l)});
            }
            if (limits.isEmpty()) {
                flow.paragraph("Limits: none (every readable wafer passes).", PdfPage.REGULAR, 8.5f);
            } else {
                float f = ReportFlow.FULL;
                flow.table(new float[] {f * 0.4f, f * 0.3f}, new boolean[] {false, false},
                        new String[] {"limit on", "pass when"}, limits, 8);
            }
            flow.paragraph("Grades: " + Criteria.grades(p), PdfPage.REGULAR, 8.5f);
        }
        long pass = rows.stream().filter(r -> r.status().equals("pass")).count();
        Map<String, Long> grades = new TreeMap<>();
        rows.forEach(r -> grades.merge(r.grade().isEmpty() ? "(none)" : r.grade(), 1L, Long::sum));
        List<String> g = new ArrayList<>();
        grades.forEach((k, v) -> g.add(k + " " + v));
        flow.paragraph("Outcome: " + pass + " pass, " + (rows.size() - pass) + " fail; grades " + String.join(", ", g)
                + ".", PdfPage.BOLD, 8.5f);
        List<String> names = rows.stream().map(WaferTable.names(c)).toList();
        String list = String.join(", ", names.subList(0, Math.min(NAMES_SHOWN, names.size())));
        flow.paragraph("Wafers: " + list + (names.size() > NAMES_SHOWN ? "; showing " + NAMES_SHOWN + " of "
                + names.size() + " (every wafer is in the wafer table)." : "."), PdfPage.REGULAR, 8);
        List<String> figures = figures(p, rows);
        if (rows.size() >= HISTOGRAM_FROM) {
            histograms(flow, p, defect, figures, rows);
        } else {
            values(flow, p, defect, figures, rows);
        }
    }

    /** The profile's figures (all the rules name for it), or those the rows have values for. */
    static List<String> figures(Rules.Profile p, List<BatchContent.Row> rows) {
        Set<String> out = new LinkedHashSet<>();
        if (p != null) {
            p.figures().stream().map(Figure::name).forEach(out::add);
        } else {
            rows.forEach(r -> r.figures().forEach((k, v) -> {
                if (Double.isFinite(v)) {
                    out.add(k);
                }
            }));
        }
        return List.copyOf(out);
    }

    private static void histograms(ReportFlow flow, Rules.Profile p, String defect, List<String> figures,
                                   List<BatchContent.Row> rows) throws IOException {
        flow.need(CHART_H + 18);
        flow.paragraph("Distributions over the " + rows.size() + " wafers of this profile (red lines: its limits).",
                PdfPage.REGULAR, 8.5f);
        float cw = (ReportFlow.FULL - 12) / 2;
        for (int i = 0; i < figures.size(); i += 2) {
            flow.need(CHART_H);
            for (int k = i; k < Math.min(i + 2, figures.size()); k++) {
                String f = figures.get(k);
                double[] v = rows.stream().mapToDouble(r -> r.figure(f)).toArray();
                flow.image(ChartExport.image(DistributionChart.of(f, defect, v, DistributionChart.limits(p, f)),
                        (int) cw, (int) CHART_H, BatchReport.SCALE), ReportFlow.LEFT + (k - i) * (cw + 12), cw,
                        CHART_H);
            }
            flow.down(CHART_H + 6);
        }
    }

    private static void values(ReportFlow flow, Rules.Profile p, String defect, List<String> figures,
                               List<BatchContent.Row> rows) throws IOException {
        List<BatchContent.Row> shown = rows.subList(0, Math.min(VALUE_COLUMNS, rows.size()));
        String lead = "Figures of the " + (rows.size() == 1 ? "wafer" : rows.size() + " wafers") + " of this"
                + " profile with its limits (too few wafers for a distribution)"
                + (rows.size() > shown.size() ? "; showing " + shown.size() + " of " + rows.size() : "") + ".";
        float f = ReportFlow.FULL;
        float first = f * 0.36f;
        float lim = f * 0.16f;
        float col = (f - first - lim) / VALUE_COLUMNS;
        float[] widths = new float[2 + shown.size()];
        boolean[] right = new boolean[widths.length];
        String[] header = new String[widths.length];
        widths[0] = first;
        widths[1] = lim;
        header[0] = "figure";
        header[1] = "limits";
        for (int k = 0; k < shown.size(); k++) {
            widths[2 + k] = col;
            right[2 + k] = true;
            header[2 + k] = shown.get(k).name();
        }
        List<String[]> table = new ArrayList<>();
        for (String fig : figures) {
            String[] row = new String[widths.length];
            row[0] = DistributionChart.label(fig, defect);
            row[1] = p == null ? "" : DistributionChart.limitText(p, fig);
            for (int k = 0; k < shown.size(); k++) {
                BatchContent.Row r = shown.get(k);
                double v = r.figure(fig);
                row[2 + k] = Labels.number(v) + (r.failed().stream().anyMatch(x -> x.equals(fig)
                        || x.startsWith(fig + " ")) ? " (fails)" : "");
            }
            table.add(row);
        }
        // the sentence stays with its table, the table on one page where it fits one
        flow.keep(flow.paragraphHeight(lead, PdfPage.REGULAR, 8.5f) + ReportFlow.tableHeight(widths, header, table,
                7.5f));
        flow.paragraph(lead, PdfPage.REGULAR, 8.5f);
        flow.table(widths, right, header, table, 7.5f);
    }
}
