package trapmap.maps.fuzz;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;

/**
 * What every reader's fuzz target demands of a failure: the reader's documented exception with a one-line message
 * that names the file. Any other exception, a hang (the fuzzer's per-input timeout) or running out of memory is a
 * finding; so is a documented exception whose message breaks these rules.
 */
public final class FuzzContract {
    private static final Path DIR;

    static {
        try {
            DIR = Files.createTempDirectory("trapmap-fuzz");
            DIR.toFile().deleteOnExit();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    private FuzzContract() {
    }

    /** Writes {@code data} to {@code name} in this run's scratch folder and returns the file. */
    public static Path write(String name, byte[] data) throws IOException {
        Path file = DIR.resolve(name);
        Files.write(file, data);
        return file;
    }

    /** The scratch folder's file {@code name} (not created). */
    public static Path file(String name) {
        return DIR.resolve(name);
    }

    /**
     * Checks a documented failure: its message is one line and names one of {@code files}.
     *
     * @throws AssertionError (a finding) otherwise, with the failure as its cause
     */
    public static void oneLineNamingFile(Throwable failure, Path... files) {
        String m = failure.getMessage();
        if (m == null || m.isBlank()) {
            throw new AssertionError("a reader's failure without a message", failure);
        }
        if (m.indexOf('\n') >= 0 || m.indexOf('\r') >= 0) {
            throw new AssertionError("a reader's message spans several lines: " + m, failure);
        }
        for (Path f : files) {
            if (m.contains(f.toString())) {
                return;
            }
        }
        throw new AssertionError("a reader's message does not name the file: " + m, failure);
    }
}
