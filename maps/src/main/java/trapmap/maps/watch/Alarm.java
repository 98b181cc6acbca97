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
 * UTC; tabs and line breaks inside a field written as spaces). A control-chart signal ({@link #signal}) is raised the
 * same way with the verdict {@code signal}. Both run on a thread of their own, one alarm after the
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

    /**
     * Why {@code file} cannot take alarm lines, checked before a watch starts without writing to it; null when it
     * can: its folder exists, and the file either exists and opens for appending or can be made there.
     */
    public static String unusableFile(Path file) {
        Path abs = file.toAbsolutePath();
        Path folder = abs.getParent();
        if (folder == null || !Files.isDirectory(folder)) {
            return "its folder " + folder + " does not exist";
        }
        if (Files.isDirectory(abs)) {
            return "it is a folder; give a file";
        }
        boolean existed = Files.exists(abs);
        // opened for appending (made when missing, then removed again), nothing written: as the first alarm opens it
        try (var c = java.nio.channels.FileChannel.open(abs, StandardOpenOption.CREATE, StandardOpenOption.WRITE,
                StandardOpenOption.APPEND)) {
            c.size();
        } catch (java.io.IOException | RuntimeException e) {
            String why = e instanceof java.nio.file.AccessDeniedException ? "permission denied"
                    : e instanceof java.nio.file.NoSuchFileException ? "the folder does not take new files"
                    : e instanceof java.nio.file.FileSystemException f && f.getReason() != null ? f.getReason()
                    : e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
            return "it cannot be " + (existed ? "appended to" : "made in " + folder) + " (" + why + ")";
        }
        if (!existed) {
            try {
                Files.deleteIfExists(abs);
            } catch (java.io.IOException e) {
                return null; // an empty alarm file stays: it takes lines all the same
            }
        }
        return null;
    }

    /** Whether there is anything to do. */
    public boolean active() {
        return program != null || file != null;
    }

    /**
     * One alarm to raise: the alarm file gets {@code TIME<TAB>WAFER_ID<TAB>ARGS[0]<TAB>LAST}, the program is run with
     * {@code WAFER_ID ARGS...}.
     *
     * @param args the verdict ({@code fail}, {@code error}) or {@code signal RULE GROUP FIGURE}
     * @param last the alarm file's last field: the map file, or {@code RULE GROUP FIGURE}
     */
    public record Raising(java.time.Instant time, String waferId, List<String> args, String last) {
        public Raising {
            args = List.copyOf(args);
            if (args.isEmpty()) {
                throw new IllegalArgumentException("an alarm needs its verdict");
            }
        }

        /** The alarm of a wafer that did not pass ({@code verdict} {@code fail} or {@code error}). */
        public static Raising wafer(java.time.Instant time, String waferId, String verdict, String mapFile) {
            return new Raising(time, waferId, List.of(verdict), mapFile == null ? "" : mapFile);
        }

        /** The alarm of a control-chart signal ({@link Alarm#signal}). */
        public static Raising signal(java.time.Instant time, String waferId, String rule, String group,
                                     String figure) {
            return new Raising(time, waferId, List.of(SIGNAL, rule, group, figure),
                    String.join(" ", field(rule), field(group), field(figure)));
        }
    }

    /** Raises the alarm of one wafer (on the alarm thread; returns at once). */
    public void raise(java.time.Instant time, String waferId, String verdict, String mapFile) {
        raise(Raising.wafer(time, waferId, verdict, mapFile), null);
    }

    /**
     * Raises {@code alarm} on the alarm thread (returns at once), then runs {@code raised} there (null: nothing):
     * after the alarm file's line is appended and the program has ended, whether they succeeded or were told as a
     * problem. Nothing is run when the alarm is not {@linkplain #active active}.
     */
    public void raise(Raising alarm, Runnable raised) {
        if (!active()) {
            return;
        }
        thread.execute(() -> {
            deliver(alarm);
            if (raised != null) {
                raised.run();
            }
        });
    }

    /**
     * Raises the alarm of a control-chart signal that wafer {@code waferId} brought (on the alarm thread; returns at
     * once): the alarm file gets {@code TIME<TAB>WAFER_ID<TAB>signal<TAB>RULE GROUP FIGURE}, the program is run with
     * the five arguments {@code WAFER_ID signal RULE GROUP FIGURE}.
     *
     * @param rule   the rule's name as in the rules file, e.g. {@code beyond_3_sigma}
     * @param group  the chart point's group, e.g. a furnace tube or a lot
     * @param figure the figure charted
     */
    public void signal(java.time.Instant time, String waferId, String rule, String group, String figure) {
        raise(Raising.signal(time, waferId, rule, group, figure), null);
    }

    /** The verdict word of a signal's alarm. */
    public static final String SIGNAL = "signal";

    private void deliver(Raising a) {
        if (file != null) {
            String line = String.join("\t", a.time().toString(), field(a.waferId()), field(a.args().get(0)),
                    field(a.last())) + "\n";
            try {
                Files.write(file, line.getBytes(StandardCharsets.UTF_8), StandardOpenOption.CREATE,
                        StandardOpenOption.APPEND, StandardOpenOption.WRITE);
            } catch (IOException e) {
                problems.accept("--alarm-file " + file + ": could not append the alarm of " + a.waferId() + ": "
                        + e);
            }
        }
        if (program != null) {
            run(a.waferId(), a.args());
        }
    }

    private void run(String waferId, List<String> args) {
        List<String> cmd = new ArrayList<>(List.of(program.toString(), waferId));
        cmd.addAll(args);
        String named = "--on-fail " + String.join(" ", cmd);
        try {
            Process p = new ProcessBuilder(cmd).redirectInput(ProcessBuilder.Redirect.from(nullFile()))
                    .redirectOutput(ProcessBuilder.Redirect.INHERIT).redirectError(ProcessBuilder.Redirect.INHERIT)
                    .start();
            if (!p.waitFor(PROGRAM_LIMIT_S, TimeUnit.SECONDS)) {
                p.destroyForcibly();
                problems.accept(named + ": still running after " + PROGRAM_LIMIT_S + " s; ended");
            } else if (p.exitValue() != 0) {
                problems.accept(named + ": exit status " + p.exitValue());
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
