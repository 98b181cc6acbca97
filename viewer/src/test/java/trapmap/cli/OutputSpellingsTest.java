package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;
import picocli.CommandLine.Model.OptionSpec;
import picocli.CommandLine.ParseResult;

/** Every command that writes an output takes it as {@code -o}, {@code --out} or {@code --output}, to one effect. */
class OutputSpellingsTest {
    private static final List<String> SPELLINGS = List.of("-o", "--out", "--output");
    private static final Path DEMO = Path.of("..", "demo-data");

    /** Each command with an output, and the other arguments it needs to be parsed. */
    private static final Map<String, List<String>> COMMANDS = Map.ofEntries(
            Map.entry("calc", List.of("--cases", "in.csv")),
            Map.entry("convert", List.of("m.tif")),
            Map.entry("compare", List.of("a.tif", "b.tif")),
            Map.entry("iron", List.of("a.tif", "b.tif")),
            Map.entry("identify", List.of("a.tif", "b.tif")),
            Map.entry("inspect", List.of("maps", "--rules", "r.json")),
            Map.entry("watch", List.of("maps", "--rules", "r.json")),
            Map.entry("report", List.of("m.tif", "--rules", "r.json")),
            Map.entry("trend", List.of("--store", "s.db", "--figure", "f")),
            Map.entry("recurrence", List.of("--store", "s.db")),
            Map.entry("demo", List.of()));

    @Test
    void everyCommandWithAnOutputTakesAllThreeSpellings() {
        CommandLine cl = TrapmapCommand.commandLine(new PrintWriter(new StringWriter()),
                new PrintWriter(new StringWriter()));
        Map<String, List<String>> withOutput = new TreeMap<>();
        cl.getSubcommands().forEach((name, sub) -> {
            for (OptionSpec o : options(sub)) {
                List<String> names = List.of(o.names());
                if (names.contains("--out") || names.contains("--output") || names.contains("-o")) {
                    withOutput.put(name, names.stream().sorted().toList());
                }
            }
        });
        assertThat(withOutput.keySet()).containsExactlyInAnyOrderElementsOf(COMMANDS.keySet());
        withOutput.forEach((name, names) ->
                assertThat(names).as(name).containsExactlyInAnyOrder("-o", "--out", "--output"));
    }

    @Test
    void helpShowsTheThreeSpellingsAlike() {
        for (String command : COMMANDS.keySet()) {
            Cli.Run r = Cli.run(command, "--help");
            assertThat(r.code()).as(command).isZero();
            assertThat(r.out()).as(command).containsPattern("-o, --out, --output[= ]<");
        }
    }

    @Test
    void everySpellingSetsTheSameOutput() {
        for (Map.Entry<String, List<String>> e : COMMANDS.entrySet()) {
            List<Object> values = new ArrayList<>();
            for (String spelling : SPELLINGS) {
                List<String> args = new ArrayList<>();
                args.add(e.getKey());
                args.addAll(e.getValue());
                args.add(spelling);
                args.add("target");
                CommandLine cl = TrapmapCommand.commandLine(new PrintWriter(new StringWriter()),
                        new PrintWriter(new StringWriter()));
                ParseResult sub = cl.parseArgs(args.toArray(String[]::new)).subcommand();
                values.add(sub.matchedOptionValue("--out", null));
                Object output = sub.matchedOptionValue("--output", null);
                Object o = sub.matchedOptionValue("-o", null);
                assertThat(output).isEqualTo(o);
            }
            assertThat(values).as(e.getKey()).containsOnly(Path.of("target"));
        }
    }

    @Test
    void calcWritesTheSameFileWhicheverSpelling(@TempDir Path dir) throws IOException {
        Path in = dir.resolve("in.csv");
        Files.writeString(in, "lifetime_us,doping,injection,defect\n12.5,p:1e16,1e14,fe-i\n40,n:5e15,1e14,midgap\n");
        List<byte[]> outputs = new ArrayList<>();
        for (String spelling : SPELLINGS) {
            Path out = dir.resolve("out" + spelling.replace("-", "") + ".csv");
            Cli.Run r = Cli.run("calc", "--cases", in.toString(), spelling, out.toString());
            assertThat(r.code()).as(spelling + ": " + r.err()).isZero();
            outputs.add(Files.readAllBytes(out));
        }
        assertThat(outputs.get(0)).isNotEmpty();
        assertThat(outputs.get(1)).isEqualTo(outputs.get(0));
        assertThat(outputs.get(2)).isEqualTo(outputs.get(0));
    }

    @Test
    void convertWritesTheSameMapWhicheverSpelling(@TempDir Path dir) throws IOException {
        Path map = DEMO.resolve("LOT-A01-W01.tif");
        List<byte[]> outputs = new ArrayList<>();
        for (String spelling : SPELLINGS) {
            Path out = dir.resolve("fe" + spelling.replace("-", "") + ".csv");
            Cli.Run r = Cli.run("convert", map.toString(), "--defect", "fe-i", spelling, out.toString());
            assertThat(r.code()).as(spelling + ": " + r.err()).isZero();
            outputs.add(Files.readAllBytes(out));
        }
        assertThat(outputs.get(0)).isNotEmpty();
        assertThat(outputs.get(1)).isEqualTo(outputs.get(0));
        assertThat(outputs.get(2)).isEqualTo(outputs.get(0));
    }

    @Test
    void demoWritesTheSameSetWhicheverSpelling(@TempDir Path dir) throws IOException {
        List<Map<String, String>> sets = new ArrayList<>();
        for (String spelling : SPELLINGS) {
            Path out = dir.resolve("set" + spelling.replace("-", ""));
            Cli.Run r = Cli.run("demo", spelling, out.toString());
            assertThat(r.code()).as(spelling + ": " + r.err()).isZero();
            sets.add(digests(out));
        }
        assertThat(sets.get(0)).isNotEmpty();
        assertThat(sets.get(1)).isEqualTo(sets.get(0));
        assertThat(sets.get(2)).isEqualTo(sets.get(0));
    }

    private static List<OptionSpec> options(CommandLine sub) {
        return sub.getCommandSpec().options();
    }

    private static Map<String, String> digests(Path root) throws IOException {
        Map<String, String> files = new TreeMap<>();
        try (Stream<Path> s = Files.walk(root)) {
            for (Path p : s.filter(Files::isRegularFile).toList()) {
                files.put(root.relativize(p).toString(), java.util.Arrays.toString(Files.readAllBytes(p)).hashCode()
                        + ":" + Files.size(p));
            }
        }
        return files;
    }
}
