package trapmap.cli;

import java.io.IOException;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.ForkJoinPool;
import java.util.concurrent.ForkJoinTask;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.MapFormatException;
import trapmap.maps.io.MapStream;
import trapmap.maps.model.WaferMap;

/** Reading maps for the map commands: one page of a file, with messages that name the file. */
final class MapInput {
    private MapInput() {
    }

    /** The map file read last by the command running in this thread. */
    private static final ThreadLocal<Path> PROCESSING = new ThreadLocal<>();

    /**
     * Page {@code page} (1-based) of {@code file}.
     *
     * @throws MapFormatException when the file is missing, not a regular file, unreadable or has no such page
     */
    static WaferMap page(Path file, int page) throws MapFormatException {
        PROCESSING.set(file);
        List<WaferMap> pages = MapFiles.read(file);
        if (page < 1 || page > pages.size()) {
            throw new MapFormatException(file.toString(), "", "has " + pages.size() + " page"
                    + (pages.size() == 1 ? "" : "s") + ", so --page " + page + " does not exist");
        }
        return pages.get(page - 1);
    }

    /**
     * Page {@code page} (1-based) of {@code file} band by band: the first page through {@link MapStream#open}
     * (straight from the file where it can), another one read whole ({@link #page}).
     *
     * @throws MapFormatException as {@link #page}
     */
    static MapStream stream(Path file, int page) throws MapFormatException {
        PROCESSING.set(file);
        return page == 1 ? MapStream.open(file) : MapStream.of(page(file, page));
    }

    /**
     * Page 1 of {@code first} and of {@code second}, read at the same time ({@code second} on the common fork-join
     * pool). Failures come as reading one after the other gives them: {@code first}'s before {@code second}'s, and
     * the file being processed is the one that failed (or {@code second}).
     *
     * @throws MapFormatException as {@link #page}
     */
    static WaferMap[] firstPages(Path first, Path second) throws MapFormatException {
        ForkJoinTask<Read> other = ForkJoinPool.commonPool().submit(() -> {
            try {
                return new Read(page(second, 1), null);
            } catch (MapFormatException | RuntimeException | Error e) {
                return new Read(null, e); // rethrown as it is on the caller's thread
            } finally {
                processingDone();
            }
        });
        WaferMap a;
        try {
            a = page(first, 1);
        } catch (MapFormatException | RuntimeException | Error e) {
            other.cancel(false);
            throw e;
        }
        PROCESSING.set(second);
        Read b = other.join();
        if (b.failure() instanceof MapFormatException m) {
            throw m;
        }
        if (b.failure() instanceof RuntimeException r) {
            throw r;
        }
        if (b.failure() instanceof Error r) {
            throw r;
        }
        return new WaferMap[] {a, b.map()};
    }

    /** A map read on another thread, or why it could not be read. */
    private record Read(WaferMap map, Throwable failure) {
    }

    /** The map file read last by the command running in this thread (the one being processed), or null. */
    static Path processing() {
        return PROCESSING.get();
    }

    /** Forgets the file read last in this thread (a command has ended). */
    static void processingDone() {
        PROCESSING.remove();
    }

    /**
     * Refuses an {@code --output} that would replace one of the {@code inputs} or its sidecar: input files are never
     * modified.
     *
     * @param output  the file given to {@code --output}
     * @param written every file the command writes for it (the output itself first)
     * @param inputs  the map files the command reads
     * @throws InputException naming the output, the input it would replace and the file written there
     */
    static void refuseOverwriting(Path output, List<Path> written, List<Path> inputs) {
        refuseOverwriting("--output", output, written, inputs);
    }

    /** {@link #refuseOverwriting(Path, List, List)} for the output of the option {@code option}. */
    static void refuseOverwriting(String option, Path output, List<Path> written, List<Path> inputs) {
        for (Path w : written) {
            for (Path in : inputs) {
                for (Path read : List.of(in, MapFiles.sidecarOf(in))) {
                    if (same(w, read)) {
                        throw new InputException(option + " " + output + " would overwrite " + read
                                + (w.equals(output) ? "" : " (the command writes " + w.getFileName() + ")")
                                + "; input files are never modified: choose another name");
                    }
                }
            }
        }
    }

    private static boolean same(Path a, Path b) {
        if (a.toAbsolutePath().normalize().equals(b.toAbsolutePath().normalize())) {
            return true;
        }
        try {
            return java.nio.file.Files.exists(a) && java.nio.file.Files.exists(b)
                    && java.nio.file.Files.isSameFile(a, b);
        } catch (IOException e) {
            return false;
        }
    }

    /**
     * Refuses an output {@code file} of {@code option} whose extension names no map format (null: none given).
     *
     * @throws InputException naming the option, the file and the formats
     */
    static void requireOutputType(String option, Path file) {
        if (file != null && MapFiles.formatOf(file) == null) {
            throw new InputException(option + " " + file + ": unsupported output type; use .tif, .tiff, .csv or .png");
        }
    }

    /** Writes {@code map} to {@code file} (format from the extension); wraps failures in one-line messages. */
    static void write(WaferMap map, Path file) {
        if (MapFiles.formatOf(file) == null) {
            throw new InputException("-o " + file + ": unsupported output type; use .tif, .tiff, .csv or .png");
        }
        try {
            MapFiles.write(map, file);
        } catch (IOException e) {
            throw cannotWrite(file, e);
        } catch (RuntimeException | Error e) { // a picture (.png) needs fonts for its colour bar and caption
            java.util.Optional<trapmap.maps.io.Rendering.Missing> m = e instanceof VirtualMachineError
                    ? java.util.Optional.empty() : trapmap.maps.io.Rendering.failure(e);
            if (m.isEmpty()) {
                throw e;
            }
            throw new Pictures.NotMade(file + " was not made: " + m.get().text());
        }
    }

    /**
     * Why writing failed, in a few words for the one-line message: "permission denied", "Read-only file system",
     * "/x/y exists and is not a folder", the system's reason, or the message; the hidden temporary file that an atomic
     * write was making is never named, since the user did not choose it.
     */
    static String writeFailure(IOException e) {
        if (e instanceof java.nio.file.FileSystemException f) {
            String file = f.getFile() == null || hidden(f.getFile()) ? "" : f.getFile();
            if (e instanceof java.nio.file.AccessDeniedException) {
                return "permission denied" + (file.isEmpty() ? "" : " (" + file + ")");
            }
            if (e instanceof java.nio.file.FileAlreadyExistsException && !file.isEmpty()) {
                return file + " exists and is not a folder";
            }
            if (e instanceof java.nio.file.NoSuchFileException) {
                return "no such file or folder" + (file.isEmpty() ? "" : " (" + file + ")");
            }
            if (f.getReason() != null) {
                return Flags.oneLine(f.getReason()) + (file.isEmpty() ? "" : " (" + file + ")");
            }
        }
        return e.getMessage() == null ? e.getClass().getSimpleName() : Flags.oneLine(e.getMessage());
    }

    /** Whether {@code path} is an atomic write's temporary file ({@code .NAME.RANDOM.tmp}). */
    private static boolean hidden(String path) {
        Path name = Path.of(path).getFileName();
        return name != null && name.toString().startsWith(".") && name.toString().endsWith(".tmp");
    }

    /** The failure to write {@code file}, with {@link #writeFailure why}: exit code 3. */
    static OutputException cannotWrite(Path file, IOException e) {
        return new OutputException(file + ": cannot write: " + writeFailure(e), e);
    }

    /** Writing an output failed (disk full, no permission): not the user's input, exit code 3. */
    static final class OutputException extends RuntimeException {
        private static final long serialVersionUID = 1L;

        OutputException(String message, Throwable cause) {
            super(message, cause);
        }
    }
}
