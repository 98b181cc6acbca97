package trapmap.cli;

import java.io.OutputStreamWriter;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.List;
import java.util.concurrent.Callable;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Spec;

/**
 * The {@code trapmap} command line: the root command and the entry point of the application jar. Sub-commands:
 * {@code calc} (with {@code iron}, {@code bo}, {@code pl}), {@code defects}, {@code convert}, {@code stats}, {@code compare}, {@code inspect},
 * {@code demo} and {@code view}. Without a command it opens the viewer on the demonstration set, or, with no display,
 * runs the demonstration batch.
 *
 * <p>Building picocli's model of a command (reflection over its options, mixins and types) is most of the start-up
 * time of a short run, so {@link #run} builds the full model only for the commands named on its command line; every
 * other command is an outline with just its name, aliases, header and description, which is all the root help and
 * the "did you mean" suggestions read. {@link #commandLine(PrintWriter, PrintWriter)} builds every command.
 */
@Command(name = "trapmap", mixinStandardHelpOptions = true, version = TrapmapCommand.VERSION, usageHelpAutoWidth = true,
        description = {"Converts minority-carrier lifetimes of silicon wafers into equivalent SRH trap densities.",
            "Without a command: opens the viewer on the demonstration set (no display: runs the demonstration batch).",
            ""},
        footer = {"", "Run 'trapmap <command> --help' for the options of a command.", "", Help.EXIT_CODES_ROOT})
public final class TrapmapCommand implements Callable<Integer> {
    /** Version line printed by {@code --version}. */
    static final String VERSION = trapmap.shared.Version.LINE;
    /** The sub-commands, in the order of the root help. */
    static final List<Class<?>> SUBCOMMANDS = List.of(CalcCommand.class, DefectsCommand.class, ConvertCommand.class,
            StatsCommand.class, CompareCommand.class, IronMapCommand.class, IdentifyCommand.class, InspectCommand.class,
            WatchCommand.class, ReportCommand.class, TrendCommand.class, RecurrenceCommand.class, DemoCommand.class,
            ViewCommand.class);

    @Spec
    CommandSpec spec;

    /** No command: the viewer on the demonstration set, or the demonstration batch when there is no display. */
    @Override
    public Integer call() throws java.io.IOException {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        if (!ViewerLaunch.displayAvailable()) {
            return ViewerLaunch.demoBatch(out, err);
        }
        ViewerLaunch.open(java.util.List.of(ViewerLaunch.demoFolder(err)));
        return Exit.OK;
    }

    /**
     * A command line for {@code trapmap} that writes to {@code out} and {@code err}, with one-line errors, and the
     * full model of every sub-command.
     */
    public static CommandLine commandLine(PrintWriter out, PrintWriter err) {
        return commandLine(out, err, type -> true, null);
    }

    /**
     * The command line for running {@code args}: the full model of each sub-command whose name or alias is one of
     * the arguments (only those can be parsed into), an outline of the others. With an argument file ({@code @file},
     * expanded by picocli) any command may be named, so every one is built.
     */
    static CommandLine commandLine(PrintWriter out, PrintWriter err, String... args) {
        if (Arrays.stream(args).anyMatch(a -> a != null && a.startsWith("@"))) {
            return commandLine(out, err);
        }
        List<String> named = Arrays.asList(args);
        return commandLine(out, err, type -> {
            Command c = type.getAnnotation(Command.class);
            return named.contains(c.name()) || Arrays.stream(c.aliases()).anyMatch(named::contains);
        }, args);
    }

    private static CommandLine commandLine(PrintWriter out, PrintWriter err,
                                           java.util.function.Predicate<Class<?>> full, String[] args) {
        CommandLine cl = new CommandLine(new TrapmapCommand());
        for (Class<?> type : SUBCOMMANDS) {
            if (full.test(type)) {
                cl.addSubcommand(type);
                if (type == InspectCommand.class && args != null) {
                    InspectCommand.takeInputsInRuns(cl.getSubcommands().get("inspect").getCommandSpec(), args);
                }
                if (type == IdentifyCommand.class) { // each level has its own injection: refused, not offered
                    MapConditionOptions.hide(cl.getSubcommands().get("identify").getCommandSpec(), "--injection",
                            "--generation");
                }
            } else {
                CommandSpec outline = outline(type);
                cl.addSubcommand(outline.name(), outline);
            }
        }
        ErrorHandler errors = new ErrorHandler();
        cl.setOut(out);
        cl.setErr(err);
        cl.setParameterExceptionHandler(errors);
        cl.setExecutionExceptionHandler(errors);
        cl.setExecutionStrategy(errors);
        // numbers without a unit converter: plain decimal or scientific notation, finite (no NaN, no hexadecimal)
        cl.registerConverter(Double.class, Quantity::plainNumber);
        cl.registerConverter(double.class, Quantity::plainNumber);
        cl.registerConverter(java.nio.file.Path.class, TrapmapCommand::path);
        return cl;
    }

    /**
     * A path argument, as picocli's built-in conversion makes it ({@code Paths.get(text)}, through reflection) and
     * with its message when that fails, called directly: a batch names hundreds of files, each converted twice.
     */
    static java.nio.file.Path path(String text) {
        try {
            return java.nio.file.Path.of(text);
        } catch (RuntimeException e) {
            throw new CommandLine.TypeConversionException(String.format("cannot convert '%s' to %s (%s)", text,
                    java.nio.file.Path.class, e));
        }
    }

    /**
     * What the root help and picocli's suggestions read of a sub-command that is not run: name, aliases, header,
     * description and whether it is hidden, from its {@link Command} annotation (no reflection over its fields).
     */
    static CommandSpec outline(Class<?> type) {
        Command c = type.getAnnotation(Command.class);
        CommandSpec spec = CommandSpec.create().name(c.name()).aliases(c.aliases());
        spec.usageMessage().header(c.header()).description(c.description()).hidden(c.hidden());
        return spec;
    }

    /**
     * For {@code convert}, which opens a map and writes one with metadata: builds the JSON mapper on a background
     * (daemon) thread, so that this overlaps building and parsing the command line ({@link
     * trapmap.maps.io.Sidecar#prepare}), and starts the kernel's warm-up ({@link ConvertCommand#warmUpEarly}). For
     * {@code inspect}: builds the rules' JSON mapper on such a thread and reads the rules file given with
     * {@code --rules} once ahead, discarding the result ({@link trapmap.maps.batch.Rules#prepare(Path)}: the command
     * reads it itself, warm), then makes the digest of the input files' list and a run record once ahead ({@link
     * trapmap.maps.batch.RunManifest#prepare}: the run takes that digest when it names the same files). Nothing for
     * help, version or other commands.
     */
    static void prepare(String... args) {
        if (args.length < 2 || !(args[0].equals("convert") || args[0].equals("inspect"))) {
            return;
        }
        for (String a : args) {
            if (a.equals("-h") || a.equals("--help") || a.equals("-V") || a.equals("--version")) {
                return;
            }
        }
        if (args[0].equals("inspect")) { // the rules are read first, then each map's metadata
            java.nio.file.Path rules = rulesArgument(args);
            Thread t = new Thread(() -> {
                trapmap.maps.batch.Rules.prepare(rules);
                trapmap.maps.batch.RunManifest.prepare(inputArguments(args));
            }, "rules-mapper");
            t.setDaemon(true);
            t.start();
            return;
        }
        Thread t = new Thread(trapmap.maps.io.Sidecar::prepare, "metadata-mapper");
        t.setDaemon(true);
        t.start();
        ConvertCommand.warmUpEarly(args);
    }

    /** The options of {@code inspect} that take a value as the next argument. */
    private static final List<String> INSPECT_VALUED = List.of("--rules", "-o", "--out", "--output", "--threads", "--physics");

    /**
     * The files {@code inspect args} most likely names, for a head start only ({@link
     * trapmap.maps.batch.RunManifest#prepare}, which checks what it is given against what the command names): the
     * arguments after the command that are no option and no option's value; picocli parses the command line. Empty
     * with an argument file ({@code @file}) or an argument that is no path.
     */
    static List<java.nio.file.Path> inputArguments(String... args) {
        List<java.nio.file.Path> files = new java.util.ArrayList<>();
        boolean options = true;
        for (int i = 1; i < args.length; i++) {
            String a = args[i];
            if (a.startsWith("@")) {
                return List.of();
            }
            if (options && INSPECT_VALUED.contains(a)) {
                i++;
            } else if (options && a.equals("--")) {
                options = false;
            } else if (!options || !a.startsWith("-")) {
                try {
                    files.add(java.nio.file.Path.of(a));
                } catch (java.nio.file.InvalidPathException e) {
                    return List.of();
                }
            }
        }
        return files;
    }

    /**
     * The file named by {@code --rules FILE} or {@code --rules=FILE} among {@code args} (the first), for a head start
     * only: picocli parses the command line; null when there is none or it is no path.
     */
    static java.nio.file.Path rulesArgument(String... args) {
        for (int i = 1; i < args.length; i++) {
            String value = args[i].equals("--rules") && i + 1 < args.length ? args[i + 1]
                    : args[i].startsWith("--rules=") ? args[i].substring("--rules=".length()) : null;
            if (value != null) {
                try {
                    return java.nio.file.Path.of(value);
                } catch (java.nio.file.InvalidPathException e) {
                    return null;
                }
            }
        }
        return null;
    }

    /**
     * Every command but the viewer's ({@code view}, or no command) runs Java headless unless told otherwise: its
     * pictures and PDFs need no display, and a {@code DISPLAY} that does not answer would make them fail.
     */
    static void headless(String... args) {
        if (args.length > 0 && !args[0].equals("view")) {
            trapmap.maps.io.Rendering.headlessUnlessSet();
        }
    }

    /** Runs {@code trapmap args} and returns the exit code. */
    public static int run(PrintWriter out, PrintWriter err, String... args) {
        int code = commandLine(out, err, args).execute(args);
        out.flush();
        err.flush();
        return code;
    }

    public static void main(String[] args) {
        if (QuickHelp.print(args, System.out)) { // the root help or the version, as picocli prints it
            System.exit(Exit.OK);
        }
        headless(args);
        prepare(args);
        PrintWriter out = new PrintWriter(new OutputStreamWriter(System.out, StandardCharsets.UTF_8), true);
        PrintWriter err = new PrintWriter(new OutputStreamWriter(System.err, StandardCharsets.UTF_8), true);
        System.exit(run(out, err, args));
    }
}
