package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.Locale;
import java.util.Map;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;
import org.apache.pdfbox.Loader;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.text.PDFTextStripper;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.junit.jupiter.api.Test;

/** {@code trapmap report} states the verdict and grade that {@code trapmap inspect} gives the same map. */
class ReportCommandTest {
    private static final Path DEMO = Path.of("..", "demo-data").toAbsolutePath().normalize();
    private static final Path RULES = DEMO.resolve("rules-example.json");
    private static final Map<String, CSVRecord> BATCH = new HashMap<>();

    @TempDir
    static Path batchDir;

    @TempDir
    Path dir;

    @BeforeAll
    static void inspectTheDemoSet() throws Exception {
        Cli.Run r = Cli.run("inspect", DEMO.toString(), "--rules", RULES.toString(), "--out",
                batchDir.resolve("report").toString(), "--no-thumbnails", "--threads", "2");
        assertThat(r.code()).as(r.err()).isEqualTo(Exit.SOME_WAFERS_NOT_PASSED);
        try (Reader in = Files.newBufferedReader(batchDir.resolve("report").resolve("results.csv"))) {
            for (CSVRecord row : CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).get().parse(in)) {
                BATCH.put(Path.of(row.get("file")).getFileName().toString(), row);
            }
        }
        assertThat(BATCH).hasSize(17);
    }

    private static String text(Path pdf) throws Exception {
        try (PDDocument doc = Loader.loadPDF(pdf.toFile())) {
            return new PDFTextStripper().getText(doc);
        }
    }

    private static String readable(String figures) {
        return java.util.Arrays.stream(figures.split(";")).map(trapmap.maps.batch.Figure::readable)
                .collect(java.util.stream.Collectors.joining(", "));
    }

    @ParameterizedTest
    @ValueSource(strings = {"LOT-A01-W01.tif", "LOT-A01-W03.tif", "LOT-N01-W01.tif", "MON-200-W01.tif",
        "LOT-A03-W02-feb-state.tif"})
    void reportStatesTheBatchVerdictGradeProfileAndDefect(String name) throws Exception {
        CSVRecord row = BATCH.get(name);
        Path pdf = dir.resolve("w.pdf");
        Cli.Run r = Cli.run("report", DEMO.resolve(name).toString(), "--rules", RULES.toString(), "-o", pdf.toString());
        boolean pass = row.get("status").equals("pass");
        assertThat(r.code()).as(r.err()).isEqualTo(pass ? Exit.OK : Exit.SOME_WAFERS_NOT_PASSED);
        assertThat(r.err()).isEmpty();
        String text = text(pdf);
        assertThat(text).contains("Verdict: " + row.get("status").toUpperCase(Locale.ROOT) + " - grade "
                + row.get("grade") + " (profile " + row.get("profile") + ", defect " + row.get("defect") + ")");
        // the report names the figures as a reader reads them; results.csv keeps the column names
        String failed = row.get("failed_rules").isEmpty() ? "none" : readable(row.get("failed_rules"));
        String down = row.get("graded_down_by").isEmpty() ? "none" : readable(row.get("graded_down_by"));
        assertThat(text.replaceAll("\\s+", " ")).contains(failed).contains(down);
        assertThat(r.out()).contains(row.get("status") + " · grade " + row.get("grade"));
    }

    @Test
    void anOverriddenDefectIsStated() throws Exception {
        Path pdf = dir.resolve("w01-cr.pdf");
        Cli.Run r = Cli.run("report", DEMO.resolve("LOT-A01-W01.tif").toString(), "--rules", RULES.toString(),
                "--defect", "cr-i", "--quantity", "trap-density", "-o", pdf.toString());
        assertThat(r.err()).isEmpty();
        assertThat(text(pdf)).contains("defect cr-i overridden").contains("judged with an overridden defect");
    }

    @Test
    void aProbabilityMapStatesItsThresholdAndSamples() throws Exception {
        Path pdf = dir.resolve("w01-p.pdf");
        Cli.Run r = Cli.run("report", DEMO.resolve("LOT-A01-W01.tif").toString(), "--rules", RULES.toString(),
                "--quantity", "exceedance-probability", "-o", pdf.toString());
        assertThat(r.err()).isEmpty();
        assertThat(text(pdf).replaceAll("\\s+", " ")).contains("map: P(N_t > 3e11 cm⁻³), over the uncertainties"
                + " of the conditions and the defect (10000 samples, seed 1)");
    }

    @Test
    void badInputNamesTheOptionAndWritesNothing() {
        Path pdf = dir.resolve("none.pdf");
        Cli.Run r = Cli.run("report", DEMO.resolve("LOT-A01-W01.tif").toString(), "--rules", RULES.toString(),
                "--quantity", "colour", "-o", pdf.toString());
        assertThat(r.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(r.err()).contains("--quantity").contains("colour");
        Cli.Run d = Cli.run("report", DEMO.resolve("LOT-A01-W01.tif").toString(), "--rules",
                DEMO.resolve("LOT-A01-W01.json").toString(), "-o", pdf.toString());
        assertThat(d.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(d.err()).contains("--rules");
        assertThat(pdf).doesNotExist();
    }

    @Test
    void aReportThatCannotBeWrittenSaysWhyWithoutAnInternalError() throws Exception {
        Path blocked = dir.resolve("not-a-folder");
        java.nio.file.Files.writeString(blocked, "x");
        Path pdf = blocked.resolve("w01.pdf");
        Cli.Run r = Cli.run("report", DEMO.resolve("LOT-A01-W01.tif").toString(), "--rules", RULES.toString(),
                "-o", pdf.toString());
        assertThat(r.code()).isEqualTo(Exit.INTERNAL_ERROR);
        assertThat(r.errLines()).containsExactly("trapmap report: " + pdf + ": cannot write: " + blocked
                + " exists and is not a folder");
    }

    @Test
    void anUnknownDefectIsRefusedWithTheIdsThatCanJudge() {
        Path pdf = dir.resolve("none2.pdf");
        for (String id : new String[] {"fe-x", "bo-lid"}) {
            Cli.Run r = Cli.run("report", DEMO.resolve("LOT-A01-W01.tif").toString(), "--rules", RULES.toString(),
                    "-o", pdf.toString(), "--defect", id);
            assertThat(r.code()).as(id).isEqualTo(Exit.INVALID_INPUT);
            assertThat(r.errLines()).as(id).hasSize(1);
            assertThat(r.err()).as(id).startsWith("trapmap report: --defect unknown defect '" + id + "'")
                    .contains("(these have them: fe-i, fe-b, ").doesNotContain("bo-lid,");
            assertThat(pdf).doesNotExist();
        }
    }
}
