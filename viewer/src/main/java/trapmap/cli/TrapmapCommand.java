package trapmap.cli;

import java.io.OutputStreamWriter;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
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
 */
@Command(name = "trapmap", mixinStandardHelpOptions = true, version = TrapmapCommand.VERSION, usageHelpAutoWidth = true,
        subcommands = {CalcCommand.class, DefectsCommand.class, ConvertCommand.class, StatsCommand.class,
            CompareCommand.class, IronMapCommand.class, InspectCommand.class, ReportCommand.class, DemoCommand.class,
            ViewCommand.class},
        description = {"Converts minority-carrier lifetimes of silicon wafers into equivalent SRH trap densities.",
            "Without a command: opens the viewer on the demonstration set (no display: runs the demonstration batch).",
            ""},
        footer = {"", "Run 'trapmap <command> --help' for the options of a command.", "", Help.EXIT_CODES_ROOT})
public final class TrapmapCommand implements Callable<Integer> {
    /** Version line printed by {@code --version}. */
    static final String VERSION = trapmap.shared.Version.LINE;

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

    /** A command line for {@code trapmap} that writes to {@code out} and {@code err}, with one-line errors. */
    public static CommandLine commandLine(PrintWriter out, PrintWriter err) {
        CommandLine cl = new CommandLine(new TrapmapCommand());
        ErrorHandler errors = new ErrorHandler();
        cl.setOut(out);
        cl.setErr(err);
        cl.setParameterExceptionHandler(errors);
        cl.setExecutionExceptionHandler(errors);
        cl.setExecutionStrategy(errors);
        // numbers without a unit converter: plain decimal or scientific notation, finite (no NaN, no hexadecimal)
        cl.registerConverter(Double.class, Quantity::plainNumber);
        cl.registerConverter(double.class, Quantity::plainNumber);
        return cl;
    }

    /** Runs {@code trapmap args} and returns the exit code. */
    public static int run(PrintWriter out, PrintWriter err, String... args) {
        int code = commandLine(out, err).execute(args);
        out.flush();
        err.flush();
        return code;
    }

    public static void main(String[] args) {
        PrintWriter out = new PrintWriter(new OutputStreamWriter(System.out, StandardCharsets.UTF_8), true);
        PrintWriter err = new PrintWriter(new OutputStreamWriter(System.err, StandardCharsets.UTF_8), true);
        System.exit(run(out, err, args));
    }
}
