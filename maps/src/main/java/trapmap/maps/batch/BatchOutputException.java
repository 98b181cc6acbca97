package trapmap.maps.batch;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.AccessDeniedException;
import java.nio.file.DirectoryNotEmptyException;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.FileSystemException;
import java.nio.file.NoSuchFileException;
import java.nio.file.NotDirectoryException;
import java.nio.file.Path;

/**
 * A file of a batch's output folder could not be written (disk full, no permission, a file in the way). This is never
 * a wafer's failure: the batch stops, what was written stays, and a resumed run continues from it.
 */
public final class BatchOutputException extends IOException {
    /** The reason of a write refused because the program is being stopped (SIGTERM, Ctrl-C). */
    static final String STOPPED = "the program is being stopped";
    private final transient Path file;
    private final String reason;

    public BatchOutputException(Path file, IOException cause) {
        this(file, cause, true);
    }

    private BatchOutputException(Path file, IOException cause, boolean running) {
        super(fileOf(file, cause) + ": " + reasonOf(cause, running), cause);
        this.file = fileOf(file, cause);
        this.reason = reasonOf(cause, running);
    }

    /** The output file (or folder) that could not be written. */
    public Path file() {
        return file;
    }

    /** Why, in a few words ("No space left on device", "permission denied"). */
    public String reason() {
        return reason;
    }

    /** Whether the write was refused because the program is being stopped, not because of the folder. */
    public boolean stopped() {
        return STOPPED.equals(reason);
    }

    /** {@code e} itself when it already is one, else {@code e} as the failure to write {@code file}. */
    static BatchOutputException of(Path file, IOException e) {
        return e instanceof BatchOutputException b ? b : new BatchOutputException(file, e);
    }

    /**
     * The failure to make the output folder {@code file} before the batch began: a missing folder is not taken for
     * one removed during the run.
     */
    static BatchOutputException atStart(Path file, IOException e) {
        return e instanceof BatchOutputException b ? b : new BatchOutputException(file, e, false);
    }

    private static Path fileOf(Path file, IOException e) {
        if (e instanceof FileSystemException fse && fse.getFile() != null && !(e instanceof BatchOutputException)) {
            return Path.of(fse.getFile());
        }
        return file;
    }

    private static String reasonOf(IOException e, boolean running) {
        if (e instanceof BatchOutputException b) {
            return b.reason();
        }
        if (e instanceof FileSystemException fse && fse.getReason() != null) {
            return fse.getReason();
        }
        if (e instanceof AccessDeniedException) {
            return "permission denied";
        }
        if (e instanceof FileAlreadyExistsException) {
            return "a file of that name is in the way";
        }
        if (e instanceof NoSuchFileException) {
            return running ? "no such file or folder (removed while the batch ran?)" : "no such file or folder";
        }
        if (e instanceof NotDirectoryException) {
            return "not a folder";
        }
        if (e instanceof DirectoryNotEmptyException) {
            return "a folder of that name is in the way";
        }
        return e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
    }

    /** The unchecked form, for the workers (a thumbnail that could not be written). */
    static final class Unchecked extends UncheckedIOException {
        Unchecked(BatchOutputException cause) {
            super(cause.getMessage(), cause);
        }

        @Override
        public synchronized BatchOutputException getCause() {
            return (BatchOutputException) super.getCause();
        }
    }
}
