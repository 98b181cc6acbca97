package trapmap.viewer.report;

import static org.assertj.core.api.Assertions.assertThat;
import static org.junit.jupiter.api.Assertions.assertTimeoutPreemptively;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.ZoneOffset;
import java.time.ZonedDateTime;
import java.util.BitSet;
import java.util.List;
import org.apache.pdfbox.Loader;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.rendering.PDFRenderer;
import org.apache.pdfbox.text.PDFTextStripper;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.geometry.WaferFormat;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.maps.region.RegionCriteria;
import trapmap.maps.region.RegionTable;
import trapmap.maps.region.ThresholdRegions;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

/** Wafer report PDFs open, have one page per wafer, carry the expected text and render. */
class WaferReportTest {
    @BeforeAll
    static void headless() {
        System.setProperty("java.awt.headless", "true");
    }

    /** A 156 mm square wafer at 1 mm with a low-lifetime spot (12 µs) in a 150 µs background. */
    static WaferMap wafer(String id) {
        int n = 160;
        float[] s = new float[n * n];
        PixelGrid g = PixelGrid.centred(n, n, 1);
        for (int y = 0; y < n; y++) {
            for (int x = 0; x < n; x++) {
                double xm = g.xMm(x);
                double ym = g.yMm(y);
                boolean inside = Math.abs(xm) <= 78 && Math.abs(ym) <= 78;
                double spot = Math.hypot(xm - 30, ym + 20) < 10 ? 12 : 150 + 10 * Math.sin(xm / 9);
                s[y * n + x] = inside ? (float) spot : Float.NaN;
            }
        }
        MeasurementConditions c = new MeasurementConditions(Doping.pType(1.5e16), 180.0, 300.0, 1e14, null, 10.0,
                null, null, null);
        return new WaferMap(FloatRaster.wrap(n, n, s), g, Quantity.EFFECTIVE_LIFETIME, id, c, Provenance.of("test"));
    }

    static WaferReport.Content content(String id) {
        WaferMap m = wafer(id);
        WaferShape shape = WaferFormat.byId("m2").shape();
        Mask mask = shape.mask(m.grid(), 2).and(Mask.valid(m.raster()));
        RegionCriteria crit = RegionCriteria.below(20, 4);
        RegionTable regions = ThresholdRegions.find(m, mask, crit, shape);
        BitSet flagged = new BitSet();
        float[] s = m.raster().samples();
        for (int i = 0; i < s.length; i++) {
            if (mask.containsIndex(i) && crit.selects(s[i])) {
                flagged.set(i);
            }
        }
        return WaferReport.Content.of(m, "/data/" + id + ".tif")
                .withCreated(ZonedDateTime.of(2026, 3, 4, 10, 30, 0, 0, ZoneOffset.UTC))
                .withStatisticsMask(mask).withFlags(20, flagged, regions).withOutline(shape, 2)
                .withDefect(DefectLibrary.byId("fe-i")).withNotes(List.of("converted at 1e14 cm⁻³"));
    }

    @Test
    void onePagePerWaferWithIdStatisticsDefectAndCaution(@TempDir Path dir) throws IOException {
        Path pdf = dir.resolve("report.pdf");
        WaferReport.write(List.of(content("W-0001"), content("W-0002")), pdf);
        try (PDDocument doc = Loader.loadPDF(pdf.toFile())) {
            assertThat(doc.getNumberOfPages()).isEqualTo(2);
            PDFTextStripper strip = new PDFTextStripper();
            strip.setStartPage(1);
            strip.setEndPage(1);
            String first = strip.getText(doc).replaceAll("\\s+", " ");
            assertThat(first).contains("Wafer W-0001", "/data/W-0001.tif", "2026-03-04", "harmonic mean",
                    "Measurement settings", "p-type", "180 µm", "fe-i", "Istratov", "Flagged regions",
                    "1 region with values below 20 µs", "converted at 1e14 cm⁻³");
            assertThat(first).contains("Equivalent density assumes one dominant defect; verify with an independent"
                    + " method before scrapping material; follow site procedures.");
            assertThat(first).doesNotContain("W-0002");
            strip.setStartPage(2);
            strip.setEndPage(2);
            assertThat(strip.getText(doc)).contains("Wafer W-0002");
            BufferedImage page = new PDFRenderer(doc).renderImageWithDPI(0, 30);
            assertThat(page.getWidth()).isEqualTo(248); // A4 is 8.27 in wide
        }
        try (var s = Files.list(dir)) {
            assertThat(s.map(p -> p.getFileName().toString()).toList()).containsExactly("report.pdf");
        }
    }

    @Test
    void aMapWithoutDataStillGivesAPage(@TempDir Path dir) throws IOException {
        float[] s = new float[16];
        java.util.Arrays.fill(s, Float.NaN);
        WaferMap empty = new WaferMap(FloatRaster.wrap(4, 4, s), PixelGrid.centred(4, 4, 1), Quantity.TRAP_DENSITY,
                "W-EMPTY", MeasurementConditions.UNKNOWN, Provenance.of("test"));
        Path pdf = dir.resolve("empty.pdf");
        WaferReport.write(WaferReport.Content.of(empty, ""), pdf);
        try (PDDocument doc = Loader.loadPDF(pdf.toFile())) {
            assertThat(doc.getNumberOfPages()).isEqualTo(1);
            assertThat(new PDFTextStripper().getText(doc)).contains("Wafer W-EMPTY", "pixels counted",
                    "No region search was made.", "doping", "unknown");
        }
    }

    /** A hang guard only: the checks are on the result. */
    private static final Duration HANG_GUARD = Duration.ofSeconds(10);

    @Test
    void aVeryLongNameIsCutToTheWidthWithDots() {
        String id = "W" + "7".repeat(49_999);
        String cut = assertTimeoutPreemptively(HANG_GUARD, () -> PdfPage.fit(id, PdfPage.BOLD, 10, 120));
        assertThat(cut).endsWith("...").hasSizeLessThan(60);
        assertThat(id).startsWith(cut.substring(0, cut.length() - 3));
        assertThat(PdfPage.width(cut, PdfPage.BOLD, 10)).isLessThanOrEqualTo(120f);
        // the longest cut that fits: one character more does not
        String longer = id.substring(0, cut.length() - 2) + "...";
        assertThat(PdfPage.width(longer, PdfPage.BOLD, 10)).isGreaterThan(120f);
        String huge = "x".repeat(15 << 20);
        String hugeCut = assertTimeoutPreemptively(HANG_GUARD, () -> PdfPage.fit(huge, PdfPage.REGULAR, 8, 300));
        assertThat(hugeCut).endsWith("...");
        assertThat(PdfPage.width(hugeCut, PdfPage.REGULAR, 8)).isLessThanOrEqualTo(300f);
    }

    @Test
    void fitKeepsWhatFitsAndCutsLikeTheCharacterByCharacterRule() {
        java.util.Random r = new java.util.Random(11);
        String letters = "iIlmMW._-0 Δτ";
        for (int t = 0; t < 300; t++) {
            StringBuilder b = new StringBuilder();
            int n = r.nextInt(60);
            for (int i = 0; i < n; i++) {
                b.append(letters.charAt(r.nextInt(letters.length())));
            }
            String s = b.toString();
            float width = 5 + r.nextInt(150);
            String expected = s;
            if (PdfPage.width(s, PdfPage.REGULAR, 9) > width) {
                String c = s;
                while (c.length() > 1 && PdfPage.width(c + "...", PdfPage.REGULAR, 9) > width) {
                    c = c.substring(0, c.length() - 1);
                }
                expected = c + "...";
            }
            assertThat(PdfPage.fit(s, PdfPage.REGULAR, 9, width)).as("'%s' in %s pt", s, width).isEqualTo(expected);
        }
    }

    @Test
    void aVeryLongWordIsWrappedIntoPiecesThatFitAndATableCellIsCut() {
        String word = "lot_" + "8".repeat(49_996);
        List<String> lines = assertTimeoutPreemptively(HANG_GUARD, () -> PdfPage.wrap(word, PdfPage.REGULAR, 8,
                200));
        assertThat(String.join("", lines)).isEqualTo(word);
        assertThat(lines).allSatisfy(l -> assertThat(PdfPage.width(l, PdfPage.REGULAR, 8)).isLessThanOrEqualTo(200f));
        assertThat(lines.get(0)).isEqualTo("lot_");
        List<String> cell = PdfPage.wrap(word, PdfPage.REGULAR, 8, 200, ReportFlow.MAX_CELL_LINES);
        assertThat(cell).hasSize(ReportFlow.MAX_CELL_LINES);
        assertThat(cell.get(cell.size() - 1)).endsWith("...");
    }

    @Test
    void aReportOfAWaferWithA50000CharacterIdHasOnePageWithTheIdCut(@TempDir Path dir) throws IOException {
        String id = "W" + "5".repeat(49_999);
        Path pdf = dir.resolve("long.pdf");
        assertTimeoutPreemptively(HANG_GUARD, () -> WaferReport.write(content(id), pdf));
        try (PDDocument doc = Loader.loadPDF(pdf.toFile())) {
            assertThat(doc.getNumberOfPages()).isEqualTo(1);
            String text = new PDFTextStripper().getText(doc);
            assertThat(text).contains("Wafer W555").contains("...").doesNotContain(id);
            assertThat(doc.getDocumentInformation().getTitle()).hasSizeLessThan(300);
        }
    }

    @Test
    void theSidecarFactsAreListedByNameAndThoseLeftOutAreCounted() {
        java.util.Map<String, String> facts = new java.util.HashMap<>();
        for (String k : new String[] {"supplier", "lot", "material", "data", "resistivity"}) {
            facts.put(k, k + " value");
        }
        MeasurementConditions m = new MeasurementConditions(Doping.pType(1e16), 180.0, 300.0, 1e14, null, 10.0,
                null, null, facts);
        List<String[]> rows = WaferReport.settings(m);
        assertThat(rows).hasSize(WaferReport.SETTINGS_ROWS);
        assertThat(rows.subList(5, 8).stream().map(r -> r[0] + ": " + r[1]).toList())
                .containsExactly("data: data value", "lot: lot value", "more facts: 3 more facts in the sidecar");
    }

    @Test
    void theHistogramTitleIsTextOnThePageSoThatThePictureIsAllPlot(@TempDir Path dir) throws IOException {
        Path pdf = dir.resolve("report.pdf");
        WaferReport.write(content("W-0003"), pdf);
        try (PDDocument doc = Loader.loadPDF(pdf.toFile())) {
            assertThat(new PDFTextStripper().getText(doc).replaceAll("\\s+", " "))
                    .contains("Histogram of effective lifetime: ");
        }
    }

    @Test
    void aWaferIdTooLongForItsCellIsBrokenAfterAHyphen() {
        // the wafer table's first column (70 pt, 7 pt text)
        assertThat(PdfPage.wrap("LOT-A02-W05-before-gettering.tif", PdfPage.REGULAR, 7, 70))
                .containsExactly("LOT-A02-W05-before-", "gettering.tif");
        assertThat(PdfPage.wrap("iron-boron-pairs", PdfPage.REGULAR, 7, 48)).containsExactly("iron-boron-", "pairs");
    }

    @Test
    void aStatusMapHasNoHistogramOfItsCodes(@TempDir Path dir) throws IOException {
        int n = 20;
        float[] s = new float[n * n];
        for (int i = 0; i < s.length; i++) {
            s[i] = i % 4;
        }
        WaferMap status = new WaferMap(FloatRaster.wrap(n, n, s), PixelGrid.centred(n, n, 1), Quantity.STATUS,
                "W-STATUS", MeasurementConditions.UNKNOWN, Provenance.of("test"));
        Path pdf = dir.resolve("status.pdf");
        WaferReport.write(WaferReport.Content.of(status, ""), pdf);
        try (PDDocument doc = Loader.loadPDF(pdf.toFile())) {
            assertThat(new PDFTextStripper().getText(doc)).contains("Wafer W-STATUS").doesNotContain("Histogram");
        }
    }
}
