package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.util.concurrent.TimeUnit;

/**
 * Named pipes for the tests of inputs that must never be opened (opening a FIFO nobody writes to blocks). Made with
 * POSIX {@code mkfifo}: a test using one is skipped only where no {@code mkfifo} program is on the PATH (a system
 * without named pipes in its file system); where it exists, a failing mkfifo fails the test.
 */
final class Fifo {
    private Fifo() {
    }

    /** Makes the FIFO {@code p} and returns it. */
    static Path make(Path p) throws IOException, InterruptedException {
        assumeTrue(onPath("mkfifo"), "no mkfifo program on the PATH: this system cannot make named pipes");
        Process proc = new ProcessBuilder("mkfifo", p.toString()).redirectErrorStream(true).start();
        String said = new String(proc.getInputStream().readAllBytes(), StandardCharsets.UTF_8);
        assertThat(proc.waitFor(20, TimeUnit.SECONDS)).as("mkfifo finished").isTrue();
        assertThat(proc.exitValue()).as("mkfifo " + p + ": " + said).isZero();
        assertThat(Files.exists(p, LinkOption.NOFOLLOW_LINKS)).isTrue();
        assertThat(Files.isRegularFile(p)).isFalse();
        return p;
    }

    /** Whether an executable {@code program} lies in a folder of the PATH. */
    private static boolean onPath(String program) {
        String path = System.getenv("PATH");
        return path != null && java.util.Arrays.stream(path.split(java.io.File.pathSeparator))
                .filter(d -> !d.isEmpty()).anyMatch(d -> Files.isExecutable(Path.of(d, program)));
    }
}
