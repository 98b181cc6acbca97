package trapmap.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.time.temporal.ChronoUnit;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.BatchOutputException;
import trapmap.maps.batch.IronPairRules;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.RulesException;
import trapmap.maps.batch.RunManifest;
import trapmap.maps.batch.RunRefusedException;
import trapmap.maps.watch.Alarm;
import trapmap.maps.watch.FolderWatch;
import trapmap.maps.watch.AlarmLedger;
import trapmap.maps.trend.TrendSettings;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.progress.ProgressListener;
import trapmap.store.StoreException;
import trapmap.store.StoreSignals;
import trapmap.store.StoreWriter;
import trapmap.viewer.report.BatchReport;

/** {@code trapmap watch}: inspects the maps of a folder as they arrive, as {@code inspect} would. */
@Command(name = "watch", version = TrapmapCommand.VERSION, mixinStandardHelpOptions = true, sortOptions = false,
        usageHelpAutoWidth = true,
        header = "Inspects the maps arriving in a folder, as inspect does, until stopped.",
        description = {
            "Watches FOLDER for maps (.tif, .tiff, .csv) and inspects each once it is complete: when a marker"
                + " NAME.done or STEM.done lies beside it (e.g. W07.tif.done), or when its sidecar STEM.json is"
                + " present and the sizes and times of map and sidecar have stayed the same for --settle-s. Partial"
                + " files are never read. DIR holds the results of one batch of every map inspected so far"
                + " (results.csv, results.json, regions.csv, recurrence maps, run.json; as inspect writes them),"
                + " each wafer's rows written as it finishes and the tables brought up to date after each round."
                + " One line per wafer on stdout: time, wafer id, verdict, grade, file.",
            "A restart continues: the maps DIR lists are not inspected again, the others are. SIGTERM or Ctrl-C"
                + " stops cleanly (the round in progress is continued by the next start).",
            ""},
        footer = {"", "Exit codes: 0 stopped (or idle for --exit-idle-s); 2 invalid input or DIR refused (watched"
                + " by another watch, or holding a run with other rules, physics, thumbnails or version); 3 internal"
                + " error; 4 output could not be written to DIR. A stop by SIGTERM ends with the signal's status"
                + " (143)."})
final class WatchCommand implements Callable<Integer> {
    /** How a wafer that could not be stored is stored later (the store's failure line). */
    private static final String STORE_AGAIN = "inspecting the wafers again with inspect --store";

    @Spec
    CommandSpec spec;

    @Parameters(index = "0", paramLabel = "FOLDER", description = "The folder the maps arrive in.")
    Path incoming;

    @Option(names = "--rules", required = true, paramLabel = "<RULES.json>",
            description = "Inspection rules (schema in the README, 'Batch inspection').")
    Path rulesFile;

    @Option(names = {"-o", "--out", "--output"}, required = true, paramLabel = "<DIR>", description = "Folder for the results.")
    Path out;

    @Option(names = "--settle-s", paramLabel = "<s>", defaultValue = "2",
            description = "How long, in s, a map and its sidecar must keep their size and time before the map is"
                    + " read (default ${DEFAULT-VALUE} s; a done marker completes a map at once).")
    double settleS;

    @Option(names = "--scan-s", paramLabel = "<s>", defaultValue = "1",
            description = "Longest time, in s, between two looks at FOLDER besides the changes the system tells"
                    + " (default ${DEFAULT-VALUE} s; some network file systems tell none).")
    double scanS;

    @Option(names = "--without-sidecar", description = "Maps may complete without a sidecar (their conditions"
            + " embedded or in the rules): by settling alone.")
    boolean withoutSidecar;

    @Option(names = "--on-fail", paramLabel = "<CMD>", description = "Program run for each wafer that fails or"
            + " cannot be inspected, with the wafer id and the verdict (fail or error) as its two arguments; with"
            + " --store and a rules trend block also for each control-chart signal, with the five arguments WAFER_ID"
            + " signal RULE GROUP FIGURE; started directly, never through a shell.")
    Path onFail;

    @Option(names = "--alarm-file", paramLabel = "<FILE>", description = "File to which one line is appended for"
            + " each wafer that fails or cannot be inspected: time (UTC), wafer id, verdict, file, separated by"
            + " tabs; for a control-chart signal: time, wafer id, signal, 'RULE GROUP FIGURE'. Alarms are raised at least"
            + " once: one a kill interrupted is raised again by the next start (recorded in DIR/.watch-alarms and"
            + " .watch-signals).")
    Path alarmFile;

    @Option(names = "--exit-idle-s", paramLabel = "<s>", defaultValue = "0",
            description = "End after this many s without a new map (default 0: never; for scripts).")
    double exitIdleS;

    @Option(names = "--threads", paramLabel = "<n>",
            description = "Maps inspected at once. Default: the number of processors.")
    Integer threads;

    @Option(names = "--thumbnails", negatable = true, defaultValue = "true", fallbackValue = "true",
            description = "Write DIR/thumbnails/FILE.png (default; --no-thumbnails leaves them out).")
    boolean thumbnails;

    @Option(names = "--pdf", description = "Also write DIR/summary.pdf after each round (default: none; it is"
            + " drawn anew from every wafer each time).")
    boolean summaryPdf;

    @Option(names = "--store", paramLabel = "<STORE>", description = "Also write each wafer's results into a results"
            + " store as it finishes: a SQLite file (made when missing) or postgresql://host[:port]/database (user"
            + " and password from PGUSER/PGPASSWORD or ~/.pgpass, never the command line); one store run per watch"
            + " start. With a trend block in the rules, each control-chart signal that a round's wafers bring after"
            + " the baseline raises the alarm (one line on stdout). A restart also inspects again the maps DIR lists"
            + " but the store lacks. See README, \"Results store\" and \"Watching a folder\".")
    String store;

    @Option(names = "--physics", paramLabel = "<physics.json>", description = PhysicsOption.DESCRIPTION
            + " Replaces the rules file's physics block.")
    Path physics;

    @Override
    public Integer call() throws IOException, InterruptedException {
        int n = threads == null ? Runtime.getRuntime().availableProcessors() : threads;
        if (n < 1 || n > 256) {
            throw new InputException("--threads must be in [1, 256] (got " + n + ")");
        }
        long settle = seconds("--settle-s", settleS, true);
        long scan = seconds("--scan-s", scanS, false);
        long idle = seconds("--exit-idle-s", exitIdleS, true);
        if (!Files.isDirectory(incoming)) {
            throw new InputException("FOLDER " + incoming + (Files.exists(incoming) ? " is not a folder"
                    : " does not exist") + "; give the folder the maps arrive in");
        }
        if (Files.exists(out) && !Files.isDirectory(out)) {
            throw new InputException("--out " + out + " is a file; give a folder");
        }
        if (onFail != null && !Files.isExecutable(onFail)) {
            throw new InputException("--on-fail " + onFail + " is not an executable program; give the program's"
                    + " path (it is run with the wafer id and verdict as arguments, without a shell)");
        }
        String alarmProblem = alarmFile == null ? null : Alarm.unusableFile(alarmFile);
        if (alarmProblem != null) {
            throw new InputException("--alarm-file " + alarmFile + " cannot take alarm lines: " + alarmProblem);
        }
        Rules parsed;
        IronPairRules ironPairs;
        RunManifest.Source source;
        java.util.regex.Pattern lots;
        try {
            String text = Rules.readText(rulesFile);
            parsed = Rules.parse(text, rulesFile.toString());
            ironPairs = IronPairRules.parse(text, rulesFile.toString()).orElse(null);
            source = RunManifest.Source.of(TrapmapCommand.VERSION, rulesFile, text);
            lots = trapmap.maps.batch.LotPattern.parse(text, rulesFile.toString()).orElse(null);
        } catch (RulesException e) {
            throw new InputException("--rules " + e.getMessage());
        }
        Rules rules = physics == null ? parsed : parsed.withPhysics(PhysicsOption.load(physics));
        PrintWriter o = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        Pictures pictures = Pictures.start();
        StoreOutput storeOutput = store == null ? null : StoreOutput.open(store, source, rules.physics(), lots,
                spec.qualifiedName(), err);
        StoreWriter storing = storeOutput == null ? null : storeOutput.writer();
        StoreWriter stored = storing;
        BatchReport.TrendSource trend = storeOutput == null ? null
                : rowFiles -> storeOutput.summaryTrend(rules, rowFiles);
        java.util.function.Consumer<String> problems = line -> {
            synchronized (err) {
                err.println("watch: " + line);
                err.flush();
            }
        };
        Alarm alarm = new Alarm(onFail, alarmFile, problems);
        // the failed wafers' alarm, recorded in the output folder so that a kill never loses one
        FailAlarm failures = new FailAlarm(alarm, problems);
        // the signal alarm: with a store and the rules' trend block, the wafers stored since the last look
        SignalAlarm signals = storeOutput == null ? null
                : rules.trend().map(t -> new SignalAlarm(storeOutput, t, alarm, o, problems)).orElse(null);
        if (storeOutput == null && rules.trend().isPresent()) {
            err.println("watch: the rules' trend block needs --store: no signal alarm");
        }
        BatchInspection.WaferListener told = signals == null ? stored : (result, row) -> {
            stored.wafer(result, row);
            signals.stored(result.file());
        };
        FolderWatch watch = new FolderWatch(new FolderWatch.Settings(incoming, out, settle, scan, !withoutSidecar,
                idle, new BatchInspection.Options(n, true, thumbnails, ProgressListener.NONE)),
                () -> {
                    BatchInspection b = new BatchInspection(rules).withIron(ironPairs).withSource(source)
                            .withRecurrencePictures(() -> pictures.allows("the recurrence pictures"))
                            .tellingWafers(told);
                    if (summaryPdf) {
                        b.finishingWith((dir, recurrence) -> {
                            if (!pictures.run(BatchReport.FILE_NAME,
                                    () -> BatchReport.writeFor(dir, rules, recurrence, trend))) {
                                Files.deleteIfExists(dir.resolve(BatchReport.FILE_NAME));
                            }
                        });
                    }
                    return b;
                },
                new FolderWatch.Listener() {
                    @Override
                    public void wafer(Map<String, String> row) {
                        Instant now = Instant.now().truncatedTo(ChronoUnit.SECONDS);
                        String status = row.getOrDefault("status", "");
                        String line = line(now, row);
                        synchronized (o) {
                            o.println(line);
                            o.flush();
                        }
                        if (!status.equals("pass")) {
                            failures.raise(now, row);
                        }
                    }

                    @Override
                    public void started(List<String> listed, java.util.Set<String> again) throws IOException {
                        failures.start(out);
                        if (signals != null) {
                            signals.start(out, listed, again);
                        }
                    }

                    @Override
                    public void round(BatchInspection.Summary summary) {
                        if (signals != null) {
                            signals.look();
                        }
                    }
                });
        if (storeOutput != null) {
            watch.inspectingAgain(storeOutput::missing); // kept wafers a killed watch did not store
        }
        CountDownLatch ended = new CountDownLatch(1);
        Thread hook = new Thread(() -> {
            watch.stop();
            try {
                ended.await(30, TimeUnit.SECONDS); // the watch stops its round and says so
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }, "trapmap-watch-stop");
        Runtime.getRuntime().addShutdownHook(hook);
        err.println("watch: watching " + incoming + " into " + out + " (settle "
                + trapmap.maps.io.NumberText.of(settleS) + " s" + (withoutSidecar ? ", sidecars not required" : "")
                + (store != null ? ", store " + store : "") + "); Ctrl-C or SIGTERM stops");
        err.flush();
        try {
            FolderWatch.Outcome outcome;
            boolean storeClosed;
            try {
                outcome = watch.run();
            } finally {
                if (signals != null) {
                    signals.look(); // the wafers of a round that a stop cut short
                }
                alarm.close();
                storeClosed = StoreOutput.close(storeOutput, spec.qualifiedName(), STORE_AGAIN, err);
            }
            if (!storeClosed) {
                return Exit.OUTPUT_NOT_WRITTEN;
            }
            err.println("watch: " + (outcome.end() == FolderWatch.End.IDLE
                    ? "idle for " + trapmap.maps.io.NumberText.of(exitIdleS) + " s" : "stopped") + "; " + outcome.inspected() + " wafers inspected by this watch; results in "
                    + out + (outcome.end() == FolderWatch.End.STOPPED ? " (a new start continues)" : ""));
            pictures.line().ifPresent(line -> err.println("watch: " + line));
            err.flush();
            return Exit.OK;
        } catch (RunRefusedException e) {
            throw new InputException(e.getMessage());
        } catch (BatchOutputException e) {
            err.println(spec.qualifiedName() + ": --out " + out + ": output could not be written: " + e.getMessage()
                    + "; the watch stopped, what was written stays and a new start continues from it");
            err.flush();
            return Exit.OUTPUT_NOT_WRITTEN;
        } finally {
            ended.countDown();
            try {
                Runtime.getRuntime().removeShutdownHook(hook);
            } catch (IllegalStateException e) {
                // shutting down: the hook is running
            }
        }
    }

    /**
     * The watch's alarm on a control-chart signal: after each round, the signals of the rules' trend block that the
     * wafers stored in it bring ({@link StoreSignals}), each told as one line on stdout and raised through the
     * {@link Alarm}. The computation is the store's; this only hands it the round's wafers.
     */
    private static final class SignalAlarm {
        private final StoreOutput store;
        private final TrendSettings settings;
        private final Alarm alarm;
        private final PrintWriter out;
        private final java.util.function.Consumer<String> tell;
        private final List<String> files = new ArrayList<>();
        private String waiting;
        private AlarmLedger ledger;

        SignalAlarm(StoreOutput store, TrendSettings settings, Alarm alarm, PrintWriter out,
                    java.util.function.Consumer<String> tell) {
            this.store = store;
            this.settings = settings;
            this.alarm = alarm;
            this.out = out;
            this.tell = tell;
        }

        /** A wafer handed to the store (on the batch's writing thread). */
        synchronized void stored(String file) {
            files.add(file);
        }

        /**
         * The watch holds {@code out}: opens its ledger, raises the signal alarms a killed watch recorded but had not
         * finished raising, and looks at once at the stored wafers of {@code listed} that a killed watch stored but
         * did not look at (those inspected {@code again} are looked at after their round).
         */
        void start(Path out, List<String> listed, java.util.Set<String> again) throws IOException {
            AlarmLedger l = AlarmLedger.open(out, AlarmLedger.SIGNALS, listed);
            List<String> pending = l.pending(listed).stream().filter(f -> !again.contains(f)).toList();
            synchronized (this) {
                ledger = l;
                files.addAll(pending);
            }
            raiseAgain(alarm, l, "signal", tell);
            look();
        }

        /**
         * Waits for the wafers handed over so far to be stored, records them in the ledger as looked at (the ones
         * not looked at before) together with the signal alarms they bring as pending, then raises those, each taken
         * off the pending list once raised.
         */
        void look() {
            List<String> round;
            AlarmLedger l;
            synchronized (this) {
                l = ledger;
                round = l == null ? List.copyOf(files) : l.pending(files);
                files.clear();
            }
            if (round.isEmpty()) {
                return;
            }
            try {
                try {
                    store.writer().awaitStored();
                } catch (StoreException e) {
                    return; // the failed write is told when the store is closed
                }
                List<StoreSignals.Raised> raised;
                try {
                    raised = StoreSignals.brought(store.results(), settings, round);
                } catch (InvalidValueException e) {
                    if (l != null) {
                        l.add(round); // nothing to raise for them
                    }
                    throw e;
                }
                Instant now = Instant.now().truncatedTo(ChronoUnit.SECONDS);
                List<Alarm.Raising> alarms = raised.stream().map(r -> Alarm.Raising.signal(now, r.waferId(),
                        r.ruleName(), r.group(), r.figure())).toList();
                if (l != null) {
                    // the wafers and their alarms in one write, the alarms pending until raised: a kill at any
                    // moment leaves each alarm to be raised (again) by the next start, never lost
                    l.add(round, alarm.active() ? alarms : List.of());
                }
                waiting = null;
                for (int i = 0; i < raised.size(); i++) {
                    StoreSignals.Raised r = raised.get(i);
                    synchronized (out) {
                        out.println(now + " " + r.waferId() + " " + Alarm.SIGNAL + " " + r.ruleName() + " "
                                + r.group() + " " + r.figure() + ": " + r.describe());
                        out.flush();
                    }
                    raise(alarm, l, alarms.get(i), tell);
                }
            } catch (InvalidValueException e) {
                if (!e.getMessage().equals(waiting)) { // said once until it changes
                    waiting = e.getMessage();
                    tell("signal alarm waits: the trend cannot be charted yet: " + e.getMessage());
                }
            } catch (StoreException e) {
                tell("signal alarm: " + e.getMessage() + "; the wafers' signals are not raised (a new start looks"
                        + " at them again)");
            } catch (IOException e) {
                tell("signal alarm: " + AlarmLedger.SIGNALS + " in --out could not be written: " + e
                        + "; the wafers' signals are not raised");
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }

        private void tell(String line) {
            tell.accept(line);
        }
    }

    /**
     * The alarm of the wafers that do not pass, at least once each: a failed wafer's alarm is recorded as pending in
     * {@link AlarmLedger#FAILURES} before it is raised and taken off once raised; a start raises the pending alarms
     * of a killed watch, and those of the failed wafers its results table lists but the ledger does not (a kill
     * between a wafer's row and its record).
     */
    private static final class FailAlarm {
        private final Alarm alarm;
        private final java.util.function.Consumer<String> tell;
        private volatile AlarmLedger ledger;

        FailAlarm(Alarm alarm, java.util.function.Consumer<String> tell) {
            this.alarm = alarm;
            this.tell = tell;
        }

        /** The watch holds {@code out}: opens the ledger (with an alarm to raise) and raises what a kill left. */
        void start(Path out) throws IOException {
            if (!alarm.active()) {
                return;
            }
            List<Map<String, String>> failed = BatchInspection.listedRows(out).stream()
                    .filter(r -> !r.getOrDefault("status", "").equals("pass")).toList();
            AlarmLedger l = AlarmLedger.open(out, AlarmLedger.FAILURES,
                    failed.stream().map(r -> r.get("file")).toList());
            ledger = l;
            raiseAgain(alarm, l, "wafer", tell);
            java.util.Set<String> unrecorded = java.util.Set.copyOf(l.pending(failed.stream()
                    .map(r -> r.get("file")).toList()));
            Instant now = Instant.now().truncatedTo(ChronoUnit.SECONDS);
            for (Map<String, String> row : failed) {
                if (unrecorded.contains(row.get("file"))) {
                    raise(now, row);
                }
            }
        }

        /** Raises the alarm of a wafer that did not pass, recorded first. */
        void raise(Instant now, Map<String, String> row) {
            String file = row.getOrDefault("file", "");
            Alarm.Raising a = Alarm.Raising.wafer(now, waferId(row), row.getOrDefault("status", ""), file);
            AlarmLedger l = ledger;
            if (l != null) {
                try {
                    l.add(List.of(file), List.of(a));
                } catch (IOException e) {
                    tell.accept(AlarmLedger.FAILURES + " in --out could not be written: " + e + "; the alarm of "
                            + a.waferId() + " is raised but a kill before it ends would lose it");
                }
            }
            WatchCommand.raise(alarm, l, a, tell);
        }
    }

    /** Raises {@code a} and then takes it off the pending alarms of {@code l} (null: none). */
    private static void raise(Alarm alarm, AlarmLedger l, Alarm.Raising a, java.util.function.Consumer<String> tell) {
        alarm.raise(a, l == null ? null : () -> {
            try {
                l.raised(a);
            } catch (IOException e) {
                tell.accept("the record of the raised alarm of " + a.waferId() + " could not be written: " + e
                        + "; a new start raises it again");
            }
        });
    }

    /** Raises the pending alarms of {@code l}: those a stopped or killed watch recorded but had not raised. */
    private static void raiseAgain(Alarm alarm, AlarmLedger l, String kind,
                                   java.util.function.Consumer<String> tell) {
        List<Alarm.Raising> left = l.pendingAlarms();
        if (left.isEmpty() || !alarm.active()) { // kept for a start with an alarm
            return;
        }
        tell.accept("raising " + left.size() + " " + kind + " alarm" + (left.size() == 1 ? "" : "s")
                + " that the last watch recorded but had not finished raising (it was stopped or killed)");
        for (Alarm.Raising a : left) {
            raise(alarm, l, a, tell);
        }
    }

    /** The log line of one wafer: time, wafer id, verdict, grade, file, and the failed rules or the error. */
    static String line(Instant time, Map<String, String> row) {
        String status = row.getOrDefault("status", "");
        StringBuilder b = new StringBuilder(time.toString()).append(' ').append(waferId(row))
                .append(' ').append(status);
        String grade = row.getOrDefault("grade", "");
        if (!grade.isEmpty()) {
            b.append(' ').append(grade);
        }
        b.append(' ').append(Path.of(row.getOrDefault("file", "")).getFileName());
        String failed = row.getOrDefault("failed_rules", "");
        String error = row.getOrDefault("error", "");
        if (!error.isEmpty()) {
            b.append(": ").append(error);
        } else if (!failed.isEmpty()) {
            b.append(": ").append(failed);
        }
        return b.toString();
    }

    /** The wafer id of a row, or for a map that could not be read (no id) its file name without extension. */
    static String waferId(Map<String, String> row) {
        String id = row.getOrDefault("wafer_id", "");
        if (!id.isEmpty()) {
            return id;
        }
        String name = Path.of(row.getOrDefault("file", "")).getFileName().toString();
        int dot = name.lastIndexOf('.');
        return dot > 0 ? name.substring(0, dot) : name;
    }

    private static long seconds(String option, double s, boolean zeroAllowed) {
        if (!Double.isFinite(s) || s < 0 || !zeroAllowed && s == 0 || s > 86_400) {
            throw new InputException(option + " must be " + (zeroAllowed ? "in [0, 86400]" : "in (0, 86400]")
                    + " s (got " + Format.exact(s) + ")");
        }
        return Math.round(s * 1e9);
    }
}
