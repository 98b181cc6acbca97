package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.PrintStream;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * {@link QuickHelp} prints exactly what picocli prints for the root help and the version (byte for byte, the stored
 * root help against picocli's rendering of the current sources), and nothing for any other request. With {@code
 * -Dtrapmap.writeRootHelp=true} the first test writes the resource anew from picocli's rendering.
 */
class QuickHelpTest {
    private static final Path SOURCE = Path.of("src/main/resources/trapmap/cli", QuickHelp.ROOT_HELP);

    /** What {@code trapmap args} prints on standard output through picocli, and its exit code. */
    private static String picocli(int[] code, String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        code[0] = TrapmapCommand.run(new PrintWriter(out), new PrintWriter(err), args);
        assertThat(err.toString()).isEmpty();
        return out.toString();
    }

    private static String quick(String... args) {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        PrintStream out = new PrintStream(bytes, true, StandardCharsets.UTF_8);
        assertThat(QuickHelp.print(args, out)).as("printed for " + String.join(" ", args)).isTrue();
        return bytes.toString(StandardCharsets.UTF_8);
    }

    @Test
    void storedRootHelpIsPicocliRendering() throws IOException {
        assumeTrue(QuickHelp.plainOutput(), "this environment makes picocli print colours or another width");
        int[] code = new int[1];
        String live = picocli(code, "--help");
        assertThat(code[0]).isEqualTo(Exit.OK);
        if (Boolean.getBoolean("trapmap.writeRootHelp")) {
            Files.writeString(SOURCE, live, StandardCharsets.UTF_8);
        }
        String stored;
        try (InputStream in = QuickHelp.class.getResourceAsStream(QuickHelp.ROOT_HELP)) {
            assertThat(in).as("resource " + QuickHelp.ROOT_HELP).isNotNull();
            stored = new String(in.readAllBytes(), StandardCharsets.UTF_8);
        }
        assertThat(Files.readString(SOURCE, StandardCharsets.UTF_8))
                .as("%s differs from picocli's root help: run this test with -Dtrapmap.writeRootHelp=true", SOURCE)
                .isEqualTo(live);
        assertThat(stored).as("the built resource (rebuild)").isEqualTo(live);
    }

    @ParameterizedTest
    @ValueSource(strings = {"--help", "-h", "--version", "-V"})
    void printsWhatPicocliPrints(String arg) {
        assumeTrue(QuickHelp.plainOutput(), "this environment makes picocli print colours or another width");
        int[] code = new int[1];
        String live = picocli(code, arg);
        assertThat(code[0]).isEqualTo(Exit.OK);
        assertThat(quick(arg)).isEqualTo(live);
    }

    @ParameterizedTest
    @ValueSource(strings = {"convert --help", "--help convert", "-hV", "--help --version", "help", "--helpx", "stats",
        "convert -h", "-V -V"})
    void leavesEveryOtherRequestToPicocli(String line) {
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        assertThat(QuickHelp.print(line.split(" "), new PrintStream(bytes))).isFalse();
        assertThat(QuickHelp.print(new String[0], new PrintStream(bytes))).isFalse();
        assertThat(bytes.size()).isZero();
    }

    @Test
    void aPicocliPropertyLeavesTheHelpToPicocli() {
        String key = "picocli.usage.width";
        assertThat(System.getProperty(key)).isNull();
        System.setProperty(key, "120");
        try {
            assertThat(QuickHelp.plainOutput()).isFalse();
            ByteArrayOutputStream bytes = new ByteArrayOutputStream();
            assertThat(QuickHelp.print(new String[] {"--help"}, new PrintStream(bytes))).isFalse();
            assertThat(bytes.size()).isZero();
        } finally {
            System.clearProperty(key);
        }
    }
}
