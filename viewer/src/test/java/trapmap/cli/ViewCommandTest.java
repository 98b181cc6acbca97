package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.awt.GraphicsEnvironment;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Comparator;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** {@code trapmap} without a command and {@code trapmap view} on a machine without a display. */
class ViewCommandTest {
    private static void headlessOnly() {
        Assumptions.assumeTrue(GraphicsEnvironment.isHeadless(),
                "a display is available here, so the viewer would open instead");
    }

    @Test
    void noCommandWithoutADisplayRunsTheDemonstrationBatch() throws Exception {
        headlessOnly();
        Cli.Run r = Cli.run();
        assertThat(r.code()).isZero();
        String[] lines = r.out().split("\\R");
        assertThat(lines[0]).startsWith("trapmap: no display available, so the viewer cannot open; running the"
                + " demonstration batch instead (trapmap inspect ").contains("rules-example.json");
        Matcher m = Pattern.compile("report: (\\S+summary\\.pdf)").matcher(r.out());
        assertThat(m.find()).as(r.out()).isTrue();
        Path csv = Path.of(m.group(1)).resolveSibling("results.csv");
        try {
            assertThat(Path.of(m.group(1))).exists();
            assertThat(csv).exists();
            assertThat(Files.readAllLines(csv)).hasSize(1 + 17).first().asString().startsWith("file,wafer_id,status");
        } finally {
            try (Stream<Path> s = Files.walk(csv.getParent())) {
                s.sorted(Comparator.reverseOrder()).forEach(p -> p.toFile().delete());
            }
        }
    }

    @Test
    void viewWithoutADisplayIsOneLine() {
        headlessOnly();
        Cli.Run r = Cli.run("view", "../demo-data");
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.errLines()).singleElement().asString().startsWith("trapmap view: no display available");
    }

    @Test
    void viewOfAMissingFileNamesIt() {
        Cli.Run r = Cli.run("view", "no-such-wafer.tif");
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.errLines()).containsExactly("trapmap view: no-such-wafer.tif does not exist");
    }

    @Test
    void viewWithAnInvalidRulesFileNamesTheOptionAndTheFieldBeforeOpening(@TempDir Path dir) throws Exception {
        Path rules = dir.resolve("bad-rules.json");
        Files.writeString(rules, "{\"flag\": {\"quantity\": \"trap-density\", \"threshold\": 3e11}}");
        Cli.Run r = Cli.run("view", "--rules", rules.toString(), "../demo-data");
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.errLines()).singleElement().asString().startsWith("trapmap view: --rules ")
                .contains("bad-rules.json").contains("defect");
    }

    @Test
    void viewWithAStoreThatDoesNotExistNamesItAndMakesNone(@TempDir Path dir) {
        Path store = dir.resolve("no-such-store.db");
        Cli.Run r = Cli.run("view", "--store", store.toString());
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.errLines()).singleElement().asString().startsWith("trapmap view: --store: store ")
                .contains("no-such-store.db does not exist");
        assertThat(store).as("looking at a store never makes one").doesNotExist();
    }
}
