package trapmap.viewer.report;

import static org.assertj.core.api.Assertions.assertThat;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
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
                    "1 region with values below 20 µs", "converted at 1e14 cm-³");
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

    @Test
    void textOutsideTheStandardFontsIsSpeltOut() {
        assertThat(PdfPage.clean("Δn = 1e14 cm⁻³, τ ≤ 5 µs")).isEqualTo("dn = 1e14 cm-³, tau <= 5 µs");
        assertThat(PdfPage.clean("漢")).isEqualTo("?");
    }
}
