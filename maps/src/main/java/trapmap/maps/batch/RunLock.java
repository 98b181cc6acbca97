package trapmap.maps.batch;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.channels.FileLock;
import java.nio.channels.OverlappingFileLockException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.time.Instant;
import java.util.Map;
import java.util.concurrent.ConcurrentHashMap;

/**
 * The exclusive hold of one batch on its output folder, for the whole run (summary included): an operating-system
 * lock ({@link FileChannel#tryLock()}) on {@value #FILE_NAME} in the folder, which records the holder's process id
 * and start time. A second run into the folder is refused at once, naming the holder; the lock goes with the
 * process, so a killed run never leaves the folder locked. The file itself stays.
 */
final class RunLock implements AutoCloseable {
    static final String FILE_NAME = ".inspect.lock";
    /** Folders held by this process: a second channel on the lock file must not be opened (closing it would drop the lock). */
    private static final Map<Path, String> HELD = new ConcurrentHashMap<>();

    private final Path key;
    private final FileChannel channel;
    private final FileLock lock;

    private RunLock(Path key, FileChannel channel, FileLock lock) {
        this.key = key;
        this.channel = channel;
        this.lock = lock;
    }

    /**
     * Takes the folder.
     *
     * @throws RunRefusedException when another run holds it
     * @throws BatchOutputException when the lock file cannot be written
     */
    static RunLock acquire(Path dir) throws BatchOutputException {
        Path file = dir.resolve(FILE_NAME);
        Path key = file.toAbsolutePath().normalize();
        long pid = ProcessHandle.current().pid();
        String holder = "pid " + pid + ", started " + Instant.now();
        String before = HELD.putIfAbsent(key, holder);
        if (before != null) {
            throw busy(dir, before);
        }
        FileChannel ch = null;
        try {
            ch = FileChannel.open(file, StandardOpenOption.CREATE, StandardOpenOption.READ, StandardOpenOption.WRITE);
            FileLock l;
            try {
                l = ch.tryLock();
            } catch (OverlappingFileLockException e) {
                l = null;
            }
            if (l == null) {
                ch.close();
                ch = null;
                HELD.remove(key);
                String text = Files.readString(file, StandardCharsets.UTF_8).strip();
                throw busy(dir, text.isEmpty() ? "process unknown" : text);
            }
            ch.truncate(0);
            ch.write(ByteBuffer.wrap((holder + "\n").getBytes(StandardCharsets.UTF_8)), 0);
            ch.force(false);
            return new RunLock(key, ch, l);
        } catch (IOException e) {
            HELD.remove(key, holder);
            if (ch != null) {
                try {
                    ch.close();
                } catch (IOException ignored) {
                    // the lock goes with the channel
                }
            }
            throw BatchOutputException.of(file, e);
        }
    }

    private static RunRefusedException busy(Path dir, String holder) {
        return new RunRefusedException(dir + " is in use by another trapmap inspect run (" + holder
                + "); wait for it to end or give another --out");
    }

    @Override
    public void close() {
        try {
            lock.release();
            channel.close();
        } catch (IOException e) {
            // closing the channel releases the lock in any case
        } finally {
            HELD.remove(key);
        }
    }
}
