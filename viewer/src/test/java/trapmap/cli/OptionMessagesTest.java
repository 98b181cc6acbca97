package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;
import picocli.CommandLine.Model.OptionSpec;

/**
 * Every numeric option of every command answers a bad value with one line naming the option, what it expects and
 * its unit; every required option says what it expects; a folder given as a map is refused as a folder.
 */
class OptionMessagesTest {
    @TempDir
    Path dir;

    private static Map<List<String>, CommandLine> commands() {
        Map<List<String>, CommandLine> all = new LinkedHashMap<>();
        walk(TrapmapCommand.commandLine(new PrintWriter(new StringWriter()), new PrintWriter(new StringWriter())),
                List.of(), all);
        return all;
    }

    private static void walk(CommandLine cl, List<String> path, Map<List<String>, CommandLine> into) {
        into.put(path, cl);
        cl.getSubcommands().forEach((name, sub) -> {
            if (name.equals(sub.getCommandName())) {
                List<String> p = new ArrayList<>(path);
                p.add(name);
                walk(sub, p, into);
            }
        });
    }

    @Test
    void everyNumericOptionNamesItselfAndItsUnitOnABadValue() {
        int checked = 0;
        for (Map.Entry<List<String>, CommandLine> c : commands().entrySet()) {
            String command = c.getValue().getCommandSpec().qualifiedName();
            for (OptionSpec o : c.getValue().getCommandSpec().options()) {
                if (!ErrorHandler.numeric(o.type())) {
                    continue;
                }
                for (String bad : List.of("20us", "NaN", "0x10", "1e999")) {
                    List<String> args = new ArrayList<>(c.getKey());
                    args.add(o.longestName());
                    args.add(bad);
                    Cli.Run r = Cli.run(args.toArray(String[]::new));
                    String what = String.join(" ", args);
                    assertThat(r.code()).as(what).isEqualTo(Exit.INVALID_INPUT);
                    assertThat(r.errLines()).as(what).hasSize(1);
                    String line = r.errLines().get(0);
                    assertThat(line).as(what).startsWith(command + ": " + o.longestName())
                            .contains(bad).doesNotContain("is not a double").doesNotContain("is not an int")
                            .doesNotContain("Invalid value");
                    assertThat(Flags.knows(command, o.longestName()) || o.converters().length > 0)
                            .as(o.longestName() + " of " + command + " has an expectation or a unit converter")
                            .isTrue();
                    if (o.converters().length == 0) {
                        assertThat(line).as(what).endsWith("expected " + Flags.expected(command, o.longestName()));
                    }
                }
                checked++;
            }
        }
        assertThat(checked).as("numeric options found").isGreaterThan(30);
    }

    @Test
    void unitsAreNamed() {
        assertThat(Cli.run("stats", "x.tif", "--edge-exclusion-mm", "2mm").errLines())
                .containsExactly("trapmap stats: --edge-exclusion-mm: '2mm' is not a number; expected a width in mm");
        assertThat(Cli.run("convert", "x.tif", "--page", "1.5").errLines())
                .containsExactly("trapmap convert: --page: '1.5' is not a whole number; expected a page number of"
                        + " the TIFF, from 1");
        assertThat(Cli.run("calc", "--thickness-um", "20us").errLines().get(0))
                .startsWith("trapmap calc: --thickness-um").contains("µm").contains("20us");
    }

    @Test
    void everyRequiredOptionSaysWhatItExpects() {
        int checked = 0;
        for (Map.Entry<List<String>, CommandLine> c : commands().entrySet()) {
            String command = c.getValue().getCommandSpec().qualifiedName();
            for (OptionSpec o : c.getValue().getCommandSpec().options()) {
                if (o.required()) {
                    assertThat(Flags.knows(command, o.longestName())).as(o.longestName() + " of " + command).isTrue();
                    checked++;
                }
            }
        }
        assertThat(checked).isGreaterThan(10);
        assertThat(Cli.run("convert", "x.tif", "--defect", "fe-i").errLines())
                .containsExactly("trapmap convert: --output is required: the output file (.tif, .csv or .png)");
        assertThat(Cli.run("report", "x.tif", "--rules", "r.json").errLines())
                .containsExactly("trapmap report: --out is required: the report to write (.pdf)");
        assertThat(Cli.run("inspect", "x.tif", "--out", "o").errLines())
                .containsExactly("trapmap inspect: --rules is required: a rules file (.json)");
    }

    @Test
    void aFolderGivenAsAMapIsRefusedAsAFolder() throws Exception {
        Path folder = Files.createDirectories(dir.resolve("map.tif"));
        Path rules = dir.resolve("rules.json");
        Files.writeString(rules, ViewerLaunch.exampleRules());
        String f = folder.toString();
        List<List<String>> runs = List.of(
                List.of("convert", f, "-o", dir.resolve("o.csv").toString(), "--defect", "fe-i", "--doping", "p:1e16",
                        "--injection", "1e14"),
                List.of("stats", f),
                List.of("compare", f, f),
                List.of("iron", f, f, "--doping", "p:1e16", "--injection", "1e14", "-o",
                        dir.resolve("fe.csv").toString()),
                List.of("report", f, "--rules", rules.toString(), "-o", dir.resolve("r.pdf").toString()));
        for (List<String> args : runs) {
            Cli.Run r = Cli.run(args.toArray(String[]::new));
            assertThat(r.code()).as(String.join(" ", args)).isEqualTo(Exit.INVALID_INPUT);
            assertThat(r.errLines()).as(String.join(" ", args)).hasSize(1);
            assertThat(r.err()).as(String.join(" ", args)).contains(f).contains("is a directory, not a regular file");
        }
    }

    @org.junit.jupiter.api.Test
    void aRefusedWholeNumberIsShownAsTypedWithoutADecimalPoint() {
        String map = Path.of("..", "demo-data", "LOT-A01-W01.tif").toString();
        String other = Path.of("..", "demo-data", "LOT-A01-W02.tif").toString();
        Map<String[], String> cases = new LinkedHashMap<>();
        cases.put(new String[] {"stats", map, "--edge-exclusion-mm", "-2"},
                "trapmap stats: --edge-exclusion-mm must be in [0, 50] mm (got -2)");
        cases.put(new String[] {"stats", map, "--threshold", "50", "--min-area-mm2", "-3"},
                "trapmap stats: --min-area-mm2 must be >= 0 mm² (got -3)");
        cases.put(new String[] {"compare", map, other, "--tolerance", "2"},
                "trapmap compare: --tolerance must be a fraction in [0, 1] (got 2)");
        cases.put(new String[] {"compare", map, other, "--max-rotation-deg", "90"},
                "trapmap compare: --max-rotation-deg must be in [0, 45] degrees (got 90)");
        cases.put(new String[] {"iron", map, other, "--max-rotation-deg", "-1"},
                "trapmap iron: --max-rotation-deg must be in [0, 45] degrees (got -1)");
        cases.forEach((args, expected) -> {
            Cli.Run r = Cli.run(args);
            assertThat(r.code()).as(expected).isEqualTo(2);
            assertThat(r.errLines()).containsExactly(expected);
        });
    }
}
