package trapmap.maps.batch;

import com.fasterxml.jackson.databind.SerializationFeature;
import java.io.IOException;
import java.io.Reader;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVPrinter;
import org.apache.commons.csv.CSVRecord;
import trapmap.maps.io.CsvCells;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.NumberText;
import trapmap.shared.progress.ProgressListener;

/**
 * Inspects many wafer maps against one set of {@link Rules} and writes the results into an output folder:
 *
 * <ul>
 *   <li>{@code run.json}: the run record ({@link RunManifest}), written first and recorded complete last; the run
 *       holds the folder locked ({@link RunLock}) and a failed write into it stops the batch
 *       ({@link BatchOutputException}).</li>
 *   <li>{@code results.csv}: one row per wafer, in input order (also after a resume). The rows are
 *       written and flushed one by one to {@code results.csv.partial}, which is moved onto {@code results.csv} when
 *       the batch is complete; an interrupted batch leaves the partial file, which a resumed run reads too.</li>
 *   <li>{@code results.json}: the same rows and a summary, written to a temporary file and moved at the end.</li>
 *   <li>{@code recurrence-FAMILY.tif} / {@code .png}: the fraction of the wafers of one family flagged at each
 *       position ({@link RecurrenceMap}; the picture on a fixed 0–100 % scale with a colour bar and the
 *       {@link HotSpots} outlined, {@link RecurrencePicture}); wafers kept from a resumed run enter it through their footprints in
 *       {@code footprints.csv} (written like {@code results.csv}), without being read again.</li>
 *   <li>{@code recurrence.csv}: per family, the number of wafers in its recurrence map and the map's file.</li>
 *   <li>{@code regions.csv}: one row per flagged region (position, area, peak, trap density), written like
 *       {@code footprints.csv}; the rows of wafers kept from a resumed run are kept.</li>
 *   <li>{@code thumbnails/FILE.png} (unless switched off): each map with its flagged regions outlined.</li>
 * </ul>
 *
 * <p>Memory is bounded: a fixed pool of {@code threads} workers each holds one map at a time, at most
 * {@value #QUEUED_PER_WORKER}{@code ·threads} inspected wafers (their rows as text, no map) wait to be written, and
 * the workers share a {@link MemoryBudget} of the heap,
 * so that big maps are inspected fewer at a time. A file that cannot be read or evaluated, a map too big for the
 * heap and a map whose inspection runs out of memory give an {@code error} row and the batch goes on. Interrupting
 * the calling thread cancels the batch.
 *
 * <p><b>Serial parts kept small.</b> The workers inspect, write the thumbnails, format each wafer's rows of the three
 * tables and add its footprint to a recurrence of their own (merged once after the last wafer; a footprint left out
 * is told to the batch's recurrence in input order, so that the result equals adding every footprint in input
 * order). The calling thread alone writes the rows, in input order, and the workers run ahead of it by up to
 * {@value #QUEUED_PER_WORKER} wafers each. While they inspect, a thread of its own does the first-use work of what
 * comes after the last wafer ({@link #warmingUp}). {@link #lastPhases()} tells how long each part took.
 *
 * <p><b>Why a kill at any moment resumes to the uninterrupted run's tables.</b> The three tables are written each
 * through a {@code .partial} file; per wafer the footprint row, then its region rows, then its results row, each
 * table flushed before the next is written. So:
 * <ol>
 *   <li>A wafer with a complete results row on disk (in {@code results.csv} or its {@code .partial}) has all its
 *       footprint and region rows complete in the footprint and region tables of the same run; the results row is the
 *       wafer's commit. A kill (SIGKILL between two writes, SIGTERM refusing the next write through
 *       {@link OutputFolder#check}) can leave footprint or region rows of wafers without a results row, and a last
 *       row cut short in any table.</li>
 *   <li>Resume keeps exactly the wafers with a complete, non-{@code error} results row (a cut row is inconsistent
 *       and skipped), and rebuilds the three partial tables from that set alone (footprints and regions looked up by
 *       the same normalised key, cells through {@link CsvCells#raw}/{@link CsvCells#text}), so rows of wafers without
 *       a results row are dropped, and the wafers inspected again are written once. (A results row reaches the file in
 *       one write while it is under the writers' 8 KiB buffers; only a longer row could be cut inside its last cell
 *       and still be complete in form.) A wafer's regions from the later
 *       file replace the earlier ones as a whole.</li>
 *   <li>The rebuilt tables are written to {@code .new} temporaries and moved over the partial files one by one; a
 *       kill between the moves leaves old and new partial files that hold the same kept wafers (the new ones are
 *       built from the old), so the next resume keeps the same set. A {@code .new} deleted by the shutdown hook
 *       makes its move fail and leaves the old partial file. The end-of-run reordering (below) and the final moves
 *       (footprints, regions, results) likewise change no table's set of wafers, and resume reads {@code results.csv}
 *       and its {@code .partial} (later wins) and the same pairs for the other tables.</li>
 *   <li>Order: kept rows are written first and inspected wafers after them. When an {@code error} row was dropped
 *       from the middle to be tried again, that order is not the input order; the three tables and
 *       {@code results.json} are then put back in input order before the final moves.</li>
 * </ol>
 */
public final class BatchInspection {
    public static final String CSV_NAME = "results.csv";
    public static final String PARTIAL_NAME = "results.csv.partial";
    public static final String JSON_NAME = "results.json";
    public static final String FOOTPRINTS_NAME = "footprints.csv";
    public static final String REGIONS_NAME = "regions.csv";
    /** Columns of {@value #REGIONS_NAME}: one row per flagged region. */
    public static final List<String> REGION_COLUMNS = List.of("file", "wafer_id", "region", "area_mm2", "x_mm", "y_mm",
            "centroid_x_mm", "centroid_y_mm", "centroid_inside", "min_x_mm", "min_y_mm", "max_x_mm", "max_y_mm",
            "peak", "peak_x_mm", "peak_y_mm", "mean", "edge_distance_mm", "peak_density_cm3", "median_density_cm3");
    public static final String THUMBNAIL_DIR = "thumbnails";
    /** One row per recurrence map: its family, the number of wafers in it and its TIFF file. */
    public static final String RECURRENCE_NAME = "recurrence.csv";
    /** Start of the recurrence maps' file names: {@code recurrence-FAMILY.tif} and {@code .png}. */
    public static final String RECURRENCE_PREFIX = "recurrence-";
    /** Columns of {@value #RECURRENCE_NAME}. */
    public static final List<String> RECURRENCE_COLUMNS = List.of("family", "wafers", "file");
    /**
     * Columns of {@value #CSV_NAME} that describe the worst region besides its area, position and peak: the rule it
     * belongs to, whether its centroid lies inside it, its peak position and bounding box (mm).
     */
    static final List<String> WORST_REGION_EXTRA = List.of("worst_region_rule", "worst_region_centroid_inside",
            "worst_region_peak_x_mm", "worst_region_peak_y_mm", "worst_region_min_x_mm", "worst_region_min_y_mm",
            "worst_region_max_x_mm", "worst_region_max_y_mm");

    /**
     * @param threads    number of workers (≥ 1)
     * @param resume     skip files already listed in an existing results file and keep their rows
     * @param thumbnails write a thumbnail per wafer
     * @param progress   told after each wafer (done, total, file name)
     * @param overwrite  a new run (not {@code resume}) into a folder holding another run's results first removes
     *                   them (only the batch's own files); without it such a folder is refused
     * @param thumbnailCaptions give each thumbnail a small caption strip (wafer id, quantity and unit; no date, so
     *                   thumbnails stay byte-identical between runs)
     */
    public record Options(int threads, boolean resume, boolean thumbnails, ProgressListener progress,
                         boolean overwrite, boolean thumbnailCaptions) {
        public Options {
            if (threads < 1) {
                throw new IllegalArgumentException("threads must be >= 1 but was " + threads);
            }
            if (resume && overwrite) {
                throw new IllegalArgumentException("resume and overwrite exclude each other");
            }
            progress = progress == null ? ProgressListener.NONE : progress;
        }

        /** Without thumbnail captions. */
        public Options(int threads, boolean resume, boolean thumbnails, ProgressListener progress,
                       boolean overwrite) {
            this(threads, resume, thumbnails, progress, overwrite, false);
        }

        /** Without overwrite and thumbnail captions. */
        public Options(int threads, boolean resume, boolean thumbnails, ProgressListener progress) {
            this(threads, resume, thumbnails, progress, false, false);
        }

        public Options withThumbnailCaptions(boolean captions) {
            return new Options(threads, resume, thumbnails, progress, overwrite, captions);
        }
    }

    /** The last step of a run, before it is recorded complete: the summary, written from the finished folder. */
    @FunctionalInterface
    public interface Finisher {
        void finish(Path outDir) throws IOException;
    }

    /**
     * The last step of a run given, besides the finished folder, the recurrence the batch built from every footprint
     * of the run (those kept from a resumed run included): the same counts as {@link RecurrenceMap#read} of the
     * folder's {@link #FOOTPRINTS_NAME}, without reading it again.
     */
    @FunctionalInterface
    public interface RecurrenceFinisher {
        void finish(Path outDir, RecurrenceMap recurrence) throws IOException;
    }

    /** Told each results row as the batch writes it ({@link #tellingRows}). */
    @FunctionalInterface
    public interface RowListener {
        /**
         * A row written to the results table, its cells as made (before {@link CsvCells#text}); called on the
         * writing thread in the table's order, so it must return at once (hand the row to a thread of its own). The
         * map is not changed afterwards.
         */
        void row(Map<String, String> row);

        /**
         * The rows are complete: {@code rows} are those of the results table in its order (as {@link #rows()} tells
         * the finisher), {@code asTold} whether they are the rows told, in the order told, and {@code recurrence} the
         * batch's recurrence (as the {@linkplain RecurrenceFinisher finisher} is given it); neither changes
         * afterwards. Called once, on the writing thread after the last row, before the tables are put in place and
         * the recurrence maps and {@value #JSON_NAME} are written, so that what is made of them (the summary) can be
         * made beside that; must return at once. Nothing by default.
         */
        default void rowsEnded(List<Map<String, String>> rows, boolean asTold, RecurrenceMap recurrence) {
        }
    }

    /** Told each wafer the batch has written ({@link #tellingWafers}), e.g. to keep it in a results store. */
    @FunctionalInterface
    public interface WaferListener {
        /**
         * A wafer inspected in this run whose results row was just written (its rows in the three tables are
         * complete): its result (figures, failed rules, regions, footprint) and its results row as made. Called on the
         * writing thread in the table's order, so it must return soon (hand the work to a thread of its own); rows
         * kept from a resumed run are not told (those it inspects again are: {@link #inspectingAgain}). Neither argument changes afterwards.
         */
        void wafer(WaferResult result, Map<String, String> row);
    }

    /** First-use work of the summary step ({@link #warmingUp}). */
    @FunctionalInterface
    public interface WarmUp {
        void warmUp() throws Exception;
    }

    /**
     * What a batch did.
     *
     * @param pass       wafers that passed (including kept rows)
     * @param fail       wafers that failed
     * @param error      files that could not be inspected
     * @param skipped    files skipped because a resumed results file lists them
     * @param csv        the results table
     * @param json       the results as JSON
     * @param recurrence the recurrence maps written (TIFF and PNG)
     */
    public record Summary(int pass, int fail, int error, int skipped, Path csv, Path json, List<Path> recurrence) {
        public int total() {
            return pass + fail + error;
        }

        /** Passed over inspected wafers (errors included), NaN when there are none. */
        public double yield() {
            return total() == 0 ? Double.NaN : (double) pass / total();
        }
    }

    /**
     * Times of the parts of a run ({@link #lastPhases()}), nanoseconds: wall clock, and in the parts other than the
     * inspection, which run on the calling thread alone, that thread's CPU time ({@link #threadCpuNanos}; -1 where
     * the system does not tell): on idle cores, what these parts take when no other thread keeps them waiting (the
     * JIT compiler's and collector's threads run beside them).
     *
     * @param prepareNanos    taking and checking the folder, the run record, rows kept from a resumed run, up to
     *                        the first map handed to a worker
     * @param inspectionNanos from the first map handed to a worker to the last results row written
     * @param tablesNanos     after that: the tables put in place, the recurrence maps, {@code recurrence.csv} and
     *                        {@code results.json} written, the run recorded finishing
     * @param summaryNanos    the {@linkplain #finishingWith finisher} (the summary) and the run recorded complete
     * @param writerBusyNanos within the inspection: the time the writer of the tables spent writing rows (not waiting
     *                        for results)
     * @param prepareCpuNanos the calling thread's CPU time in the preparation
     * @param tablesCpuNanos  the calling thread's CPU time in the tables part
     * @param summaryCpuNanos the calling thread's CPU time in the summary part
     * @param workerCpuNanos  the workers' CPU time in all, inspecting and formatting the wafers (their threads' CPU
     *                        time from the start to the end of each wafer, summed)
     * @param inspectionCpuNanos the calling thread's CPU time in the inspection (writing the rows beside the workers)
     */
    public record Phases(long prepareNanos, long inspectionNanos, long tablesNanos, long summaryNanos,
                        long writerBusyNanos, long prepareCpuNanos, long tablesCpuNanos, long summaryCpuNanos,
                        long workerCpuNanos, long inspectionCpuNanos) {
        public static final Phases NONE = new Phases(0, 0, 0, 0, 0, 0, 0, 0, 0, 0);
    }

    /** CPU time of this process so far (all threads), nanoseconds; -1 where the system does not tell. */
    public static long processCpuNanos() {
        return ProcessHandle.current().info().totalCpuDuration().map(java.time.Duration::toNanos).orElse(-1L);
    }

    /**
     * CPU time of the calling thread so far, nanoseconds, from Linux's {@code /proc/thread-self/schedstat} (its
     * first field: time on a CPU, ns); -1 elsewhere.
     */
    public static long threadCpuNanos() {
        try {
            String s = Files.readString(Path.of("/proc/thread-self/schedstat"), StandardCharsets.US_ASCII);
            return Long.parseLong(s.substring(0, s.indexOf(' ')));
        } catch (IOException | RuntimeException e) {
            return -1;
        }
    }

    private static long cpuBetween(long from, long to) {
        return from < 0 || to < 0 ? -1 : to - from;
    }

    /**
     * Inspected wafers that may wait to be written, per worker: the workers run ahead of the writer by this many
     * wafers each before they wait for it (a slow wafer at the head of the queue holds no worker).
     */
    static final int QUEUED_PER_WORKER = 8;

    /**
     * Whether the other workers wait for the first wafer of a run before they start theirs: on a machine of at most
     * two processors that the workers fill ({@code threads} at least 2). The first wafer runs mostly in the
     * interpreter (its code is not compiled yet, and the compilers and the summary's warm-up want the processors at
     * the same time); a second worker beside it would run the same cold code at the same cost, about 100 ms of CPU
     * more, while waiting it leaves its processor to the compilers and starts on compiled code. With more
     * processors the start-up's other threads leave cores spare, and every worker starts at once.
     */
    static boolean firstWaferAlone(int threads, int processors) {
        return threads >= 2 && processors <= 2;
    }

    /**
     * One wafer inspected and formatted by a worker, for the writer: the results row (kept for {@code results.json})
     * and the CSV text of its rows in the three tables, with their record separators.
     *
     * @param file          the map file as given
     * @param footprint     where the wafer was evaluated and flagged, null for none
     * @param row           the results row ({@link #row}, iron columns merged)
     * @param rowText       the row in {@value #CSV_NAME}
     * @param regionsText   its rows in {@value #REGIONS_NAME} (empty for none)
     * @param footprintText its row in {@value #FOOTPRINTS_NAME} (empty when {@code footprint} is null)
     * @param waferJson     its object in {@value #JSON_NAME}'s list of wafers ({@link #waferJson})
     */
    record Inspected(String file, Footprint footprint, Map<String, String> row, String rowText, String regionsText,
                     String footprintText, String waferJson, WaferResult result) {
        /**
         * Formats {@code r} with {@code format} (one per thread: its printing is synchronized); {@code withIron}:
         * merges the iron columns {@code iron} (null: none could be evaluated) into the row ({@link IronPairs}).
         */
        static Inspected of(WaferResult r, List<String> columns, boolean withIron, Map<String, String> iron,
                            Rules rules, CSVFormat format) throws IOException {
            return of(r, columns, withIron, iron, rules, format, false);
        }

        /** As above; {@code keepResult}: the result is kept for a {@link WaferListener} (null otherwise). */
        static Inspected of(WaferResult r, List<String> columns, boolean withIron, Map<String, String> iron,
                            Rules rules, CSVFormat format, boolean keepResult) throws IOException {
            Map<String, String> row = BatchInspection.row(r);
            if (withIron) {
                IronPairs.merge(row, iron == null ? Map.of() : iron, rules);
            }
            StringBuilder rowText = new StringBuilder();
            StringBuilder regionsText = new StringBuilder();
            StringBuilder footprintText = new StringBuilder();
            try (CSVPrinter rp = new CSVPrinter(rowText, format);
                 CSVPrinter gp = new CSVPrinter(regionsText, format);
                 CSVPrinter fp = new CSVPrinter(footprintText, format)) {
                print(rp, columns, row);
                for (Map<String, String> region : regionRows(r)) {
                    print(gp, REGION_COLUMNS, region);
                }
                if (r.footprint() != null) {
                    fp.printRecord(FootprintStore.record(r.file(), r.footprint()));
                }
            }
            return new Inspected(r.file(), r.footprint(), row, rowText.toString(), regionsText.toString(),
                    footprintText.toString(), BatchInspection.waferJson(row, columns), keepResult ? r : null);
        }
    }

    private final Rules rules;
    private final WaferInspection inspection;
    private final WaferInspection.MapReader reader;
    /** The rules' iron section, null when there is none. */
    private IronPairRules iron;
    /** Heap the workers may hold at once, bytes; negative: {@link MemoryBudget#ofThisHeap()}. */
    private long memoryBudgetBytes = -1;
    /** Whether the first wafer runs alone ({@link #firstWaferAlone}); null: as that decides for this machine. */
    private Boolean firstAlone;
    /** Program version and rules file, for the run record. */
    private RunManifest.Source source = RunManifest.Source.UNKNOWN;
    /** The summary step, null for none. */
    private RecurrenceFinisher finisher;
    /** The recurrence of the last {@link #inspectAll}, handed to the summary step. */
    private RecurrenceMap builtRecurrence;
    /** Whether the recurrence pictures are drawn, asked once when they are due; null: always. */
    private java.util.function.BooleanSupplier recurrencePictures;
    /** What {@code run.json} records about the summary once the finisher ran; null: nothing. */
    private java.util.function.Supplier<String> summaryRecord;
    /** Told each results row as it is written; null for none. */
    private RowListener rowListener;
    /** Told each wafer inspected in this run once its rows are written; null for none. */
    private WaferListener waferListener;
    /** The rows of the results table of the running run once its tables are complete, in the table's order. */
    private List<Map<String, String>> finishedRows = List.of();
    /** Whether {@link #finishedRows} are the rows told to the listener, in the order told. */
    private boolean finishedAsTold;
    /** First-use work of the summary step, run beside the workers; null for none. */
    private WarmUp warmUp;
    /** Whether a resumed run keeps the {@code error} rows instead of trying their files again ({@link #keepingErrors}). */
    private boolean keepErrors;
    /** Files of kept rows that a resumed run inspects again ({@link #inspectingAgain}); null for none. */
    private java.util.function.Predicate<String> inspectAgain;
    /** Whether a resumed run may have more input files than the recorded run ({@link #growingInputs}). */
    private boolean growingInputs;
    /** Times of the last run's parts. */
    private volatile Phases phases = Phases.NONE;
    /** {@link System#nanoTime} marks of the running run: start, first map submitted, last row written. */
    private long startedAt;
    private long inspectingFrom;
    private long inspectedAt;
    /** {@link #threadCpuNanos} of the calling thread at the same marks. */
    private long startedCpu;
    private long inspectingFromCpu;
    private long inspectedCpu;
    private long writerBusy;
    /** The workers' CPU time in the running run; a wafer whose CPU time is unknown makes the sum negative (unknown). */
    private final java.util.concurrent.atomic.LongAdder workerCpu = new java.util.concurrent.atomic.LongAdder();

    public BatchInspection(Rules rules) {
        this(rules, MapFiles::readSingle);
    }

    /** With another map reader (a test counting the reads). */
    public BatchInspection(Rules rules, WaferInspection.MapReader reader) {
        this.rules = rules;
        this.inspection = new WaferInspection(rules, reader);
        this.reader = reader;
    }

    /**
     * Also maps the iron of the FeB-dissociation pairs found by {@code ironRules} (null: none): their figures and
     * limits go into extra columns ({@link IronPairs}). Returns this batch.
     */
    public BatchInspection withIron(IronPairRules ironRules) {
        this.iron = ironRules;
        return this;
    }

    /**
     * Budgets the workers' memory at {@code bytes} in all instead of {@value MemoryBudget#HEAP_SHARE} of the maximum
     * heap (a test of the budget). Returns this batch.
     */
    BatchInspection withMemoryBudget(long bytes) {
        this.memoryBudgetBytes = bytes;
        return this;
    }

    /**
     * Runs the first wafer alone, the other workers waiting for it (true), or every worker at once (false), instead
     * of as {@link #firstWaferAlone} decides for this machine (a test of either). Returns this batch.
     */
    BatchInspection withFirstWaferAlone(boolean alone) {
        this.firstAlone = alone;
        return this;
    }

    /**
     * A resumed run keeps the {@code error} rows of the earlier run as they are instead of trying their files again
     * (the watch inspects each arriving file once). Returns this batch.
     */
    public BatchInspection keepingErrors(boolean keep) {
        this.keepErrors = keep;
        return this;
    }

    /**
     * A resumed run inspects again the wafers of the earlier run whose file (as written in the {@code file} column)
     * {@code again} accepts, as it does {@code error} rows, instead of keeping their rows; they are told to the
     * {@linkplain #tellingWafers wafer listener} like every inspected wafer (e.g. the wafers a killed run wrote into
     * the folder but not yet into a results store). Null for none. Returns this batch.
     */
    public BatchInspection inspectingAgain(java.util.function.Predicate<String> again) {
        this.inspectAgain = again;
        return this;
    }

    /**
     * A resumed run accepts another list of input files than the recorded one (the watch's list grows as maps
     * arrive); the rules, physics, thumbnails and program version must still be the same. Returns this batch.
     */
    public BatchInspection growingInputs(boolean growing) {
        this.growingInputs = growing;
        return this;
    }

    /**
     * The files listed in the results table of {@code outDir} ({@value #CSV_NAME} and its {@code .partial}, the
     * later winning), in the table's order, as written in its {@code file} column; rows cut short are left out.
     */
    public static List<String> listedFiles(Path outDir) throws IOException {
        List<Map<String, String>> rows = listedRows(outDir);
        List<String> files = new ArrayList<>(rows.size());
        rows.forEach(r -> files.add(r.get("file")));
        return files;
    }

    /** The rows of the results table of {@code outDir} as {@link #listedFiles} takes them, in the table's order. */
    public static List<Map<String, String>> listedRows(Path outDir) throws IOException {
        Map<String, Map<String, String>> rows = new LinkedHashMap<>();
        readRows(outDir.resolve(CSV_NAME), rows);
        readRows(outDir.resolve(PARTIAL_NAME), rows);
        return List.copyOf(rows.values());
    }

    /** Records the program version and the rules file in the run record ({@link RunManifest}). Returns this batch. */
    public BatchInspection withSource(RunManifest.Source s) {
        this.source = s == null ? RunManifest.Source.UNKNOWN : s;
        return this;
    }

    /**
     * Runs {@code f} (the summary) after the results are complete and before the run is recorded complete, while
     * the batch still holds its folder. Returns this batch.
     */
    public BatchInspection finishingWith(Finisher f) {
        this.finisher = f == null ? null : (dir, recurrence) -> f.finish(dir);
        return this;
    }

    /** As {@link #finishingWith(Finisher)}, the step also given the recurrence the batch built. */
    public BatchInspection finishingWith(RecurrenceFinisher f) {
        this.finisher = f;
        return this;
    }

    /**
     * Draws the recurrence pictures ({@code recurrence-FAMILY.png}) only when {@code draw} says so, asked once when
     * they are due (a runtime that cannot draw text skips them; the recurrence maps and table are written all the
     * same). Returns this batch.
     */
    public BatchInspection withRecurrencePictures(java.util.function.BooleanSupplier draw) {
        this.recurrencePictures = draw;
        return this;
    }

    /**
     * Records {@code outcome}'s text as {@code summary_pdf} in the complete {@code run.json}, asked after the
     * finisher ran ("written", or why it is missing). Returns this batch.
     */
    public BatchInspection recordingSummary(java.util.function.Supplier<String> outcome) {
        this.summaryRecord = outcome;
        return this;
    }

    /**
     * Tells {@code listener} each row of the results table as it is written (rows kept from a resumed run first),
     * so that a summary can be made while the batch runs ({@link #rows()}, {@link #rowsAsTold()} after the last
     * wafer). Returns this batch.
     */
    public BatchInspection tellingRows(RowListener listener) {
        this.rowListener = listener;
        return this;
    }

    /**
     * Tells {@code listener} each wafer inspected in this run, with its result, once its rows are written (in the
     * table's order; wafers kept from a resumed run are not told). Returns this batch.
     */
    public BatchInspection tellingWafers(WaferListener listener) {
        this.waferListener = listener;
        return this;
    }

    /**
     * The rows of the results table, in its order, once the run's rows are complete, after its last wafer (for the
     * {@linkplain #finishingWith finisher}); empty before.
     */
    public List<Map<String, String>> rows() {
        return finishedRows;
    }

    /**
     * Whether {@link #rows()} are the rows told to the {@linkplain #tellingRows listener}, in the order told (false
     * when a resumed run put them back in input order).
     */
    public boolean rowsAsTold() {
        return finishedAsTold;
    }

    /**
     * Runs {@code w} on a thread of its own while the workers inspect (after the batch's own first-use work on its
     * tables, {@link #warmUpTables}), so that the summary step that runs after the last wafer finds its classes
     * loaded and compiled: e.g. the summary made of a few made-up wafers into nothing. It must write nothing into
     * the output folder and share no state with the run; its failures are ignored (the step itself reports its own).
     * The batch waits for it after the last wafer. Returns this batch.
     */
    public BatchInspection warmingUp(WarmUp w) {
        this.warmUp = w;
        return this;
    }

    /** Starts {@link #warmUpTables} and the {@linkplain #warmingUp summary's warm-up} on a daemon thread. */
    private Thread startWarmUp() {
        WarmUp summary = warmUp;
        Thread t = new Thread(() -> {
            ignoringFailures(() -> {
                warmUpTables();
                return null;
            });
            if (summary != null) {
                ignoringFailures(() -> {
                    summary.warmUp();
                    return null;
                });
            }
        }, "inspect-warm-up");
        t.setDaemon(true);
        t.start();
        return t;
    }

    private static void ignoringFailures(java.util.concurrent.Callable<Void> work) {
        try {
            work.call();
        } catch (VirtualMachineError e) {
            throw e;
        } catch (Exception | Error e) {
            // only a head start: the step itself runs (and reports its failures) after the last wafer
        }
    }

    private static void awaitWarmUp(Thread t) throws InterruptedException {
        try {
            t.join();
        } catch (InterruptedException e) {
            t.interrupt();
            throw e;
        }
    }

    /**
     * The first-use work (class loading, compiling; AWT fonts for the colour bar) of what the batch writes after its
     * last wafer, done on a made-up recurrence of a few cells in a temporary folder that is removed again: the
     * recurrence TIFF and PNG with its hot spots, and {@code results.json}'s writer.
     */
    static void warmUpTables() throws IOException {
        Path dir = Files.createTempDirectory("trapmap-warm-up");
        try {
            java.util.BitSet covered = new java.util.BitSet();
            covered.set(0, 64);
            java.util.BitSet flagged = new java.util.BitSet();
            flagged.set(18, 22);
            RecurrenceMap m = new RecurrenceMap();
            m.add(new Footprint("warm-up", Footprint.PITCH_MM, -4, -4, 8, 8, covered, flagged));
            for (Recurrence r : m.families().values()) {
                MapFiles.write(r.fraction(), dir.resolve("recurrence.tif"));
                RecurrencePicture.write(r, HotSpots.find(r, HotSpots.Criteria.DEFAULT),
                        dir.resolve("recurrence.png"));
            }
            Map<String, Object> row = new LinkedHashMap<>();
            row.put("file", "warm-up.tif");
            row.put("tau_median_us", 12.5);
            row.put("error", null);
            Map<String, Object> root = new LinkedHashMap<>();
            root.put("summary", Map.of("pass", 1));
            root.put("wafers", List.of(row));
            Json.WRITER.writeValue(java.io.OutputStream.nullOutputStream(), root);
        } finally {
            try (java.util.stream.Stream<Path> all = Files.walk(dir)) {
                for (Path p : all.sorted(java.util.Comparator.reverseOrder()).toList()) {
                    Files.deleteIfExists(p);
                }
            }
        }
    }

    /** The writer of {@value #JSON_NAME}, one for all runs: its serializers are made on first use. */
    private static final class Json {
        static final com.fasterxml.jackson.databind.ObjectWriter WRITER = NumberText.jsonMapper()
                .writer(SerializationFeature.INDENT_OUTPUT);
        /** The line break and the indentation of one level of the pretty printer (Jackson's default indenter). */
        static final String LINE_BREAK = com.fasterxml.jackson.core.util.DefaultIndenter.SYSTEM_LINEFEED_INSTANCE
                .getEol();
        static final String INDENT = com.fasterxml.jackson.core.util.DefaultIndenter.SYSTEM_LINEFEED_INSTANCE
                .getIndent();
    }

    /**
     * True for the name of a file or folder that a batch writes into its output folder (results, regions,
     * footprints, recurrence maps and table, thumbnails, partial and temporary files), so that a folder scanned for
     * maps can leave a batch's own outputs out.
     */
    public static boolean isOutputName(String fileName) {
        return List.of(CSV_NAME, PARTIAL_NAME, JSON_NAME, FOOTPRINTS_NAME, REGIONS_NAME, RECURRENCE_NAME,
                THUMBNAIL_DIR).contains(fileName) || fileName.startsWith(RECURRENCE_PREFIX)
                || fileName.endsWith(".partial") || fileName.endsWith(".new") || fileName.endsWith(".tmp");
    }

    /** The CSV columns for these rules. */
    public static List<String> columns(Rules rules) {
        List<String> c = new ArrayList<>(List.of("file", "wafer_id", "status", "grade", "profile", "defect"));
        rules.figures().forEach(f -> c.add(f.name()));
        c.addAll(List.of("failed_rules", "graded_down_by", "worst_region_area_mm2", "worst_region_x_mm",
                "worst_region_y_mm", "worst_region_peak"));
        c.addAll(WORST_REGION_EXTRA);
        c.add("error");
        return c;
    }

    /**
     * Runs the batch over {@code files} and writes the results into {@code outDir}: takes the folder
     * ({@link RunLock}), checks it (a resumed run only continues a run with the same record, a new run only starts
     * in a folder without another run's results or with {@code overwrite}), records the run as running
     * ({@link RunManifest}), inspects, writes the tables, recurrence files and {@code results.json}, records
     * finishing, runs the {@linkplain #finishingWith finisher}, and records the run complete.
     *
     * @throws RunRefusedException  the folder is held by another run, holds another run's results, or its record
     *                              differs from this run's (resume); nothing was written
     * @throws BatchOutputException a file of the folder could not be written; what was written stays, the record
     *                              says running (or finishing), and a resumed run continues
     * @throws InterruptedException the calling thread was interrupted; as above
     */
    public Summary run(List<Path> files, Path outDir, Options options) throws IOException, InterruptedException {
        startedAt = System.nanoTime();
        startedCpu = threadCpuNanos();
        inspectingFrom = 0;
        inspectedAt = 0;
        writerBusy = 0;
        workerCpu.reset();
        finishedRows = List.of();
        finishedAsTold = false;
        phases = Phases.NONE;
        try {
            OutputFolder.check(outDir);
            Files.createDirectories(outDir);
        } catch (IOException e) { // before the run: a missing parent was never there, not removed meanwhile
            throw BatchOutputException.atStart(outDir, e);
        }
        try (RunLock lock = RunLock.acquire(outDir)) {
            RunManifest manifest = prepare(files, outDir, options);
            Thread hook = OutputFolder.cleanOnExit(outDir);
            try {
                manifest.write(outDir);
                Summary s = inspectAll(files, outDir, options);
                manifest = manifest.with(RunManifest.State.FINISHING, null);
                manifest.write(outDir);
                long tablesDone = System.nanoTime();
                long tablesDoneCpu = threadCpuNanos();
                if (finisher != null) {
                    finisher.finish(outDir, builtRecurrence);
                }
                manifest.with(RunManifest.State.COMPLETE, java.time.Instant.now())
                        .withSummaryPdf(summaryRecord == null ? null : summaryRecord.get()).write(outDir);
                long from = inspectingFrom == 0 ? inspectedAt : inspectingFrom;
                long fromCpu = inspectingFrom == 0 ? inspectedCpu : inspectingFromCpu;
                phases = new Phases(from - startedAt, inspectedAt - from, tablesDone - inspectedAt,
                        System.nanoTime() - tablesDone, writerBusy, cpuBetween(startedCpu, fromCpu),
                        cpuBetween(inspectedCpu, tablesDoneCpu), cpuBetween(tablesDoneCpu, threadCpuNanos()),
                        Math.max(-1, workerCpu.sum()), cpuBetween(fromCpu, inspectedCpu));
                return s;
            } catch (IOException e) {
                throw BatchOutputException.of(outDir, e);
            } finally {
                OutputFolder.release(hook);
            }
        }
    }

    /** The times of the parts of the last {@link #run} that completed; {@link Phases#NONE} before. */
    public Phases lastPhases() {
        return phases;
    }

    /**
     * Checks the folder for this run and returns the run's record: a resumed run's record keeps the first start;
     * a new run into a folder of another run's results removes them ({@code overwrite}) or is refused. Stale
     * temporaries of an interrupted write are removed.
     */
    private RunManifest prepare(List<Path> files, Path outDir, Options options) throws IOException {
        java.time.Instant now = java.time.Instant.now();
        RunManifest manifest = RunManifest.start(source, rules.physics(), files, options.thumbnails(),
                options.thumbnailCaptions(), now);
        RunManifest earlier;
        try {
            earlier = RunManifest.read(outDir);
        } catch (IOException e) {
            if (options.resume()) {
                throw new RunRefusedException("--resume: " + e.getMessage() + "; use a new --out or --overwrite");
            }
            earlier = null; // refused below unless --overwrite, which removes it
        }
        List<Path> results = OutputFolder.results(outDir);
        if (options.resume()) {
            if (earlier == null && !results.isEmpty()) {
                throw new RunRefusedException("--resume: " + outDir + " holds results without a "
                        + RunManifest.FILE_NAME + " (made before runs were recorded, or not by inspect), so they"
                        + " cannot be checked; use a new --out or --overwrite");
            }
            if (earlier != null) {
                List<String> d = earlier.differences(manifest, !growingInputs);
                if (!d.isEmpty()) {
                    throw new RunRefusedException("--resume: " + outDir + " was run with " + String.join(", ", d)
                            + "; use a new --out or --overwrite");
                }
                manifest = manifest.resumedFrom(earlier, now);
            }
            OutputFolder.removeTemporaries(outDir);
        } else if (!results.isEmpty()) {
            if (!options.overwrite()) {
                throw new RunRefusedException(outDir + " already holds the results of "
                        + (earlier == null ? "an earlier run" : earlier.state() == RunManifest.State.COMPLETE
                        ? "a run of " + earlier.started() : "an unfinished run of " + earlier.started())
                        + " (" + results.get(0).getFileName() + (results.size() > 1 ? " and " + (results.size() - 1)
                        + " more" : "") + "); use --resume to continue it, --overwrite to replace it, or a new --out");
            }
            OutputFolder.clean(outDir);
        } else {
            OutputFolder.removeTemporaries(outDir);
        }
        return manifest;
    }

    private Summary inspectAll(List<Path> files, Path outDir, Options options) throws IOException,
            InterruptedException {
        List<String> columns = new ArrayList<>(columns(rules));
        IronPairs pairs = iron == null ? null : new IronPairs(iron, rules, reader, files);
        if (pairs != null) {
            columns.addAll(IronPairs.columns(iron));
        }
        Path csv = outDir.resolve(CSV_NAME);
        Path partial = outDir.resolve(PARTIAL_NAME);
        Path footprints = outDir.resolve(FOOTPRINTS_NAME);
        Path footprintsPartial = outDir.resolve(FOOTPRINTS_NAME + ".partial");
        Map<String, Map<String, String>> kept = new LinkedHashMap<>();
        Map<String, Footprint> keptFootprints = new LinkedHashMap<>();
        Path regionsCsv = outDir.resolve(REGIONS_NAME);
        Path regionsPartial = outDir.resolve(REGIONS_NAME + ".partial");
        Map<String, List<Map<String, String>>> keptRegions = new LinkedHashMap<>();
        if (options.resume()) {
            readRows(csv, kept);
            readRows(partial, kept);
            readRegionRows(regionsCsv, keptRegions);
            readRegionRows(regionsPartial, keptRegions);
            FootprintStore.read(footprints, keptFootprints, BatchInspection::key);
            FootprintStore.read(footprintsPartial, keptFootprints, BatchInspection::key);
            if (!keepErrors) {
                kept.values().removeIf(r -> WaferResult.Status.ERROR.key().equals(r.get("status"))); // tried again
            }
            if (inspectAgain != null) {
                kept.values().removeIf(r -> inspectAgain.test(r.get("file")));
            }
        }
        List<Path> todo = new ArrayList<>();
        int skipped = 0;
        for (Path f : files) {
            if (kept.containsKey(key(f.toString()))) {
                skipped++;
            } else {
                todo.add(f);
            }
        }
        Path thumbs = options.thumbnails() ? outDir.resolve(THUMBNAIL_DIR) : null;
        if (thumbs != null) {
            OutputFolder.write(thumbs, () -> Files.createDirectories(thumbs));
        }
        List<Map<String, String>> rows = new ArrayList<>(kept.values());
        // the rows' files as the inputs are compared (key()), in the rows' order: for the check of that order
        List<String> rowKeys = new ArrayList<>(rows.size());
        for (Map<String, String> row : rows) {
            rowKeys.add(key(row.get("file")));
        }
        // each input's place in the input order by its key: made beside the workers once they have their first maps
        Map<String, Integer> position = new java.util.HashMap<>();
        // each inspected wafer's object in results.json, formatted by its worker (kept rows: when the file is written)
        Map<Map<String, String>, String> wafersJson = new java.util.IdentityHashMap<>();
        RecurrenceMap recurrence = new RecurrenceMap();
        int threads = Math.max(1, Math.min(options.threads(), todo.size()));
        ExecutorService pool = Executors.newFixedThreadPool(threads, r -> {
            Thread t = new Thread(r, "inspect");
            t.setDaemon(true);
            return t;
        });
        // each worker adds the footprints of its wafers to a recurrence of its own; merged once after the last wafer
        List<RecurrenceMap> workerRecurrences = java.util.Collections.synchronizedList(new ArrayList<>());
        ThreadLocal<RecurrenceMap> workerRecurrence = ThreadLocal.withInitial(() -> {
            RecurrenceMap m = new RecurrenceMap();
            workerRecurrences.add(m);
            return m;
        });
        // CSVFormat prints under a lock on the format object: each worker formats its rows with a format of its own
        ThreadLocal<CSVFormat> workerFormat = ThreadLocal.withInitial(() -> CSVFormat.DEFAULT.builder().build());
        Thread warmUp = startWarmUp();
        Path tmpPartial = outDir.resolve(PARTIAL_NAME + ".new");
        Path tmpFootprints = outDir.resolve(FOOTPRINTS_NAME + ".new");
        Path tmpRegions = outDir.resolve(REGIONS_NAME + ".new");
        try (Writer w = OutputFolder.writer(tmpPartial);
             Writer rw = OutputFolder.writer(tmpRegions);
             CSVPrinter rout = new CSVPrinter(rw, CSVFormat.DEFAULT.builder().setHeader(REGION_COLUMNS.toArray(
                     String[]::new)).build());
             CSVPrinter out = new CSVPrinter(w, CSVFormat.DEFAULT.builder().setHeader(columns.toArray(
                     String[]::new)).build());
             Writer fw = OutputFolder.writer(tmpFootprints);
             CSVPrinter fout = new CSVPrinter(fw, CSVFormat.DEFAULT.builder().setHeader(
                     FootprintStore.COLUMNS).build())) {
            for (Map<String, String> row : rows) {
                print(out, columns, row);
                for (Map<String, String> region : keptRegions.getOrDefault(key(row.get("file")), List.of())) {
                    print(rout, REGION_COLUMNS, region);
                }
                Footprint f = keptFootprints.get(key(row.get("file")));
                if (f != null) {
                    recurrence.add(f);
                    fout.printRecord(FootprintStore.record(row.get("file"), f));
                }
            }
            out.flush();
            fout.flush();
            rout.flush();
            if (rowListener != null) {
                rows.forEach(rowListener::row);
            }
            move(tmpPartial, partial);
            move(tmpRegions, regionsPartial);
            move(tmpFootprints, footprintsPartial);
            // The workers inspect and format each wafer's rows; this thread alone writes them, in input order, from a
            // queue of up to QUEUED_PER_WORKER x threads wafers (small: text and the results row, no map)
            Deque<Future<Inspected>> pending = new ArrayDeque<>();
            Iterator<Path> next = todo.iterator();
            WaferInspection inspection = this.inspection.withThumbnailCaptions(options.thumbnailCaptions());
            MemoryBudget memory = memoryBudgetBytes < 0 ? MemoryBudget.ofThisHeap()
                    : new MemoryBudget(memoryBudgetBytes);
            int done = 0;
            // one set of working arrays per worker, reused from wafer to wafer and dropped with the pool
            ThreadLocal<InspectionBuffers> buffers = ThreadLocal.withInitial(InspectionBuffers::new);
            inspectingFromCpu = threadCpuNanos();
            inspectingFrom = System.nanoTime();
            // the workers after the first wait for its end, where the first wafer runs alone (firstWaferAlone)
            boolean alone = firstAlone != null ? firstAlone
                    : firstWaferAlone(threads, Runtime.getRuntime().availableProcessors());
            java.util.concurrent.CountDownLatch firstDone = new java.util.concurrent.CountDownLatch(alone ? 1 : 0);
            boolean submitted = false;
            while (next.hasNext() || !pending.isEmpty()) {
                while (next.hasNext() && pending.size() < QUEUED_PER_WORKER * threads) {
                    Path f = next.next();
                    Path thumb = thumbs == null ? null : thumbs.resolve(f.getFileName() + ".png");
                    boolean first = !submitted;
                    submitted = true;
                    pending.add(pool.submit(() -> {
                        if (!first) {
                            firstDone.await(); // counted down by the writer below once the first wafer is in
                        }
                        long cpuFrom = threadCpuNanos();
                        @SuppressWarnings("unchecked")
                        Map<String, String>[] iron = new Map[1];
                        WaferResult r = memory.run(f, rules.stackLevels(f.getFileName().toString()), () -> {
                            WaferResult inspected = inspection.inspect(f, thumb, buffers.get());
                            if (pairs != null) {
                                iron[0] = pairs.evaluate(f);
                            }
                            return inspected;
                        });
                        Footprint fp = r.footprint();
                        if (fp != null && RecurrenceMap.accepts(fp)) {
                            workerRecurrence.get().add(fp);
                        }
                        Inspected formatted = Inspected.of(r, columns, pairs != null, iron[0], rules,
                                workerFormat.get(), waferListener != null);
                        long cpuTo = threadCpuNanos();
                        workerCpu.add(cpuFrom < 0 || cpuTo < 0 ? Long.MIN_VALUE / 4 : cpuTo - cpuFrom);
                        return formatted;
                    }));
                }
                if (position.isEmpty()) {
                    positions(files, position);
                }
                Inspected r;
                try {
                    r = pending.removeFirst().get();
                } catch (ExecutionException e) {
                    if (e.getCause() instanceof BatchOutputException.Unchecked u) {
                        throw u.getCause(); // a thumbnail that could not be written: the output's failure
                    }
                    throw new IllegalStateException("inspection failed unexpectedly", e.getCause());
                }
                long writing = System.nanoTime();
                firstDone.countDown(); // the first wafer is in (a failed one ends the run, the waiting tasks with it)
                if (r.footprint() != null) {
                    if (!RecurrenceMap.accepts(r.footprint())) {
                        recurrence.add(r.footprint()); // left out, its reason kept in input order
                    }
                    fw.write(r.footprintText());
                    fw.flush();
                }
                rw.write(r.regionsText());
                rw.flush();
                rows.add(r.row());
                rowKeys.add(key(r.file()));
                wafersJson.put(r.row(), r.waferJson());
                w.write(r.rowText());
                w.flush();
                if (rowListener != null) {
                    rowListener.row(r.row());
                }
                if (waferListener != null) {
                    waferListener.wafer(r.result(), r.row());
                }
                writerBusy += System.nanoTime() - writing;
                options.progress().progress(++done, todo.size(), r.file());
                if (Thread.currentThread().isInterrupted()) {
                    throw new InterruptedException("batch inspection cancelled");
                }
            }
            synchronized (workerRecurrences) {
                workerRecurrences.forEach(recurrence::addAll);
            }
        } finally {
            pool.shutdownNow();
            Files.deleteIfExists(tmpPartial);
            Files.deleteIfExists(tmpFootprints);
            Files.deleteIfExists(tmpRegions);
        }
        inspectedAt = System.nanoTime();
        inspectedCpu = threadCpuNanos();
        awaitWarmUp(warmUp);
        if (position.isEmpty()) { // no map was inspected
            positions(files, position);
        }
        java.util.Comparator<Map<String, String>> byInput = java.util.Comparator.comparingInt(
                row -> position.getOrDefault(key(row.get("file")), Integer.MAX_VALUE));
        boolean asTold = true;
        if (!inputOrdered(rowKeys, position)) { // a resumed run that tried an error row again: back to input order
            asTold = false;
            rows.sort(byInput);
            inInputOrder(footprintsPartial, tmpFootprints, position);
            inInputOrder(regionsPartial, tmpRegions, position);
            inInputOrder(partial, tmpPartial, position);
        }
        builtRecurrence = recurrence;
        finishedRows = java.util.Collections.unmodifiableList(rows);
        finishedAsTold = asTold;
        if (rowListener != null) {
            rowListener.rowsEnded(finishedRows, asTold, recurrence);
        }
        move(footprintsPartial, footprints);
        move(regionsPartial, regionsCsv);
        move(partial, csv);

        int pass = 0;
        int fail = 0;
        int error = 0;
        for (Map<String, String> row : rows) {
            switch (row.getOrDefault("status", "")) {
                case "pass" -> pass++;
                case "fail" -> fail++;
                default -> error++;
            }
        }
        boolean pictures = recurrence.families().isEmpty() || recurrencePictures == null
                || recurrencePictures.getAsBoolean();
        List<Path> written = RecurrenceFiles.write(outDir, RecurrenceFiles.of(recurrence), false, pictures);
        Summary summary = new Summary(pass, fail, error, skipped, csv, outDir.resolve(JSON_NAME), written);
        writeJson(summary, columns, rows, wafersJson);
        return summary;
    }

    /** Puts each input's first place in {@code files} into {@code position}, by its {@link #key}. */
    private static void positions(List<Path> files, Map<String, Integer> position) {
        for (int i = 0; i < files.size(); i++) {
            position.putIfAbsent(key(files.get(i).toString()), i);
        }
    }

    /**
     * Whether rows whose files have the keys {@code rowKeys} are in input order: their places in {@code position}
     * (unknown: last) never decrease.
     */
    private static boolean inputOrdered(List<String> rowKeys, Map<String, Integer> position) {
        int last = Integer.MIN_VALUE;
        for (String k : rowKeys) {
            int at = position.getOrDefault(k, Integer.MAX_VALUE);
            if (at < last) {
                return false;
            }
            last = at;
        }
        return true;
    }

    /**
     * Rewrites the complete table {@code table} with its rows grouped by wafer in input order (a wafer's rows keep
     * their order, cells are written back as read), through {@code tmp} and a move: the table holds the same rows
     * before and after, so a stop at any moment leaves it as a resumed run expects.
     */
    private static void inInputOrder(Path table, Path tmp, Map<String, Integer> position) throws IOException {
        List<String> header;
        Map<String, List<List<String>>> byWafer = new LinkedHashMap<>();
        try (Reader r = Files.newBufferedReader(table, StandardCharsets.UTF_8);
             CSVParser p = CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).build().parse(r)) {
            header = p.getHeaderNames();
            for (CSVRecord rec : p) {
                byWafer.computeIfAbsent(key(CsvCells.raw(rec.get("file"))), k -> new ArrayList<>())
                        .add(rec.toList());
            }
        }
        List<String> wafers = new ArrayList<>(byWafer.keySet());
        wafers.sort(java.util.Comparator.comparingInt(k -> position.getOrDefault(k, Integer.MAX_VALUE)));
        try {
            try (Writer w = OutputFolder.writer(tmp);
                 CSVPrinter out = new CSVPrinter(w, CSVFormat.DEFAULT.builder().setHeader(
                         header.toArray(String[]::new)).build())) {
                for (String k : wafers) {
                    for (List<String> rec : byWafer.get(k)) {
                        out.printRecord(rec);
                    }
                }
            }
            move(tmp, table);
        } finally {
            Files.deleteIfExists(tmp);
        }
    }

    private static void move(Path from, Path to) throws BatchOutputException {
        OutputFolder.write(to, () -> Files.move(from, to, StandardCopyOption.REPLACE_EXISTING,
                StandardCopyOption.ATOMIC_MOVE));
    }

    private static String key(String file) {
        return Path.of(file).toAbsolutePath().normalize().toString();
    }

    private static void readRows(Path file, Map<String, Map<String, String>> into) throws IOException {
        if (!Files.isRegularFile(file)) {
            return;
        }
        try (Reader r = Files.newBufferedReader(file, StandardCharsets.UTF_8);
             CSVParser p = CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).build().parse(r)) {
            for (CSVRecord rec : p) {
                if (!rec.isConsistent() || !rec.isMapped("file") || rec.get("file").isEmpty()) {
                    continue; // a row cut short by an interruption
                }
                into.put(key(CsvCells.raw(rec.get("file"))), rawCells(rec));
            }
        }
    }

    /** A row of one of our CSV files with each cell as it was before {@link CsvCells#text}. */
    private static Map<String, String> rawCells(CSVRecord rec) {
        Map<String, String> m = new LinkedHashMap<>();
        rec.toMap().forEach((k, v) -> m.put(k, CsvCells.raw(v)));
        return m;
    }

    private static void readRegionRows(Path file, Map<String, List<Map<String, String>>> into) throws IOException {
        if (!Files.isRegularFile(file)) {
            return;
        }
        Map<String, List<Map<String, String>>> read = new LinkedHashMap<>();
        try (Reader r = Files.newBufferedReader(file, StandardCharsets.UTF_8);
             CSVParser p = CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).build().parse(r)) {
            for (CSVRecord rec : p) {
                if (!rec.isConsistent() || !rec.isMapped("file") || rec.get("file").isEmpty()) {
                    continue; // a row cut short by an interruption
                }
                read.computeIfAbsent(key(CsvCells.raw(rec.get("file"))), k -> new ArrayList<>()).add(rawCells(rec));
            }
        }
        into.putAll(read); // a later file (the partial one) replaces a file's regions as a whole
    }

    /**
     * The {@value #REGIONS_NAME} rows of a result: one per flagged region ({@link #REGION_COLUMNS}), numbers as in
     * {@link #row}.
     */
    public static List<Map<String, String>> regionRows(WaferResult r) {
        List<Map<String, String>> rows = new ArrayList<>();
        for (FlaggedRegions.FlaggedRegion fr : r.regions()) {
            trapmap.maps.region.Region g = fr.region();
            Map<String, String> m = new LinkedHashMap<>();
            m.put("file", r.file());
            m.put("wafer_id", r.waferId());
            m.put("region", Integer.toString(g.id()));
            m.put("area_mm2", NumberText.mm2(g.areaMm2()));
            m.put("x_mm", num(g.positionXMm()));
            m.put("y_mm", num(g.positionYMm()));
            m.put("centroid_x_mm", num(g.centroidXMm()));
            m.put("centroid_y_mm", num(g.centroidYMm()));
            m.put("centroid_inside", Boolean.toString(g.centroidInside()));
            m.put("min_x_mm", num(g.bounds().minXMm()));
            m.put("min_y_mm", num(g.bounds().minYMm()));
            m.put("max_x_mm", num(g.bounds().maxXMm()));
            m.put("max_y_mm", num(g.bounds().maxYMm()));
            m.put("peak", NumberText.sample(g.peakValue()));
            m.put("peak_x_mm", num(g.peakXMm()));
            m.put("peak_y_mm", num(g.peakYMm()));
            m.put("mean", NumberText.of(g.meanValue()));
            m.put("edge_distance_mm", num(g.edgeDistanceMm()));
            m.put("peak_density_cm3", NumberText.sample(fr.peakDensityCm3()));
            m.put("median_density_cm3", NumberText.sample(fr.medianDensityCm3()));
            rows.add(m);
        }
        return rows;
    }

    private static void print(CSVPrinter out, List<String> columns, Map<String, String> row) throws IOException {
        List<String> values = new ArrayList<>(columns.size());
        for (String c : columns) {
            values.add(CsvCells.text(row.getOrDefault(c, "")));
        }
        out.printRecord(values);
    }

    /**
     * The CSV row of a result; numbers as {@link NumberText} writes them (figures: {@link Figure#text}), NaN as an
     * empty cell.
     */
    static Map<String, String> row(WaferResult r) {
        Map<String, String> m = new LinkedHashMap<>();
        m.put("file", r.file());
        m.put("wafer_id", r.waferId());
        m.put("status", r.status().key());
        m.put("grade", r.grade());
        m.put("profile", r.profile());
        m.put("defect", r.defectId());
        r.figures().forEach((k, v) -> m.put(k, Figure.parse(k).text(v)));
        m.put("failed_rules", String.join(";", r.failed()));
        m.put("graded_down_by", String.join(";", r.gradedDownBy()));
        trapmap.maps.region.Region worst = r.worstRegion();
        if (worst != null) {
            m.put("worst_region_area_mm2", NumberText.mm2(worst.areaMm2()));
            m.put("worst_region_x_mm", num(worst.positionXMm()));
            m.put("worst_region_y_mm", num(worst.positionYMm()));
            m.put("worst_region_peak", NumberText.sample(worst.peakValue()));
            m.put("worst_region_rule", r.worstRegionRule());
            m.put("worst_region_centroid_inside", Boolean.toString(worst.centroidInside()));
            m.put("worst_region_peak_x_mm", num(worst.peakXMm()));
            m.put("worst_region_peak_y_mm", num(worst.peakYMm()));
            m.put("worst_region_min_x_mm", num(worst.bounds().minXMm()));
            m.put("worst_region_min_y_mm", num(worst.bounds().minYMm()));
            m.put("worst_region_max_x_mm", num(worst.bounds().maxXMm()));
            m.put("worst_region_max_y_mm", num(worst.bounds().maxYMm()));
        }
        m.put("error", r.error());
        return m;
    }

    /** A position or length in mm as the outputs write it ({@link NumberText#mm}). */
    private static String num(double mm) {
        return NumberText.mm(mm);
    }

    /**
     * Writes {@value #JSON_NAME}: the summary, the physics settings, the flags with a confidence (by profile: the flag
     * in words, the confidence, the uncertainty settings; only when some profile has one) and one object per row. The wafers' objects are
     * taken from {@code wafersJson} (formatted by the workers, {@link #waferJson}) or formatted now; the file is the
     * one {@link #jsonTree} would give written whole by the same writer ({@code BatchJsonTest} compares them).
     */
    private void writeJson(Summary s, List<String> columns, List<Map<String, String>> rows,
                           Map<Map<String, String>, String> wafersJson) throws IOException {
        Map<String, Object> root = jsonRoot(s, rules, rawWafers(columns, rows, wafersJson));
        Path target = s.json();
        Path tmp = target.resolveSibling(JSON_NAME + ".tmp");
        try {
            OutputFolder.write(target, () -> {
                Json.WRITER.writeValue(tmp.toFile(), root);
                Files.move(tmp, target, StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
            });
        } finally {
            Files.deleteIfExists(tmp);
        }
    }

    /** The wafers' objects of {@value #JSON_NAME} as text, from {@code wafersJson} where it holds the row. */
    private static List<com.fasterxml.jackson.databind.util.RawValue> rawWafers(
            List<String> columns, List<Map<String, String>> rows, Map<Map<String, String>, String> wafersJson) {
        List<com.fasterxml.jackson.databind.util.RawValue> wafers = new ArrayList<>(rows.size());
        for (Map<String, String> row : rows) {
            String text = wafersJson.get(row);
            wafers.add(new com.fasterxml.jackson.databind.util.RawValue(text != null ? text : waferJson(row, columns)));
        }
        return wafers;
    }

    /** {@value #JSON_NAME} as {@link #writeJson} writes it (a test's view). */
    static byte[] jsonBytes(Summary s, Rules rules, List<String> columns, List<Map<String, String>> rows,
                            Map<Map<String, String>, String> wafersJson) throws IOException {
        return Json.WRITER.writeValueAsBytes(jsonRoot(s, rules, rawWafers(columns, rows, wafersJson)));
    }

    /** The content of {@value #JSON_NAME} with {@code wafers} as its list of wafers. */
    private static Map<String, Object> jsonRoot(Summary s, Rules rules, List<?> wafers) {
        Map<String, Object> root = new LinkedHashMap<>();
        Map<String, Object> sum = new LinkedHashMap<>();
        sum.put("pass", s.pass());
        sum.put("fail", s.fail());
        sum.put("error", s.error());
        sum.put("skipped", s.skipped());
        sum.put("yield_fraction", Double.isNaN(s.yield()) ? null : s.yield());
        root.put("summary", sum);
        root.put("physics", trapmap.maps.io.PhysicsSettingsFile.toJson(rules.physics()));
        Map<String, Object> confident = new LinkedHashMap<>();
        for (Rules.Profile p : rules.allProfiles()) {
            Rules.Flag f = p.flag();
            if (f.confident()) {
                Map<String, Object> c = new LinkedHashMap<>();
                c.put("flag", f.describe());
                c.put("confidence", f.confidence());
                c.put("uncertainty", f.uncertainty().toJson());
                confident.put(p.name(), c);
            }
        }
        if (!confident.isEmpty()) {
            // only with a flag confidence, so that other runs' files stay as they were
            root.put("flag_confidence", confident);
        }
        root.put("wafers", wafers);
        return root;
    }

    /**
     * The content of {@value #JSON_NAME} as one tree (the wafers as {@link #waferObject}s): the reference that
     * {@link #writeJson} writes piecewise.
     */
    static Map<String, Object> jsonTree(Summary s, Rules rules, List<String> columns, List<Map<String, String>> rows) {
        List<Map<String, Object>> wafers = new ArrayList<>();
        for (Map<String, String> row : rows) {
            wafers.add(waferObject(row, columns));
        }
        return jsonRoot(s, rules, wafers);
    }

    /** {@link #jsonTree} written as {@link #writeJson} writes it (a test's reference). */
    static byte[] jsonTreeBytes(Summary s, Rules rules, List<String> columns, List<Map<String, String>> rows)
            throws IOException {
        return Json.WRITER.writeValueAsBytes(jsonTree(s, rules, columns, rows));
    }

    /** The object of one row in {@value #JSON_NAME}: its cells by column, numeric columns as numbers. */
    private static Map<String, Object> waferObject(Map<String, String> row, List<String> columns) {
        Map<String, Object> w = new LinkedHashMap<>();
        for (String c : columns) {
            String v = row.getOrDefault(c, "");
            w.put(c, numeric(c) ? number(v) : v);
        }
        return w;
    }

    /**
     * The text of one row's object in {@value #JSON_NAME}'s list of wafers, as the whole file's writer places it
     * there: the object written alone by the same writer, every line after the first indented by the one level it
     * lies at (the root object's; the pretty printer keeps a list on one line and indents no level for it). The
     * pretty printer puts a line break only between the members of an object and before its closing brace; a line
     * break inside a text is written escaped, {@code \n}, so every line break of the text is one of those.
     */
    static String waferJson(Map<String, String> row, List<String> columns) {
        try {
            String alone = Json.WRITER.writeValueAsString(waferObject(row, columns));
            return alone.replace(Json.LINE_BREAK, Json.LINE_BREAK + Json.INDENT);
        } catch (com.fasterxml.jackson.core.JsonProcessingException e) {
            throw new IllegalStateException("a results row could not be written as JSON", e);
        }
    }

    private static boolean numeric(String column) {
        return !List.of("file", "wafer_id", "status", "grade", "profile", "defect", "failed_rules",
                "graded_down_by", "worst_region_rule", "error")
                .contains(column);
    }

    private static Object number(String v) {
        if (v.isEmpty()) {
            return null;
        }
        if (v.equals("true") || v.equals("false")) {
            return Boolean.valueOf(v);
        }
        try {
            return Double.valueOf(v);
        } catch (NumberFormatException e) {
            return v;
        }
    }
}
