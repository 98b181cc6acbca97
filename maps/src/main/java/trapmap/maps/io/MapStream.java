package trapmap.maps.io;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.List;
import trapmap.maps.model.MapHeader;
import trapmap.maps.model.WaferMap;

/**
 * A map read band by band: its header first, then any rows on demand, so that a command that treats pixels one by
 * one (a conversion) holds a few bands instead of the whole map. A single-page TIFF file of uncompressed 32-bit float
 * strips is read straight from the file ({@link #open}); every other map is read whole, as {@link MapFiles#read}
 * reads it, and handed out in bands ({@link #of}). Both give the samples and header {@link MapFiles#read} gives, bit
 * for bit: the file passes the same checks first, and each band goes through the same per-sample steps (no-data
 * value, unit).
 * Bands may be read from several threads at once, each through its own {@link #reader}.
 */
public final class MapStream implements AutoCloseable {
    private final String name;
    private final MapHeader header;
    private final FileChannel channel;
    private final TiffHeader.Page page;
    private final MapBuilder.Plan plan;
    private final float[] samples;

    private MapStream(String name, MapHeader header, FileChannel channel, TiffHeader.Page page, MapBuilder.Plan plan,
                      float[] samples) {
        this.name = name;
        this.header = header;
        this.channel = channel;
        this.page = page;
        this.plan = plan;
        this.samples = samples;
    }

    /** A map already in memory, handed out in bands (its samples are not copied). */
    public static MapStream of(WaferMap map) {
        return new MapStream(map.provenance().source(), MapHeader.of(map), null, null, null, map.raster().samples());
    }

    /**
     * The map in {@code file} (its first page), read band by band when it is a single-page TIFF file of uncompressed
     * 32-bit float strips, else read whole as {@link MapFiles#read} reads it (its structure checked once, its blocks
     * decoded once). The file passes every check {@link MapFiles#read} makes before its samples are read; a map whose
     * sidecar names a no-data value is read once more here, to count those pixels for its history.
     *
     * @throws MapFormatException for any reason the file cannot be read, naming file, place and unit
     */
    public static MapStream open(Path file) throws MapFormatException {
        String name = file.toString();
        ReadOptions options = ReadOptions.DEFAULTS;
        FileChannel ch = null;
        try {
            MapFiles.Opened o = MapFiles.open(file, name, options);
            if (o.format() != MapFiles.Format.TIFF) {
                return of(MapFiles.readOpened(MapSource.of(file), name, options, o, null).get(0));
            }
            ch = FileChannel.open(file, StandardOpenOption.READ);
            List<TiffHeader.Page> pages = TiffHeader.scan(ch, o.size(), name, options);
            if (pages.size() != 1 || pages.get(0).strips() == null) {
                ch.close();
                ch = null;
                return of(MapFiles.readOpened(MapSource.of(file), name, options, o, pages).get(0)); // checked once, decoded once
            }
            TiffHeader.Page p = pages.get(0);
            MapBuilder.Raw raw = MapFiles.tiffRaw(p, null, "direct", TiffMaps.embedded(p, name), o.source(), 0, 1);
            MapBuilder.Plan plan = MapBuilder.plan(raw, name, o.source(), o.stem(), o.sidecar(), o.sidecarName(), 0,
                    1, options);
            if (plan.countsNoData()) {
                plan = plan.withNoDataPixels(countNoData(ch, p, plan));
            }
            MapStream s = new MapStream(name, plan.header(), ch, p, plan, null);
            ch = null;
            return s;
        } catch (IOException | RuntimeException | OutOfMemoryError e) {
            throw MapFiles.readFailure(name, e);
        } finally {
            if (ch != null) {
                try {
                    ch.close();
                } catch (IOException e) {
                    // nothing was read through it that could be lost
                }
            }
        }
    }

    private static int countNoData(FileChannel ch, TiffHeader.Page p, MapBuilder.Plan plan) throws IOException {
        int rows = bandRows(p.width());
        float[] band = new float[rows * p.width()];
        ByteBuffer buf = TiffMaps.directBuffer(p, rows);
        int n = 0;
        for (int row = 0; row < p.height(); row += rows) {
            int r = Math.min(rows, p.height() - row);
            TiffMaps.directRows(ch, p, row, r, band, 0, buf);
            n += plan.countNoData(band, 0, r * p.width());
        }
        return n;
    }

    /** Rows of about 1 Mi pixels (at least one row) for a map {@code width} pixels wide. */
    public static int bandRows(int width) {
        return Math.max(1, (1 << 20) / width);
    }

    /** The map's header: what {@link MapFiles#read} gives but the samples. */
    public MapHeader header() {
        return header;
    }

    public int width() {
        return header.width();
    }

    public int height() {
        return header.height();
    }

    /** True when the rows come from the file as they are asked for; false when the whole map is in memory. */
    public boolean streamed() {
        return channel != null;
    }

    /** A reader of bands of up to {@code maxRows} rows; one per thread. */
    public Reader reader(int maxRows) {
        return new Reader(channel == null ? null : TiffMaps.directBuffer(page, Math.max(1, maxRows)));
    }

    /** Reads bands of rows for one thread. */
    public final class Reader {
        private final ByteBuffer buffer;

        private Reader(ByteBuffer buffer) {
            this.buffer = buffer;
        }

        /**
         * Rows {@code [row0, row0 + rows)} into {@code out} from index 0, as {@link MapFiles#read} gives them.
         *
         * @throws MapFormatException when the file cannot be read or a sample leaves the float range in a unit
         *                            conversion, naming file and place
         */
        public void read(int row0, int rows, float[] out) throws MapFormatException {
            int w = header.width();
            if (row0 < 0 || rows < 0 || row0 + rows > header.height() || out.length < rows * w) {
                throw new IllegalArgumentException("rows " + row0 + "+" + rows + " of " + header.height()
                        + " into " + out.length + " samples");
            }
            if (channel == null) {
                System.arraycopy(samples, row0 * w, out, 0, rows * w);
                return;
            }
            try {
                TiffMaps.directRows(channel, page, row0, rows, out, 0, buffer);
            } catch (IOException e) {
                throw new MapFormatException(name, null, "cannot be read (" + e.getMessage() + ")", "", e);
            }
            plan.apply(out, 0, rows * w, (long) row0 * w);
        }
    }

    @Override
    public void close() throws IOException {
        if (channel != null) {
            channel.close();
        }
    }
}
