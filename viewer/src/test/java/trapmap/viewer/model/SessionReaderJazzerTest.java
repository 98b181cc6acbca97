package trapmap.viewer.model;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Timeout;

/**
 * Fuzz target of the session reader ({@link SessionFiles#read}): a session or a
 * {@link SessionFiles.SessionException} with one line naming the file; anything else (another exception, a hang, out
 * of memory) is a finding. Seeds and fixed findings:
 * {@code src/test/resources/trapmap/viewer/model/SessionReaderJazzerTestInputs/readSession/}. How to fuzz:
 * DEVELOPERS.md.
 */
class SessionReaderJazzerTest {
    private static final Path FILE;

    static {
        try {
            Path dir = Files.createTempDirectory("trapmap-fuzz");
            dir.toFile().deleteOnExit();
            FILE = dir.resolve("s.trapmap.json");
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    @FuzzTest(maxDuration = "2m")
    @Timeout(10)
    void readSession(byte[] data) throws IOException {
        Files.write(FILE, data);
        try {
            SessionFiles.read(FILE);
        } catch (SessionFiles.SessionException e) {
            String m = e.getMessage();
            if (m == null || m.indexOf('\n') >= 0 || m.indexOf('\r') >= 0 || !m.contains(FILE.toString())) {
                throw new AssertionError("not one line naming the file: " + m, e);
            }
        }
    }
}
