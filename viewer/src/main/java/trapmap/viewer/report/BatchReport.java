package trapmap.viewer.report;

import java.io.IOException;
import java.nio.file.Path;
import org.apache.pdfbox.pdmodel.PDDocument;
import trapmap.maps.batch.RecurrenceMap;
import trapmap.maps.batch.Rules;
import trapmap.maps.io.AtomicFiles;
import trapmap.maps.model.Caution;

/**
 * The summary PDF of a batch inspection, made from what the batch wrote into its output folder
 * ({@link BatchFolder}: {@code results.csv}, {@code footprints.csv}, {@code thumbnails/}), so that it also covers
 * rows kept from a resumed run:
 * <ol>
 *   <li>yield, grades, and the profiles that judged the wafers ({@link SummarySection});</li>
 *   <li>one section per profile: its wafers, defect, flag, limits and grades, and the distribution of each figure
 *       with that profile's limits ({@link ProfileSection});</li>
 *   <li>every wafer in a table ({@link WaferTable});</li>
 *   <li>the failed wafers, worst first, with pictures ({@link FailedWafersSection});</li>
 *   <li>the recurrence map of each wafer family with its hot spots ({@link RecurrenceSection});</li>
 *   <li>the files that could not be inspected ({@link ErrorSection}), and the caution.</li>
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

    /** Reads the batch's results and writes {@value #FILE_NAME} into its output folder; returns the file. */
    public static Path writeFor(Path outputDir, Rules rules) throws IOException {
        Path pdf = outputDir.resolve(FILE_NAME);
        write(read(outputDir, rules), pdf);
        return pdf;
    }

    /** Writes the summary into {@code pdf} (atomically). */
    public static void write(BatchContent c, Path pdf) throws IOException {
        AtomicFiles.write(pdf, tmp -> {
            try (PDDocument doc = new PDDocument(); ReportFlow flow = new ReportFlow(doc)) {
                doc.getDocumentInformation().setTitle("Batch inspection summary");
                doc.getDocumentInformation().setCreator("trapmap");
                SummarySection.draw(flow, c);
                ProfileSection.drawAll(flow, c);
                WaferTable.draw(flow, c);
                FailedWafersSection.draw(flow, c);
                RecurrenceSection.drawAll(flow, c);
                ErrorSection.draw(flow, c);
                flow.down(8);
                flow.caution(Caution.TEXT);
                flow.close();
                PdfPage.footers(doc, "trapmap batch summary - " + PdfPage.clean(c.outputDir().toString()) + " - "
                        + SummarySection.DATE.format(c.created()));
                doc.save(tmp.toFile());
            }
        });
    }
}
