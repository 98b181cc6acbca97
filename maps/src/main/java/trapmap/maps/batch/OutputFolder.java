package trapmap.maps.batch;

import java.io.FilterWriter;
import java.io.IOException;
import java.io.OutputStreamWriter;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;

/**
 * What a batch owns in its output folder: the names of its outputs (so that {@code --overwrite} removes those and
 * nothing else), its temporaries (removed at the start of a run and when the program is stopped by a signal), and
 * the one place where writes into the folder are checked, so that any failure to write names the file and is never
 * taken for a wafer's failure.
 */
final class OutputFolder {
    /** The files of a run, by name (in the folder itself). */
    static final Set<String> OUTPUTS = Set.of(RunManifest.FILE_NAME, BatchInspection.CSV_NAME,
            BatchInspection.PARTIAL_NAME, BatchInspection.JSON_NAME, BatchInspection.REGIONS_NAME,
            BatchInspection.REGIONS_NAME + ".partial", BatchInspection.FOOTPRINTS_NAME,
            BatchInspection.FOOTPRINTS_NAME + ".partial", BatchInspection.RECURRENCE_NAME, "summary.pdf");
    /** Temporaries with fixed names (in the folder itself). */
    static final Set<String> FIXED_TEMPORARIES = Set.of(BatchInspection.PARTIAL_NAME + ".new",
            BatchInspection.FOOTPRINTS_NAME + ".new", BatchInspection.REGIONS_NAME + ".new",
            BatchInspection.JSON_NAME + ".tmp");

    /** Test seam: told before every write into an output folder; may throw to simulate a failing disk. */
    interface Fault {
        void check(Path file) throws IOException;
    }

    static volatile Fault fault;
    /** Set when the program is being stopped (SIGTERM, Ctrl-C): no new write into an output folder starts. */
    private static volatile boolean stopping;

    /** An action writing one output file. */
    interface Write {
        void run() throws IOException;
    }

    private OutputFolder() {
    }

    /** Runs {@code w}, which writes {@code file}; any failure becomes a {@link BatchOutputException} naming it. */
    static void write(Path file, Write w) throws BatchOutputException {
        try {
            check(file);
            w.run();
        } catch (IOException e) {
            throw BatchOutputException.of(file, e);
        }
    }

    static void check(Path file) throws IOException {
        if (stopping) {
            throw new IOException(BatchOutputException.STOPPED);
        }
        Fault f = fault;
        if (f != null) {
            f.check(file);
        }
    }

    /** A new UTF-8 writer of {@code file} whose failures are {@link BatchOutputException}s naming it. */
    static Writer writer(Path file) throws BatchOutputException {
        Writer raw;
        try {
            check(file);
            raw = new OutputStreamWriter(Files.newOutputStream(file), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw BatchOutputException.of(file, e);
        }
        return new java.io.BufferedWriter(new FilterWriter(raw) {
            @Override
            public void write(int c) throws IOException {
                write(String.valueOf((char) c), 0, 1);
            }

            @Override
            public void write(char[] cbuf, int off, int len) throws IOException {
                try {
                    check(file);
                    out.write(cbuf, off, len);
                } catch (IOException e) {
                    throw BatchOutputException.of(file, e);
                }
            }

            @Override
            public void write(String str, int off, int len) throws IOException {
                try {
                    check(file);
                    out.write(str, off, len);
                } catch (IOException e) {
                    throw BatchOutputException.of(file, e);
                }
            }

            @Override
            public void flush() throws IOException {
                try {
                    out.flush();
                } catch (IOException e) {
                    throw BatchOutputException.of(file, e);
                }
            }
        });
    }

    /** The files of a run in {@code dir} (outputs, recurrence maps, thumbnails), by path; empty when none. */
    static List<Path> results(Path dir) throws IOException {
        List<Path> found = new ArrayList<>();
        if (!Files.isDirectory(dir)) {
            return found;
        }
        try (DirectoryStream<Path> s = Files.newDirectoryStream(dir)) {
            for (Path p : s) {
                String n = p.getFileName().toString();
                if (Files.isRegularFile(p) && (OUTPUTS.contains(n) || isRecurrenceFile(n))) {
                    found.add(p);
                }
            }
        }
        Path thumbs = dir.resolve(BatchInspection.THUMBNAIL_DIR);
        if (Files.isDirectory(thumbs)) {
            try (DirectoryStream<Path> s = Files.newDirectoryStream(thumbs)) {
                for (Path p : s) {
                    if (Files.isRegularFile(p) && isThumbnail(p.getFileName().toString())) {
                        found.add(p);
                    }
                }
            }
        }
        found.sort(null);
        return found;
    }

    /** Removes the files of a run and its temporaries from {@code dir}; other files stay. */
    static void clean(Path dir) throws IOException {
        removeTemporaries(dir);
        for (Path p : results(dir)) {
            OutputFolder.write(p, () -> Files.deleteIfExists(p));
        }
        Path thumbs = dir.resolve(BatchInspection.THUMBNAIL_DIR);
        if (Files.isDirectory(thumbs)) {
            try (DirectoryStream<Path> s = Files.newDirectoryStream(thumbs)) {
                if (!s.iterator().hasNext()) {
                    Files.delete(thumbs);
                }
            }
        }
    }

    /** Removes what an interrupted write may have left: the batch's temporaries in {@code dir} and its thumbnails. */
    static void removeTemporaries(Path dir) throws IOException {
        for (Path folder : List.of(dir, dir.resolve(BatchInspection.THUMBNAIL_DIR))) {
            if (!Files.isDirectory(folder)) {
                continue;
            }
            try (DirectoryStream<Path> s = Files.newDirectoryStream(folder)) {
                for (Path p : s) {
                    if (Files.isRegularFile(p) && isTemporary(folder.equals(dir), p.getFileName().toString())) {
                        Files.deleteIfExists(p);
                    }
                }
            }
        }
    }

    /**
     * A temporary of the batch: a fixed name, the {@code .NAME.*.tmp} of an atomic write of one of the outputs
     * (the summary and recurrence files included), or in {@code thumbnails/} a thumbnail's {@code .tmp}.
     */
    static boolean isTemporary(boolean topLevel, String n) {
        if (!n.endsWith(".tmp") && !n.endsWith(".new")) {
            return false;
        }
        if (!topLevel) {
            return n.endsWith(".png.tmp") || n.startsWith(".") && n.contains(".png.");
        }
        if (FIXED_TEMPORARIES.contains(n)) {
            return true;
        }
        if (!n.startsWith(".") || !n.endsWith(".tmp")) {
            return false;
        }
        String inner = n.substring(1);
        for (String o : OUTPUTS) {
            if (inner.startsWith(o + ".")) {
                return true;
            }
        }
        return inner.startsWith("recurrence-");
    }

    static boolean isRecurrenceFile(String n) {
        return n.startsWith("recurrence-") && (n.endsWith(".tif") || n.endsWith(".png"));
    }

    /** A thumbnail's name: the map file's name and ".png". */
    static boolean isThumbnail(String n) {
        String m = n.toLowerCase(java.util.Locale.ROOT);
        return m.endsWith(".tif.png") || m.endsWith(".tiff.png") || m.endsWith(".csv.png");
    }

    /**
     * A shutdown hook that removes the temporaries of {@code dir} when the program is stopped (SIGTERM, Ctrl-C)
     * while the batch runs; run.json keeps saying "running", so a resumed run continues. Registered until
     * {@link #release(Thread)}.
     */
    static Thread cleanOnExit(Path dir) {
        Thread hook = new Thread(() -> {
            // the batch's threads go on while the hook runs: no new write starts, the writes in flight end (and
            // remove their own temporaries), then what is left is swept
            stopping = true;
            for (int i = 0; i < 2; i++) {
                try {
                    Thread.sleep(150);
                    removeTemporaries(dir);
                } catch (IOException | InterruptedException | RuntimeException e) {
                    return;
                }
            }
        }, "trapmap-inspect-cleanup");
        try {
            Runtime.getRuntime().addShutdownHook(hook);
        } catch (IllegalStateException e) {
            return null; // already shutting down
        }
        return hook;
    }

    static void release(Thread hook) {
        if (hook == null) {
            return;
        }
        try {
            Runtime.getRuntime().removeShutdownHook(hook);
        } catch (IllegalStateException e) {
            // shutting down: the hook runs
        }
    }
}
