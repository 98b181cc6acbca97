package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.AccessDeniedException;
import java.nio.file.FileSystemException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** An output that cannot be written is refused in one line that says why, never naming a temporary file. */
class OutputFailureMessagesTest {
    private static final Path DEMO = Path.of("..", "demo-data");

    @TempDir
    Path dir;

    /** A regular file where the output's folder should be: fails for every user, root included. */
    private Path fileInTheWay() throws Exception {
        Path file = dir.resolve("not-a-folder");
        Files.writeString(file, "x");
        return file;
    }

    @Test
    void theReasonOfAFailedWriteIsSaidWithoutTheTemporaryFile() {
        assertThat(MapInput.writeFailure(new AccessDeniedException("/data/.a.tif.123.tmp")))
                .isEqualTo("permission denied");
        assertThat(MapInput.writeFailure(new AccessDeniedException("/data/out")))
                .isEqualTo("permission denied (/data/out)");
        assertThat(MapInput.writeFailure(new FileSystemException("/ro/.a.tif.77.tmp", null, "Read-only file system")))
                .isEqualTo("Read-only file system");
        assertThat(MapInput.writeFailure(new java.nio.file.FileAlreadyExistsException("/data/x")))
                .isEqualTo("/data/x exists and is not a folder");
        assertThat(MapInput.writeFailure(new java.io.IOException("No space left on device")))
                .isEqualTo("No space left on device");
    }

    @Test
    void convertSaysThatTheOutputFolderIsAFile() throws Exception {
        Path in = dir.resolve("w.tif");
        Files.copy(DEMO.resolve("LOT-A01-W01.tif"), in);
        Files.copy(DEMO.resolve("LOT-A01-W01.json"), dir.resolve("w.json"));
        Path blocked = fileInTheWay();
        Path out = blocked.resolve("nt.tif");
        Cli.Run r = Cli.run("convert", in.toString(), "--defect", "fe-i", "-o", out.toString());
        assertThat(r.code()).isEqualTo(3);
        assertThat(r.errLines()).containsExactly("trapmap convert: " + out + ": cannot write: " + blocked
                + " exists and is not a folder");
    }

    @Test
    void calcCasesSaysThatTheOutputFolderIsAFile() throws Exception {
        Path cases = dir.resolve("cases.csv");
        Files.writeString(cases, "lifetime_us,doping,injection,defect\n10,p:1e16,1e14,fe-i\n");
        Path blocked = fileInTheWay();
        Path out = blocked.resolve("out.csv");
        Cli.Run r = Cli.run("calc", "--cases", cases.toString(), "--out", out.toString());
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.errLines()).hasSize(1);
        assertThat(r.err()).contains("--out " + out + ": cannot write it (").doesNotContain(".tmp");
    }

    @Test
    void demoSaysThatTheOutputFolderIsAFile() throws Exception {
        Path blocked = fileInTheWay();
        Path out = blocked.resolve("demo");
        Cli.Run r = Cli.run("demo", "--out", out.toString());
        assertThat(r.code()).isEqualTo(3);
        assertThat(r.errLines()).hasSize(1);
        assertThat(r.err()).startsWith("trapmap demo: cannot write the demonstration set to " + out + ": ")
                .containsPattern("Not a directory|exists and is not a folder").doesNotContain(".tmp");
    }

    @Test
    void identifySaysThatTheOutputFolderIsAFile() throws Exception {
        Path stack = DEMO.resolve("injection-stack");
        Path blocked = fileInTheWay();
        Path out = blocked.resolve("hint.tif");
        Cli.Run r = Cli.run("identify", stack.resolve("LOT-S01-W01-dn1e13.tif").toString(),
                stack.resolve("LOT-S01-W01-dn1e14.tif").toString(), "--defects", "fe-i", "--block", "8",
                "-o", out.toString());
        assertThat(r.code()).isEqualTo(3);
        assertThat(r.errLines()).containsExactly("trapmap identify: " + out + ": cannot write: " + blocked
                + " exists and is not a folder");
    }
}
