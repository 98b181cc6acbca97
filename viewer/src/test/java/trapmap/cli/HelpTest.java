package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import picocli.CommandLine;
import picocli.CommandLine.Model.OptionSpec;

/** Every option's help names its unit (when it has one) and its default. */
class HelpTest {
    private static final Set<String> STANDARD = Set.of("--help", "--version");
    private static final Set<String> UNITS = Set.of("µs", "µm", "K", "cm^-3", "cm^-3 s^-1", "cm/s", "counts");

    private static CommandLine command(String path) {
        CommandLine cl = TrapmapCommand.commandLine(new PrintWriter(new StringWriter()),
                new PrintWriter(new StringWriter()));
        for (String name : path.split(" ")) {
            Map<String, CommandLine> subs = cl.getSubcommands();
            cl = subs.get(name);
        }
        return cl;
    }

    @ParameterizedTest
    @ValueSource(strings = {"calc", "calc iron", "calc bo", "calc pl", "defects"})
    void everyOptionHasItsUnitAndDefault(String path) {
        CommandLine cl = command(path);
        List<String> args = new ArrayList<>(List.of(path.split(" ")));
        args.add("--help");
        Cli.Run r = Cli.run(args.toArray(String[]::new));
        assertThat(r.code()).isZero();
        String help = r.out().replaceAll("\\s+", " ");
        for (OptionSpec o : cl.getCommandSpec().options()) {
            String name = o.longestName();
            if (STANDARD.contains(name)) {
                continue;
            }
            assertThat(r.out()).as("help of " + path).contains(name);
            String description = String.join(" ", o.description());
            assertThat(description).as(name + " states its default").containsIgnoringCase("default");
            assertThat(help).as(name + " description is printed").contains(description.substring(0, 40)
                    .replaceAll("\\s+", " "));
            String label = o.paramLabel().replaceAll("[<>]", "");
            if (UNITS.contains(label)) {
                assertThat(description).as(name + " states its unit").contains(label);
            }
        }
    }

    @ParameterizedTest
    @ValueSource(strings = {"convert", "stats", "compare", "iron", "identify"})
    void mapConditionsDefaultToTheSidecarNotToARequiredValueOrAFixedOne(String name) {
        CommandLine cl = command(name);
        for (String option : new String[] {"--doping", "--temperature", "--thickness-um"}) {
            String text = String.join(" ", cl.getCommandSpec().findOption(option).description());
            assertThat(text).as(name + " " + option).contains("Default: the sidecar's").doesNotContain("required");
        }
    }

    /**
     * The text between the usage lines and the options (the description) is wrapped by picocli at the help's width: no
     * line ends where the next line's first word would still have fitted on it (as text broken by hand for a wider
     * screen would), within a paragraph.
     */
    @ParameterizedTest
    @ValueSource(strings = {"convert", "stats", "compare", "iron", "defects", "demo", "view"})
    void theDescriptionIsWrappedAtTheHelpsWidthNotBrokenByHand(String name) {
        String help = Cli.run(name, "--help").out();
        List<String> lines = List.of(help.split("\\R"));
        int i = 0;
        while (!lines.get(i).startsWith("Usage:")) {
            i++;
        }
        i++;
        while (lines.get(i).startsWith(" ")) { // the rest of the usage synopsis
            i++;
        }
        int width = 80;
        for (; i + 1 < lines.size() && !lines.get(i + 1).startsWith(" "); i++) {
            String line = lines.get(i);
            String next = lines.get(i + 1);
            if (line.isBlank() || next.isBlank()) {
                continue;
            }
            String firstWord = next.split(" ")[0];
            assertThat(line.length() + 1 + firstWord.length()).as(name + ": '" + line + "' then '" + next + "'")
                    .isGreaterThanOrEqualTo(width); // picocli keeps a line below the width
        }
    }

    @ParameterizedTest
    @ValueSource(strings = {"convert", "stats"})
    void thePageOptionSaysWhereCountingStartsAndItsDefault(String name) {
        String text = String.join(" ", command(name).getCommandSpec().findOption("--page").description());
        assertThat(text).contains("from 1").contains("Default: 1.");
    }

    /** identify reads each level's injection from its sidecar: its help offers no --injection or --generation. */
    @org.junit.jupiter.api.Test
    void identifyOffersNoInjectionOrGeneration() {
        Cli.Run help = Cli.run("identify", "--help");
        assertThat(help.code()).isZero();
        assertThat(help.out()).contains("--doping=").contains("there is no --injection or --generation")
                .doesNotContain("--injection=").doesNotContain("--generation=");
        Cli.Run refused = Cli.run("identify", "a.tif", "b.tif", "-o", "x.tif", "--generation", "1e19");
        assertThat(refused.code()).isEqualTo(2);
        assertThat(refused.errLines()).hasSize(1);
        assertThat(refused.err()).contains("--generation would give every level the same value");
    }
}
