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
 * longest part, which starts on a page of its own) into the document. Once the rows are complete
 * ({@link #rowsEnded}, told before the batch writes its tables), the same thread draws what depends on every wafer
 * (summary page and profile sections, placed before the table; failed wafers, recurrence, errors after it; the
 * footers) and saves the document into memory, beside the batch writing its tables and {@code results.json};
 * {@link #write}, after the tables, waits for it and writes the file atomically. The document is the one
 * {@link BatchReport#write} draws from the same rows; where the rows told are not those of the finished table (a
 * resumed run put back in input order, a wafer id that recurs and names its rows by file) the thread draws the whole
 * document from the finished rows instead, and where the thread could not make it (a failure, a runtime that cannot
 * draw text, rows never told ended), {@link #write} draws it from the finished rows on the calling thread.
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
    /** What {@link #rowsEnded} was told (set before the end mark is queued, read by the drawing thread after it). */
    private volatile Ended told;
    /** The document made by the drawing thread after the rows ended, for {@link #write}; null: none. */
    private byte[] finished;
    /** The drawing thread's CPU time when it ended, ns; -1: not known. */
    private volatile long drawingCpu = -1;
    /** The drawing thread's CPU time spent after the rows ended (finishing the document), ns; -1: none or unknown. */
    private volatile long finishingCpu = -1;
    /** Whether the last {@link #write} used the table drawn ahead (a test's view). */
    private boolean drewAhead;
    /** Whether the last {@link #write} wrote the document finished by the drawing thread (a test's view). */
    private boolean finishedAhead;
    /** Whether {@link #write} ran (else {@link #close} interrupts the drawing thread). */
    private volatile boolean written;
    /** The trend page's source, asked once the rows ended (after the batch's wafers were told); null: no page. */
    private volatile BatchReport.TrendSource trend;

    /** The complete rows and the recurrence, as {@link #rowsEnded} was told them. */
    private record Ended(List<Map<String, String>> rows, boolean asTold, RecurrenceMap recurrence) {
    }

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

    /**
     * Adds the trend page ({@link TrendSection}) of {@code source}, asked when the rows are complete (on the drawing
     * thread, beside the batch's tables, or by {@link #write}); null: none. Call before the batch starts. Returns
     * this draft.
     */
    public SummaryDraft withTrend(BatchReport.TrendSource source) {
        this.trend = source;
        return this;
    }

    /** The content with the trend page, when there is one. */
    private BatchContent trended(BatchContent c) throws IOException {
        BatchReport.TrendSource t = trend;
        return t == null ? c : c.withTrend(t.trend(BatchReport.files(c)));
    }

    /** A results row the batch wrote (its cells as made, before {@code CsvCells.text}); returns at once. */
    @Override
    public void row(Map<String, String> row) {
        if (!ended) {
            queue.add(row);
        }
    }

    /**
     * The rows are complete: the drawing thread finishes the document after the rows told so far (from
     * {@code finishedRows}, the finished table, where they differ from the rows told) and saves it into memory for
     * {@link #write}; returns at once.
     */
    @Override
    public void rowsEnded(List<Map<String, String>> finishedRows, boolean asTold, RecurrenceMap recurrence) {
        if (!ended) {
            told = new Ended(finishedRows, asTold, recurrence);
            ended = true;
            queue.add(END);
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
            return;
        } catch (Exception | Error e) {
            // out of memory or a runtime that cannot draw text included: the summary step draws it all again after
            // the last wafer and reports its own failure (an error thrown here would only end this thread)
            usable = false;
            return;
        }
        Ended e = told;
        if (e != null) {
            long from = BatchInspection.threadCpuNanos();
            try {
                finished = finish(e);
            } catch (Exception | Error failure) {
                finished = null; // drawn again by write(), which reports the failure
            } finally {
                usable = false; // the document drawn ahead is finished (or broken) either way
                dropQuietly();
                long to = BatchInspection.threadCpuNanos();
                finishingCpu = from < 0 || to < 0 ? -1 : to - from;
            }
        }
    }

    /**
     * The whole document in memory (on the drawing thread, or by {@link #write} where that thread did not make it):
     * the table drawn ahead finished when it holds the rows {@code e} names, in their order; else drawn anew from
     * them.
     */
    private byte[] finish(Ended e) throws IOException {
        java.io.ByteArrayOutputStream bytes = new java.io.ByteArrayOutputStream(1 << 20);
        if (!usable || !e.asTold() || rows.size() != e.rows().size() || rows.size() != expected) {
            dropDocument();
            drewAhead = false;
            try (PDDocument d = new PDDocument()) {
                BatchReport.draw(d, trended(content(e.rows(), e.recurrence())));
                d.save(bytes);
            }
            return bytes.toByteArray();
        }
        BatchContent c = trended(new BatchContent(outDir, rules, rows, e.recurrence().families(), null,
                HotSpots.Criteria.DEFAULT, e.recurrence().refused()));
        table.end();
        BatchReport.describe(doc);
        try (ReportFlow head = new ReportFlow(doc, tableStart)) {
            BatchReport.head(head, c);
        }
        stopIfCancelled();
        BatchReport.tail(flow, c, pictures::get);
        BatchReport.footers(doc, c);
        stopIfCancelled();
        doc.save(bytes);
        drewAhead = true;
        return bytes.toByteArray();
    }

    /** Ends the drawing after a step when {@link #close} interrupted it (a batch that failed or was cancelled). */
    private static void stopIfCancelled() throws java.io.InterruptedIOException {
        if (Thread.currentThread().isInterrupted()) {
            throw new java.io.InterruptedIOException("summary cancelled");
        }
    }

    /** The content of the summary of {@code finishedRows} (cells as made) and {@code recurrence}. */
    private BatchContent content(List<Map<String, String>> finishedRows, RecurrenceMap recurrence) {
        List<BatchContent.Row> all = new ArrayList<>(finishedRows.size());
        List<String> figures = BatchFolder.figureColumns(rules);
        for (Map<String, String> cells : finishedRows) {
            all.add(BatchFolder.row(cells, figures));
        }
        return new BatchContent(outDir, rules, all, recurrence.families(), null, HotSpots.Criteria.DEFAULT,
                recurrence.refused());
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
        written = true;
        end();
        Path pdf = outDir.resolve(BatchReport.FILE_NAME);
        Ended e = told;
        byte[] bytes = finished;
        finished = null;
        finishedAhead = bytes != null && e != null && e.recurrence() == recurrence && e.rows() == finishedRows
                && e.asTold() == asTold;
        if (!finishedAhead) { // rows never told ended, told otherwise, or the drawing thread failed: finished here
            try {
                bytes = finish(new Ended(finishedRows, asTold, recurrence));
            } finally {
                dropDocument();
            }
        }
        AtomicFiles.write(pdf, bytes);
        return pdf;
    }

    /**
     * The CPU time of the drawing thread, which ran beside the workers, nanoseconds, once {@link #write} or
     * {@link #close} ended it; -1 before or where the system does not tell.
     */
    public long drawingCpuNanos() {
        return drawingCpu;
    }

    /**
     * The CPU time the drawing thread spent finishing the document after the rows ended ({@link #rowsEnded}),
     * nanoseconds, once {@link #write} or {@link #close} ended it: the summary's serial work, done beside the batch's
     * tables; -1 for none or where the system does not tell.
     */
    public long finishingCpuNanos() {
        return finishingCpu;
    }

    /** Whether the last {@link #write} used the wafer table drawn while the batch ran. */
    boolean drewAhead() {
        return drewAhead;
    }

    /** Whether the last {@link #write} wrote the document the drawing thread finished beside the tables. */
    boolean finishedAhead() {
        return finishedAhead;
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

    private void dropQuietly() {
        try {
            dropDocument();
        } catch (IOException | RuntimeException e) {
            // only memory: the document is not used again
        }
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
        ended = true;
        if (!written) {
            thread.interrupt();
        }
        try {
            thread.join();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
        finished = null;
        dropDocument();
    }
}
