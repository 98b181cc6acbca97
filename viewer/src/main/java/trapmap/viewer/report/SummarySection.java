package trapmap.viewer.report;

import java.awt.Color;
import java.io.IOException;
import java.time.format.DateTimeFormatter;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import trapmap.maps.batch.Rules;
import trapmap.maps.model.Caution;
import trapmap.viewer.graphics.Labels;

/** The first page: yield, grades, the profiles that judged the wafers and what the document holds. */
final class SummarySection {
    static final DateTimeFormatter DATE = DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm z", Locale.ROOT);
    static final Color PASS = new Color(0x2E7D32);
    static final Color FAIL = new Color(0xC62828);

    private SummarySection() {
    }

    static String share(long k, long n) {
        return n == 0 ? "n/a" : Labels.percent((double) k / n);
    }

    static void draw(ReportFlow flow, BatchContent c) throws IOException {
        float left = ReportFlow.LEFT;
        float full = ReportFlow.FULL;
        flow.part("Batch inspection summary");
        PdfPage p = flow.page();
        p.text(PdfPage.fit(c.rows().size() + " wafers - results in " + c.outputDir() + " - "
                + DATE.format(c.created()), PdfPage.REGULAR, 9, full), left, flow.y() - 2, PdfPage.REGULAR, 9,
                PdfPage.MUTED);
        flow.down(16);
        float y = flow.y();

        long n = c.rows().size();
        long pass = c.count("pass");
        long fail = c.count("fail");
        long error = n - pass - fail;
        float half = (full - 16) / 2;
        p.heading("Yield", left, y, half);
        List<String[]> yield = new ArrayList<>();
        yield.add(new String[] {"status", "wafers", "share"});
        yield.add(new String[] {"pass", Long.toString(pass), share(pass, n)});
        yield.add(new String[] {"fail", Long.toString(fail), share(fail, n)});
        yield.add(new String[] {"error (not inspected)", Long.toString(error), share(error, n)});
        yield.add(new String[] {"all", Long.toString(n), n == 0 ? "n/a" : "100.0 %"});
        float h1 = p.table(left, y + 20, new float[] {half * 0.5f, half * 0.25f, half * 0.25f},
                new boolean[] {false, true, true}, yield, 9, true);
        p.text("Yield " + share(pass, n) + " (pass over all inspected files)", left, y + 24 + h1, PdfPage.BOLD,
                10, pass == n ? PASS : FAIL);
        p.text(error == 0 ? "Every file was read and inspected." : error + " file" + (error == 1 ? "" : "s")
                + " could not be inspected: see the last pages.", left, y + 38 + h1, PdfPage.REGULAR, 8.5f,
                PdfPage.MUTED);

        float gx = left + half + 16;
        p.heading("Grades", gx, y, half);
        Map<String, Long> grades = new TreeMap<>();
        for (BatchContent.Row r : c.rows()) {
            if (r.inspected()) {
                grades.merge(r.grade().isEmpty() ? "(none)" : r.grade(), 1L, Long::sum);
            }
        }
        List<String[]> g = new ArrayList<>();
        g.add(new String[] {"grade", "wafers", "share"});
        grades.forEach((k, v) -> g.add(new String[] {k, Long.toString(v), share(v, n)}));
        if (grades.isEmpty()) {
            g.add(new String[] {"no graded wafers", "", ""});
        }
        float h2 = p.table(gx, y + 20, new float[] {half * 0.5f, half * 0.25f, half * 0.25f},
                new boolean[] {false, true, true}, g, 9, true);
        flow.down(20 + Math.max(h1 + 32, h2) + 10);

        criteria(flow, c);
        contents(flow, c);
        flow.caution(Caution.TEXT);
    }

    /** One line per profile that judged wafers: what it judges, its defect and flag, and its outcome. */
    private static void criteria(ReportFlow flow, BatchContent c) throws IOException {
        Map<String, List<BatchContent.Row>> groups = c.byProfile();
        flow.heading("Criteria: " + groups.size() + " profile" + (groups.size() == 1 ? "" : "s")
                + " judged these wafers", 60);
        flow.paragraph("Each wafer is judged by the first profile of the rules that matches it, else by the"
                + " default profile; each profile has its own defect, flag, limits and grades (a section for each"
                + " follows).", PdfPage.REGULAR, 8.5f);
        if (c.rules() != null) {
            flow.paragraph("Each map is converted at its own doping (" + Typeset.PER_CM3 + ", or from the resistivity"
                    + " in " + Typeset.OHM_CM + "), thickness, temperature and injection level " + Typeset.DELTA_N
                    + " as its sidecar gives them. Physics settings of every conversion: "
                    + c.rules().physics().oneLine() + ".", PdfPage.REGULAR, 8.5f);
        }
        List<String[]> rows = new ArrayList<>();
        for (Map.Entry<String, List<BatchContent.Row>> e : groups.entrySet()) {
            Rules.Profile prof = c.profile(e.getKey());
            long pass = e.getValue().stream().filter(r -> r.status().equals("pass")).count();
            rows.add(new String[] {e.getKey().isEmpty() ? "(none)" : e.getKey(),
                Integer.toString(e.getValue().size()), prof == null ? "unknown (no rules)" : Criteria.judges(prof),
                prof == null ? defects(e.getValue()) : prof.defectId() == null ? "none" : prof.defectId(),
                prof == null ? "" : Criteria.flag(prof), Long.toString(pass),
                Long.toString(e.getValue().size() - pass)});
        }
        float f = ReportFlow.FULL;
        flow.table(new float[] {f * 0.15f, f * 0.07f, f * 0.25f, f * 0.09f, f * 0.30f, f * 0.07f, f * 0.07f},
                new boolean[] {false, true, false, false, false, true, true},
                new String[] {"profile", "wafers", "judges", "defect", "flagged", "pass", "fail"}, rows, 8);
        if (c.rules() != null) {
            List<String> unused = c.rules().allProfiles().stream().map(Rules.Profile::name)
                    .filter(k -> !groups.containsKey(k)).toList();
            if (!unused.isEmpty()) {
                flow.paragraph("Profiles of the rules that judged no wafer: " + String.join(", ", unused) + ".",
                        PdfPage.REGULAR, 8);
            }
        }
    }

    private static String defects(List<BatchContent.Row> rows) {
        return String.join(", ", rows.stream().map(BatchContent.Row::defect).filter(d -> !d.isEmpty()).distinct()
                .toList());
    }

    private static void contents(ReportFlow flow, BatchContent c) throws IOException {
        long failed = c.count("fail");
        int shown = Math.min(FailedWafersSection.SHOWN, (int) failed);
        long errors = c.rows().stream().filter(r -> !r.inspected()).count();
        int iron = IronSection.pairs(c).size();
        flow.heading("In this document", 40);
        flow.paragraph("Per profile: its criteria, wafers and the distribution of each figure with the profile's"
                + " limits. Every wafer: one row each (" + c.rows().size() + "). Failed wafers, worst first: "
                + (failed == 0 ? "none failed." : "showing " + shown + " of " + failed + " failed wafers.")
                + (iron == 0 ? "" : " Interstitial iron: " + iron + " FeB pair" + (iron == 1 ? "" : "s") + ".")
                + " Recurrence: " + c.recurrence().size() + " wafer famil" + (c.recurrence().size() == 1 ? "y"
                : "ies") + " with their hot spots." + (errors == 0 ? "" : " Files not inspected: " + errors + "."),
                PdfPage.REGULAR, 8.5f);
    }
}
