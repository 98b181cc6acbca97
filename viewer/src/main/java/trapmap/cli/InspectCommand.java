package trapmap.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.attribute.BasicFileAttributes;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.Stack;
import java.util.concurrent.Callable;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.IParameterConsumer;
import picocli.CommandLine.Model.ArgSpec;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Model.PositionalParamSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.LotPattern;
import trapmap.maps.batch.BatchOutputException;
import trapmap.maps.batch.IronPairRules;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.RulesException;
import trapmap.maps.batch.RunManifest;
import trapmap.maps.batch.RunRefusedException;
import trapmap.shared.progress.ProgressListener;
import trapmap.store.StoreWriter;
import trapmap.viewer.report.BatchReport;
import trapmap.viewer.report.SummaryDraft;

/** {@code trapmap inspect}: pass/fail, grades and flagged regions of many wafer maps against a rules file. */
@Command(name = "inspect", version = TrapmapCommand.VERSION, mixinStandardHelpOptions = true, sortOptions = false,
        usageHelpAutoWidth = true,
        header = "Inspects a batch of wafer maps against a rules file.",
        description = {
            "Evaluates every map (a folder: all .tif, .tiff and .csv files in it, by name, less the --out folder and"
                + " trapmap's own outputs) against RULES.json:"
                + " figures over the wafer less the edge exclusion, flagged regions, pass/fail and grade. Writes"
                + " results.csv and results.json (one row per wafer, in input order), regions.csv (one row per"
                + " flagged region), recurrence maps of the flagged positions per wafer family (with"
                + " recurrence.csv counting the wafers of each) and a small picture"
                + " per wafer with its flagged regions outlined (thumbnails/). A file that cannot be read (also a"
                + " folder, FIFO, device or dangling link named like a map) gives an 'error' row; the batch goes on.",
            ""},
        footer = {"", "DIR/run.json records the run (version, rules and physics hashes, inputs, state running,"
                + " finishing or complete); a run holds DIR locked until it ends.",
            "", "Exit codes: 0 all wafers pass; 1 some wafers fail or could not be read; 2 invalid input"
                + " (rules file, options, no input files) or DIR refused (in use by another run, holds other"
                + " results, or --resume with other rules, physics, inputs or version); 3 internal error;"
                + " 4 output could not be written to DIR (disk full, no permission): what was written stays,"
                + " --resume continues; 5 the results are complete (pass/fail in results.csv and the last line) but"
                + " summary.pdf or the recurrence pictures or thumbnail captions could not be made: this Java"
                + " runtime lacks font libraries, fonts or a display; one line names what and the packages to"
                + " install (after which --resume makes them; --no-pdf skips the PDF on purpose)."})
final class InspectCommand implements Callable<Integer> {
    /** How a wafer that could not be stored is stored later (the store's failure line). */
    private static final String STORE_AGAIN = "inspecting the wafers again with --store";

    /** Writes the summary PDF into a finished batch folder. */
    @FunctionalInterface
    interface SummaryWriter {
        Path write(Path dir, Rules rules, trapmap.maps.batch.RecurrenceMap recurrence) throws IOException;
    }

    /**
     * The summary step; null: the summary drawn while the batch runs ({@link SummaryDraft}, the same document as
     * {@link BatchReport#writeFor}). A test puts a failing one here.
     */
    static volatile SummaryWriter summaryWriter = null;

    /** How the one line names the recurrence pictures when they are skipped. */
    private static final String RECURRENCE_PICTURES = "the recurrence pictures";

    @Spec
    CommandSpec spec;

    /** The map arguments' label. */
    static final String INPUTS_LABEL = "FOLDER|FILES";

    @Parameters(index = "0..*", arity = "1..*", paramLabel = INPUTS_LABEL,
            description = "A folder of maps, or map files (TIFF or CSV, with optional sidecars).")
    List<Path> inputs;

    @Option(names = "--rules", required = true, paramLabel = "<RULES.json>",
            description = "Inspection rules (schema in the README, 'Batch inspection').")
    Path rulesFile;

    @Option(names = {"-o", "--out", "--output"}, required = true, paramLabel = "<DIR>", description = "Folder for the results.")
    Path out;

    @Option(names = "--threads", paramLabel = "<n>",
            description = "Maps inspected at once (each worker holds one map). Default: the number of processors.")
    Integer threads;

    @Option(names = "--resume", description = "Continue the run recorded in DIR/run.json: skip files already listed"
            + " in DIR/results.csv and keep their rows (error rows are tried again). Refused when the rules, physics"
            + " settings, input files, thumbnails or program version differ.")
    boolean resume;

    @Option(names = "--overwrite", description = "DIR holds another run's results: remove them (only trapmap's own"
            + " files) and start anew. Without it (and without --resume) such a DIR is refused.")
    boolean overwrite;

    @Option(names = "--thumbnails", negatable = true, defaultValue = "true", fallbackValue = "true",
            description = "Write DIR/thumbnails/FILE.png with the flagged regions outlined (default; --no-thumbnails"
                    + " leaves them out).")
    boolean thumbnails;

    @Option(names = "--pdf", negatable = true, defaultValue = "true", fallbackValue = "true",
            description = "Write DIR/summary.pdf, the batch summary (default; --no-pdf leaves it out: a server that"
                    + " only needs the tables). The results are the same either way.")
    boolean summaryPdf;

    @Option(names = "--thumbnail-captions", description = "Give each thumbnail a small caption strip below it: the"
            + " wafer id and the quantity with its unit (no date: thumbnails stay the same between runs)."
            + " Default: none.")
    boolean thumbnailCaptions;

    @Option(names = "--physics", paramLabel = "<physics.json>", description = PhysicsOption.DESCRIPTION
            + " Replaces the rules file's physics block.")
    Path physics;

    @Option(names = "--store", paramLabel = "<STORE>", description = "Also write each wafer's results into a results"
            + " store as it finishes: a SQLite file (made when missing) or postgresql://host[:port]/database (user"
            + " and password from PGUSER/PGPASSWORD or ~/.pgpass, never the command line). See README, \"Results"
            + " store\".")
    String store;

    @Option(names = "--json", description = "Print the summary as one JSON object.")
    boolean json;

    @Override
    public Integer call() throws IOException, InterruptedException {
        long callStart = System.currentTimeMillis();
        long callStartNanos = System.nanoTime();
        long[] startCpu = PhaseTimes.startCpu();
        int n = threads == null ? Runtime.getRuntime().availableProcessors() : threads;
        if (n < 1 || n > 256) {
            throw new InputException("--threads must be in [1, 256] (got " + n + ")");
        }
        if (resume && overwrite) {
            throw new InputException("--resume and --overwrite exclude each other: --resume continues the run in"
                    + " --out, --overwrite replaces it");
        }
        Rules rules;
        IronPairRules ironPairs;
        RunManifest.Source source;
        Pattern lots;
        try {
            String text = Rules.readText(rulesFile); // read once: the rules, their iron section and their hash
            rules = Rules.parse(text, rulesFile.toString());
            ironPairs = IronPairRules.parse(text, rulesFile.toString()).orElse(null);
            source = RunManifest.Source.of(TrapmapCommand.VERSION, rulesFile, text);
            lots = LotPattern.parse(text, rulesFile.toString()).orElse(null);
        } catch (RulesException e) {
            throw new InputException("--rules " + e.getMessage());
        }
        if (physics != null) {
            rules = rules.withPhysics(PhysicsOption.load(physics));
        }
        List<Path> files = files(inputs, out);
        if (Files.exists(out) && !Files.isDirectory(out)) {
            throw new InputException("--out " + out + " is a file; give a folder");
        }
        PrintWriter err = spec.commandLine().getErr();
        ProgressListener progress = System.console() != null ? bar(err) : lines(err);
        Rules judged = rules;
        Path pdf = out.resolve(BatchReport.FILE_NAME);
        Pictures pictures = Pictures.start(); // the runtime is asked once, when the first picture step is due
        boolean captions = thumbnails && thumbnailCaptions && pictures.allows("the thumbnail captions");
        BatchInspection.Summary s;
        BatchInspection batch = new BatchInspection(rules);
        StoreOutput storeOutput = store == null ? null : StoreOutput.open(store, source, rules.physics(), lots,
                spec.qualifiedName(), err);
        StoreWriter storing = storeOutput == null ? null : storeOutput.writer();
        if (storing != null) {
            batch.tellingWafers(storing);
            if (resume) {
                batch.inspectingAgain(storeOutput::misses); // kept wafers the interrupted run did not store
            }
        }
        SummaryWriter writer = summaryWriter;
        // drawn beside the workers when this runtime draws text (asked on the drawing thread)
        Rules judgedBy = rules;
        BatchReport.TrendSource trend = storeOutput == null ? null
                : rowFiles -> storeOutput.summaryTrend(judgedBy, rowFiles);
        SummaryDraft draft = summaryPdf && writer == null
                ? SummaryDraft.start(out, judged, files.size(), () -> pictures.missing().isEmpty()).withTrend(trend)
                : null;
        long batchStart = System.nanoTime();
        long batchStartCpu = PhaseTimes.wanted() ? BatchInspection.threadCpuNanos() : -1;
        try (draft) {
            s = batch.withIron(ironPairs).withSource(source).tellingRows(draft)
                    .finishingWith((dir, recurrence) -> {
                        if (!summaryPdf || !pictures.run(BatchReport.FILE_NAME, () -> {
                            if (draft == null) {
                                writer.write(dir, judged, recurrence);
                            } else {
                                try {
                                    draft.write(recurrence, batch.rows(), batch.rowsAsTold());
                                } catch (InterruptedException e) {
                                    Thread.currentThread().interrupt();
                                    throw new java.io.InterruptedIOException("summary cancelled");
                                }
                            }
                        })) {
                            Files.deleteIfExists(pdf); // an earlier run's summary would not match these results
                        }
                    })
                    .warmingUp(!summaryPdf ? null : () -> {
                        try {
                            if (pictures.missing().isEmpty()) { // a runtime without fonts is told once, by the step
                                BatchReport.warmUp(judged);
                            }
                        } finally {
                            if (draft != null) {
                                draft.warmedUp(); // draws its rows now, with the drawing code loaded and compiled
                            }
                        }
                    })
                    .withRecurrencePictures(() -> pictures.allows(RECURRENCE_PICTURES))
                    .recordingSummary(() -> !summaryPdf ? "off (--no-pdf)" : pictures.skipped(BatchReport.FILE_NAME)
                            ? "missing: " + pictures.missingText() : "written")
                    .run(files, out, new BatchInspection.Options(n, resume, thumbnails, progress, overwrite)
                            .withThumbnailCaptions(captions));
        } catch (RunRefusedException e) {
            StoreOutput.close(storeOutput, spec.qualifiedName(), STORE_AGAIN, err);
            throw new InputException(e.getMessage());
        } catch (BatchOutputException e) {
            StoreOutput.close(storeOutput, spec.qualifiedName(), STORE_AGAIN, err);
            if (System.console() != null) {
                err.println();
            }
            if (e.stopped()) {
                err.println(spec.qualifiedName() + ": stopped; the run in --out " + out + " is unfinished and"
                        + " --resume continues it");
            } else {
                err.println(spec.qualifiedName() + ": --out " + out + ": output could not be written: "
                        + e.getMessage() + "; the batch stopped, what was written stays and --resume continues from"
                        + " it");
            }
            err.flush();
            return Exit.OUTPUT_NOT_WRITTEN;
        }
        if (System.console() != null) {
            err.println();
            err.flush();
        }
        if (!StoreOutput.close(storeOutput, spec.qualifiedName(), STORE_AGAIN, err)) {
            return Exit.OUTPUT_NOT_WRITTEN;
        }
        boolean pdfWritten = summaryPdf && !pictures.skipped(BatchReport.FILE_NAME);
        Optional<String> notMade = pictures.line();
        notMade.ifPresent(line -> {
            err.println(spec.qualifiedName() + ": " + line + "; the results are complete"
                    + (pictures.skipped(BatchReport.FILE_NAME) || pictures.skipped(RECURRENCE_PICTURES)
                    ? " (once that is installed, --resume writes the missing files)" : ""));
            err.flush();
        });
        PrintWriter o = spec.commandLine().getOut();
        if (json) {
            Map<String, Object> m = new LinkedHashMap<>();
            m.put("pass", s.pass());
            m.put("fail", s.fail());
            m.put("error", s.error());
            m.put("skipped", s.skipped());
            m.put("yield_fraction", Output.num(s.yield()));
            m.put("results_csv", s.csv().toString());
            m.put("results_json", s.json().toString());
            m.put("recurrence", s.recurrence().stream().map(Path::toString).toList());
            if (pdfWritten) {
                m.put("summary_pdf", pdf.toString());
            }
            notMade.ifPresent(line -> m.put("not_made", line));
            o.println(Output.json(m));
        } else {
            o.printf(Locale.ROOT, "%d wafers: %d pass, %d fail, %d error; yield %s%s; results in %s and %s%s%n",
                    s.total(), s.pass(), s.fail(), s.error(),
                    Double.isNaN(s.yield()) ? "n/a" : String.format(Locale.ROOT, "%.1f %%", 100 * s.yield()),
                    s.skipped() > 0 ? " (" + s.skipped() + " kept from the previous run)" : "", s.csv(), s.json(),
                    pdfWritten ? "; summary " + pdf : !summaryPdf ? "; no summary PDF (--no-pdf)"
                            : "; summary PDF missing (see the line above)");
        }
        o.flush();
        PhaseTimes.print(err, callStart, startCpu, batch.lastPhases(), new PhaseTimes.Steps(
                batchStart - callStartNanos, startCpu[1] < 0 || batchStartCpu < 0 ? -1 : batchStartCpu - startCpu[1],
                draft == null ? -1 : draft.drawingCpuNanos(), draft == null ? -1 : draft.finishingCpuNanos()));
        return notMade.isPresent() ? Exit.REPORT_MISSING
                : s.pass() == s.total() ? Exit.OK : Exit.SOME_WAFERS_NOT_PASSED;
    }

    /**
     * Lets {@code inspect}'s map arguments be taken in runs ({@link Inputs}) rather than one at a time: a batch names
     * hundreds of files, and picocli checks each value of a list as it takes it (whether it is an option or a number,
     * and converts it twice), some 40 microseconds an argument before any code is compiled. Only for a command line
     * {@code args} whose every argument is a path on this system (POSIX paths: no NUL character), and not where
     * picocli would trim quotes from the values ({@code picocli.trimQuotes}): picocli takes the others itself.
     */
    static void takeInputsInRuns(CommandSpec spec, String... args) {
        if (spec.parser().trimQuotes() || !java.nio.file.FileSystems.getDefault().getSeparator().equals("/")) {
            return;
        }
        for (String a : args) {
            if (a.indexOf('\0') >= 0) {
                return;
            }
        }
        for (PositionalParamSpec p : spec.positionalParameters()) {
            if (p.paramLabel().equals(INPUTS_LABEL) && p.parameterConsumer() == null) {
                spec.remove(p);
                spec.addPositional(PositionalParamSpec.builder(p).parameterConsumer(new Inputs()).build());
                return;
            }
        }
    }

    /**
     * Takes the argument picocli found to be a map argument and every one after it up to the next that starts with
     * {@code -}, each converted as picocli converts a path ({@link TrapmapCommand#path}). An argument that starts with
     * {@code -} is left to picocli (an option, {@code --}, an unknown option's message, or a map argument after all,
     * which comes back here): the list is the one picocli makes. A first value that is no path fails with picocli's
     * message, a later one ends the run there, as picocli's taking of values ends ({@link #takeInputsInRuns} leaves
     * such command lines to picocli anyway).
     */
    static final class Inputs implements IParameterConsumer {
        @Override
        public void consumeParameters(Stack<String> args, ArgSpec argSpec, CommandSpec commandSpec) {
            String a = args.peek();
            Path p;
            try {
                p = TrapmapCommand.path(a);
            } catch (CommandLine.TypeConversionException e) {
                throw new CommandLine.ParameterException(commandSpec.commandLine(), String.format(
                        "Invalid value for positional parameter at index %s (%s): %s",
                        ((PositionalParamSpec) argSpec).index(), argSpec.paramLabel(), e.getMessage()), e, argSpec, a);
            }
            List<Path> list = argSpec.getValue(); // once a run: picocli's getter reads the field by reflection
            if (list == null) {
                list = new ArrayList<>();
                argSpec.setValue(list);
            }
            while (true) {
                args.pop();
                list.add(p);
                if (args.isEmpty() || args.peek().startsWith("-")) {
                    return;
                }
                try {
                    p = TrapmapCommand.path(args.peek());
                } catch (CommandLine.TypeConversionException e) {
                    return; // as picocli, which stops taking values at one it cannot convert
                }
            }
        }
    }

    /**
     * The map files of the inputs: folders expand to their entries named .tif/.tiff/.csv, by name, whatever kind of
     * file they are (a folder, FIFO, device or dangling link among them becomes an error row of the batch, since the
     * reader refuses it from its attributes without opening it); left out are the output folder {@code outDir} and a
     * batch's own outputs ({@link BatchInspection#isOutputName}), so that {@code --out} may be the input folder or
     * lie inside it. A file named as an argument is always taken.
     *
     * @throws InputException when an input does not exist, or when nothing is left
     */
    static List<Path> files(List<Path> inputs, Path outDir) throws IOException {
        Path outAbs = outDir.toAbsolutePath().normalize();
        List<Path> files = new ArrayList<>();
        int outputs = 0;
        for (Path in : inputs) {
            // one lstat per input (a map named as an argument is no folder; a link is followed to see whether it is)
            BasicFileAttributes attributes;
            try {
                attributes = Files.readAttributes(in, BasicFileAttributes.class, LinkOption.NOFOLLOW_LINKS);
            } catch (IOException e) {
                throw new InputException("input " + in + " does not exist");
            }
            if (attributes.isDirectory() || attributes.isSymbolicLink() && Files.isDirectory(in)) {
                List<Path> maps = new ArrayList<>();
                try (Stream<Path> s = Files.list(in)) {
                    s.filter(InspectCommand::isMap).forEach(maps::add);
                }
                maps.sort((a, b) -> a.getFileName().toString().compareTo(b.getFileName().toString()));
                for (Path p : maps) {
                    if (p.toAbsolutePath().normalize().equals(outAbs)
                            || BatchInspection.isOutputName(p.getFileName().toString())) {
                        outputs++;
                    } else {
                        files.add(p);
                    }
                }
            } else {
                files.add(in);
            }
        }
        if (files.isEmpty()) {
            throw new InputException("no map files (.tif, .tiff, .csv) in " + inputs + (outputs == 0 ? ""
                    : ": the " + outputs + " found " + (outputs == 1 ? "is" : "are") + " trapmap's own outputs ("
                    + BatchInspection.CSV_NAME + ", " + BatchInspection.REGIONS_NAME + ", "
                    + BatchInspection.RECURRENCE_PREFIX + "*.tif, ...) or the --out folder " + outDir
                    + ", which are never inspected"));
        }
        return files;
    }

    private static boolean isMap(Path p) {
        String n = p.getFileName().toString().toLowerCase(Locale.ROOT);
        return n.endsWith(".tif") || n.endsWith(".tiff") || n.endsWith(".csv");
    }

    private static ProgressListener bar(PrintWriter err) {
        long start = System.nanoTime();
        return (done, total, message) -> {
            int width = 30;
            int filled = total == 0 ? width : (int) (width * done / total);
            double seconds = (System.nanoTime() - start) / 1e9;
            err.printf(Locale.ROOT, "\r[%s%s] %d/%d  %.1f maps/s ", "#".repeat(filled), " ".repeat(width - filled),
                    done, total, seconds > 0 ? done / seconds : 0.0);
            err.flush();
        };
    }

    private static ProgressListener lines(PrintWriter err) {
        return (done, total, message) -> {
            err.println("inspect: " + done + "/" + total + " " + message);
            err.flush();
        };
    }
}
