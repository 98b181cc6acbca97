package trapmap.viewer.ui;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.ColourMap;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.viewer.report.WaferReport;
import trapmap.viewer.graphics.DisplayStyle;
import trapmap.viewer.model.DisplayedQuantity;
import trapmap.viewer.model.ViewerModel;
import trapmap.viewer.model.WaferAnalysis;

/** The window's exports, built from model results without a display. */
class ViewerExportsTest {
    private static final Path W03 = Path.of("..", "demo-data", "LOT-A01-W03.tif").toAbsolutePath().normalize();

    private static ViewerModel analysed(DisplayedQuantity q) {
        ViewerModel m = new ViewerModel();
        m.open(List.of(W03));
        m.setAnalysis(m.analysis().withQuantity(q), "quantity");
        m.compute(0, () -> false);
        return m;
    }

    @Test
    void regionsCsvListsEveryRegionWithUnitsInTheHeader() throws Exception {
        ViewerModel m = analysed(DisplayedQuantity.TRAP_DENSITY);
        WaferAnalysis r = m.wafer(0).result();
        String csv = ViewerExports.regionsCsv(r);
        List<CSVRecord> rows = CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).get()
                .parse(new java.io.StringReader(csv)).getRecords();
        assertThat(csv).startsWith("id,area_mm2,centroid_x_mm,centroid_y_mm,peak_cm-3,");
        assertThat(rows).hasSize(r.regions().size()).isNotEmpty();
        assertThat(Double.parseDouble(rows.get(0).get("area_mm2")))
                .isEqualTo(trapmap.maps.io.NumberText.roundMm2(r.regions().regions().get(0).areaMm2()));
        for (CSVRecord row : rows) {
            for (String c : List.of("area_mm2", "centroid_x_mm", "centroid_y_mm", "peak_x_mm", "peak_y_mm",
                    "edge_distance_mm")) {
                assertThat(row.get(c)).as(c).matches("-?\\d+(\\.\\d{0,2}[1-9])?");
            }
            assertThat(row.get("peak_cm-3")).isEqualTo(trapmap.maps.io.NumberText.of(Float.parseFloat(
                    row.get("peak_cm-3"))));
        }
    }

    @Test
    void reportOfTheShownResultsIsAPdf(@TempDir Path dir) throws Exception {
        ViewerModel m = analysed(DisplayedQuantity.TRAP_DENSITY);
        WaferAnalysis r = m.wafer(0).result();
        WaferReport.Content page = ViewerExports.reportContent(m.wafer(0), r, new DisplayStyle(ColourMap.HEAT, true,
                1e10, 1e12), m.defect());
        assertThat(page.defect().id()).isEqualTo("fe-i");
        assertThat(page.regions()).isSameAs(r.regions());
        assertThat(page.judgement().pass()).isEqualTo(r.pass());
        assertThat(page.judgement().headline()).isEqualTo("Quick threshold check: " + (r.pass() ? "PASS" : "FAIL")
                + " (not a rules verdict)");
        assertThat(page.judgement().rows()).anySatisfy(row -> assertThat(row[1]).contains("above 3e11 cm⁻³"));
        Path pdf = dir.resolve("w03.pdf");
        WaferReport.write(page, pdf);
        assertThat(new String(Files.readAllBytes(pdf), 0, 5, java.nio.charset.StandardCharsets.US_ASCII))
                .isEqualTo("%PDF-");
        try (org.apache.pdfbox.pdmodel.PDDocument doc = org.apache.pdfbox.Loader.loadPDF(pdf.toFile())) {
            String text = new org.apache.pdfbox.text.PDFTextStripper().getText(doc);
            assertThat(text).contains("Quick threshold check: " + (r.pass() ? "PASS" : "FAIL")
                    + " (not a rules verdict)").doesNotContain("grade");
        }
    }

    @Test
    void convertedMapExportsReadBackWithTheirMetadata(@TempDir Path dir) throws Exception {
        WaferAnalysis r = analysed(DisplayedQuantity.TRAP_DENSITY).wafer(0).result();
        Path tif = dir.resolve("w03-nt.tif");
        ViewerExports.writeMap(r, tif);
        WaferMap back = MapFiles.readSingle(tif);
        assertThat(back.quantity()).isEqualTo(Quantity.TRAP_DENSITY);
        assertThat(back.raster().samples()).containsExactly(r.displayed().raster().samples());
        assertThat(back.waferId()).isEqualTo(r.displayed().waferId());
        assertThat(back.conditions()).isEqualTo(r.displayed().conditions());
        Path csv = dir.resolve("w03-nt.csv");
        ViewerExports.writeMap(r, csv);
        assertThat(Files.readAllLines(csv)).anySatisfy(l -> assertThat(l).startsWith("x_mm,y_mm,"));
        assertThat(MapFiles.readSingle(csv).raster().size()).isEqualTo(r.displayed().raster().size());
        try (var files = Files.list(dir)) {
            assertThat(files.map(f -> f.getFileName().toString())).noneMatch(n -> n.endsWith(".tmp"));
        }
    }

    @Test
    void statisticsCsvHoldsTheShownStatisticsAndTheRulesVerdict() throws Exception {
        ViewerModel m = new ViewerModel();
        m.open(List.of(W03));
        m.loadRules(W03.resolveSibling("rules-example.json"));
        m.setAnalysis(m.analysis().withQuantity(DisplayedQuantity.TRAP_DENSITY), "quantity");
        WaferAnalysis r = m.compute(0, () -> false);
        java.util.Map<String, CSVRecord> rows = new java.util.HashMap<>();
        for (CSVRecord row : CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).get()
                .parse(new java.io.StringReader(ViewerExports.statisticsCsv(r)))) {
            rows.put(row.get("statistic"), row);
        }
        // quantiles of the float map at float precision, means as the double itself
        assertThat(Float.parseFloat(rows.get("median").get("value"))).isEqualTo((float) r.displayedStats().median());
        assertThat(Double.parseDouble(rows.get("harmonic_mean").get("value")))
                .isEqualTo(r.displayedStats().harmonicMean());
        assertThat(rows.get("median").get("unit")).isEqualTo("cm-3");
        assertThat(Float.parseFloat(rows.get("p95").get("value")))
                .isEqualTo((float) r.displayedStats().percentile(95));
        assertThat(rows.get("judged_by").get("value")).isEqualTo("rules rules-example.json");
        assertThat(rows.get("verdict").get("value")).isEqualTo("pass");
        assertThat(rows.get("grade").get("value")).isEqualTo("B");
        assertThat(rows.get("graded_down_by").get("value")).isEqualTo("trap_density_p95_cm3;flagged_area_fraction");
        assertThat(Float.parseFloat(rows.get("figure trap_density_p95_cm3").get("value")))
                .isEqualTo(r.verdict().figures().get("trap_density_p95_cm3").floatValue());
        for (CSVRecord row : rows.values()) {
            String v = row.get("value");
            if (v.matches("-?[0-9].*")) {
                assertThat(v).as(row.get("statistic")).isEqualTo(trapmap.maps.io.NumberText.of(Double.parseDouble(v)));
            }
        }
    }
}
