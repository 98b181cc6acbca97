package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;

/**
 * {@code inspect} takes its map arguments in runs ({@link InspectCommand.Inputs}) instead of picocli's value by value:
 * the same list, in the same order, and the same messages as picocli's own parsing of the same declaration
 * ({@code new CommandLine(new InspectCommand())}, which leaves them to picocli) on every kind of command line.
 */
class InspectInputsTest {
    /** The command lines compared: options between, before and after the maps, {@code --}, dashes, numbers. */
    private static final List<List<String>> LINES = List.of(
            List.of("a.tif", "b.tif", "--rules", "r.json", "--out", "o"),
            List.of("--rules", "r.json", "a.tif", "--out", "o", "b.tif", "c.csv", "--threads", "2", "d.tiff"),
            List.of("--rules=r.json", "--out=o", "dir", "x y.tif", "--no-pdf", "z.tif"),
            List.of("--rules", "r.json", "--out", "o", "a.tif", "--", "-b.tif", "--c.tif", "d.tif", "-e.tif"),
            List.of("a.tif", "-", "-5", "-1.5e3", "b.tif", "--rules", "r.json", "--out", "o"),
            List.of("a.tif", "-x.tif", "--rules", "r.json", "--out", "o"),
            List.of("a.tif", "--rulez", "r.json", "--out", "o"),
            List.of("--rules", "r.json", "--out", "o"),
            List.of("a.tif", "--rules", "r.json", "--out", "o", "--help"),
            List.of("./a/../b.tif", "a//b.tif", "", "--rules", "r.json", "--out", "o"),
            List.of("a.tif", "b.tif", "c", "--rules", "r.json", "--out", "o"));

    @Test
    void theMapArgumentsAndMessagesAreThoseOfPicocliItself() {
        for (List<String> line : LINES) {
            String[] args = line.toArray(String[]::new);
            Parsed runs = parse(true, args);
            Parsed picocli = parse(false, args);
            assertThat(runs.inputs).as("%s", line).isEqualTo(picocli.inputs);
            assertThat(runs.error).as("%s", line).isEqualTo(picocli.error);
        }
        assertThat(parse(true, LINES.get(1).toArray(String[]::new)).inputs).containsExactly(Path.of("a.tif"),
                Path.of("b.tif"), Path.of("c.csv"), Path.of("d.tiff"));
        assertThat(parse(true, LINES.get(3).toArray(String[]::new)).inputs).containsExactly(Path.of("a.tif"),
                Path.of("-b.tif"), Path.of("--c.tif"), Path.of("d.tif"), Path.of("-e.tif"));
    }

    @Test
    void aMapArgumentThatIsNoPathFailsAsInPicocli() {
        String[] args = {"a\0b.tif", "--rules", "r.json", "--out", "o"};
        InspectCommand command = new InspectCommand();
        CommandLine cl = new CommandLine(command);
        cl.getCommandSpec().addPositional(CommandLine.Model.PositionalParamSpec.builder(
                cl.getCommandSpec().positionalParameters().get(0)).parameterConsumer(new InspectCommand.Inputs())
                .build()); // the consumer alone, without the check of takeInputsInRuns
        cl.getCommandSpec().remove(cl.getCommandSpec().positionalParameters().get(0));
        cl.registerConverter(Path.class, TrapmapCommand::path);
        String runs = null;
        try {
            cl.parseArgs(args);
        } catch (CommandLine.ParameterException e) {
            runs = e.getMessage();
        }
        assertThat(runs).startsWith("Invalid value for positional parameter at index 0..* (FOLDER|FILES): cannot"
                + " convert").isEqualTo(parse(false, args).error);
    }

    @Test
    void theProgramTakesTheMapsInRunsOnlyWhereEveryArgumentIsAPath() {
        assertThat(consumer("inspect", "a.tif", "--out", "o")).isInstanceOf(InspectCommand.Inputs.class);
        assertThat(consumer("inspect", "a.tif", "b\0.tif", "--out", "o")).isNull();
        assertThat(consumer("inspect", "@args.txt")).isNull(); // all commands built: picocli reads the file
    }

    private static CommandLine.IParameterConsumer consumer(String... args) {
        CommandLine cl = TrapmapCommand.commandLine(new PrintWriter(new StringWriter()),
                new PrintWriter(new StringWriter()), args);
        CommandLine.Model.CommandSpec inspect = cl.getSubcommands().get("inspect").getCommandSpec();
        assertThat(inspect.positionalParameters()).hasSize(1);
        assertThat(inspect.positionalParameters().get(0).paramLabel()).isEqualTo(InspectCommand.INPUTS_LABEL);
        return inspect.positionalParameters().get(0).parameterConsumer();
    }

    @Test
    void aWholeBatchOfArgumentsIsOneList(@TempDir Path dir) {
        List<String> args = new ArrayList<>();
        for (int i = 0; i < 600; i++) {
            args.add(dir.resolve(String.format("W-%04d.tif", i)).toString());
        }
        args.addAll(List.of("--rules", "r.json", "--out", "o", "--threads", "1"));
        Parsed runs = parse(true, args.toArray(String[]::new));
        assertThat(runs.error).isNull();
        assertThat(runs.inputs).hasSize(600).isEqualTo(parse(false, args.toArray(String[]::new)).inputs);
    }

    @Test
    void aFolderALinkToOneAndMissingInputsAreToldApartWithOneLookEach(@TempDir Path dir) throws Exception {
        Path maps = Files.createDirectory(dir.resolve("maps"));
        Files.writeString(maps.resolve("b.tif"), "");
        Files.writeString(maps.resolve("a.csv"), "");
        Path file = Files.writeString(dir.resolve("one.tif"), "");
        Path link = Files.createSymbolicLink(dir.resolve("maps-link"), maps);
        Path dangling = Files.createSymbolicLink(dir.resolve("gone.tif"), dir.resolve("nothing.tif"));
        assertThat(InspectCommand.files(List.of(file, maps, link, dangling), dir.resolve("out"))).containsExactly(file,
                maps.resolve("a.csv"), maps.resolve("b.tif"), link.resolve("a.csv"), link.resolve("b.tif"), dangling);
        Path missing = dir.resolve("missing.tif");
        org.assertj.core.api.Assertions.assertThatThrownBy(() -> InspectCommand.files(List.of(file, missing),
                dir.resolve("out"))).isInstanceOf(InputException.class)
                .hasMessage("input " + missing + " does not exist");
    }

    private record Parsed(List<Path> inputs, String error) {
    }

    /** {@code inspect args} parsed as the program does ({@code runs}) or by picocli alone. */
    private static Parsed parse(boolean runs, String... args) {
        InspectCommand command = new InspectCommand();
        CommandLine cl = new CommandLine(command);
        if (runs) {
            cl.registerConverter(Path.class, TrapmapCommand::path);
            InspectCommand.takeInputsInRuns(cl.getCommandSpec(), args);
            assertThat(cl.getCommandSpec().positionalParameters().get(0).parameterConsumer()).isNotNull();
        }
        try {
            cl.parseArgs(args);
            return new Parsed(command.inputs, null);
        } catch (CommandLine.ParameterException e) {
            return new Parsed(command.inputs, e.getMessage());
        }
    }
}
