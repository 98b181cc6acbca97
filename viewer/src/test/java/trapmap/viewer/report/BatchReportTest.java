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
import trapmap.maps.model.Caution;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.progress.ProgressListener;

/** The batch summary PDF: yield, profiles, every wafer, failed wafers, recurrence, errors and the caution. */
public class BatchReportTest {
    static final String RULES = """
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
    void summaryHasYieldProfilesWaferTableFailedWafersRecurrenceErrorsAndCaution(@TempDir Path dir)
            throws Exception {
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
            String first = page(doc, 1);
            assertThat(first).contains("Batch inspection summary", "4 wafers", "pass 2 50.0 %", "fail 1 25.0 %",
                    "error (not inspected) 1 25.0 %", "Yield 50.0 %", "A 1 25.0 %", "B 1 25.0 %", "(none) 1 25.0 %",
                    "1 file could not be inspected", "Criteria: 1 profile judged these wafers");
            assertThat(first).contains(Caution.TEXT);
            String all = text(doc);
            // the default profile's section: its flag and limits, and its 3 wafers' values (too few for histograms)
            assertThat(all).contains("Profile default: 3 wafers", "lifetime below 10 µs", "lifetime P5",
                    "≥ 5 µs", "flagged area fraction", "≤ 1e-3", "Outcome: 2 pass, 1 fail",
                    "too few wafers for a distribution");
            assertThat(all).contains("Every wafer", "Failed wafers, worst first: showing 1 of 1", "W-B",
                    "failed: flagged area fraction");
            // three wafers: fewer than a hot spot needs
            assertThat(all).contains("(3 wafers)", "Too few wafers", "No hot spot.");
            String last = page(doc, doc.getNumberOfPages());
            assertThat(last).contains("Files not inspected", "broken.tif", Caution.TEXT);
            BufferedImage img = new PDFRenderer(doc).renderImageWithDPI(0, 30);
            assertThat(img.getHeight()).isEqualTo(350); // A4 is 11.69 in high: 350.8 px, cut to 350
        }
    }

    /** Two profiles: seven wafers with a spot (failing), two "thin" wafers judged on lifetime with a lower limit. */
    private static final String TWO_PROFILES = """
            {"edge_exclusion_mm": 2,
             "flag": {"quantity": "lifetime", "threshold": 10, "min_area_mm2": 1},
             "limits": {"flagged_area_fraction": {"max": 0.001}, "median_lifetime_us": {"min": 50}},
             "grades": [{"grade": "A"}],
             "fail_grade": "R",
             "profiles": [{"name": "thin", "match": {"file": "*-thin.*"},
                           "flag": {"quantity": "lifetime", "threshold": 3, "min_area_mm2": 1},
                           "limits": {"median_lifetime_us": {"min": 20}}}]}
            """;

    @Test
    void everyProfileHasItsSectionEveryWaferItsRowAndCutListsSaySo(@TempDir Path dir) throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        List<Path> files = new java.util.ArrayList<>();
        for (int i = 1; i <= 7; i++) {
            files.add(wafer(in, "SPOT-" + i, 60 + i, 6));
        }
        files.add(wafer(in, "T1-thin", 30, 0));
        files.add(wafer(in, "T2-thin", 35, 0));
        Rules rules = Rules.parse(TWO_PROFILES, "rules.json");
        Path out = dir.resolve("out");
        new BatchInspection(rules).run(files, out, new BatchInspection.Options(1, false, false,
                ProgressListener.NONE));

        Path pdf = BatchReport.writeFor(out, rules);

        try (PDDocument doc = Loader.loadPDF(pdf.toFile())) {
            String all = text(doc);
            assertThat(all).contains("Criteria: 2 profiles judged these wafers");
            assertThat(all).contains("Profile default: 7 wafers", "Distributions over the 7 wafers of this profile",
                    "Outcome: 0 pass, 7 fail");
            assertThat(all).contains("Profile thin: 2 wafers", "lifetime below 3 µs", "≥ 20 µs",
                    "Outcome: 2 pass, 0 fail");
            // the wafer table holds every wafer, each with its profile and verdict
            int from = all.indexOf("All 9 wafers in the order of results.csv");
            assertThat(from).isPositive();
            String table = all.substring(from, all.indexOf("Failed wafers, worst first", from));
            for (int i = 1; i <= 7; i++) {
                assertThat(table).contains("SPOT-" + i + " default fail R flagged area fraction");
            }
            assertThat(table).contains("T1-thin thin pass A", "T2-thin thin pass A");
            // seven failures, six pictures: the cut is stated
            assertThat(all).contains("Failed wafers, worst first: showing 6 of 7",
                    "the other failed wafer is in the wafer table", "showing 6 of 7 failed wafers");
            // the spot sits at one place on all nine wafers' cells: 7 of 9 flagged there, a hot spot
            assertThat(all).contains("(9 wafers)", "1 hot spot");
            assertThat(all).doesNotContain("Too few wafers");
        }
    }

    @Test
    void formulaLikeWaferIdsAreShownRawInTheSummary(@TempDir Path dir) throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        Path dde = wafer(in, "w-dde", 70, 6);
        Files.writeString(in.resolve("w-dde.json"), "{\"wafer_id\": \"=cmd|' /C calc'!A0\"}");
        Rules rules = Rules.parse(RULES, "rules.json");
        Path out = dir.resolve("out");
        new BatchInspection(rules).run(List.of(dde, wafer(in, "@two", 80, 0)), out,
                new BatchInspection.Options(1, false, false, ProgressListener.NONE));
        assertThat(Files.readString(out.resolve(BatchInspection.CSV_NAME))).contains(",'=cmd|", ",'@two,");

        try (PDDocument doc = Loader.loadPDF(BatchReport.writeFor(out, rules).toFile())) {
            String all = text(doc);
            assertThat(all).contains("=cmd|", "@two").doesNotContain("'=cmd", "'@two");
        }
    }

    @Test
    void theFailedWafersSayWhatTheirPicturesShowAndNameTheWorstRegionAsResultsCsvDoes(@TempDir Path dir)
            throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        List<Path> files = List.of(wafer(in, "W-A", 80, 0), wafer(in, "W-B", 70, 6));
        Rules rules = Rules.parse(RULES, "rules.json");
        for (boolean thumbnails : new boolean[] {true, false}) {
            Path out = dir.resolve("out-" + thumbnails);
            new BatchInspection(rules).run(files, out, new BatchInspection.Options(1, false, thumbnails,
                    ProgressListener.NONE));
            try (PDDocument doc = Loader.loadPDF(BatchReport.writeFor(out, rules).toFile())) {
                String all = text(doc);
                assertThat(all).contains("worst region: the flagged region behind the verdict", "worst region 109.3 mm² at (20.0, -10.0)");
                assertThat(all).doesNotContain("largest flagged region", "circle: the largest region");
                if (thumbnails) {
                    assertThat(all).contains("Pictures: thumbnails (lifetime").doesNotContain("circle");
                } else {
                    assertThat(all).contains("Pictures: the map as read, with a magenta circle around the worst"
                            + " region");
                }
            }
        }
    }

    private static String text(PDDocument doc) throws Exception {
        return new PDFTextStripper().getText(doc).replaceAll("\\s+", " ");
    }

    private static String page(PDDocument doc, int p) throws Exception {
        PDFTextStripper s = new PDFTextStripper();
        s.setStartPage(p);
        s.setEndPage(p);
        return s.getText(doc).replaceAll("\\s+", " ");
    }
}
