package trapmap.maps.io;

import com.fasterxml.jackson.databind.JsonNode;
import java.awt.Transparency;
import java.awt.color.ColorSpace;
import java.awt.image.BufferedImage;
import java.awt.image.ColorModel;
import java.awt.image.ComponentColorModel;
import java.awt.image.ComponentSampleModel;
import java.awt.image.DataBuffer;
import java.awt.image.DataBufferFloat;
import java.awt.image.PixelInterleavedSampleModel;
import java.awt.image.Raster;
import java.awt.image.SampleModel;
import java.awt.image.WritableRaster;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import javax.imageio.IIOImage;
import javax.imageio.ImageIO;
import javax.imageio.ImageReader;
import javax.imageio.ImageTypeSpecifier;
import javax.imageio.ImageWriteParam;
import javax.imageio.ImageWriter;
import javax.imageio.metadata.IIOMetadata;
import javax.imageio.plugins.tiff.BaselineTIFFTagSet;
import javax.imageio.plugins.tiff.TIFFDirectory;
import javax.imageio.plugins.tiff.TIFFField;
import javax.imageio.plugins.tiff.TIFFTag;
import javax.imageio.spi.IIORegistry;
import javax.imageio.spi.ImageReaderSpi;
import javax.imageio.stream.FileImageOutputStream;
import javax.imageio.stream.ImageInputStream;
import javax.imageio.stream.ImageOutputStream;
import trapmap.maps.model.WaferMap;

/**
 * TIFF maps through ImageIO. Reading: the structure is checked first ({@link TiffHeader}), then each page is decoded
 * by the JDK's TIFF plugin ({@code read(i).getRaster()}); pages the JDK plugin cannot decode (float samples with a
 * horizontal or floating-point predictor) go to the TwelveMonkeys plugin ({@code readRaster(i, null)}). Both plugins
 * are selected by class, never through {@code ImageIO.read}, which would pick TwelveMonkeys' image path and clamp
 * float samples. Writing: 32-bit float with the map's metadata as JSON in ImageDescription (tag 270) and the pitch
 * in X/YResolution (282/283, ResolutionUnit 296 = centimetre); uncompressed files are written directly by
 * {@link FastTiffWriter}, compressed ones by the JDK plugin.
 */
final class TiffMaps {
    static final String JDK_READER = "com.sun.imageio.plugins.tiff.TIFFImageReaderSpi";
    static final String JDK_WRITER = "com.sun.imageio.plugins.tiff.TIFFImageWriter";
    static final String SOFTWARE = "trapmap";

    private TiffMaps() {
    }

    /**
     * A decoded page: its header, raw samples (integer samples as exact float values, no scaling yet), the decoder
     * used and the metadata embedded in its ImageDescription (null when there is none trapmap understands).
     */
    record Decoded(TiffHeader.Page page, float[] samples, String decoder, Sidecar embedded) {
    }

    static List<Decoded> read(MapSource file, String name, long size, ReadOptions options) throws MapFormatException {
        List<TiffHeader.Page> pages;
        try (FileChannel ch = file.channel()) {
            pages = TiffHeader.scan(ch, size, name, options);
        } catch (MapFormatException e) {
            throw e;
        } catch (IOException e) {
            throw new MapFormatException(name, null, "cannot be read (" + e.getMessage() + ")", "", e);
        }
        return read(file, name, pages);
    }

    /** The pages of {@code file}, already scanned and checked by {@link TiffHeader#scan}. */
    static List<Decoded> read(MapSource file, String name, List<TiffHeader.Page> pages) throws MapFormatException {
        List<Decoded> out = new ArrayList<>(pages.size());
        ImageReader jdk = null;
        ImageReader fallback = null;
        ImageInputStream in = null; // opened for the first page that the direct path does not read
        try {
            for (TiffHeader.Page p : pages) {
                Sidecar embedded = embedded(p, name);
                boolean jdkCannot = p.type() == TiffHeader.SampleType.FLOAT32 && p.predictor() != 1;
                if (p.strips() != null) {
                    try {
                        out.add(new Decoded(p, direct(file, p), "direct", embedded));
                        continue;
                    } catch (OutOfMemoryError e) {
                        throw outOfMemory(name, p, e);
                    }
                }
                float[] samples = null;
                String decoder;
                Exception jdkFailure = null;
                if (!jdkCannot) {
                    if (jdk == null) {
                        in = file.images();
                        jdk = reader(JDK_READER);
                        jdk.setInput(in, false, true);
                    }
                    try {
                        samples = samples(jdk.read(p.ifdIndex(), null).getRaster(), p, name);
                    } catch (MapFormatException e) {
                        throw e;
                    } catch (IOException | RuntimeException e) {
                        jdkFailure = e;
                    } catch (OutOfMemoryError e) {
                        throw outOfMemory(name, p, e);
                    }
                }
                decoder = "jdk";
                if (samples == null) {
                    if (fallback == null) {
                        fallback = new com.twelvemonkeys.imageio.plugins.tiff.TIFFImageReaderSpi()
                                .createReaderInstance();
                    }
                    decoder = "twelvemonkeys";
                    try (ImageInputStream in2 = file.images()) {
                        fallback.setInput(in2, false, true);
                        samples = samples(fallback.readRaster(p.ifdIndex(), null), p, name);
                    } catch (MapFormatException e) {
                        throw e;
                    } catch (IOException | RuntimeException e) {
                        Exception shown = jdkFailure != null ? jdkFailure : e;
                        throw new MapFormatException(name, "page " + p.number(), "the image data ("
                                + p.type().label + ", " + p.compressionName() + " compression) cannot be decoded: "
                                + describe(shown), "", shown);
                    } catch (OutOfMemoryError e) {
                        throw outOfMemory(name, p, e);
                    } finally {
                        fallback.setInput(null);
                    }
                }
                out.add(new Decoded(p, samples, decoder, embedded));
            }
            if (in != null) {
                in.close(); // a failure here as from the try-with-resources it replaces
                in = null;
            }
        } catch (MapFormatException e) {
            throw e;
        } catch (IOException e) {
            throw new MapFormatException(name, null, "cannot be read (" + e.getMessage() + ")", "", e);
        } finally {
            if (jdk != null) {
                jdk.dispose();
            }
            if (fallback != null) {
                fallback.dispose();
            }
            closeQuietly(in);
        }
        return out;
    }

    /**
     * The samples of an uncompressed 32-bit float page straight from its strips (checked by {@link TiffHeader}: each
     * lies inside the file and holds its rows), in large blocks with the file's byte order: the values the JDK plugin
     * decodes, bit for bit, without its per-sample copying.
     */
    static float[] direct(MapSource file, TiffHeader.Page p) throws IOException {
        float[] out = new float[p.width() * p.height()];
        ByteBuffer buf = READ_BUFFER.get().order(p.strips().order());
        try (FileChannel ch = file.channel()) {
            directRows(ch, p, 0, p.height(), out, 0, buf);
        }
        return out;
    }

    /**
     * The buffer of {@link #direct} on each thread (1 MiB of native memory, kept for the thread's next file): a new
     * direct buffer per file is zeroed and later freed, which cost a quarter of reading a 4 MiB map.
     */
    private static final ThreadLocal<ByteBuffer> READ_BUFFER = ThreadLocal.withInitial(
            () -> ByteBuffer.allocateDirect(1 << 20));

    /** Closes {@code in} (null: nothing) after another failure, which is the one reported. */
    private static void closeQuietly(ImageInputStream in) {
        if (in != null) {
            try {
                in.close();
            } catch (IOException e) {
                // the failure being reported is the other one
            }
        }
    }

    /** A buffer for {@link #directRows} of up to {@code rows} rows of page {@code p}: at most 1 MiB, native memory. */
    static ByteBuffer directBuffer(TiffHeader.Page p, int rows) {
        return ByteBuffer.allocateDirect((int) Math.min(1 << 20, 4L * p.width() * rows)).order(p.strips().order());
    }

    /**
     * Rows {@code [row0, row0 + rows)} of an uncompressed 32-bit float page straight from its strips into
     * {@code out} from index {@code at}, through {@code buf} ({@link #directBuffer}); safe to call from several
     * threads at once with their own buffers.
     */
    static void directRows(FileChannel ch, TiffHeader.Page p, int row0, int rows, float[] out, int at,
                           ByteBuffer buf) throws IOException {
        int w = p.width();
        TiffHeader.Strips strips = p.strips();
        int rps = strips.rowsPerStrip();
        int row = row0;
        int end = row0 + rows;
        int to = at;
        while (row < end) {
            int strip = row / rps;
            int inStrip = Math.min(end, (strip + 1) * rps) - row;
            long pos = strips.offsets()[strip] + 4L * w * (row - (long) strip * rps);
            long left = 4L * w * inStrip;
            while (left > 0) {
                int n = (int) Math.min(left, buf.capacity() & ~3);
                buf.clear().limit(n);
                while (buf.hasRemaining()) {
                    if (ch.read(buf, pos + buf.position()) < 0) {
                        throw new IOException("the file ended at byte " + (pos + buf.position()));
                    }
                }
                buf.flip();
                buf.asFloatBuffer().get(out, to, n / 4);
                to += n / 4;
                pos += n;
                left -= n;
            }
            row += inStrip;
        }
    }

    private static MapFormatException outOfMemory(String name, TiffHeader.Page p, OutOfMemoryError e) {
        return new MapFormatException(name, "page " + p.number(), "not enough memory to decode " + p.width() + " × "
                + p.height() + " pixels; give Java more memory (-Xmx) or read smaller files", "", e);
    }

    /**
     * What a decoder's failure says: the message of an I/O failure; for a runtime exception inside a plugin (a null
     * pointer, an index out of bounds on invalid data) no JDK text, which would mean nothing to the user — the cause
     * keeps it for logs.
     */
    static String describe(Throwable e) {
        String m = e.getMessage();
        if (e instanceof RuntimeException || m == null || m.isBlank()) {
            return "the decoder stopped on invalid data";
        }
        return MapFormatException.oneLine(m);
    }

    /** The reader of the plugin whose service provider has class {@code spiClass}. */
    private static ImageReader reader(String spiClass) throws IOException {
        Iterator<ImageReaderSpi> it = IIORegistry.getDefaultInstance().getServiceProviders(ImageReaderSpi.class,
                true);
        while (it.hasNext()) {
            ImageReaderSpi spi = it.next();
            if (spi.getClass().getName().equals(spiClass)) {
                return spi.createReaderInstance();
            }
        }
        throw new IOException("the TIFF reader " + spiClass + " is not available in this Java runtime");
    }

    /** The samples of band 0 as floats (the raster's own array when its layout allows). */
    private static float[] samples(Raster r, TiffHeader.Page p, String name) throws MapFormatException {
        int w = p.width();
        int h = p.height();
        if (r.getWidth() != w || r.getHeight() != h || r.getNumBands() < 1) {
            throw new MapFormatException(name, "page " + p.number(), "the decoder returned " + r.getWidth() + " × "
                    + r.getHeight() + " pixels with " + r.getNumBands() + " bands; the header says " + w + " × " + h);
        }
        DataBuffer db = r.getDataBuffer();
        SampleModel sm = r.getSampleModel();
        if (db instanceof DataBufferFloat f && sm instanceof ComponentSampleModel c && db.getNumBanks() == 1
                && c.getNumBands() == 1 && c.getPixelStride() == 1 && c.getScanlineStride() == w
                && c.getBandOffsets()[0] == 0 && f.getOffset() == 0 && f.getData().length == w * h
                && r.getSampleModelTranslateX() == 0 && r.getSampleModelTranslateY() == 0) {
            return f.getData();
        }
        float[] out = new float[w * h];
        int x0 = r.getMinX();
        int y0 = r.getMinY();
        if (db.getDataType() == DataBuffer.TYPE_FLOAT || db.getDataType() == DataBuffer.TYPE_DOUBLE) {
            float[] row = new float[w];
            for (int y = 0; y < h; y++) {
                r.getSamples(x0, y0 + y, w, 1, 0, row);
                System.arraycopy(row, 0, out, y * w, w);
            }
        } else {
            int[] row = new int[w];
            for (int y = 0; y < h; y++) {
                r.getSamples(x0, y0 + y, w, 1, 0, row);
                for (int x = 0; x < w; x++) {
                    out[y * w + x] = row[x];
                }
            }
        }
        return out;
    }

    /** The metadata in the page's ImageDescription when it is JSON in (or close to) the sidecar schema. */
    static Sidecar embedded(TiffHeader.Page p, String name) throws MapFormatException {
        String d = p.description();
        if (d == null || !d.trim().startsWith("{")) {
            return null;
        }
        JsonNode tree;
        try {
            tree = Sidecar.JSON.readTree(d);
        } catch (IOException | RuntimeException e) {
            return null; // a description in some other notation: not ours
        }
        if (tree == null || !tree.isObject()) {
            return null;
        }
        JsonNode format = tree.get("format");
        boolean ours = format != null && format.asText().startsWith("trapmap-map/");
        boolean schemaLike = false;
        for (String k : Sidecar.topLevelKeys()) {
            if (tree.has(k) && !k.equals("format") && !k.equals("history") && !k.equals("pages")) {
                schemaLike = true;
            }
        }
        if (!ours && !schemaLike) {
            return null;
        }
        try {
            return Sidecar.parse(d, name);
        } catch (MapFormatException e) {
            throw new MapFormatException(name, "page " + p.number() + ", " + TiffHeader.tagName(
                    TiffHeader.IMAGE_DESCRIPTION) + (e.location() == null ? "" : ", " + e.location()), e.problem(),
                    e.unit(), e);
        }
    }

    // ---------------------------------------------------------------------------------------------------- writing

    /** Writes float TIFF pages with the JDK plugin. */
    static void writeWithImageIo(List<WaferMap> maps, Path target, WriteOptions.TiffCompression compression)
            throws IOException {
        ImageWriter writer = jdkWriter();
        try (ImageOutputStream out = new FileImageOutputStream(target.toFile())) {
            writer.setOutput(out);
            ImageWriteParam param = writer.getDefaultWriteParam();
            if (compression != WriteOptions.TiffCompression.NONE) {
                param.setCompressionMode(ImageWriteParam.MODE_EXPLICIT);
                param.setCompressionType(switch (compression) {
                    case DEFLATE -> "ZLib";
                    case LZW -> "LZW";
                    case PACKBITS -> "PackBits";
                    case NONE -> throw new IllegalStateException();
                });
            }
            if (maps.size() == 1) {
                writer.write(null, image(writer, maps.get(0), param), param);
            } else {
                writer.prepareWriteSequence(null);
                for (WaferMap m : maps) {
                    writer.writeToSequence(image(writer, m, param), param);
                }
                writer.endWriteSequence();
            }
        } finally {
            writer.dispose();
        }
    }

    private static ImageWriter jdkWriter() throws IOException {
        for (Iterator<ImageWriter> it = ImageIO.getImageWritersByFormatName("tiff"); it.hasNext();) {
            ImageWriter w = it.next();
            if (w.getClass().getName().equals(JDK_WRITER)) {
                return w;
            }
            w.dispose();
        }
        throw new IOException("the JDK TIFF writer is not available in this Java runtime");
    }

    private static IIOImage image(ImageWriter writer, WaferMap m, ImageWriteParam param) throws IOException {
        int w = m.width();
        int h = m.height();
        DataBufferFloat db = new DataBufferFloat(m.raster().samples(), w * h);
        SampleModel sm = new PixelInterleavedSampleModel(DataBuffer.TYPE_FLOAT, w, h, 1, w, new int[] {0});
        WritableRaster raster = Raster.createWritableRaster(sm, db, null);
        ColorModel cm = new ComponentColorModel(ColorSpace.getInstance(ColorSpace.CS_GRAY), false, false,
                Transparency.OPAQUE, DataBuffer.TYPE_FLOAT);
        BufferedImage img = new BufferedImage(cm, raster, false, null);
        IIOMetadata meta = writer.getDefaultImageMetadata(new ImageTypeSpecifier(img), param);
        TIFFDirectory dir = TIFFDirectory.createFromMetadata(meta);
        BaselineTIFFTagSet base = BaselineTIFFTagSet.getInstance();
        dir.addTIFFField(new TIFFField(base.getTag(TiffHeader.IMAGE_DESCRIPTION), TIFFTag.TIFF_ASCII, 1,
                new String[] {Sidecar.toJson(m)}));
        dir.addTIFFField(new TIFFField(base.getTag(TiffHeader.SOFTWARE), TIFFTag.TIFF_ASCII, 1,
                new String[] {SOFTWARE}));
        long[] res = resolution(m.grid().pitchMm());
        if (res != null) {
            dir.addTIFFField(new TIFFField(base.getTag(TiffHeader.X_RESOLUTION), TIFFTag.TIFF_RATIONAL, 1,
                    new long[][] {res}));
            dir.addTIFFField(new TIFFField(base.getTag(TiffHeader.Y_RESOLUTION), TIFFTag.TIFF_RATIONAL, 1,
                    new long[][] {res}));
            dir.addTIFFField(new TIFFField(base.getTag(TiffHeader.RESOLUTION_UNIT), 3));
        }
        return new IIOImage(img, null, dir.getAsMetadata());
    }

    /**
     * Pixels per centimetre for a pitch in mm as a TIFF rational {numerator, denominator} (denominator a power of
     * ten up to 10⁶), or null when the pitch is outside what a rational of 32-bit parts can express.
     */
    static long[] resolution(double pitchMm) {
        double perCm = 10 / pitchMm;
        for (long den = 1_000_000; den >= 1; den /= 10) {
            double num = Math.rint(perCm * den);
            if (num <= 0xFFFFFFFFL) {
                return num >= 1 ? new long[] {(long) num, den} : null;
            }
        }
        return null;
    }
}
