package trapmap.viewer.report;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.BitSet;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import javax.imageio.ImageIO;
import org.apache.pdfbox.pdmodel.PDDocument;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.Figure;
import trapmap.maps.batch.Footprint;
import trapmap.maps.batch.HotSpots;
import trapmap.maps.batch.RecurrenceMap;
import trapmap.maps.batch.Rules;
import trapmap.maps.io.AtomicFiles;
import trapmap.maps.model.Caution;
import trapmap.store.BatchTrend;

/**
 * The summary PDF of a batch inspection, made from what the batch wrote into its output folder
 * ({@link BatchFolder}: {@code results.csv}, {@code footprints.csv}, {@code thumbnails/}), so that it also covers
 * rows kept from a resumed run:
 * <ol>
 *   <li>yield, grades, and the profiles that judged the wafers ({@link SummarySection});</li>
 *   <li>one section per profile: its wafers, defect, flag, limits and grades, and the distribution of each figure
 *       with that profile's limits ({@link ProfileSection});</li>
 *   <li>when the batch has FeB-dissociation pairs, their interstitial iron as {@code results.csv} gives it
 *       ({@link IronSection});</li>
 *   <li>every wafer in a table ({@link WaferTable});</li>
 *   <li>the failed wafers, worst first, with pictures ({@link FailedWafersSection});</li>
 *   <li>the recurrence map of each wafer family with its hot spots ({@link RecurrenceSection});</li>
 *   <li>the files that could not be inspected ({@link ErrorSection}), and the caution;</li>
 *   <li>with a results store and the rules' {@code trend} block, the trend over the store on pages of its own
 *       ({@link TrendSection}).</li>
 * </ol>
 * Works headless; pictures are embedded at {@value #SCALE}×; a list cut short says how much of it is shown.
 */
public final class BatchReport {
    /** The file name in the batch's output folder. */
    public static final String FILE_NAME = "summary.pdf";
    /** Picture pixels per PDF point. */
    static final double SCALE = 2;

    private BatchReport() {
    }

    /**
     * Reads the results of a finished batch from its output folder; refused (an {@code IOException} saying why) when
     * the folder's {@code run.json} is missing, says the run is unfinished, or names other physics settings.
     */
    public static BatchContent read(Path outputDir, Rules rules) throws IOException {
        return BatchFolder.read(outputDir, rules);
    }

    /**
     * As {@link #read(Path, Rules)}, with the recurrence the batch built in memory ({@link RecurrenceMap}, the same
     * counts as the folder's footprints) instead of reading and rebuilding it; null reads it from the folder.
     */
    public static BatchContent read(Path outputDir, Rules rules, RecurrenceMap recurrence) throws IOException {
        return BatchFolder.read(outputDir, rules, recurrence);
    }

    /**
     * Writes {@value #FILE_NAME} into a finished batch's output folder from its results table and the recurrence the
     * batch built in memory (null: read from the folder's footprints); returns the file.
     */
    public static Path writeFor(Path outputDir, Rules rules, RecurrenceMap recurrence) throws IOException {
        Path pdf = outputDir.resolve(FILE_NAME);
        write(read(outputDir, rules, recurrence), pdf);
        return pdf;
    }

    /**
     * As {@link #writeFor(Path, Rules, RecurrenceMap)}, with the trend page of {@code trend} (given the files of the
     * batch's results rows; null: no trend page).
     */
    public static Path writeFor(Path outputDir, Rules rules, RecurrenceMap recurrence, TrendSource trend)
            throws IOException {
        Path pdf = outputDir.resolve(FILE_NAME);
        BatchContent c = read(outputDir, rules, recurrence);
        write(trend == null ? c : c.withTrend(trend.trend(files(c))), pdf);
        return pdf;
    }

    /**
     * The trend of a batch over its results store ({@link BatchTrend#of}), computed once the batch's wafers are
     * stored.
     */
    @FunctionalInterface
    public interface TrendSource {
        /** The trend, {@code files} being the files of the batch's results rows. */
        BatchTrend trend(List<String> files) throws IOException;
    }

    /** The files of the content's rows, in order. */
    static List<String> files(BatchContent c) {
        return c.rows().stream().map(BatchContent.Row::file).toList();
    }

    /** Reads the batch's results and writes {@value #FILE_NAME} into its output folder; returns the file. */
    public static Path writeFor(Path outputDir, Rules rules) throws IOException {
        Path pdf = outputDir.resolve(FILE_NAME);
        write(read(outputDir, rules), pdf);
        return pdf;
    }

    /** Writes the summary into {@code pdf} (atomically). */
    public static void write(BatchContent c, Path pdf) throws IOException {
        AtomicFiles.write(pdf, tmp -> {
            try (PDDocument doc = new PDDocument()) {
                draw(doc, c);
                doc.save(tmp.toFile());
            }
        });
    }

    static void draw(PDDocument doc, BatchContent c) throws IOException {
        try (ReportFlow flow = new ReportFlow(doc)) {
            describe(doc);
            head(flow, c);
            WaferTable.draw(flow, c);
            tail(flow, c);
        }
        footers(doc, c);
    }

    /** The document's title and creator. */
    static void describe(PDDocument doc) {
        doc.getDocumentInformation().setTitle("Batch inspection summary");
        doc.getDocumentInformation().setCreator("trapmap");
    }

    /**
     * What comes before the wafer table: the summary page, the sections per profile and, when the batch has
     * FeB-dissociation pairs, their interstitial iron.
     */
    static void head(ReportFlow flow, BatchContent c) throws IOException {
        SummarySection.draw(flow, c);
        ProfileSection.drawAll(flow, c);
        IronSection.draw(flow, c);
    }

    /**
     * What comes after the wafer table: failed wafers, recurrence, errors and the caution, then the trend page when
     * there is one; closes the last page.
     */
    static void tail(ReportFlow flow, BatchContent c) throws IOException {
        tail(flow, c, r -> null);
    }

    /** As {@link #tail(ReportFlow, BatchContent)}, with failed wafers' pictures made ahead where there are. */
    static void tail(ReportFlow flow, BatchContent c, FailedWafersSection.Pictures made) throws IOException {
        FailedWafersSection.draw(flow, c, made);
        RecurrenceSection.drawAll(flow, c);
        ErrorSection.draw(flow, c);
        flow.down(8);
        flow.caution(Caution.TEXT);
        if (c.trend() != null) { // last, on pages of its own: the pages before are those of a summary without it
            TrendSection.draw(flow, c.trend());
        }
        flow.close();
    }

    /** Every page's footer: the folder, the date and the page number. */
    static void footers(PDDocument doc, BatchContent c) throws IOException {
        PdfPage.footers(doc, "trapmap batch summary - " + PdfPage.clean(c.outputDir().toString()) + " - "
                + SummarySection.DATE.format(c.created()));
    }

    /** Made-up wafers of {@link #warmUp}: enough rows for the table and chart code to be compiled. */
    static final int WARM_UP_WAFERS = 120;

    /**
     * The summary's first-use work (fonts loaded into a document, charts, tables, thumbnails embedded; the classes
     * loaded and compiled) done on a made-up batch of {@value #WARM_UP_WAFERS} wafers under {@code rules} (passes,
     * fails with thumbnails, errors) and a small recurrence map, drawn and saved into nothing; the thumbnails lie in a
     * temporary folder that is removed again. Run beside a batch's workers ({@code BatchInspection.warmingUp}), it leaves the
     * summary written after the last wafer only its own work. Writes no file of any batch.
     */
    public static void warmUp(Rules rules) throws IOException {
        Path dir = Files.createTempDirectory("trapmap-summary-warm-up");
        try {
            Path thumbs = Files.createDirectories(dir.resolve(BatchInspection.THUMBNAIL_DIR));
            List<String> figures = rules.figures().stream().map(Figure::name).toList();
            String profile = rules.allProfiles().isEmpty() ? "default" : rules.allProfiles().get(0).name();
            List<BatchContent.Row> rows = new ArrayList<>();
            for (int i = 0; i < WARM_UP_WAFERS; i++) {
                String file = dir.resolve("warm-up-" + i + ".tif").toString();
                if (i % 10 == 9) {
                    rows.add(new BatchContent.Row(file, "", "error", "", "", "", Map.of(), List.of(), Double.NaN,
                            Double.NaN, Double.NaN, Double.NaN, "unreadable"));
                    continue;
                }
                boolean fail = i % 3 == 0;
                Map<String, Double> values = new LinkedHashMap<>();
                double v = 1 + 0.37 * i;
                for (String f : figures) {
                    values.put(f, fail ? 3 * v + 0.5 : v);
                    v *= 1.7;
                }
                if (fail && i < 3 * FailedWafersSection.SHOWN) {
                    BufferedImage thumb = new BufferedImage(64, 64, BufferedImage.TYPE_INT_RGB);
                    ImageIO.write(thumb, "png", thumbs.resolve("warm-up-" + i + ".tif.png").toFile());
                }
                rows.add(new BatchContent.Row(file, "W-" + i, fail ? "fail" : "pass", fail ? "C" : "A", profile, "",
                        values, fail && !figures.isEmpty() ? List.of(figures.get(i % figures.size())) : List.of(),
                        fail ? 2.5 + i : Double.NaN, fail ? 10 - i % 20 : Double.NaN, fail ? i % 30 - 15 : Double.NaN,
                        fail ? 3.5 : Double.NaN, ""));
            }
            BitSet covered = new BitSet();
            covered.set(0, 64);
            BitSet flagged = new BitSet();
            flagged.set(18, 22);
            RecurrenceMap recurrence = new RecurrenceMap();
            recurrence.add(new Footprint("warm-up", Footprint.PITCH_MM, -4, -4, 8, 8, covered, flagged));
            BatchContent c = new BatchContent(dir, rules, rows, recurrence.families(), null, HotSpots.Criteria.DEFAULT);
            try (PDDocument doc = new PDDocument()) {
                draw(doc, c);
                doc.save(OutputStream.nullOutputStream());
            }
        } finally {
            try (Stream<Path> all = Files.walk(dir)) {
                for (Path p : all.sorted(Comparator.reverseOrder()).toList()) {
                    Files.deleteIfExists(p);
                }
            }
        }
    }
}
