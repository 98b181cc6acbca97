package trapmap.viewer.report;

import static org.assertj.core.api.Assertions.assertThat;

import java.awt.image.BufferedImage;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.apache.pdfbox.Loader;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.rendering.PDFRenderer;
import org.apache.pdfbox.text.PDFTextStripper;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.Rules;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.progress.ProgressListener;

/** The batch summary PDF: yield, distributions, worst wafers, recurrence, errors and the caution. */
public class BatchReportTest {
    private static final String RULES = """
            {"edge_exclusion_mm": 2,
             "flag": {"quantity": "lifetime", "threshold": 10, "min_area_mm2": 1},
             "limits": {"flagged_area_fraction": {"max": 0.001}, "p5_lifetime_us": {"min": 5}},
             "grades": [{"grade": "A", "when": {"median_lifetime_us": {"min": 60}}}, {"grade": "B"}]}
            """;

    @BeforeAll
    static void headless() {
        System.setProperty("java.awt.headless", "true");
    }

    /** A round wafer of radius 50 mm at 0.5 mm, {@code baseUs} everywhere but a 4 µs spot of {@code spotMm} radius. */
    public static Path wafer(Path dir, String id, double baseUs, double spotMm) throws Exception {
        int n = 201;
        PixelGrid g = PixelGrid.centred(n, n, 0.5);
        float[] s = new float[n * n];
        for (int y = 0; y < n; y++) {
            for (int x = 0; x < n; x++) {
                double r = Math.hypot(g.xMm(x), g.yMm(y));
                double spot = Math.hypot(g.xMm(x) - 20, g.yMm(y) + 10);
                s[y * n + x] = r > 50 ? Float.NaN : (float) (spot < spotMm ? 4 : baseUs);
            }
        }
        WaferMap m = new WaferMap(FloatRaster.wrap(n, n, s), g, Quantity.EFFECTIVE_LIFETIME, id,
                MeasurementConditions.UNKNOWN, Provenance.of("test"));
        Path f = dir.resolve(id + ".tif");
        MapFiles.write(m, f);
        return f;
    }

    @Test
    void summaryHasYieldWorstWafersRecurrenceErrorsAndCaution(@TempDir Path dir) throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        Path broken = in.resolve("broken.tif");
        Files.writeString(broken, "not a map");
        List<Path> files = List.of(wafer(in, "W-A", 80, 0), wafer(in, "W-B", 70, 6), wafer(in, "W-C", 40, 0),
                broken);
        Rules rules = Rules.parse(RULES, "rules.json");
        Path out = dir.resolve("out");
        new BatchInspection(rules).run(files, out, new BatchInspection.Options(1, false, false,
                ProgressListener.NONE));

        Path pdf = BatchReport.writeFor(out, rules);

        assertThat(pdf).isEqualTo(out.resolve("summary.pdf"));
        try (PDDocument doc = Loader.loadPDF(pdf.toFile())) {
            // summary, worst wafers, one recurrence family, errors
            assertThat(doc.getNumberOfPages()).isEqualTo(4);
            String first = page(doc, 1);
            assertThat(first).contains("Batch inspection summary", "4 wafers", "pass 2 50.0 %", "fail 1 25.0 %",
                    "error (not inspected) 1 25.0 %", "Yield 50.0 %", "A 1 25.0 %", "B 1 25.0 %", "(none) 1 25.0 %",
                    "1 file could not be inspected");
            assertThat(first).contains(WaferReport.CAUTION);
            String worst = page(doc, 2);
            assertThat(worst).contains("Worst wafers", "W-B", "FAIL", "failed: flagged_area_fraction");
            assertThat(worst.indexOf("W-B")).isLessThan(worst.indexOf("W-A"));
            assertThat(page(doc, 3)).contains("Recurrence", "3 wafers", "Hot spots", "1 hot spot");
            String last = page(doc, 4);
            assertThat(last).contains("Files not inspected", "broken.tif", WaferReport.CAUTION);
            BufferedImage img = new PDFRenderer(doc).renderImageWithDPI(0, 30);
            assertThat(img.getHeight()).isEqualTo(350); // A4 is 11.69 in high: 350.8 px, cut to 350
        }
    }

    private static String page(PDDocument doc, int p) throws Exception {
        PDFTextStripper s = new PDFTextStripper();
        s.setStartPage(p);
        s.setEndPage(p);
        return s.getText(doc).replaceAll("\\s+", " ");
    }
}
