package trapmap.maps.io;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.util.zip.DataFormatException;
import java.util.zip.Inflater;

/**
 * Checks that each strip or tile of a TIFF image holds all of its bytes, before an image decoder sees it. Image
 * decoders fill what a short, truncated or corrupt block does not deliver with zeros (or stop with a low-level
 * exception); trapmap would then judge a wafer on invented pixels. So every block is decoded here, counting the bytes
 * it yields without keeping them: Deflate through {@link Inflater} (as the JDK plugin does), LZW and PackBits as
 * TIFF 6.0 (sections 13 and 9) defines them. A block must yield exactly the bytes of its rows (the last strip also
 * may hold its full RowsPerStrip rows, as some writers pad it); fewer, more or undecodable data is an error naming
 * page, block and byte counts, in the manner of libtiff's "Read error on strip N; got X bytes, expected Y".
 */
final class TiffBlocks {
    /** Bytes read from the file at a time. */
    private static final int CHUNK = 1 << 16;

    private final FileChannel channel;
    private final String file;
    private final String location;
    private final long offset;
    private final long count;
    private final long expected;
    private final long alsoAccepted;
    private final int compression;
    private final ByteBuffer in = ByteBuffer.allocate(CHUNK);
    private long read;

    private TiffBlocks(FileChannel channel, String file, String location, long offset, long count, long expected,
                       long alsoAccepted, int compression) {
        this.channel = channel;
        this.file = file;
        this.location = location;
        this.offset = offset;
        this.count = count;
        this.expected = expected;
        this.alsoAccepted = alsoAccepted;
        this.compression = compression;
        in.limit(0);
    }

    /**
     * Checks one strip or tile.
     *
     * @param location     page and block for messages, e.g. {@code page 1 (directory at byte 8), strip 3 of 34}
     * @param size         file length, bytes
     * @param offset       where the block's data start (StripOffsets/TileOffsets)
     * @param count        its bytes in the file (StripByteCounts/TileByteCounts)
     * @param expected     the bytes its pixels take once decoded
     * @param alsoAccepted a second decoded length accepted (a padded last strip), or {@code expected}
     * @param compression  TIFF compression code (1, 5, 8, 32773 or 32946)
     * @throws MapFormatException when the block lies outside the file, is empty, decodes to another length or
     *                            cannot be decoded
     */
    static void check(FileChannel channel, String file, String location, long size, long offset, long count,
                      long expected, long alsoAccepted, int compression) throws MapFormatException {
        if (offset + count > size) {
            long got = Math.max(0, Math.min(count, size - offset));
            throw new MapFormatException(file, location, "read error: got " + got + " of its " + count + " bytes at"
                    + " byte " + offset + ", the file ends at byte " + size + "; the file is truncated");
        }
        if (count == 0) {
            throw new MapFormatException(file, location, "read error: got 0 bytes, expected " + expected
                    + " (its byte count is 0)");
        }
        if (compression == 1) {
            if (count < expected) {
                throw new MapFormatException(file, location, "read error: got " + count + " bytes, expected "
                        + expected);
            }
            return;
        }
        new TiffBlocks(channel, file, location, offset, count, expected, alsoAccepted, compression).decode();
    }

    private void decode() throws MapFormatException {
        long max = Math.max(expected, alsoAccepted);
        long got;
        try {
            got = switch (compression) {
                case 8, 32946 -> inflate(max);
                case 5 -> lzw(max);
                case 32773 -> packBits(max);
                default -> throw new IllegalArgumentException("compression " + compression);
            };
        } catch (Corrupt e) {
            throw new MapFormatException(file, location, "read error: the " + name() + " data are corrupt ("
                    + e.getMessage() + ") after " + e.decoded + " decoded bytes, expected " + expected);
        }
        if (got > max) {
            throw new MapFormatException(file, location, "read error: got more than " + max + " bytes after "
                    + name() + " decompression of its " + count + " bytes, expected " + expected);
        }
        if (got != expected && got != alsoAccepted) {
            throw new MapFormatException(file, location, "read error: got " + got + " bytes after " + name()
                    + " decompression of its " + count + " bytes, expected " + expected);
        }
    }

    private String name() {
        return TiffHeader.compressionName(compression);
    }

    /** Block data that do not follow the rules of their compression. */
    private static final class Corrupt extends Exception {
        private static final long serialVersionUID = 1L;
        final long decoded;

        Corrupt(String message, long decoded) {
            super(message, null, false, false);
            this.decoded = decoded;
        }
    }

    /** The next byte of the block, or -1 at its end. */
    private int next() throws MapFormatException {
        if (!in.hasRemaining() && !fill()) {
            return -1;
        }
        return in.get() & 0xFF;
    }

    /** Reads the next chunk of the block; false at its end. */
    private boolean fill() throws MapFormatException {
        long left = count - read;
        if (left <= 0) {
            return false;
        }
        in.clear().limit((int) Math.min(left, CHUNK));
        try {
            while (in.hasRemaining()) {
                if (channel.read(in, offset + read + in.position()) < 0) {
                    throw new MapFormatException(file, location, "read error: the file ended at byte " + (offset
                            + read + in.position()) + " while reading its " + count + " bytes; it is truncated or"
                            + " changed while being read");
                }
            }
        } catch (MapFormatException e) {
            throw e;
        } catch (IOException e) {
            throw new MapFormatException(file, location, "cannot be read (" + e.getMessage() + ")", "", e);
        }
        read += in.position();
        in.flip();
        return true;
    }

    /** Bytes decoded from zlib-wrapped Deflate data (stops counting past {@code max}). */
    private long inflate(long max) throws MapFormatException, Corrupt {
        Inflater inflater = new Inflater();
        byte[] out = new byte[CHUNK];
        long got = 0;
        try {
            while (got <= max && !inflater.finished()) {
                if (inflater.needsInput()) {
                    if (!fill()) {
                        break; // the data end before the Deflate stream does
                    }
                    inflater.setInput(in.array(), 0, in.limit());
                }
                if (inflater.needsDictionary()) {
                    throw new Corrupt("a preset dictionary is required", got);
                }
                int n = inflater.inflate(out);
                if (n == 0 && !inflater.needsInput() && !inflater.finished() && !inflater.needsDictionary()) {
                    throw new Corrupt("the Deflate stream makes no progress", got);
                }
                got += n;
            }
        } catch (DataFormatException e) {
            throw new Corrupt(e.getMessage() == null ? "invalid Deflate stream" : e.getMessage(), got);
        } finally {
            inflater.end();
        }
        return got;
    }

    /**
     * Bytes decoded from TIFF LZW data: 9- to 12-bit codes, most significant bit first, code 256 clears the table,
     * 257 ends the data, the code width grows one code early (TIFF 6.0, section 13). Data starting with a zero byte
     * and an odd byte are the older bit-reversed variant (least significant bit first, no early change) that some
     * old writers produce and the TwelveMonkeys plugin reads. Only the length of each table entry is kept.
     */
    private long lzw(long max) throws MapFormatException, Corrupt {
        int b0 = next();
        int b1 = next();
        boolean reversed = b0 == 0 && b1 >= 0 && (b1 & 1) == 1; // a clear code written least significant bit first
        in.position(0);
        read = 0;
        in.limit(0);
        int[] length = new int[4096];
        int nextCode = 258;
        int width = 9;
        int previous = -1;
        long got = 0;
        long bits = 0;
        int have = 0;
        while (got <= max) {
            while (have < width) {
                int b = next();
                if (b < 0) {
                    return got; // no end code: the data simply stop, which readers accept
                }
                bits = reversed ? bits | ((long) b << have) : bits << 8 | b;
                have += 8;
            }
            int code;
            if (reversed) {
                code = (int) (bits & ((1 << width) - 1));
                bits >>>= width;
            } else {
                code = (int) (bits >>> (have - width)) & ((1 << width) - 1);
            }
            have -= width;
            if (code == 256) {
                nextCode = 258;
                width = 9;
                previous = -1;
                continue;
            }
            if (code == 257) {
                return got;
            }
            int len;
            if (code < 256) {
                len = 1;
            } else if (previous < 0) {
                throw new Corrupt("code " + code + " where a literal byte must follow a clear code", got);
            } else if (code < nextCode) {
                len = length[code];
            } else if (code == nextCode) {
                len = (previous < 256 ? 1 : length[previous]) + 1;
            } else {
                throw new Corrupt("code " + code + " is not yet defined; the table holds " + nextCode + " codes", got);
            }
            got += len;
            if (previous >= 0) {
                if (nextCode >= 4096) {
                    throw new Corrupt("the code table overflows without a clear code", got);
                }
                length[nextCode++] = (previous < 256 ? 1 : length[previous]) + 1;
                int limit = reversed ? 1 << width : (1 << width) - 1;
                if (nextCode >= limit && width < 12) {
                    width++;
                }
            }
            previous = code;
        }
        return got;
    }

    /** Bytes decoded from PackBits data (TIFF 6.0, section 9): literal runs, repeated bytes, -128 a no-op. */
    private long packBits(long max) throws MapFormatException {
        long got = 0;
        int h;
        while (got <= max && (h = next()) >= 0) {
            byte n = (byte) h;
            if (n >= 0) {
                int literal = n + 1;
                for (int i = 0; i < literal; i++) {
                    if (next() < 0) {
                        return got; // the data end inside a literal run
                    }
                    got++;
                }
            } else if (n != -128) {
                if (next() < 0) {
                    return got;
                }
                got += 1 - n;
            }
        }
        return got;
    }
}
