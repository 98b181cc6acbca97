package trapmap.maps.watch;

import java.io.IOException;
import java.nio.channels.FileChannel;
import java.nio.channels.FileLock;
import java.nio.channels.OverlappingFileLockException;
import java.nio.file.ClosedWatchServiceException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.nio.file.WatchKey;
import java.nio.file.WatchService;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.TimeUnit;
import java.util.function.Supplier;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.RunManifest;
import trapmap.maps.batch.RunRefusedException;

/**
 * Inspects the maps of a folder as they arrive, into one output folder, on the batch inspection: each round hands
 * the maps that became complete since the last ({@link Arrivals}) to a resumed {@link BatchInspection} over every
 * map taken so far, so that the tables, {@code results.json}, the recurrence maps and {@code run.json} are those of
 * one batch of all of them, brought up to date after each round (each wafer's rows written and flushed as it
 * finishes). The rows of earlier rounds are kept, not read again ({@code error} rows too: a map is inspected once);
 * a restart takes the maps the results table lists as done, and an interrupted round is finished by the next.
 *
 * <p>The folder is looked at when {@link WatchService} tells of a change and, as some file systems (network mounts)
 * tell nothing, at least every {@code scanEvery}. {@link #stop} (from a shutdown hook: SIGTERM, Ctrl-C) ends the
 * watch: a round in progress stops after its current wafers as an interrupted batch does, and the next start
 * continues it. One watch holds the output folder at a time (an operating-system lock on {@value #LOCK_NAME}).
 */
public final class FolderWatch {
    /** The lock file of a watch in its output folder. */
    public static final String LOCK_NAME = ".watch.lock";

    /**
     * @param incoming        the watched folder
     * @param out             the output folder
     * @param settleNanos     how long a map's (and sidecar's) size and time must stay the same, ns
     * @param scanEveryNanos  longest time between two looks at the folder, ns
     * @param sidecarRequired whether a map waits for its sidecar (unless a done marker says it is complete)
     * @param idleExitNanos   end the watch after this long without a new map, ns; ≤ 0: never
     * @param options         the batch options of each round (resume is set)
     */
    public record Settings(Path incoming, Path out, long settleNanos, long scanEveryNanos, boolean sidecarRequired,
                           long idleExitNanos, BatchInspection.Options options) {
    }

    /** Told what the watch does. */
    public interface Listener {
        /** A wafer of this watch was inspected: its results row (on the writing thread; return at once). */
        void wafer(Map<String, String> row);

        /**
         * The watch holds the output folder and starts: {@code listed} are the maps its results table lists, of which
         * {@code again} are inspected again ({@link #inspectingAgain}) in the first round.
         */
        default void started(List<String> listed, Set<String> again) throws IOException {
        }

        /** A round ended: the batch's summary over every wafer of the folder. */
        default void round(BatchInspection.Summary summary) {
        }
    }

    /** How the watch ended. */
    public enum End {
        /** {@link #stop} was called. */
        STOPPED,
        /** No new map arrived for the idle time. */
        IDLE
    }

    /** What the watch did: how it ended, the wafers inspected by it, the last round's summary (null: none). */
    public record Outcome(End end, int inspected, BatchInspection.Summary last) {
    }

    private final Settings settings;
    private final Supplier<BatchInspection> batches;
    private final Listener listener;
    private volatile boolean stopped;
    private volatile Thread running;
    private java.util.function.Function<List<String>, Set<String>> again;

    /**
     * @param batches makes each round's batch (rules, source, iron pairs, summary step); the watch sets how it
     *                resumes and tells the rows
     */
    public FolderWatch(Settings settings, Supplier<BatchInspection> batches, Listener listener) {
        this.settings = settings;
        this.batches = batches;
        this.listener = listener;
    }

    /**
     * Chooses, once at the start, which of the maps the output folder already lists are inspected again (e.g. those
     * that a killed watch wrote into the folder but not yet into a results store): given the listed files as the
     * results table writes them, it returns those to inspect again; then the first round does, even when no map is
     * new. Null (the default) for none. Returns this watch.
     */
    public FolderWatch inspectingAgain(java.util.function.Function<List<String>, Set<String>> chooser) {
        this.again = chooser;
        return this;
    }

    /** Ends the watch: the running round stops after its current wafers (as an interrupted batch). */
    public void stop() {
        stopped = true;
        Thread t = running;
        if (t != null) {
            t.interrupt();
        }
    }

    /**
     * Watches until {@link #stop} or the idle time.
     *
     * @throws RunRefusedException               another watch holds the output folder, or its run was made with
     *                                           other rules, physics, thumbnails or program version
     * @throws trapmap.maps.batch.BatchOutputException an output file could not be written (not when stopped)
     */
    public Outcome run() throws IOException {
        Path out = settings.out();
        Files.createDirectories(out);
        running = Thread.currentThread();
        try (FileChannel ch = FileChannel.open(out.resolve(LOCK_NAME), StandardOpenOption.CREATE,
                StandardOpenOption.WRITE)) {
            FileLock lock;
            try {
                lock = ch.tryLock();
            } catch (OverlappingFileLockException e) {
                lock = null;
            }
            if (lock == null) {
                throw new RunRefusedException(out + " is watched by another trapmap watch; stop it or give another"
                        + " --out");
            }
            return watch();
        } finally {
            running = null;
            Thread.interrupted(); // a stop's interrupt ends here
        }
    }

    private Outcome watch() throws IOException {
        Path incoming = settings.incoming().toAbsolutePath().normalize();
        Path out = settings.out();
        Arrivals arrivals = new Arrivals(settings.settleNanos(), settings.sidecarRequired());
        List<Path> all = new ArrayList<>();
        List<String> listed = BatchInspection.listedFiles(out);
        for (String f : listed) {
            Path p = Path.of(f).toAbsolutePath().normalize();
            all.add(p);
            arrivals.take(p);
        }
        Set<String> redo = again == null || listed.isEmpty() ? Set.of() : Set.copyOf(again.apply(listed));
        listener.started(listed, redo);
        boolean unfinished;
        try {
            unfinished = Files.exists(out.resolve(RunManifest.FILE_NAME))
                    && RunManifest.read(out).state() != RunManifest.State.COMPLETE;
        } catch (IOException e) {
            unfinished = true; // the batch says what is wrong with it
        }
        int inspected = 0;
        BatchInspection.Summary last = null;
        WatchService ws = null;
        try {
            try {
                ws = incoming.getFileSystem().newWatchService();
                incoming.register(ws, java.nio.file.StandardWatchEventKinds.ENTRY_CREATE,
                        java.nio.file.StandardWatchEventKinds.ENTRY_MODIFY,
                        java.nio.file.StandardWatchEventKinds.ENTRY_DELETE);
            } catch (IOException | UnsupportedOperationException e) {
                if (ws != null) {
                    ws.close();
                }
                ws = null; // the periodic look alone
            }
            long lastNew = System.nanoTime();
            while (!stopped) {
                List<Path> fresh = arrivals.scan(incoming, out, System.nanoTime());
                if (!fresh.isEmpty() || unfinished || !redo.isEmpty()) {
                    all.addAll(fresh);
                    try {
                        last = round(all, fresh, redo);
                    } catch (InterruptedException e) {
                        break; // stopped: the run says running, the next start finishes it
                    } catch (trapmap.maps.batch.BatchOutputException e) {
                        if (stopped || e.stopped()) {
                            break;
                        }
                        throw e;
                    }
                    inspected += fresh.size();
                    unfinished = false;
                    redo = Set.of();
                    lastNew = System.nanoTime();
                    listener.round(last);
                    continue; // look again at once: maps may have arrived during the round
                }
                if (settings.idleExitNanos() > 0 && System.nanoTime() - lastNew >= settings.idleExitNanos()) {
                    return new Outcome(End.IDLE, inspected, last);
                }
                if (!await(ws)) {
                    break;
                }
            }
            return new Outcome(End.STOPPED, inspected, last);
        } finally {
            if (ws != null) {
                ws.close();
            }
        }
    }

    /** Waits for a change in the folder or the periodic look; false when stopped meanwhile. */
    private boolean await(WatchService ws) {
        long wait = Math.max(1, settings.scanEveryNanos());
        try {
            if (ws == null) {
                TimeUnit.NANOSECONDS.sleep(wait);
                return !stopped;
            }
            WatchKey k = ws.poll(wait, TimeUnit.NANOSECONDS);
            while (k != null) {
                k.pollEvents();
                k.reset();
                k = ws.poll(); // take the other changes told meanwhile with it
            }
            return !stopped;
        } catch (InterruptedException | ClosedWatchServiceException e) {
            return false;
        }
    }

    /**
     * One round: a resumed batch over {@code all}, of which {@code fresh} are new and the kept maps of {@code redo}
     * (as listed) are inspected again.
     */
    private BatchInspection.Summary round(List<Path> all, List<Path> fresh, Set<String> redo) throws IOException,
            InterruptedException {
        Set<Path> news = new HashSet<>(fresh);
        BatchInspection.Options o = settings.options();
        BatchInspection batch = batches.get().keepingErrors(true).growingInputs(true)
                .inspectingAgain(redo.isEmpty() ? null : redo::contains)
                .tellingRows(row -> {
                    if (news.contains(Path.of(row.get("file")).toAbsolutePath().normalize())) {
                        listener.wafer(row);
                    }
                });
        return batch.run(List.copyOf(all), out(), new BatchInspection.Options(o.threads(), true, o.thumbnails(),
                o.progress(), false, o.thumbnailCaptions()));
    }

    private Path out() {
        return settings.out();
    }
}
