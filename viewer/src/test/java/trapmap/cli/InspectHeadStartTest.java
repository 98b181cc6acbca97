package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatCode;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.Rules;

/**
 * {@code inspect}'s head start reads the rules file named on the command line once ahead, on a background thread,
 * and discards it: it finds the file in either form of the option, never reads what is not a regular file (a pipe
 * would be empty for the command's own reading afterwards), and leaves every failure to that reading.
 */
class InspectHeadStartTest {
    @Test
    void theRulesFileIsFoundInEitherFormOfTheOption() {
        assertThat(TrapmapCommand.rulesArgument("inspect", "dir", "--rules", "r.json", "--out", "o"))
                .isEqualTo(Path.of("r.json"));
        assertThat(TrapmapCommand.rulesArgument("inspect", "dir", "--rules=a/r.json")).isEqualTo(Path.of("a/r.json"));
        assertThat(TrapmapCommand.rulesArgument("inspect", "dir", "--rules")).isNull();
        assertThat(TrapmapCommand.rulesArgument("inspect", "dir", "--out", "o")).isNull();
        assertThat(TrapmapCommand.rulesArgument("inspect", "--rules=a\0b")).isNull();
    }

    @Test
    void theMapsAreGuessedFromTheArgumentsThatAreNoOptionAndNoOptionsValue() {
        assertThat(TrapmapCommand.inputArguments("inspect", "a.tif", "--rules", "r.json", "b.tif", "--out", "o",
                "--threads", "2", "--physics", "p.json", "--no-pdf", "--rules=x.json", "c.csv"))
                .containsExactly(Path.of("a.tif"), Path.of("b.tif"), Path.of("c.csv"));
        assertThat(TrapmapCommand.inputArguments("inspect", "--out", "o", "a.tif", "--", "--rules", "-b.tif"))
                .containsExactly(Path.of("a.tif"), Path.of("--rules"), Path.of("-b.tif"));
        assertThat(TrapmapCommand.inputArguments("inspect", "a.tif", "@more.txt")).isEmpty();
        assertThat(TrapmapCommand.inputArguments("inspect", "a.tif", "b\0.tif")).isEmpty();
        assertThat(TrapmapCommand.inputArguments("inspect", "--rules", "r.json")).isEmpty();
    }

    @Test
    void aPipeIsNotReadAndABadFileFailsNothing(@TempDir Path dir) throws Exception {
        Path bad = Files.writeString(dir.resolve("bad.json"), "{\"limits\": [");
        assertThatCode(() -> Rules.prepare(bad)).doesNotThrowAnyException();
        assertThatCode(() -> Rules.prepare(dir.resolve("missing.json"))).doesNotThrowAnyException();
        assertThatCode(() -> Rules.prepare(null)).doesNotThrowAnyException();

        assumeTrue(Files.isExecutable(Path.of("/usr/bin/mkfifo")), "mkfifo");
        Path fifo = dir.resolve("rules.json");
        assertThat(new ProcessBuilder("/usr/bin/mkfifo", fifo.toString()).start().waitFor(10, TimeUnit.SECONDS))
                .isTrue();
        assumeTrue(Files.exists(fifo) && !Files.isRegularFile(fifo), "a FIFO");
        // opening a FIFO for reading blocks until a writer comes: prepare must return without opening it
        Thread t = new Thread(() -> Rules.prepare(fifo), "prepare");
        t.setDaemon(true);
        t.start();
        t.join(Duration.ofSeconds(20).toMillis());
        assertThat(t.isAlive()).as("prepare opened the pipe").isFalse();
    }
}
