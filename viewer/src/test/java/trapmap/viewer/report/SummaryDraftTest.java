package trapmap.viewer.report;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.pdfbox.Loader;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.text.PDFTextStripper;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.IronPairRules;
import trapmap.maps.batch.Rules;
import trapmap.shared.progress.ProgressListener;
import trapmap.viewer.graphics.Labels;

/**
 * The summary drawn while the batch runs ({@link SummaryDraft}) is the document {@link BatchReport#writeFor} draws
 * from the finished folder: the same pages with the same text, on a table of several pages, with failed wafers,
 * errors and recurrence; where a wafer id recurs it draws the whole document at the end, the same again.
 */
class SummaryDraftTest {
    @BeforeAll
    static void headless() {
        System.setProperty("java.awt.headless", "true");
    }

    @Test
    void draftEqualsTheSummaryDrawnFromTheFolder(@TempDir Path dir) throws Exception {
        List<Path> files = new ArrayList<>();
        Path in = Files.createDirectories(dir.resolve("in"));
        for (int i = 0; i < 70; i++) { // more than one page of the wafer table
            files.add(BatchReportTest.wafer(in, String.format("W-%03d", i), i % 7 == 3 ? 40 : 80 + i,
                    i % 5 == 1 ? 6 : 0));
        }
        Path broken = in.resolve("broken.tif");
        Files.writeString(broken, "not a map");
        files.add(35, broken);
        SummaryDraft draft = drawn(files, dir.resolve("out"), 2);

        assertThat(draft.drewAhead()).isTrue();
        assertThat(draft.finishedAhead()).as("finished beside the tables").isTrue();
        String all = assertSameAsFromFolder(dir.resolve("out"));
        assertThat(all).as("no iron pairs: no iron section").doesNotContain(IronSection.TITLE, "Interstitial iron");
    }

    @Test
    void theIronOfTheDemonstrationPairIsShownAsResultsCsvGivesItOnBothPaths(@TempDir Path dir) throws Exception {
        Path demo = Path.of("..", "demo-data").toAbsolutePath().normalize();
        Path rulesFile = demo.resolve("rules-example.json");
        List<Path> files = List.of(demo.resolve("LOT-A01-W01.tif"), demo.resolve("LOT-A03-W02-fe-i-state.tif"),
                demo.resolve("LOT-A03-W02-feb-state.tif"));
        Rules rules = Rules.read(rulesFile);
        Path out = dir.resolve("out");
        drawn(files, out, 2, true, rules, IronPairRules.read(rulesFile).orElseThrow());

        Map<String, String> feb;
        try (Reader r = Files.newBufferedReader(out.resolve(BatchInspection.CSV_NAME));
             CSVParser p = CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).build().parse(r)) {
            feb = p.getRecords().stream().filter(rec -> rec.get("file").endsWith("-feb-state.tif")).findFirst()
                    .orElseThrow().toMap();
        }
        assertThat(feb.get("iron_status")).isEqualTo("pass");
        String median = Labels.number(Double.parseDouble(feb.get("iron_median_cm3")));
        String p95 = Labels.number(Double.parseDouble(feb.get("iron_p95_cm3")));
        assertThat(median).isEqualTo("4.917e10"); // README: median about 4.9e10 cm⁻³, P95 about 3.3e11 cm⁻³
        assertThat(p95).isEqualTo("3.303e11");

        String all = assertSameAsFromFolder(out, rules);
        assertThat(all).contains(IronSection.TITLE, "median", "P95 (cm⁻³)", "LOT-A03-W02-feb-state.tif /",
                "Interstitial iron: 1 FeB pair.");
        assertThat(all).contains("LOT-A03-W02 LOT-A03-W02-feb-state.tif / LOT-A03-W02-fe-i-state.tif pass "
                + median + " " + p95);
        assertThat(all.indexOf(IronSection.TITLE)).as("one section").isEqualTo(all.lastIndexOf(IronSection.TITLE));
    }

    @Test
    void aRecurringWaferIdDrawsItAllAtTheEndTheSame(@TempDir Path dir) throws Exception {
        Path a = Files.createDirectories(dir.resolve("a"));
        Path b = Files.createDirectories(dir.resolve("b"));
        List<Path> files = new ArrayList<>();
        for (int i = 0; i < 8; i++) {
            files.add(BatchReportTest.wafer(a, "W-" + i, 80, i == 2 ? 6 : 0));
        }
        files.add(BatchReportTest.wafer(b, "W-3", 30, 0)); // the id of an earlier wafer, another state of it
        SummaryDraft draft = drawn(files, dir.resolve("out"), 1);

        assertThat(draft.drewAhead()).isFalse();
        assertThat(draft.finishedAhead()).as("drawn anew beside the tables").isTrue();
        assertSameAsFromFolder(dir.resolve("out"));
    }

    @Test
    void rowsNeverToldEndedAreFinishedByWriteTheSame(@TempDir Path dir) throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        List<Path> files = new ArrayList<>();
        for (int i = 0; i < 40; i++) {
            files.add(BatchReportTest.wafer(in, String.format("W-%03d", i), i % 6 == 2 ? 40 : 80 + i, 0));
        }
        SummaryDraft draft = drawn(files, dir.resolve("out"), 2, false);

        assertThat(draft.drewAhead()).isTrue();
        assertThat(draft.finishedAhead()).as("finished by write, from the table drawn ahead").isFalse();
        assertSameAsFromFolder(dir.resolve("out"));
    }

    private static SummaryDraft drawn(List<Path> files, Path out, int workers) throws Exception {
        return drawn(files, out, workers, true);
    }

    /** {@code tellEnd}: whether the draft is told the rows ended (else only each row, and write finishes it). */
    private static SummaryDraft drawn(List<Path> files, Path out, int workers, boolean tellEnd) throws Exception {
        return drawn(files, out, workers, tellEnd, Rules.parse(BatchReportTest.RULES, "rules.json"), null);
    }

    /** As {@link #drawn(List, Path, int, boolean)} under {@code rules}, with the iron pairs of {@code iron} (null: none). */
    private static SummaryDraft drawn(List<Path> files, Path out, int workers, boolean tellEnd, Rules rules,
                                      IronPairRules iron) throws Exception {
        BatchInspection batch = new BatchInspection(rules).withIron(iron);
        try (SummaryDraft draft = SummaryDraft.start(out, rules, files.size(), () -> true)) {
            batch.tellingRows(tellEnd ? draft : draft::row).warmingUp(draft::warmedUp).finishingWith((d, recurrence) -> {
                try {
                    draft.write(recurrence, batch.rows(), batch.rowsAsTold());
                } catch (InterruptedException e) {
                    throw new AssertionError(e);
                }
            }).run(files, out, new BatchInspection.Options(workers, false, true, ProgressListener.NONE));
            return draft;
        }
    }

    private static String assertSameAsFromFolder(Path out) throws Exception {
        return assertSameAsFromFolder(out, Rules.parse(BatchReportTest.RULES, "rules.json"));
    }

    /** Asserts that the summary drawn ahead is the one drawn from the folder; returns its text. */
    private static String assertSameAsFromFolder(Path out, Rules rules) throws Exception {
        Path drafted = Files.move(out.resolve(BatchReport.FILE_NAME), out.resolve("drafted.pdf"));
        Path folder = BatchReport.writeFor(out, rules);
        try (PDDocument d = Loader.loadPDF(drafted.toFile()); PDDocument f = Loader.loadPDF(folder.toFile())) {
            assertThat(d.getNumberOfPages()).isEqualTo(f.getNumberOfPages()).isGreaterThan(3);
            assertThat(d.getDocumentInformation().getTitle()).isEqualTo(f.getDocumentInformation().getTitle());
            StringBuilder all = new StringBuilder();
            for (int p = 1; p <= d.getNumberOfPages(); p++) {
                assertThat(undated(text(d, p))).as("page %d", p).isEqualTo(undated(text(f, p)));
                all.append(text(d, p));
            }
            return all.toString().replaceAll("\\s+", " ");
        }
    }

    private static String text(PDDocument doc, int page) throws Exception {
        PDFTextStripper s = new PDFTextStripper();
        s.setStartPage(page);
        s.setEndPage(page);
        return s.getText(doc);
    }

    /** The text less the minute it was written at (the two documents may be a minute apart). */
    private static String undated(String text) {
        return text.replaceAll("\\d{4}-\\d{2}-\\d{2} \\d{2}:\\d{2} \\S+", "DATE");
    }
}
