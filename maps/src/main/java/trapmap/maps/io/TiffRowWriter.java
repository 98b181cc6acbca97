package trapmap.maps.io;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.channels.FileChannel;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.concurrent.atomic.AtomicLong;
import trapmap.maps.model.MapHeader;

/**
 * Writes a single-page TIFF map band by band: the header and metadata first, then rows in any order, from any
 * number of threads. The file is the one {@link MapFiles#write} writes for the same map (uncompressed, byte for
 * byte), and is written atomically ({@link AtomicFiles}): the target appears complete or not at all, also when the
 * bands fail half-way. While rows are written, every {@value #FLUSH_BYTES} bytes a background thread hands what is
 * written so far to the disk ({@link FileChannel#force}), so that the disk writes overlap the conversion instead of
 * all waiting for the final flush of {@link AtomicFiles} (which still flushes everything before the rename).
 */
public final class TiffRowWriter {
    private final FileChannel channel;
    private final MapHeader header;
    private final long dataPos;
    private final ThreadLocal<ByteBuffer> chunk = ThreadLocal.withInitial(
            () -> ByteBuffer.allocateDirect(FastTiffWriter.CHUNK).order(ByteOrder.LITTLE_ENDIAN));

    /** Bytes written between two background flushes. */
    static final long FLUSH_BYTES = 16L << 20;

    private final long flushBytes;
    private final AtomicLong sinceFlush = new AtomicLong();
    private final AtomicBoolean flushing = new AtomicBoolean();

    private TiffRowWriter(FileChannel channel, MapHeader header, long dataPos, long flushBytes) {
        this.channel = channel;
        this.header = header;
        this.dataPos = dataPos;
        this.flushBytes = flushBytes;
    }

    /** Writes the rows of a map. */
    @FunctionalInterface
    public interface Rows {
        void writeTo(TiffRowWriter out) throws IOException;
    }

    /**
     * Writes {@code target} (.tif or .tiff) with the map of {@code header}, whose rows {@code rows} writes; every row
     * must be written once.
     *
     * @throws MapFormatException when the target is not a TIFF file name
     * @throws IOException        from writing or from {@code rows}; the target is then unchanged
     */
    public static void write(Path target, MapHeader header, Rows rows) throws IOException {
        write(target, header, rows, FLUSH_BYTES);
    }

    /** {@link #write(Path, MapHeader, Rows)} with a background flush every {@code flushBytes} bytes. */
    static void write(Path target, MapHeader header, Rows rows, long flushBytes) throws IOException {
        if (MapFiles.formatOf(target) != MapFiles.Format.TIFF) {
            throw new MapFormatException(target.toString(), null, "band-wise writing makes TIFF files only (.tif,"
                    + " .tiff)");
        }
        AtomicFiles.write(target, tmp -> {
            try (FileChannel ch = FileChannel.open(tmp, StandardOpenOption.WRITE,
                    StandardOpenOption.TRUNCATE_EXISTING, StandardOpenOption.CREATE)) {
                FastTiffWriter.writeFully(ch, FastTiffWriter.fileHeader(), 0);
                FastTiffWriter.Page page = FastTiffWriter.page(header, 8, true, target);
                FastTiffWriter.writeFully(ch, page.ifd(), 8);
                rows.writeTo(new TiffRowWriter(ch, header, page.dataPos(), flushBytes));
            }
        });
    }

    /** Writes {@code rows} rows from {@code row0} on, taken from {@code samples} from index 0; thread-safe. */
    public void write(int row0, int rows, float[] samples) throws IOException {
        int w = header.width();
        if (row0 < 0 || rows < 0 || row0 + rows > header.height() || samples.length < rows * w) {
            throw new IllegalArgumentException("rows " + row0 + "+" + rows + " of " + header.height() + " from "
                    + samples.length + " samples");
        }
        FastTiffWriter.writeSamples(channel, samples, 0, rows * w, dataPos + 4L * w * row0, chunk.get());
        if (sinceFlush.addAndGet(4L * w * rows) >= flushBytes && flushing.compareAndSet(false, true)) {
            sinceFlush.set(0);
            Thread t = new Thread(this::flush, "tiff-flush");
            t.setDaemon(true);
            t.start();
        }
    }

    /** Hands the rows written so far to the disk; a failure here is found again by the final flush. */
    private void flush() {
        try {
            channel.force(false);
        } catch (IOException | RuntimeException e) {
            // the final flush before the rename reports it (or the channel is already closed: the file is done)
        } finally {
            flushing.set(false);
        }
    }
}
