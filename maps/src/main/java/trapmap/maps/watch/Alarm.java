package trapmap.maps.watch;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.TimeUnit;
import java.util.function.Consumer;

/**
 * What the watch does for a wafer that did not pass ({@code fail} or {@code error}): runs a program with the wafer's
 * id and verdict as its two arguments (started directly, never through a shell, so nothing in an id is ever run as a
 * command) and/or appends one line to an alarm file: {@code TIME<TAB>WAFER_ID<TAB>VERDICT<TAB>FILE} (time ISO-8601
 * UTC; tabs and line breaks inside a field written as spaces). Both run on a thread of their own, one alarm after the
 * other in the wafers' order, so that a slow program never holds the inspection; a program that fails to start, exits
 * with a status other than 0 or runs longer than {@value #PROGRAM_LIMIT_S} s (then ended) is told as one line.
 */
public final class Alarm implements AutoCloseable {
    /** Longest a program may run, s. */
    static final long PROGRAM_LIMIT_S = 60;

    private final Path program;
    private final Path file;
    private final Consumer<String> problems;
    private final ExecutorService thread = Executors.newSingleThreadExecutor(r -> {
        Thread t = new Thread(r, "watch-alarm");
        t.setDaemon(true);
        return t;
    });

    /**
     * @param program  the program to run (null: none)
     * @param file     the alarm file appended to (null: none)
     * @param problems told one line for each alarm that could not be raised
     */
    public Alarm(Path program, Path file, Consumer<String> problems) {
        this.program = program;
        this.file = file;
        this.problems = problems;
    }

    /** Whether there is anything to do. */
    public boolean active() {
        return program != null || file != null;
    }

    /** Raises the alarm of one wafer (on the alarm thread; returns at once). */
    public void raise(java.time.Instant time, String waferId, String verdict, String mapFile) {
        if (!active()) {
            return;
        }
        thread.execute(() -> {
            if (file != null) {
                String line = String.join("\t", time.toString(), field(waferId), field(verdict), field(mapFile))
                        + "\n";
                try {
                    Files.write(file, line.getBytes(StandardCharsets.UTF_8), StandardOpenOption.CREATE,
                            StandardOpenOption.APPEND, StandardOpenOption.WRITE);
                } catch (IOException e) {
                    problems.accept("--alarm-file " + file + ": could not append the alarm of " + waferId + ": " + e);
                }
            }
            if (program != null) {
                run(waferId, verdict);
            }
        });
    }

    private void run(String waferId, String verdict) {
        List<String> cmd = new ArrayList<>(List.of(program.toString(), waferId, verdict));
        try {
            Process p = new ProcessBuilder(cmd).redirectInput(ProcessBuilder.Redirect.from(nullFile()))
                    .redirectOutput(ProcessBuilder.Redirect.INHERIT).redirectError(ProcessBuilder.Redirect.INHERIT)
                    .start();
            if (!p.waitFor(PROGRAM_LIMIT_S, TimeUnit.SECONDS)) {
                p.destroyForcibly();
                problems.accept("--on-fail " + program + " " + waferId + " " + verdict + ": still running after "
                        + PROGRAM_LIMIT_S + " s; ended");
            } else if (p.exitValue() != 0) {
                problems.accept("--on-fail " + program + " " + waferId + " " + verdict + ": exit status "
                        + p.exitValue());
            }
        } catch (IOException e) {
            problems.accept("--on-fail " + program + ": could not be started: " + e.getMessage());
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
    }

    private static java.io.File nullFile() {
        return new java.io.File(System.getProperty("os.name", "").startsWith("Windows") ? "NUL" : "/dev/null");
    }

    private static String field(String s) {
        return s == null ? "" : s.replaceAll("[\\t\\r\\n]", " ");
    }

    /** Waits up to {@code seconds} for the alarms raised so far, then stops the thread. */
    public void close(long seconds) throws InterruptedException {
        thread.shutdown();
        thread.awaitTermination(seconds, TimeUnit.SECONDS);
    }

    @Override
    public void close() throws InterruptedException {
        close(PROGRAM_LIMIT_S + 5);
    }
}
