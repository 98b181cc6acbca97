package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.util.ArrayList;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.MethodSource;
import picocli.CommandLine;

/**
 * {@link TrapmapCommand#run} builds the full model only of the commands named on its command line; what it prints
 * and returns must be exactly what the full model of every command gives.
 */
class LazyCommandLineTest {

    /** Exit code, standard output and standard error of one run. */
    private record Outcome(int code, String out, String err) {
    }

    private static Outcome lazy(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = TrapmapCommand.run(new PrintWriter(out), new PrintWriter(err), args);
        return new Outcome(code, out.toString(), err.toString());
    }

    private static Outcome full(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        PrintWriter o = new PrintWriter(out);
        PrintWriter e = new PrintWriter(err);
        int code = TrapmapCommand.commandLine(o, e).execute(args);
        o.flush();
        e.flush();
        return new Outcome(code, out.toString(), err.toString());
    }

    static Stream<String> commandLines() {
        List<String> lines = new ArrayList<>(List.of("--help", "-h", "--version", "-V", "--no-such-option",
                "convrt", "conver --help", "stats --no-such-option", "calc --help", "calc iron --help",
                "calc bo --help", "calc pl --help", "calc --lifetime-us 50 --doping p:1e16 --injection 1e14",
                "iron --help", "--help convert"));
        for (Class<?> type : TrapmapCommand.SUBCOMMANDS) {
            String name = type.getAnnotation(CommandLine.Command.class).name();
            lines.add(name + " --help");
            lines.add(name + " --version");
        }
        return lines.stream();
    }

    @ParameterizedTest
    @MethodSource("commandLines")
    void printsAndReturnsWhatTheFullModelGives(String line) {
        String[] args = line.split(" ");
        Outcome expected = full(args);
        assertThat(lazy(args)).as(line).isEqualTo(expected);
        if (line.endsWith("--help") && !line.startsWith("conver ")) {
            assertThat(expected.code()).as(line).isZero();
            assertThat(expected.out()).as(line).contains("Usage: trapmap");
        }
    }

    @Test
    void rootHelpListsEveryCommandWithItsHeader() {
        Outcome help = lazy("--help");
        for (Class<?> type : TrapmapCommand.SUBCOMMANDS) {
            CommandLine.Command c = type.getAnnotation(CommandLine.Command.class);
            assertThat(help.out()).contains("  " + c.name() + " ").contains(c.header()[0].substring(0, 30));
        }
    }

    @Test
    void onlyTheNamedCommandsGetTheirFullModel() {
        PrintWriter sink = new PrintWriter(new StringWriter());
        CommandLine help = TrapmapCommand.commandLine(sink, sink, "--help");
        assertThat(help.getSubcommands().keySet()).containsExactlyElementsOf(TrapmapCommand.SUBCOMMANDS.stream()
                .map(t -> t.getAnnotation(CommandLine.Command.class).name()).toList());
        assertThat(help.getSubcommands().values()).allSatisfy(sub ->
                assertThat(sub.getCommandSpec().options()).isEmpty());

        CommandLine convert = TrapmapCommand.commandLine(sink, sink, "convert", "a.tif", "-o", "b.tif");
        Object command = convert.getSubcommands().get("convert").getCommand();
        assertThat(command).isInstanceOf(ConvertCommand.class);
        Object defect = convert.getSubcommands().get("convert").getCommandSpec().findOption("--defect");
        assertThat(defect).isNotNull();
        assertThat(convert.getSubcommands().get("stats").getCommandSpec().options()).isEmpty();
    }

    @Test
    void anArgumentFileMayNameAnyCommandSoAllAreBuilt() {
        PrintWriter sink = new PrintWriter(new StringWriter());
        CommandLine atFile = TrapmapCommand.commandLine(sink, sink, "@args.txt");
        assertThat(atFile.getSubcommands().values()).allSatisfy(sub ->
                assertThat(sub.getCommandSpec().options()).isNotEmpty());
    }
}
