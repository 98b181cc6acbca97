package trapmap.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collection;
import java.util.Collections;
import java.util.List;
import java.util.Objects;
import java.util.Optional;
import picocli.CommandLine;
import picocli.CommandLine.IExecutionExceptionHandler;
import picocli.CommandLine.IExecutionStrategy;
import picocli.CommandLine.IParameterExceptionHandler;
import picocli.CommandLine.Model.ArgGroupSpec;
import picocli.CommandLine.Model.ArgSpec;
import picocli.CommandLine.Model.OptionSpec;
import picocli.CommandLine.Model.PositionalParamSpec;
import picocli.CommandLine.MissingParameterException;
import picocli.CommandLine.ParameterException;
import picocli.CommandLine.ParseResult;
import picocli.CommandLine.RunLast;
import picocli.CommandLine.UnmatchedArgumentException;
import trapmap.maps.io.MapFormatException;
import trapmap.maps.io.MapMemory;
import trapmap.maps.io.Rendering;
import trapmap.shared.error.InvalidValueException;

/**
 * Turns every failure into exactly one line on stderr, {@code <command>: <message>}, that names the flag and what
 * it expects; never a stack trace, never the usage text. Invalid input exits with {@link Exit#INVALID_INPUT}. An
 * unexpected exception exits with {@link Exit#INTERNAL_ERROR}; its stack trace is printed only when the environment
 * variable {@code TRAPMAP_DEBUG} is set. Running out of memory exits with {@link Exit#INTERNAL_ERROR} and one line
 * naming the file, the memory it needs and the {@code -Xmx} to try.
 */
final class ErrorHandler implements IParameterExceptionHandler, IExecutionExceptionHandler, IExecutionStrategy {

    /**
     * Runs the command as picocli's {@link RunLast} does. An {@link OutOfMemoryError} (an Error, which picocli passes
     * through its exception handler) becomes one line naming the file being processed, its size, the memory it needs
     * and the heap option to try, with {@link Exit#INTERNAL_ERROR}.
     */
    @Override
    public int execute(ParseResult parseResult) {
        MapInput.processingDone(); // a file read by an earlier command line of this thread
        try {
            return new RunLast().execute(parseResult);
        } catch (OutOfMemoryError e) {
            ParseResult last = parseResult;
            while (last.hasSubcommand()) {
                last = last.subcommand();
            }
            return outOfMemory(last.commandSpec().commandLine(), last, e);
        } catch (Error e) {
            // a picture step that failed for want of a library, font or display, where no step caught it
            Optional<Rendering.Missing> m = Rendering.failure(e);
            if (m.isEmpty() || e instanceof VirtualMachineError) {
                throw e;
            }
            ParseResult last = parseResult;
            while (last.hasSubcommand()) {
                last = last.subcommand();
            }
            CommandLine cmd = last.commandSpec().commandLine();
            print(cmd, "a picture could not be made: " + m.get().text());
            if (System.getenv("TRAPMAP_DEBUG") != null) {
                e.printStackTrace(cmd.getErr());
            }
            return Exit.INTERNAL_ERROR;
        }
    }

    @Override
    public int handleParseException(ParameterException ex, String[] args) {
        CommandLine cmd = ex.getCommandLine();
        print(cmd, describe(ex));
        return Exit.INVALID_INPUT;
    }

    @Override
    public int handleExecutionException(Exception ex, CommandLine cmd, ParseResult parseResult) {
        for (Throwable t = ex; t != null; t = t.getCause()) {
            if (t instanceof OutOfMemoryError) {
                return outOfMemory(cmd, parseResult, ex);
            }
        }
        if (ex instanceof InputException) {
            print(cmd, ex.getMessage());
            return Exit.INVALID_INPUT;
        }
        if (ex instanceof InvalidValueException ive) {
            print(cmd, Flags.message(ive));
            return Exit.INVALID_INPUT;
        }
        if (ex instanceof MapFormatException) {
            print(cmd, ex.getMessage());
            return Exit.INVALID_INPUT;
        }
        if (ex instanceof Pictures.NotMade) {
            print(cmd, ex.getMessage());
            return Exit.REPORT_MISSING;
        }
        Optional<Rendering.Missing> missing = Rendering.failure(ex);
        if (missing.isPresent()) { // e.g. a HeadlessException where no step caught it
            print(cmd, "a picture could not be made: " + missing.get().text());
            return Exit.INTERNAL_ERROR;
        }
        if (ex instanceof MapInput.OutputException) {
            print(cmd, ex.getMessage());
            return Exit.INTERNAL_ERROR;
        }
        print(cmd, "internal error: " + ex + " (set TRAPMAP_DEBUG=1 for details)");
        if (System.getenv("TRAPMAP_DEBUG") != null) {
            ex.printStackTrace(cmd.getErr());
        }
        return Exit.INTERNAL_ERROR;
    }

    private static int outOfMemory(CommandLine cmd, ParseResult parseResult, Throwable error) {
        Path file = MapInput.processing();
        if (file == null) {
            file = firstPathArgument(parseResult);
        }
        String name = file == null ? "the input" : file.toString();
        long perPixel = cmd.getCommandName().equals("inspect") ? MapMemory.INSPECTION_BYTES_PER_PIXEL
                : cmd.getCommandName().equals("convert") && tiffOutput(parseResult)
                ? MapMemory.STREAMED_CONVERT_BYTES_PER_PIXEL : MapMemory.MAP_BYTES_PER_PIXEL;
        print(cmd, MapMemory.outOfMemory(name, file == null ? null : MapMemory.estimate(file), perPixel));
        if (System.getenv("TRAPMAP_DEBUG") != null) {
            error.printStackTrace(cmd.getErr());
        }
        return Exit.INTERNAL_ERROR;
    }

    /** True when the command that ran writes a TIFF file with {@code -o} (convert then streams its bands). */
    private static boolean tiffOutput(ParseResult parseResult) {
        if (parseResult == null) {
            return false;
        }
        ParseResult last = parseResult;
        while (last.hasSubcommand()) {
            last = last.subcommand();
        }
        Object o = last.matchedOptionValue("-o", null);
        return o instanceof Path p && trapmap.maps.io.MapFiles.formatOf(p) == trapmap.maps.io.MapFiles.Format.TIFF;
    }

    /** The first file among the positional arguments of the command that ran, or null. */
    private static Path firstPathArgument(ParseResult parseResult) {
        if (parseResult == null) {
            return null;
        }
        ParseResult last = parseResult;
        while (last.hasSubcommand()) {
            last = last.subcommand();
        }
        for (PositionalParamSpec p : last.matchedPositionals()) {
            Path path = firstPath(p.getValue());
            if (path != null) {
                return path;
            }
        }
        // map arguments taken in runs by InspectCommand.Inputs, which picocli does not list as matched
        for (PositionalParamSpec p : last.commandSpec().positionalParameters()) {
            Path path = p.parameterConsumer() instanceof InspectCommand.Inputs ? firstPath(p.getValue()) : null;
            if (path != null) {
                return path;
            }
        }
        return null;
    }

    private static Path firstPath(Object v) {
        if (v instanceof Path path) {
            return path;
        }
        if (v instanceof Collection<?> c && !c.isEmpty() && c.iterator().next() instanceof Path path) {
            return path;
        }
        if (v instanceof Path[] a && a.length > 0) {
            return a[0];
        }
        return null;
    }

    private static void print(CommandLine cmd, String message) {
        PrintWriter err = cmd.getErr();
        err.println(cmd.getCommandSpec().qualifiedName() + ": " + Flags.oneLine(message));
        err.flush();
    }

    /** One line for a parse failure, naming the flag and what it expects. */
    static String describe(ParameterException ex) {
        String flag = flagOf(ex.getArgSpec());
        Throwable cause = ex.getCause();
        if (flag != null && cause instanceof Quantity.BadValue) {
            return flag + " " + cause.getMessage();
        }
        if (flag != null && cause instanceof InvalidValueException ive) {
            return Flags.message(ive);
        }
        String command = ex.getCommandLine().getCommandSpec().qualifiedName();
        if (flag != null && ex.getValue() != null && !(cause instanceof Quantity.BadValue)
                && String.valueOf(ex.getMessage()).startsWith("Invalid value for option")
                && numeric(ex.getArgSpec().type())) {
            return flag + ": '" + Flags.oneLine(ex.getValue()) + "' is not a "
                    + (integral(ex.getArgSpec().type()) ? "whole number" : "number") + "; expected "
                    + Flags.expected(command, flag);
        }
        if (ex instanceof MissingParameterException mp) {
            List<String> missing = new ArrayList<>();
            if (mp.getMissing() != null) {
                mp.getMissing().forEach(a -> missing.add(flagOf(a)));
            }
            missing.removeIf(Objects::isNull);
            if (!missing.isEmpty() && String.valueOf(ex.getMessage()).startsWith("Missing required option")) {
                String f = missing.get(0);
                String also = missing.size() == 1 ? ""
                        : " (also missing: " + String.join(", ", missing.subList(1, missing.size())) + ")";
                return f + " is required: " + Flags.expected(command, f) + also;
            }
            if (String.valueOf(ex.getMessage()).contains("specify one of these")) {
                // an exclusive group none of whose options was given: one of them is needed
                for (ArgGroupSpec g : ex.getCommandLine().getCommandSpec().argGroups()) {
                    List<String> names = new ArrayList<>();
                    g.options().forEach(o -> names.add(Flags.name(o)));
                    if (g.exclusive() && names.size() > 1
                            && (names.contains(flag) || !Collections.disjoint(names, missing))) {
                        List<String> each = new ArrayList<>();
                        names.forEach(m -> each.add(m + ": " + Flags.expected(command, m)));
                        return String.join(" or ", names) + " is required (" + String.join("; ", each) + ")";
                    }
                }
            }
            String f = flag != null ? flag : missing.isEmpty() ? null : missing.get(0);
            if (f != null) {
                return f + " needs a value: " + Flags.expected(command, f);
            }
        }
        String help = " (see '" + ex.getCommandLine().getCommandSpec().qualifiedName() + " --help')";
        if (ex instanceof UnmatchedArgumentException u) {
            for (String a : u.getUnmatched()) {
                if (a.equals("--reference-injection") || a.startsWith("--reference-injection=")) {
                    return "--reference-injection applies only to convert --quantity lifetime-at-reference" + help;
                }
            }
            List<String> suggestions = u.getSuggestions();
            String first = Flags.oneLine(u.getMessage());
            return suggestions.isEmpty() ? first + help
                    : first + "; did you mean " + String.join(" or ", suggestions) + "?" + help;
        }
        return Flags.oneLine(ex.getMessage()) + help;
    }

    /** Whether options of {@code type} take a number. */
    static boolean numeric(Class<?> type) {
        return integral(type) || type == double.class || type == Double.class || type == float.class
                || type == Float.class;
    }

    private static boolean integral(Class<?> type) {
        return type == int.class || type == Integer.class || type == long.class || type == Long.class
                || type == short.class || type == Short.class;
    }

    private static String flagOf(ArgSpec arg) {
        return arg instanceof OptionSpec o ? Flags.name(o) : null;
    }
}
