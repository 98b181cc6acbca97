package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.apache.pdfbox.Loader;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.text.PDFTextStripper;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.viewer.report.BatchReportTest;

/**
 * {@code inspect} with a trap-density flag with a confidence and an exceedance figure: the verdicts follow the
 * probability, results.csv carries the figure's column, results.json the flag's confidence and uncertainties, and
 * the summary PDF names the confidence.
 */
class InspectConfidenceTest {
    @Test
    void flagConfidenceAndExceedanceFigureReachEveryOutput(@TempDir Path dir) throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        BatchReportTest.wafer(in, "W-1", 80, 0);   // Fe_i above 1e11 cm^-3 almost surely at 80 µs
        BatchReportTest.wafer(in, "W-2", 400, 0);  // almost surely not at 400 µs
        Path rules = Files.writeString(dir.resolve("rules.json"), """
                {"conditions": {"doping": "p:1e16", "injection_cm3": 1e14, "thickness_um": 180, "srv_cm_s": 10},
                 "defect": "fe-i",
                 "physics": {"uncertainty": {"samples": 2000, "seed": 7}},
                 "flag": {"quantity": "trap-density", "threshold": 1e11, "confidence": 0.95},
                 "limits": {"exceedance_area_fraction_c95": {"max": 0.05}}}
                """);
        Path out = dir.resolve("out");
        Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules.toString(), "--out", out.toString(),
                "--threads", "1");
        assertThat(r.code()).as(r.err()).isEqualTo(1);
        List<String> csv = Files.readAllLines(out.resolve("results.csv"));
        int col = List.of(csv.get(0).split(",")).indexOf("exceedance_area_fraction_c95");
        assertThat(col).isPositive();
        String w1 = csv.stream().filter(l -> l.contains("W-1.")).findFirst().orElseThrow();
        String w2 = csv.stream().filter(l -> l.contains("W-2.")).findFirst().orElseThrow();
        assertThat(w1).contains(",fail,");
        assertThat(w2).contains(",pass,");
        assertThat(Double.parseDouble(w1.split(",")[col])).isGreaterThan(0.9);
        assertThat(Double.parseDouble(w2.split(",")[col])).isLessThan(0.05);
        JsonNode json = new ObjectMapper().readTree(out.resolve("results.json").toFile());
        JsonNode flag = json.get("flag_confidence").get("default");
        assertThat(flag.get("confidence").asDouble()).isEqualTo(0.95);
        assertThat(flag.get("uncertainty").get("samples").asInt()).isEqualTo(2000);
        assertThat(flag.get("flag").asText()).isEqualTo("P(trap density above 1E11 cm^-3) at least 0.95");
        try (PDDocument doc = Loader.loadPDF(out.resolve("summary.pdf").toFile())) {
            String text = new PDFTextStripper().getText(doc).replaceAll("\\s+", " ");
            assertThat(text).contains("with probability at least 0.95");
        }
    }
}
