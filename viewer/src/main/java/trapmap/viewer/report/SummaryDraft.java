package trapmap.viewer.report;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.IdentityHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.LinkedBlockingQueue;
import java.util.function.BooleanSupplier;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.pdmodel.PDPage;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.HotSpots;
import trapmap.maps.batch.RecurrenceMap;
import trapmap.maps.batch.Rules;
import trapmap.maps.io.AtomicFiles;

/**
 * The summary PDF of a batch ({@link BatchReport}) drawn while the batch runs, so that little of it is left for
 * after the last wafer: a thread of its own takes each results row as the batch writes it
 * ({@link BatchInspection#tellingRows}, in the order of {@code results.csv}) and draws its row of the wafer table (the
 * longest part, which starts on a page of its own) into the document. After the last wafer, {@link #write} draws what
 * depends on every wafer (summary page and profile sections, placed before the table; failed wafers, recurrence,
 * errors after it; the footers) and saves the document atomically. The document is the one {@link BatchReport#write}
 * draws from the same rows; where the rows told are not those of the finished table (a resumed run put back in input
 * order, a wafer id that recurs and names its rows by file, a failure of the drawing thread), {@link #write} draws the
 * whole document from the finished rows instead.
 *
 * <p>The drawing thread writes nothing into the output folder; {@link #close} stops it and drops its document.
 */
public final class SummaryDraft implements BatchInspection.RowListener, AutoCloseable {
    /** Rows between two rounds of {@link #makePictures}. */
    private static final int PICTURES_EVERY = 32;
    /** Marks the end of the rows in the queue. */
    private static final Map<String, String> END = Map.of("", "");

    private final Path outDir;
    private final Rules rules;
    private final int expected;
    private final BooleanSupplier drawable;
    private final BlockingQueue<Map<String, String>> queue = new LinkedBlockingQueue<>();
    private final Thread thread;
    /** Opened by {@link #warmedUp}: the rows wait for the summary's warm-up (drawn cold, they would cost more). */
    private final java.util.concurrent.CountDownLatch warm = new java.util.concurrent.CountDownLatch(1);
    // the drawing thread's, read by write() after it ended
    private final List<BatchContent.Row> rows = new ArrayList<>();
    private final Set<String> names = new HashSet<>();
    /** The worst failed wafers so far ({@link BatchContent#WORST_FIRST}, ties in the table's order), at most shown. */
    private final List<BatchContent.Row> worst = new ArrayList<>();
    /** Their cards' pictures, made as they entered {@link #worst}. */
    private final Map<BatchContent.Row, Optional<PdfPage.Picture>> pictures = new IdentityHashMap<>();
    private PDDocument doc;
    private ReportFlow flow;
    private ReportFlow.Table table;
    private PDPage tableStart;
    /** Whether the document drawn so far holds the told rows' table as {@link BatchReport} draws it. */
    private boolean usable;
    private volatile boolean ended;
    /** The drawing thread's CPU time when it ended, ns; -1: not known. */
    private volatile long drawingCpu = -1;
    /** Whether the last {@link #write} used the table drawn ahead (a test's view). */
    private boolean drewAhead;

    private SummaryDraft(Path outDir, Rules rules, int expectedRows, BooleanSupplier drawable) {
        this.outDir = outDir;
        this.rules = rules;
        this.expected = expectedRows;
        this.drawable = drawable;
        this.thread = new Thread(this::draw, "inspect-summary");
        thread.setDaemon(true);
    }

    /**
     * Starts drawing the summary of a batch into {@code outDir} (its thumbnails are read from there as they are
     * written) under {@code rules} whose results table will hold {@code expectedRows}
     * rows (one per input file); {@code drawable} is asked first on the drawing thread (false: this runtime cannot
     * draw text, and nothing is drawn ahead).
     */
    public static SummaryDraft start(Path outDir, Rules rules, int expectedRows, BooleanSupplier drawable) {
        SummaryDraft d = new SummaryDraft(outDir, rules, expectedRows, drawable);
        d.thread.start();
        return d;
    }

    /** A results row the batch wrote (its cells as made, before {@code CsvCells.text}); returns at once. */
    @Override
    public void row(Map<String, String> row) {
        if (!ended) {
            queue.add(row);
        }
    }

    private void draw() {
        try {
            drawing();
        } finally {
            drawingCpu = BatchInspection.threadCpuNanos();
        }
    }

    /**
     * The summary's warm-up ({@link BatchReport#warmUp}) ended, or there is none: the drawing thread starts on the
     * rows told so far. Without it the rows are drawn by {@link #write} (or when the batch ends).
     */
    public void warmedUp() {
        warm.countDown();
    }

    private void drawing() {
        try {
            warm.await();
            List<String> figureColumns = BatchFolder.figureColumns(rules);
            if (!drawable.getAsBoolean()) {
                return;
            }
            doc = new PDDocument();
            flow = new ReportFlow(doc);
            table = WaferTable.start(flow, expected);
            tableStart = doc.getPage(0);
            usable = true;
            for (Map<String, String> cells = queue.take(); cells != END; cells = queue.take()) {
                BatchContent.Row r = BatchFolder.row(cells, figureColumns);
                rows.add(r);
                if (!usable) {
                    continue;
                }
                if (!names.add(r.name()) || rows.size() > expected) {
                    usable = false; // a recurring id names its rows by file: drawn from the finished rows
                    continue;
                }
                table.row(WaferTable.row(r.name(), BatchContent.profile(rules, r.profile()), r));
                if (r.status().equals("fail")) {
                    rank(r);
                }
                if (rows.size() % PICTURES_EVERY == 0) {
                    makePictures();
                }
            }
        } catch (InterruptedException e) {
            usable = false;
        } catch (Exception | Error e) {
            // out of memory or a runtime that cannot draw included: the summary step draws it all again after the
            // last wafer and reports its own failure (an error thrown here would only end this thread)
            usable = false;
        }
    }

    /**
     * Keeps {@code r} among the worst failed wafers when it is one of the {@value FailedWafersSection#SHOWN} worst
     * so far (after those as bad before it: the stable order of the section); a wafer pushed out loses its picture.
     */
    private void rank(BatchContent.Row r) {
        int at = worst.size();
        while (at > 0 && BatchContent.WORST_FIRST.compare(worst.get(at - 1), r) > 0) {
            at--;
        }
        if (at >= FailedWafersSection.SHOWN) {
            return;
        }
        worst.add(at, r);
        while (worst.size() > FailedWafersSection.SHOWN) {
            pictures.remove(worst.remove(worst.size() - 1));
        }
    }

    /**
     * Makes the card pictures of the worst failed wafers that have none yet: every {@value #PICTURES_EVERY} rows, so
     * that a wafer pushed out again soon after it came in (frequent early in a batch) costs no picture; those
     * still missing after the last row are made by {@link #write}.
     */
    private void makePictures() {
        for (BatchContent.Row w : worst) {
            pictures.computeIfAbsent(w, k -> FailedWafersSection.picture(outDir, k));
        }
    }

    /**
     * Writes {@value BatchReport#FILE_NAME} into the batch's folder once the batch's tables are complete:
     * {@code finishedRows} are the rows of {@code results.csv} in its order, {@code asTold} whether they are the rows
     * told, in the order told; {@code recurrence} the batch's recurrence. Returns the file.
     */
    public Path write(RecurrenceMap recurrence, List<Map<String, String>> finishedRows, boolean asTold)
            throws IOException, InterruptedException {
        end();
        Path pdf = outDir.resolve(BatchReport.FILE_NAME);
        if (!usable || !asTold || rows.size() != finishedRows.size() || rows.size() != expected) {
            List<BatchContent.Row> all = new ArrayList<>(finishedRows.size());
            List<String> figures = BatchFolder.figureColumns(rules);
            for (Map<String, String> cells : finishedRows) {
                all.add(BatchFolder.row(cells, figures));
            }
            dropDocument();
            drewAhead = false;
            BatchReport.write(new BatchContent(outDir, rules, all, recurrence.families(), null,
                    HotSpots.Criteria.DEFAULT, recurrence.refused()), pdf);
            return pdf;
        }
        BatchContent c = new BatchContent(outDir, rules, rows, recurrence.families(), null, HotSpots.Criteria.DEFAULT,
                recurrence.refused());
        try {
            table.end();
            BatchReport.describe(doc);
            try (ReportFlow head = new ReportFlow(doc, tableStart)) {
                BatchReport.head(head, c);
            }
            BatchReport.tail(flow, c, pictures::get);
            BatchReport.footers(doc, c);
            AtomicFiles.write(pdf, tmp -> doc.save(tmp.toFile()));
            drewAhead = true;
        } finally {
            dropDocument();
        }
        return pdf;
    }

    /**
     * The CPU time of the drawing thread, which ran beside the workers, nanoseconds, once {@link #write} or
     * {@link #close} ended it; -1 before or where the system does not tell.
     */
    public long drawingCpuNanos() {
        return drawingCpu;
    }

    /** Whether the last {@link #write} used the wafer table drawn while the batch ran. */
    boolean drewAhead() {
        return drewAhead;
    }

    /** Ends the drawing thread after the rows told so far. */
    private void end() throws InterruptedException {
        if (!ended) {
            ended = true;
            queue.add(END);
        }
        warm.countDown();
        thread.join();
    }

    private void dropDocument() throws IOException {
        if (doc != null) {
            PDDocument d = doc;
            doc = null;
            flow = null;
            d.close();
        }
    }

    /** Stops the drawing thread (when {@link #write} did not run) and drops the document. */
    @Override
    public void close() throws IOException {
        if (!ended) {
            ended = true;
            thread.interrupt();
        }
        try {
            thread.join();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
        dropDocument();
    }
}
