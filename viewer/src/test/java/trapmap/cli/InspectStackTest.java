package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.Map;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;
import org.apache.pdfbox.Loader;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.text.PDFTextStripper;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.Figure;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.WaferInspection;
import trapmap.maps.batch.WaferResult;
import trapmap.maps.demo.InjectionStackDemo;

/**
 * A rules profile with an injection stack, end to end on the demonstration stack: {@code inspect} writes the two
 * stack figures into results.csv and the summary PDF with the values the maps-level judgement gives, and
 * {@code report} (the viewer's verdict) fails the wafer on the same figure.
 */
class InspectStackTest {
    private static final Path STACK = Path.of("..", "demo-data", InjectionStackDemo.FOLDER).toAbsolutePath()
            .normalize();
    private static final Path RULES = STACK.resolve(InjectionStackDemo.RULES);
    private static final Path FIRST = STACK.resolve("LOT-S01-W01-dn1e13.tif");
    private static final Map<String, CSVRecord> ROWS = new HashMap<>();

    @TempDir
    static Path out;

    @BeforeAll
    static void inspect() throws Exception {
        Cli.Run r = Cli.run("inspect", STACK.toString(), "--rules", RULES.toString(), "--out",
                out.resolve("report").toString(), "--no-thumbnails", "--threads", "2");
        assertThat(r.code()).as(r.err()).isEqualTo(Exit.SOME_WAFERS_NOT_PASSED);
        try (Reader in = Files.newBufferedReader(out.resolve("report").resolve("results.csv"))) {
            for (CSVRecord row : CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).get().parse(in)) {
                ROWS.put(Path.of(row.get("file")).getFileName().toString(), row);
            }
        }
    }

    @Test
    void resultsCarryTheStackFiguresOfTheMapsJudgement() throws Exception {
        assertThat(ROWS).hasSize(3);
        CSVRecord first = ROWS.get("LOT-S01-W01-dn1e13.tif");
        assertThat(first.get("status")).isEqualTo("fail");
        assertThat(first.get("profile")).isEqualTo("injection-stack");
        assertThat(first.get("failed_rules")).isEqualTo(Figure.BEST_DEFECT_AREA_FRACTION);
        WaferResult direct = new WaferInspection(Rules.read(RULES)).inspect(FIRST);
        for (String f : new String[] {Figure.BEST_DEFECT_AREA_FRACTION, Figure.NO_SINGLE_DEFECT_AREA_FRACTION}) {
            assertThat(first.get(f)).as(f).isEqualTo(Figure.parse(f).text(direct.figures().get(f)));
            assertThat(Double.parseDouble(first.get(f))).as(f).isBetween(0.02, 0.06);
        }
        CSVRecord second = ROWS.get("LOT-S01-W01-dn1e14.tif");
        assertThat(second.get("status")).isEqualTo("pass");
        assertThat(second.get(Figure.BEST_DEFECT_AREA_FRACTION)).isEmpty();
        assertThat(Files.readString(out.resolve("report").resolve("results.json")))
                .contains("\"" + Figure.NO_SINGLE_DEFECT_AREA_FRACTION + "\"");
    }

    @Test
    void summaryPdfNamesTheStackAndItsFigures() throws Exception {
        String text;
        try (PDDocument doc = Loader.loadPDF(out.resolve("report").resolve("summary.pdf").toFile())) {
            text = new PDFTextStripper().getText(doc).replaceAll("\\s+", " ");
        }
        assertThat(text).contains("best-defect area fraction").contains("no-single-defect area fraction")
                .contains("injection stack (3 levels");
    }

    @Test
    void reportGivesTheSameVerdict(@TempDir Path dir) {
        Cli.Run r = Cli.run("report", FIRST.toString(), "--rules", RULES.toString(), "-o",
                dir.resolve("w.pdf").toString());
        assertThat(r.out()).contains("fail").contains("profile injection-stack")
                .contains("failed " + Figure.BEST_DEFECT_AREA_FRACTION);
        assertThat(Files.exists(dir.resolve("w.pdf"))).isTrue();
    }
}
