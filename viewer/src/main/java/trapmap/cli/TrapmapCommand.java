package trapmap.cli;

import java.io.OutputStreamWriter;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.util.concurrent.Callable;
import picocli.CommandLine;
import picocli.CommandLine.Command;

/**
 * The {@code trapmap} command line: the root command and the entry point of the application jar. Sub-commands:
 * {@code calc} (with {@code iron}, {@code bo}, {@code pl}), {@code defects}, {@code convert}, {@code stats}, {@code compare}, {@code inspect} and {@code demo}.
 */
@Command(name = "trapmap", mixinStandardHelpOptions = true, version = TrapmapCommand.VERSION, usageHelpAutoWidth = true,
        subcommands = {CalcCommand.class, DefectsCommand.class, ConvertCommand.class, StatsCommand.class, CompareCommand.class,
            InspectCommand.class, DemoCommand.class},
        description = {"Converts minority-carrier lifetimes of silicon wafers into equivalent SRH trap densities.",
            ""},
        footer = {"", "Run 'trapmap <command> --help' for the options of a command.", "", Help.EXIT_CODES})
public final class TrapmapCommand implements Callable<Integer> {
    /** Version line printed by {@code --version}. */
    static final String VERSION = "trapmap 0.1.0";

    @Override
    public Integer call() {
        throw new InputException("missing command: calc, convert, stats, compare, inspect, demo or defects (see 'trapmap --help')");
    }

    /** A command line for {@code trapmap} that writes to {@code out} and {@code err}, with one-line errors. */
    public static CommandLine commandLine(PrintWriter out, PrintWriter err) {
        CommandLine cl = new CommandLine(new TrapmapCommand());
        ErrorHandler errors = new ErrorHandler();
        cl.setOut(out);
        cl.setErr(err);
        cl.setParameterExceptionHandler(errors);
        cl.setExecutionExceptionHandler(errors);
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
