package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import org.apache.pdfbox.Loader;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.text.PDFTextStripper;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.viewer.report.BatchReportTest;

/** {@code trapmap inspect} writes the summary PDF beside its results. */
class InspectSummaryTest {
    @Test
    void inspectWritesSummaryPdfWithTheYield(@TempDir Path dir) throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        BatchReportTest.wafer(in, "W-1", 80, 0);
        BatchReportTest.wafer(in, "W-2", 70, 6);
        Path rules = Files.writeString(dir.resolve("rules.json"), """
                {"flag": {"quantity": "lifetime", "threshold": 10, "min_area_mm2": 1},
                 "limits": {"flagged_area_fraction": {"max": 0.001}}}
                """);
        Path out = dir.resolve("out");
        Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules.toString(), "--out", out.toString(),
                "--threads", "1");
        assertThat(r.code()).isEqualTo(1);
        assertThat(r.err()).doesNotContain("not written");
        assertThat(r.out()).contains("; summary " + out.resolve("summary.pdf"));
        try (PDDocument doc = Loader.loadPDF(out.resolve("summary.pdf").toFile())) {
            String text = new PDFTextStripper().getText(doc).replaceAll("\\s+", " ");
            assertThat(text).contains("Batch inspection summary", "2 wafers", "Yield 50.0 %", "W-2");
        }
    }
}
