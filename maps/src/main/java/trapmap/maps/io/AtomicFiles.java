package trapmap.maps.io;

import java.io.IOException;
import java.nio.channels.FileChannel;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.nio.file.attribute.PosixFilePermission;
import java.nio.file.attribute.PosixFilePermissions;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.ThreadLocalRandom;
import java.util.concurrent.atomic.AtomicBoolean;

/**
 * Writes a file so that readers see either the old content or the complete new one: the content goes to a
 * temporary file in the target's directory, which is flushed to disk and then renamed over the target in one
 * step. On failure the temporary file is removed and the target is untouched; when the program is stopped while
 * writing (Ctrl-C, SIGTERM), a shutdown hook removes the temporary files still being written.
 */
public final class AtomicFiles {
    private static final Set<PosixFilePermission> DEFAULT_PERMISSIONS = PosixFilePermissions.fromString("rw-r--r--");

    /** Writes the content of a file at a given path. */
    @FunctionalInterface
    public interface Content {
        void writeTo(Path file) throws IOException;
    }

    /** Temporary files being written, removed by {@link #HOOK} when the program stops before they are done. */
    private static final Set<Path> PENDING = ConcurrentHashMap.newKeySet();
    private static final Thread HOOK = new Thread(AtomicFiles::removePending, "trapmap-atomic-files-cleanup");
    private static final AtomicBoolean HOOKED = new AtomicBoolean();

    private AtomicFiles() {
    }

    /** Removes the temporary files still being written (what the shutdown hook does). */
    static void removePending() {
        for (Path p : PENDING) {
            try {
                Files.deleteIfExists(p);
            } catch (IOException | RuntimeException e) {
                // best effort while the program stops
            }
        }
    }

    private static void track(Path tmp) {
        if (HOOKED.compareAndSet(false, true)) {
            try {
                Runtime.getRuntime().addShutdownHook(HOOK);
            } catch (IllegalStateException e) {
                // already stopping: the finally block below removes the file if it gets there
            }
        }
        PENDING.add(tmp);
    }

    /** {@link #write(Path, Content)} of the given bytes. */
    public static void write(Path target, byte[] bytes) throws IOException {
        write(target, tmp -> Files.write(tmp, bytes));
    }

    /**
     * Writes {@code target} (creating its folder) so that readers see either its old content or the complete new one.
     *
     * @throws IOException from the content or the move; the target is then unchanged
     */
    public static void write(Path target, Content content) throws IOException {
        Path abs = target.toAbsolutePath();
        Path dir = abs.getParent();
        Files.createDirectories(dir);
        Path tmp = createTemporary(dir, "." + abs.getFileName() + ".", ".tmp");
        track(tmp);
        boolean done = false;
        try {
            content.writeTo(tmp);
            try (FileChannel ch = FileChannel.open(tmp, StandardOpenOption.WRITE)) {
                ch.force(true);
            }
            permissions(tmp, abs);
            try {
                Files.move(tmp, abs, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
            } catch (AtomicMoveNotSupportedException e) {
                Files.move(tmp, abs, StandardCopyOption.REPLACE_EXISTING);
            }
            done = true;
        } finally {
            PENDING.remove(tmp);
            if (!done) {
                Files.deleteIfExists(tmp);
            }
        }
    }

    /** Owner read and write only: the permissions of a temporary file while it is written. */
    private static final Set<PosixFilePermission> PRIVATE = PosixFilePermissions.fromString("rw-------");

    /**
     * A new empty file {@code prefix + random number + suffix} in {@code dir}, readable and writable by its owner only
     * (on POSIX file systems), as {@link Files#createTempFile(Path, String, String, java.nio.file.attribute.FileAttribute[])} makes it, but
     * named from {@link ThreadLocalRandom}: that method's {@code SecureRandom} is seeded and its security providers
     * loaded at the first call, tens of milliseconds of a short command. The name needs no secrecy: the file is created
     * exclusively ({@code O_EXCL}, no link followed), and a name already taken is drawn again.
     */
    static Path createTemporary(Path dir, String prefix, String suffix) throws IOException {
        boolean posix = dir.getFileSystem().supportedFileAttributeViews().contains("posix");
        for (int attempt = 0; ; attempt++) {
            Path tmp = dir.resolve(prefix + Long.toUnsignedString(ThreadLocalRandom.current().nextLong()) + suffix);
            try {
                return posix ? Files.createFile(tmp, PosixFilePermissions.asFileAttribute(PRIVATE))
                        : Files.createFile(tmp);
            } catch (FileAlreadyExistsException e) {
                if (attempt >= 100) {
                    throw e;
                }
            }
        }
    }

    /** Temporary files are private; give the new file the target's permissions, or rw-r--r--. */
    private static void permissions(Path tmp, Path target) {
        try {
            Set<PosixFilePermission> p = Files.exists(target) ? Files.getPosixFilePermissions(target)
                    : DEFAULT_PERMISSIONS;
            Files.setPosixFilePermissions(tmp, p);
        } catch (UnsupportedOperationException | IOException e) {
            // not a POSIX file system: keep the defaults
        }
    }
}
