package trapmap.viewer.report;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.apache.pdfbox.Loader;
import org.apache.pdfbox.cos.COSName;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.pdmodel.PDPage;
import org.apache.pdfbox.pdmodel.PDResources;
import org.apache.pdfbox.pdmodel.font.PDFont;
import org.apache.pdfbox.text.PDFTextStripper;
import org.apache.pdfbox.text.TextPosition;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.Rules;
import trapmap.maps.model.Caution;
import trapmap.shared.progress.ProgressListener;

/**
 * The PDF reports print units and symbols as written (cm⁻³, Ω·cm, Δn, σₙ, mm²) in an embedded face, never a
 * spelt-out form, and keep every caution whole.
 */
class ReportTypesetTest {
    /** Spelt-out forms the reports must not print. */
    private static final List<String> SPELT_OUT = List.of("cm-³", "cm-3", "cm^-3", "Ohm", "sigma_", "tau", "mm^2",
            "mm2 ", "dn ");

    @BeforeAll
    static void headless() {
        System.setProperty("java.awt.headless", "true");
    }

    @Test
    void waferReportPrintsUnitsAndSymbolsInAnEmbeddedFaceAndTheFooterCautionWhole(@TempDir Path dir)
            throws IOException {
        Path pdf = dir.resolve("w.pdf");
        WaferReport.write(WaferReportTest.content("W-0001"), pdf);
        try (PDDocument doc = Loader.loadPDF(pdf.toFile())) {
            String text = new PDFTextStripper().getText(doc);
            assertThat(text).contains("cm⁻³", "Ω·cm", "Δn", "σₙ", "σₚ", "mm²", "µs");
            assertThat(text).doesNotContain(SPELT_OUT);
            String flat = text.replaceAll("\\s+", " ");
            // the footer wraps the caution rather than cutting it
            assertThat(flat).contains("trapmap wafer report - " + Caution.TEXT);
            assertThat(flat).doesNotContain("...");
            assertEmbedded(doc);
        }
    }

    @Test
    void aWaferPageWithManyNotesKeepsEveryLineOnThePage(@TempDir Path dir) throws IOException {
        List<String> notes = new ArrayList<>();
        for (int i = 0; i < 8; i++) {
            notes.add("note " + i + ": the surface lifetime is within 2× of the effective lifetime over part of the"
                    + " wafer, so the trap density there is an upper bound; see the settings above");
        }
        Path pdf = dir.resolve("w.pdf");
        WaferReport.write(WaferReportTest.content("W-0002").withNotes(notes), pdf);
        try (PDDocument doc = Loader.loadPDF(pdf.toFile())) {
            assertThat(doc.getNumberOfPages()).isEqualTo(1);
            float height = doc.getPage(0).getMediaBox().getHeight();
            float width = doc.getPage(0).getMediaBox().getWidth();
            List<TextPosition> glyphs = new ArrayList<>();
            PDFTextStripper s = new PDFTextStripper() {
                @Override
                protected void writeString(String text, List<TextPosition> positions) throws IOException {
                    glyphs.addAll(positions);
                    super.writeString(text, positions);
                }
            };
            String text = s.getText(doc).replaceAll("\\s+", " ");
            assertThat(glyphs).isNotEmpty().allSatisfy(g -> {
                assertThat(g.getYDirAdj()).isBetween(0f, height);
                assertThat(g.getXDirAdj() + g.getWidthDirAdj()).isLessThanOrEqualTo(width);
            });
            assertThat(text).contains("note 7:", "Caution: " + Caution.TEXT);
        }
    }

    @Test
    void batchSummaryPrintsUnitsAndReadableFigureNamesInAnEmbeddedFace(@TempDir Path dir) throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        List<Path> files = List.of(BatchReportTest.wafer(in, "W-A", 80, 0), BatchReportTest.wafer(in, "W-B", 70, 6));
        Rules rules = Rules.parse(BatchReportTest.RULES, "rules.json");
        Path out = dir.resolve("out");
        new BatchInspection(rules).run(files, out, new BatchInspection.Options(1, false, false,
                ProgressListener.NONE));
        try (PDDocument doc = Loader.loadPDF(BatchReport.writeFor(out, rules).toFile())) {
            String text = new PDFTextStripper().getText(doc);
            assertThat(text).contains("cm⁻³", "Ω·cm", "Δn", "mm²", "µs");
            assertThat(text).doesNotContain(SPELT_OUT);
            // figure names as a reader reads them; results.csv keeps the column names
            assertThat(text.replaceAll("\\s+", " ")).contains("flagged area fraction", "lifetime P5")
                    .doesNotContain("flagged_area_fraction", "p5_lifetime_us");
            assertThat(Files.readString(out.resolve("results.csv"))).contains("flagged_area_fraction");
            assertEmbedded(doc);
        }
    }

    @Test
    void textKeepsSymbolsAndReplacesOnlyWhatTheFaceCannotShow() {
        String s = "Δn = 1e14 cm⁻³, τ ≤ 5 µs, σₙ/σₚ, 1.5 Ω·cm, 4 mm², −3.1 × 10⁻²";
        assertThat(PdfPage.clean(s)).isEqualTo(s);
        assertThat(PdfPage.clean("a\tb\nc")).isEqualTo("a b c");
        assertThat(PdfPage.clean("漢")).isEqualTo("?");
    }

    @Test
    void typesetUnitsReplaceSpeltOutForms() {
        assertThat(Typeset.unit("cm^-3")).isEqualTo("cm⁻³");
        assertThat(Typeset.unit("cm-3")).isEqualTo("cm⁻³");
        assertThat(Typeset.unit("Ohm cm")).isEqualTo("Ω·cm");
        assertThat(Typeset.unit("mm^2")).isEqualTo("mm²");
        assertThat(Typeset.unit("us")).isEqualTo("µs");
        assertThat(Typeset.unit("K")).isEqualTo("K");
        assertThat(Typeset.headed("area", "mm2")).isEqualTo("area (mm²)");
        assertThat(Typeset.headed("fraction", "")).isEqualTo("fraction");
    }

    /** Every font on every page is embedded, and is the bundled face. */
    private static void assertEmbedded(PDDocument doc) throws IOException {
        int fonts = 0;
        for (PDPage page : doc.getPages()) {
            PDResources res = page.getResources();
            for (COSName name : res.getFontNames()) {
                PDFont f = res.getFont(name);
                assertThat(f.isEmbedded()).as(f.getName()).isTrue();
                assertThat(f.getName()).contains("DejaVuSansCondensed");
                fonts++;
            }
        }
        assertThat(fonts).isPositive();
    }
}
