package trapmap.viewer.report;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.ByteArrayOutputStream;
import java.util.ArrayList;
import java.util.List;
import org.apache.pdfbox.Loader;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.text.PDFTextStripper;
import org.junit.jupiter.api.Test;
import trapmap.maps.batch.Rules;

/** The page layout of the reports and the criteria in words. */
class ReportFlowTest {
    private static String page(PDDocument doc, int p) throws Exception {
        PDFTextStripper s = new PDFTextStripper();
        s.setStartPage(p);
        s.setEndPage(p);
        return s.getText(doc);
    }

    @Test
    void longTableRunsOverPagesWithItsHeaderOnEachAndNoRowLost() throws Exception {
        List<String[]> rows = new ArrayList<>();
        for (int i = 1; i <= 150; i++) {
            rows.add(new String[] {"row-" + i, "a long cell that has to wrap onto a second line in its column"});
        }
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        try (PDDocument doc = new PDDocument(); ReportFlow flow = new ReportFlow(doc)) {
            flow.part("Table");
            flow.table(new float[] {80, 120}, null, new String[] {"name", "note"}, rows, 8);
            flow.close();
            doc.save(bytes);
        }
        try (PDDocument doc = Loader.loadPDF(bytes.toByteArray())) {
            assertThat(doc.getNumberOfPages()).isGreaterThan(2);
            StringBuilder all = new StringBuilder();
            for (int p = 1; p <= doc.getNumberOfPages(); p++) {
                String t = page(doc, p);
                assertThat(t).as("page " + p).contains("name", "note");
                if (p > 1) {
                    assertThat(t).as("page " + p).contains("Table (continued)");
                }
                all.append(t);
            }
            for (int i = 1; i <= 150; i++) {
                assertThat(all.toString()).contains("row-" + i + " a long cell");
            }
        }
    }

    @Test
    void aShortTableThatDoesNotFitTheRestOfThePageStartsOnTheNextWhole() throws Exception {
        List<String[]> rows = new ArrayList<>();
        for (int i = 1; i <= 6; i++) {
            rows.add(new String[] {"row-" + i, "value " + i});
        }
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        try (PDDocument doc = new PDDocument(); ReportFlow flow = new ReportFlow(doc)) {
            flow.part("Table");
            flow.down(ReportFlow.BOTTOM - flow.y() - 60); // 60 points left: the header and about two rows
            flow.paragraph("filler", PdfPage.REGULAR, 8);
            flow.table(new float[] {80, 120}, null, new String[] {"name", "note"}, rows, 8);
            flow.close();
            doc.save(bytes);
        }
        try (PDDocument doc = Loader.loadPDF(bytes.toByteArray())) {
            assertThat(doc.getNumberOfPages()).isEqualTo(2);
            assertThat(page(doc, 1)).contains("filler").doesNotContain("name", "row-");
            String second = page(doc, 2);
            assertThat(second).contains("Table (continued)", "name note");
            for (int i = 1; i <= 6; i++) {
                assertThat(second).contains("row-" + i + " value " + i);
            }
        }
    }

    @Test
    void overlongWordsBreakAfterAnUnderscore() {
        List<String> lines = PdfPage.wrap("failed: largest_interior_region_mm2", PdfPage.REGULAR, 8, 60);
        assertThat(lines).allSatisfy(l -> assertThat(PdfPage.width(l, PdfPage.REGULAR, 8)).isLessThanOrEqualTo(60));
        assertThat(String.join("", lines).replace(" ", "")).isEqualTo("failed:largest_interior_region_mm2");
        assertThat(lines.stream().filter(l -> l.endsWith("_")).count()).isPositive();
    }

    @Test
    void criteriaInWordsNameTheProfilesOwnDefectFlagAndLimits() throws Exception {
        Rules rules = Rules.parse("""
                {"defect": "fe-i",
                 "flag": {"quantity": "trap-density", "threshold": 3e11, "min_area_mm2": 4},
                 "limits": {"trap_density_p95_cm3": {"max": 4e11}},
                 "grades": [{"grade": "A", "when": {"flagged_area_fraction": {"max": 0.05}}}, {"grade": "B"}],
                 "fail_grade": "R",
                 "profiles": [{"name": "n-type", "match": {"type": "n"}, "defect": "midgap",
                               "flag": {"quantity": "trap-density", "threshold": 1e12, "min_area_mm2": 4},
                               "limits": {"trap_density_p95_cm3": {"max": 1e12}}}]}
                """, "rules.json");
        Rules.Profile n = rules.profiles().get(0);
        assertThat(Criteria.judges(n)).isEqualTo("n-type maps");
        assertThat(Criteria.judges(rules.defaultProfile())).isEqualTo("every map no other profile matches");
        assertThat(Criteria.flag(n)).isEqualTo("trap density above 1e12 cm⁻³ (midgap), regions of at least 4 mm²");
        assertThat(Criteria.grades(rules.defaultProfile()))
                .isEqualTo("A when flagged area fraction ≤ 0.05; otherwise B. Failed wafers: R.");
        // each profile's histogram carries its own limits and its own defect on the axis
        assertThat(DistributionChart.limits(n, "trap_density_p95_cm3")).containsExactly(1e12);
        assertThat(DistributionChart.limits(rules.defaultProfile(), "trap_density_p95_cm3")).containsExactly(4e11);
        assertThat(DistributionChart.of("trap_density_p95_cm3", "midgap", new double[] {5e11, 8e11},
                DistributionChart.limits(n, "trap_density_p95_cm3")).getXYPlot().getDomainAxis().getLabel())
                .isEqualTo("trap density P95 (cm⁻³, midgap)");
    }
}
