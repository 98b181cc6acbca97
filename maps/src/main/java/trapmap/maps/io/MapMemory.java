package trapmap.maps.io;

import java.io.IOException;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.List;
import java.util.Locale;

/**
 * Memory a map needs while it is read and processed, estimated before it is read, and the one-line advice given
 * when Java runs out of memory. The estimate comes from the TIFF header (width × height of every page, read without
 * the samples) or, for CSV files, from the file size; it is a planning figure, not a measurement.
 *
 * <p>{@link #MAP_BYTES_PER_PIXEL}: a map of n pixels holds its samples (4n bytes); converting it to one quantity
 * adds that plane and one byte each for status and warning codes (4n + 2n); statistics, masks and region labels add
 * a few planes more. {@link #INSPECTION_BYTES_PER_PIXEL}: batch inspection also keeps the evaluated pixels' indices,
 * packed lifetimes, densities and statuses, an OK-only copy and region labels; an 8192² map needed more than 2 GB and
 * less than 2.5 GB of heap. {@code scripts/bench-memory} measures the peaks on an 8192² map.
 */
public final class MapMemory {
    /** Working memory of one map being read, converted and summarised, bytes per pixel (all pages together). */
    public static final long MAP_BYTES_PER_PIXEL = 24;
    /**
     * Working memory of {@code convert} to a TIFF file, bytes per pixel: it converts and writes bands of rows, so at
     * most the input is whole (4 bytes a pixel, when it cannot be read band by band: see
     * {@link MapStream#open}); the bands take a few MB per thread whatever the map's size.
     */
    public static final long STREAMED_CONVERT_BYTES_PER_PIXEL = 4;
    /** Working memory of one map in batch inspection, bytes per pixel. */
    public static final long INSPECTION_BYTES_PER_PIXEL = 36;
    /**
     * CSV text bytes per pixel assumed when estimating a CSV map's pixels from its file size (a short number and a
     * separator; point lists take more, so the estimate errs on the large side).
     */
    public static final long CSV_BYTES_PER_PIXEL = 4;

    private static final long MIB = 1L << 20;
    private static final long GIB = 1L << 30;

    private MapMemory() {
    }

    /**
     * The size of a map file before it is read.
     *
     * @param width  width of the largest page, pixels (0 when unknown, e.g. CSV)
     * @param height height of the largest page, pixels (0 when unknown)
     * @param pixels pixels of all pages together (estimated from the file size for CSV files)
     */
    public record Size(int width, int height, long pixels) {
        /** Working memory to read and process the map at {@code bytesPerPixel}, bytes. */
        public long workingBytes(long bytesPerPixel) {
            return pixels * bytesPerPixel;
        }

        /** E.g. {@code 8192×8192 pixels} or {@code about 1000000 pixels}. */
        public String describe() {
            return width > 0 && height > 0 ? width + "×" + height + " pixels" : "about " + pixels + " pixels";
        }
    }

    /**
     * The size of {@code file} from its TIFF header (a few kilobytes read) or, for other files, from its length;
     * null when the file cannot be examined (missing, not a regular file, a TIFF header the reader refuses): the
     * reader then gives the reason.
     */
    public static Size estimate(Path file) {
        try {
            if (!Files.isRegularFile(file)) {
                return null;
            }
            long size = Files.size(file);
            if (MapFiles.formatOf(file) != MapFiles.Format.CSV && looksLikeTiff(file)) {
                ReadOptions unlimited = ReadOptions.DEFAULTS.withMaxPixels(ReadOptions.MAX_PIXELS_LIMIT)
                        .withMaxFileBytes(Long.MAX_VALUE);
                List<TiffHeader.Page> pages;
                try (FileChannel ch = FileChannel.open(file, StandardOpenOption.READ)) {
                    pages = TiffHeader.scan(ch, size, file.toString(), unlimited);
                }
                long pixels = 0;
                TiffHeader.Page largest = null;
                for (TiffHeader.Page p : pages) {
                    long n = (long) p.width() * p.height();
                    pixels += n;
                    if (largest == null || n > (long) largest.width() * largest.height()) {
                        largest = p;
                    }
                }
                return largest == null ? null : new Size(largest.width(), largest.height(), pixels);
            }
            return new Size(0, 0, Math.max(1, size / CSV_BYTES_PER_PIXEL));
        } catch (IOException | RuntimeException e) {
            return null;
        }
    }

    private static boolean looksLikeTiff(Path file) throws IOException {
        byte[] head = new byte[4];
        int got;
        try (var in = Files.newInputStream(file)) {
            got = in.readNBytes(head, 0, head.length);
        }
        return TiffHeader.looksLikeTiff(java.util.Arrays.copyOf(head, got));
    }

    /**
     * The heap option to try when {@code neededBytes} did not fit: a whole number of GiB, at least the estimate
     * plus a quarter for the Java runtime and at least twice the present maximum heap, e.g. {@code -Xmx2g}.
     */
    public static String heapAdvice(long neededBytes) {
        long want = Math.max(neededBytes + neededBytes / 4, 2 * Runtime.getRuntime().maxMemory());
        return "-Xmx" + Math.max(1, (want + GIB - 1) / GIB) + "g";
    }

    /** A byte count in words, e.g. {@code 1.3 GB} (binary units: GB = 2^30 bytes, MB = 2^20 bytes). */
    public static String describeBytes(long bytes) {
        if (bytes >= GIB) {
            return String.format(Locale.ROOT, "%.1f GB", bytes / (double) GIB);
        }
        return String.format(Locale.ROOT, "%d MB", Math.max(1, (bytes + MIB - 1) / MIB));
    }

    /**
     * The reason an out-of-memory failure while processing {@code file} gives, one line without the command's name:
     * {@code out of memory while processing big.tif (8192×8192 pixels need about 1.5 GB; the maximum heap is
     * 1.0 GB; run with JAVA_OPTS=-Xmx2g)}; {@code size} may be null when unknown; the need is {@code bytesPerPixel}
     * per pixel ({@link #MAP_BYTES_PER_PIXEL} or {@link #INSPECTION_BYTES_PER_PIXEL}).
     */
    public static String outOfMemory(String file, Size size, long bytesPerPixel) {
        long max = Runtime.getRuntime().maxMemory();
        StringBuilder b = new StringBuilder("out of memory while processing ").append(file).append(" (");
        if (size != null) {
            b.append(size.describe()).append(" need about ").append(describeBytes(size.workingBytes(bytesPerPixel)))
                    .append("; ");
        }
        b.append("the maximum heap is ").append(describeBytes(max)).append("; run with JAVA_OPTS=")
                .append(heapAdvice(size == null ? max : size.workingBytes(bytesPerPixel)))
                .append(')');
        return b.toString();
    }
}
