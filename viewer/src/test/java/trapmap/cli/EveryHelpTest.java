package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.TreeSet;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import picocli.CommandLine;

/**
 * The {@code --help} of every command and subcommand prints without picocli warnings (descriptions are format
 * strings: a lone {@code %} makes picocli warn on stderr) and ends with the exit codes that command can return.
 */
class EveryHelpTest {
    /** The exit codes each command can return (see the {@code Exit.…} returns and the ErrorHandler). */
    private static final Map<String, Set<Integer>> CODES = Map.ofEntries(
            Map.entry("trapmap", Set.of(0, 2, 3, 4, 5)),
            Map.entry("trapmap calc", Set.of(0, 1, 2, 3)),
            Map.entry("trapmap calc iron", Set.of(0, 2, 3)),
            Map.entry("trapmap calc bo", Set.of(0, 2, 3)),
            Map.entry("trapmap calc pl", Set.of(0, 2, 3)),
            Map.entry("trapmap defects", Set.of(0, 2, 3)),
            Map.entry("trapmap convert", Set.of(0, 2, 3, 5)),
            Map.entry("trapmap stats", Set.of(0, 2, 3)),
            Map.entry("trapmap compare", Set.of(0, 2, 3, 5)),
            Map.entry("trapmap iron", Set.of(0, 2, 3, 5)),
            Map.entry("trapmap identify", Set.of(0, 2, 3)),
            Map.entry("trapmap inspect", Set.of(0, 1, 2, 3, 4, 5)),
            Map.entry("trapmap watch", Set.of(0, 2, 3, 4)),
            Map.entry("trapmap report", Set.of(0, 1, 2, 3, 5)),
            Map.entry("trapmap trend", Set.of(0, 1, 2, 3, 5)),
            Map.entry("trapmap recurrence", Set.of(0, 2, 3, 4, 5)),
            Map.entry("trapmap demo", Set.of(0, 2, 3)),
            Map.entry("trapmap view", Set.of(0, 2)));

    private static final Pattern CODE = Pattern.compile("(?:^|[;:] )(\\d) ");

    /** Every command path below {@code cl}, e.g. {@code [calc, iron]}. */
    private static void walk(CommandLine cl, List<String> path, Map<String, List<String>> into) {
        into.put(cl.getCommandSpec().qualifiedName(), path);
        for (Map.Entry<String, CommandLine> e : new LinkedHashMap<>(cl.getSubcommands()).entrySet()) {
            if (!e.getKey().equals(e.getValue().getCommandName())) {
                continue; // an alias
            }
            List<String> sub = new ArrayList<>(path);
            sub.add(e.getKey());
            walk(e.getValue(), sub, into);
        }
    }

    @Test
    void everyHelpPrintsWithoutWarningsAndListsItsOwnExitCodes() {
        Map<String, List<String>> commands = new LinkedHashMap<>();
        walk(TrapmapCommand.commandLine(new PrintWriter(new StringWriter()), new PrintWriter(new StringWriter())),
                List.of(), commands);
        assertThat(commands.keySet()).as("every command has its exit codes listed here")
                .containsExactlyInAnyOrderElementsOf(CODES.keySet());
        for (Map.Entry<String, List<String>> c : commands.entrySet()) {
            String name = c.getKey();
            List<String> args = new ArrayList<>(c.getValue());
            args.add("--help");
            PrintStream saved = System.err;
            ByteArrayOutputStream traced = new ByteArrayOutputStream();
            Cli.Run r;
            try {
                // picocli's tracer writes its warnings to System.err as it is when it warns
                System.setErr(new PrintStream(traced, true, StandardCharsets.UTF_8));
                r = Cli.run(args.toArray(String[]::new));
            } finally {
                System.setErr(saved);
            }
            String warnings = traced.toString(StandardCharsets.UTF_8);
            assertThat(r.code()).as(name + " --help").isZero();
            assertThat(warnings).as("picocli warnings of " + name + " --help").isEmpty();
            assertThat(r.err()).as(name + " --help stderr").isEmpty();

            String help = r.out().replaceAll("\\s+", " ");
            int at = help.lastIndexOf("Exit codes");
            assertThat(at).as(name + " --help lists its exit codes").isNotNegative();
            String footer = help.substring(at);
            Set<Integer> listed = new TreeSet<>();
            Matcher m = CODE.matcher(footer.substring("Exit codes".length()));
            while (m.find()) {
                listed.add(Integer.parseInt(m.group(1)));
            }
            assertThat(listed).as(name + " exit codes in: " + footer).isEqualTo(new TreeSet<>(CODES.get(name)));
            if (!name.equals("trapmap calc")) {
                assertThat(footer).as(name + " footer").doesNotContainIgnoringCase("cases");
            }
            if (!name.equals("trapmap inspect")) {
                assertThat(footer).as(name + " footer").doesNotContain("inspect").doesNotContain("--resume");
            }
        }
    }
}
