package trapmap.maps.io;

import java.io.FilterInputStream;
import java.io.IOException;
import java.io.InputStream;
import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.nio.file.attribute.BasicFileAttributes;

/**
 * Size-limited reading of the small input files (rules, physics settings, sidecars, sessions, defect files, truth
 * files, cases tables). Before a file is opened it must be a regular file after following links (a device such as
 * {@code /dev/zero}, a pipe or a socket is refused without being opened, so a pipe cannot block the reader) of at
 * most the limit; the bytes are then read through a stream that stops at the limit, so that a file growing while it
 * is read is still capped. Refusals are {@link Refused} exceptions whose message names the file, its size and the
 * limit.
 */
public final class InputFiles {
    /** Largest JSON input (rules, physics settings, sidecar, session, defect, truth file): 16 MiB. */
    public static final long JSON_MAX_BYTES = 16L << 20;
    /** Largest table of calculation cases (CSV): 64 MiB. */
    public static final long TABLE_MAX_BYTES = 64L << 20;

    private InputFiles() {
    }

    /** An input file refused before or while reading; the message is {@code FILE: reason}. */
    public static final class Refused extends IOException {
        private static final long serialVersionUID = 1L;
        private final String reason;

        Refused(Path file, String reason) {
            super(file + ": " + reason);
            this.reason = reason;
        }

        /** The reason without the file name, e.g. {@code is a FIFO, socket or device, not a regular file}. */
        public String reason() {
            return reason;
        }
    }

    /**
     * Why a file with attributes {@code a} (links followed) cannot be read as a file, e.g. {@code is a directory, not
     * a regular file}; null for a regular file. The one wording of every reader's message.
     */
    public static String notRegular(BasicFileAttributes a) {
        if (a.isRegularFile()) {
            return null;
        }
        return "is " + (a.isDirectory() ? "a directory" : "a FIFO, socket or device") + ", not a regular file";
    }

    /**
     * Checks that {@code file} is a regular file (after following links) of at most {@code maxBytes} bytes; opens
     * nothing.
     *
     * @return its size, bytes
     * @throws NoSuchFileException when it does not exist
     * @throws Refused             when it is a directory, not a regular file, or larger than the limit
     */
    public static long check(Path file, long maxBytes) throws IOException {
        BasicFileAttributes a = Files.readAttributes(file, BasicFileAttributes.class);
        String notRegular = notRegular(a);
        if (notRegular != null) {
            throw new Refused(file, notRegular);
        }
        if (a.size() > maxBytes) {
            throw new Refused(file, tooLarge(a.size(), maxBytes));
        }
        return a.size();
    }

    /** Why an input of {@code size} bytes is refused under the limit {@code maxBytes}, as {@link #check} says it. */
    public static String tooLarge(long size, long maxBytes) {
        return "is " + size + " bytes, more than the limit of " + limit(maxBytes);
    }

    /**
     * The bytes of {@code file} after {@link #check}, read through a stream capped at {@code maxBytes}.
     *
     * @throws Refused also when the file grew beyond the limit while it was read
     */
    public static byte[] readBytes(Path file, long maxBytes) throws IOException {
        try (InputStream in = open(file, maxBytes)) {
            return in.readAllBytes();
        }
    }

    /**
     * The text of {@code file} as UTF-8 (malformed bytes refused, a leading byte-order mark kept), read as by
     * {@link #readBytes}.
     *
     * @throws CharacterCodingException when the bytes are not UTF-8
     */
    public static String readUtf8(Path file, long maxBytes) throws IOException {
        byte[] bytes = readBytes(file, maxBytes);
        return StandardCharsets.UTF_8.newDecoder().decode(ByteBuffer.wrap(bytes)).toString();
    }

    /**
     * A stream over {@code file} after {@link #check}, which throws {@link Refused} when more than {@code maxBytes}
     * bytes would be read (a file that grows while it is read).
     */
    public static InputStream open(Path file, long maxBytes) throws IOException {
        check(file, maxBytes);
        return new Capped(Files.newInputStream(file), file, maxBytes);
    }

    /** E.g. {@code 16777216 bytes (16 MB)}; the part in brackets from 1 MiB on. */
    private static String limit(long bytes) {
        return bytes + " bytes" + (bytes >= 1L << 20 ? " (" + MapMemory.describeBytes(bytes) + ")" : "");
    }

    private static final class Capped extends FilterInputStream {
        private final Path file;
        private final long max;
        private long count;

        Capped(InputStream in, Path file, long max) {
            super(in);
            this.file = file;
            this.max = max;
        }

        @Override
        public boolean markSupported() {
            return false;
        }

        @Override
        public int read() throws IOException {
            int b = super.read();
            if (b >= 0) {
                counted(1);
            }
            return b;
        }

        @Override
        public int read(byte[] b, int off, int len) throws IOException {
            int n = super.read(b, off, (int) Math.min(len, max - count + 1));
            if (n > 0) {
                counted(n);
            }
            return n;
        }

        @Override
        public long skip(long n) throws IOException {
            long s = super.skip(Math.min(n, max - count + 1));
            counted(s);
            return s;
        }

        private void counted(long n) throws Refused {
            count += n;
            if (count > max) {
                throw new Refused(file, "grew to more than the limit of " + limit(max) + " while being read");
            }
        }
    }
}
