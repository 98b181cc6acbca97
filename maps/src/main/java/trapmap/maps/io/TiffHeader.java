package trapmap.maps.io;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.channels.FileChannel;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;

/**
 * Reads and checks the structure of a classic TIFF file before any image decoder sees it: the chain of image file
 * directories (IFDs), the tags that size the image and locate its data, and the few descriptive tags trapmap uses.
 * Everything that a decoder would trust — sizes, counts, offsets — is checked against the file length and the
 * limits of {@link ReadOptions}, so that a truncated, tampered or oversized file is refused with a message naming
 * the page, tag and byte offset instead of making a decoder allocate or read past the end. Each strip or tile is
 * then decoded once by {@link TiffBlocks} to check that it yields exactly the bytes of its pixels, since decoders
 * fill missing data with zeros.
 */
final class TiffHeader {
    /** Most pages (IFDs) followed. */
    static final int MAX_PAGES = 4096;
    /** Most entries in one IFD. */
    static final int MAX_ENTRIES = 4096;
    /** Most strips or tiles of one image. */
    static final int MAX_BLOCKS = 1 << 20;
    /** Longest ImageDescription read, bytes. */
    static final int MAX_DESCRIPTION_BYTES = 16 << 20;

    static final int NEW_SUBFILE_TYPE = 254;
    static final int IMAGE_WIDTH = 256;
    static final int IMAGE_LENGTH = 257;
    static final int BITS_PER_SAMPLE = 258;
    static final int COMPRESSION = 259;
    static final int PHOTOMETRIC = 262;
    static final int IMAGE_DESCRIPTION = 270;
    static final int STRIP_OFFSETS = 273;
    static final int SAMPLES_PER_PIXEL = 277;
    static final int ROWS_PER_STRIP = 278;
    static final int STRIP_BYTE_COUNTS = 279;
    static final int X_RESOLUTION = 282;
    static final int Y_RESOLUTION = 283;
    static final int PLANAR_CONFIGURATION = 284;
    static final int RESOLUTION_UNIT = 296;
    static final int SOFTWARE = 305;
    static final int PREDICTOR = 317;
    static final int TILE_WIDTH = 322;
    static final int TILE_LENGTH = 323;
    static final int TILE_OFFSETS = 324;
    static final int TILE_BYTE_COUNTS = 325;
    static final int SAMPLE_FORMAT = 339;

    private static final Map<Integer, String> NAMES = Map.ofEntries(
            Map.entry(NEW_SUBFILE_TYPE, "NewSubfileType"), Map.entry(IMAGE_WIDTH, "ImageWidth"),
            Map.entry(IMAGE_LENGTH, "ImageLength"), Map.entry(BITS_PER_SAMPLE, "BitsPerSample"),
            Map.entry(COMPRESSION, "Compression"), Map.entry(PHOTOMETRIC, "PhotometricInterpretation"),
            Map.entry(IMAGE_DESCRIPTION, "ImageDescription"), Map.entry(STRIP_OFFSETS, "StripOffsets"),
            Map.entry(SAMPLES_PER_PIXEL, "SamplesPerPixel"), Map.entry(ROWS_PER_STRIP, "RowsPerStrip"),
            Map.entry(STRIP_BYTE_COUNTS, "StripByteCounts"), Map.entry(X_RESOLUTION, "XResolution"),
            Map.entry(Y_RESOLUTION, "YResolution"), Map.entry(PLANAR_CONFIGURATION, "PlanarConfiguration"),
            Map.entry(RESOLUTION_UNIT, "ResolutionUnit"), Map.entry(PREDICTOR, "Predictor"),
            Map.entry(TILE_WIDTH, "TileWidth"), Map.entry(TILE_LENGTH, "TileLength"),
            Map.entry(TILE_OFFSETS, "TileOffsets"), Map.entry(TILE_BYTE_COUNTS, "TileByteCounts"),
            Map.entry(SAMPLE_FORMAT, "SampleFormat"), Map.entry(SOFTWARE, "Software"));

    /** Bytes per value of each TIFF field type (index = type code; 0 = unknown type). */
    private static final int[] TYPE_SIZE = {0, 1, 1, 2, 4, 8, 1, 1, 2, 4, 8, 4, 8, 4};

    /** Sample types trapmap reads. */
    enum SampleType {
        FLOAT32("32-bit float", 4), UINT16("16-bit unsigned integer", 2), UINT8("8-bit unsigned integer", 1);

        final String label;
        final int bytes;

        SampleType(String label, int bytes) {
            this.label = label;
            this.bytes = bytes;
        }

        boolean integer() {
            return this != FLOAT32;
        }
    }

    /**
     * One image of the file, checked.
     *
     * @param ifdIndex       0-based index of its IFD (the decoder's image index)
     * @param ifdOffset      byte offset of its IFD
     * @param width          pixels per row
     * @param height         rows
     * @param type           sample type
     * @param compression    TIFF compression code
     * @param predictor      TIFF predictor code (1 = none)
     * @param description    ImageDescription text, or null
     * @param xResolution    pixels per resolution unit along x, NaN when absent
     * @param yResolution    pixels per resolution unit along y, NaN when absent
     * @param resolutionUnit ResolutionUnit (1 none, 2 inch, 3 cm), 0 when absent
     * @param tiled          true for tiled, false for striped data
     */
    record Page(int ifdIndex, long ifdOffset, int width, int height, SampleType type, int compression,
                int predictor, String description, double xResolution, double yResolution, int resolutionUnit,
                boolean tiled, Strips strips) {

        /** 1-based page number for messages. */
        int number() {
            return ifdIndex + 1;
        }

        String compressionName() {
            return TiffHeader.compressionName(compression);
        }

        /** Pixel pitch from the resolution tags when their unit is cm or inch, mm; null otherwise. */
        Double pitchMm() {
            double perMm = resolutionUnit == 3 ? xResolution / 10 : resolutionUnit == 2 ? xResolution / 25.4 : 0;
            if (!(perMm > 0) || !Double.isFinite(perMm)) {
                return null;
            }
            double pitch = 1 / perMm;
            return pitch > 0 && pitch <= 1000 ? pitch : null;
        }

        /** True when both resolutions are given and differ by more than 1e-6 relative. */
        boolean nonSquare() {
            return xResolution > 0 && yResolution > 0
                    && Math.abs(xResolution - yResolution) > 1e-6 * Math.max(xResolution, yResolution);
        }
    }

    /**
     * Where the samples of an uncompressed 32-bit float page lie, for reading them without a decoder: strip i holds
     * rows [i·rowsPerStrip, min(h, (i + 1)·rowsPerStrip)) from byte {@code offsets[i]}, in byte order {@code order}.
     */
    record Strips(long[] offsets, int rowsPerStrip, ByteOrder order) {
    }

    private record Entry(int tag, int type, long count, long valuePos, long entryPos) {
    }

    private final FileChannel channel;
    private final long size;
    private final String file;
    private final ReadOptions options;
    private ByteOrder order;

    private TiffHeader(FileChannel channel, long size, String file, ReadOptions options) {
        this.channel = channel;
        this.size = size;
        this.file = file;
        this.options = options;
    }

    static String tagName(int tag) {
        String n = NAMES.get(tag);
        return "tag " + tag + (n == null ? "" : " (" + n + ")");
    }

    static String compressionName(int code) {
        switch (code) {
            case 1: return "none";
            case 5: return "LZW";
            case 8: case 32946: return "Deflate";
            case 32773: return "PackBits";
            case 7: return "JPEG";
            case 2: case 3: case 4: return "CCITT";
            default: return "code " + code;
        }
    }

    /** True when the first bytes are a TIFF (or BigTIFF) signature. */
    static boolean looksLikeTiff(byte[] head) {
        return head.length >= 4 && ((head[0] == 'I' && head[1] == 'I' && head[2] == 42 && head[3] == 0)
                || (head[0] == 'M' && head[1] == 'M' && head[2] == 0 && head[3] == 42)
                || (head[0] == 'I' && head[1] == 'I' && head[2] == 43 && head[3] == 0)
                || (head[0] == 'M' && head[1] == 'M' && head[2] == 0 && head[3] == 43));
    }

    /**
     * The images of the file, reduced-resolution images (thumbnails) left out.
     *
     * @throws MapFormatException for anything a decoder could not use safely, naming page, tag and byte offset
     */
    static List<Page> scan(FileChannel channel, long size, String file, ReadOptions options)
            throws MapFormatException {
        return new TiffHeader(channel, size, file, options).scan();
    }

    private List<Page> scan() throws MapFormatException {
        if (size < 8) {
            throw new MapFormatException(file, "byte 0", "is too short for a TIFF file (" + size
                    + " bytes; the header alone needs 8)");
        }
        byte[] head = read(0, 8);
        if (head[0] == 'I' && head[1] == 'I') {
            order = ByteOrder.LITTLE_ENDIAN;
        } else if (head[0] == 'M' && head[1] == 'M') {
            order = ByteOrder.BIG_ENDIAN;
        } else {
            throw new MapFormatException(file, "byte 0", "is not a TIFF file (it starts with neither 'II' nor 'MM')");
        }
        ByteBuffer hb = ByteBuffer.wrap(head).order(order);
        int magic = hb.getShort(2) & 0xFFFF;
        if (magic == 43) {
            throw new MapFormatException(file, "byte 2", "is a BigTIFF file, which is not supported; save it as a"
                    + " classic TIFF (files up to 4 GiB)");
        }
        if (magic != 42) {
            throw new MapFormatException(file, "byte 2", "is not a TIFF file (version " + magic + ", expected 42)");
        }
        long next = hb.getInt(4) & 0xFFFFFFFFL;
        List<Page> pages = new ArrayList<>();
        Set<Long> seen = new HashSet<>();
        long totalPixels = 0;
        int index = 0;
        long pointerPos = 4;
        while (next != 0) {
            if (index >= MAX_PAGES) {
                throw new MapFormatException(file, null, "has more than " + MAX_PAGES + " pages");
            }
            if (!seen.add(next)) {
                throw new MapFormatException(file, "byte " + pointerPos, "the chain of pages loops back to the"
                        + " directory at byte " + next);
            }
            if (next < 8 || next > size - 2) {
                throw new MapFormatException(file, "byte " + pointerPos, "page " + (index + 1)
                        + " directory offset " + next + " lies outside the file (" + size + " bytes)");
            }
            long ifd = next;
            int n = u16(read(ifd, 2), 0);
            String where = "page " + (index + 1) + " (directory at byte " + ifd + ")";
            if (n == 0 || n > MAX_ENTRIES) {
                throw new MapFormatException(file, where, "has " + n + " entries (expected 1 to " + MAX_ENTRIES + ")");
            }
            long blockEnd = ifd + 2 + 12L * n + 4;
            if (blockEnd > size) {
                throw new MapFormatException(file, where, "the directory of " + n + " entries ends at byte "
                        + blockEnd + ", past the end of the file (" + size + " bytes); the file is truncated");
            }
            byte[] block = read(ifd + 2, 12 * n + 4);
            Map<Integer, Entry> entries = new HashMap<>();
            for (int i = 0; i < n; i++) {
                int p = 12 * i;
                int tag = u16(block, p);
                int type = u16(block, p + 2);
                long count = u32(block, p + 4);
                long entryPos = ifd + 2 + p;
                Entry e = new Entry(tag, type, count, entryPos + 8, entryPos);
                if (entries.put(tag, e) != null) {
                    throw new MapFormatException(file, where + ", " + tagName(tag) + " at byte " + entryPos,
                            "appears twice in the directory");
                }
                checkExtent(e, where);
            }
            Page page = page(index, ifd, entries, where);
            if (page != null) {
                totalPixels += (long) page.width() * page.height();
                if (totalPixels > options.maxPixels()) {
                    throw new MapFormatException(file, where, "the pages hold " + totalPixels + " pixels together"
                            + " so far, more than the limit of " + options.maxPixels()
                            + " pixels (ReadOptions.maxPixels)");
                }
                pages.add(page);
            }
            pointerPos = ifd + 2 + 12L * n;
            next = u32(block, 12 * n);
            index++;
        }
        if (pages.isEmpty()) {
            throw new MapFormatException(file, null, index == 0 ? "holds no image" : "holds only thumbnails, no"
                    + " full-resolution image");
        }
        return pages;
    }

    /** Checks that the values of an entry lie inside the file. */
    private void checkExtent(Entry e, String where) throws MapFormatException {
        if (e.type >= TYPE_SIZE.length || TYPE_SIZE[e.type] == 0) {
            return; // unknown types are skipped by readers
        }
        long bytes = e.count * TYPE_SIZE[e.type];
        if (bytes <= 4) {
            return;
        }
        long at = u32(read(e.valuePos, 4), 0);
        if (at + bytes > size) {
            throw new MapFormatException(file, where + ", " + tagName(e.tag) + " at byte " + e.entryPos,
                    e.count + " values (" + bytes + " bytes) at byte " + at + " extend past the end of the file ("
                    + size + " bytes)");
        }
    }

    private Page page(int index, long ifd, Map<Integer, Entry> entries, String where) throws MapFormatException {
        Entry subfile = entries.get(NEW_SUBFILE_TYPE);
        if (subfile != null && (single(subfile, where) & 1) != 0) {
            return null; // reduced-resolution copy of another page
        }
        long width = required(entries, IMAGE_WIDTH, where);
        long height = required(entries, IMAGE_LENGTH, where);
        if (width == 0 || height == 0) {
            throw new MapFormatException(file, at(entries, width == 0 ? IMAGE_WIDTH : IMAGE_LENGTH, where),
                    "the image is " + width + " × " + height + " pixels; both must be at least 1");
        }
        long pixels = width * height;
        if (pixels > options.maxPixels()) {
            throw new MapFormatException(file, at(entries, IMAGE_WIDTH, where), "the image is " + width + " × "
                    + height + " = " + pixels + " pixels, more than the limit of " + options.maxPixels()
                    + " pixels (ReadOptions.maxPixels)");
        }
        long spp = optional(entries, SAMPLES_PER_PIXEL, 1, where);
        if (spp != 1) {
            throw new MapFormatException(file, at(entries, SAMPLES_PER_PIXEL, where), "the image has " + spp
                    + " samples per pixel (colour or with alpha); a map needs 1 (greyscale)");
        }
        long bits = optional(entries, BITS_PER_SAMPLE, 1, where);
        long format = optional(entries, SAMPLE_FORMAT, 1, where);
        SampleType type = sampleType(bits, format);
        if (type == null) {
            String f = format == 1 ? "unsigned integer" : format == 2 ? "signed integer" : format == 3 ? "float"
                    : "sample format " + format;
            throw new MapFormatException(file, at(entries, BITS_PER_SAMPLE, where), "unsupported samples: " + bits
                    + "-bit " + f + "; supported are 32-bit float and 16- or 8-bit unsigned integer");
        }
        long photometric = optional(entries, PHOTOMETRIC, 1, where);
        if (photometric != 1) {
            throw new MapFormatException(file, at(entries, PHOTOMETRIC, where), "photometric interpretation "
                    + photometric + " is not supported; a map needs 1 (grey, black is zero)");
        }
        long planar = optional(entries, PLANAR_CONFIGURATION, 1, where);
        if (planar != 1 && planar != 2) {
            throw new MapFormatException(file, at(entries, PLANAR_CONFIGURATION, where), "planar configuration "
                    + planar + " is not valid (expected 1 or 2)");
        }
        long compression = optional(entries, COMPRESSION, 1, where);
        if (compression != 1 && compression != 5 && compression != 8 && compression != 32946
                && compression != 32773) {
            throw new MapFormatException(file, at(entries, COMPRESSION, where), "compression "
                    + compressionName((int) compression) + " is not supported; supported are none, LZW, Deflate"
                    + " and PackBits");
        }
        long predictor = optional(entries, PREDICTOR, 1, where);
        boolean predictive = compression == 5 || compression == 8 || compression == 32946;
        if (predictor != 1 && (!predictive || (predictor != 2 && predictor != 3)
                || (predictor == 3 && type != SampleType.FLOAT32))) {
            throw new MapFormatException(file, at(entries, PREDICTOR, where), "predictor " + predictor
                    + " is not supported with " + compressionName((int) compression) + " compression and "
                    + type.label + " samples");
        }
        boolean tiled = entries.containsKey(TILE_WIDTH) || entries.containsKey(TILE_OFFSETS);
        int w = (int) width;
        int h = (int) height;
        Strips strips = null;
        if (tiled) {
            checkTiles(entries, w, h, type, compression, where);
        } else {
            strips = checkStrips(entries, w, h, type, compression, where);
            if (compression != 1 || type != SampleType.FLOAT32) {
                strips = null;
            }
        }
        String description = description(entries.get(IMAGE_DESCRIPTION), where);
        double xr = rational(entries.get(X_RESOLUTION), where);
        double yr = rational(entries.get(Y_RESOLUTION), where);
        int unit = entries.containsKey(RESOLUTION_UNIT) ? (int) single(entries.get(RESOLUTION_UNIT), where) : 0;
        return new Page(index, ifd, w, h, type, (int) compression, (int) predictor, description, xr, yr, unit, tiled,
                strips);
    }

    private static SampleType sampleType(long bits, long format) {
        if (bits == 32 && format == 3) {
            return SampleType.FLOAT32;
        }
        if (bits == 16 && format == 1) {
            return SampleType.UINT16;
        }
        if (bits == 8 && format == 1) {
            return SampleType.UINT8;
        }
        return null;
    }

    private Strips checkStrips(Map<Integer, Entry> entries, int w, int h, SampleType type, long compression,
                               String where) throws MapFormatException {
        long rps = Math.min(optional(entries, ROWS_PER_STRIP, 0xFFFFFFFFL, where), h);
        if (rps == 0) {
            throw new MapFormatException(file, at(entries, ROWS_PER_STRIP, where), "rows per strip is 0");
        }
        long strips = (h + rps - 1) / rps;
        Entry offsets = entries.get(STRIP_OFFSETS);
        Entry counts = entries.get(STRIP_BYTE_COUNTS);
        if (offsets == null) {
            throw new MapFormatException(file, where, tagName(STRIP_OFFSETS) + " is missing: the file says nowhere"
                    + " where its image data is");
        }
        if (counts == null) {
            throw new MapFormatException(file, where, tagName(STRIP_BYTE_COUNTS) + " is missing");
        }
        checkBlockCount("strips", strips, offsets, where);
        long[] off = values(offsets, strips, where);
        long[] cnt = values(counts, strips, where);
        long rowBytes = (long) w * type.bytes;
        for (int i = 0; i < strips; i++) {
            long rows = Math.min(rps, h - i * rps);
            TiffBlocks.check(channel, file, where + ", strip " + (i + 1) + " of " + strips, size, off[i], cnt[i],
                    rows * rowBytes, rps * rowBytes, (int) compression);
        }
        return new Strips(off, (int) rps, order);
    }

    private void checkTiles(Map<Integer, Entry> entries, int w, int h, SampleType type, long compression,
                            String where) throws MapFormatException {
        long tw = required(entries, TILE_WIDTH, where);
        long th = required(entries, TILE_LENGTH, where);
        if (tw == 0 || th == 0 || tw * th > options.maxPixels()) {
            throw new MapFormatException(file, at(entries, TILE_WIDTH, where), "tiles of " + tw + " × " + th
                    + " pixels are not usable");
        }
        long across = (w + tw - 1) / tw;
        long down = (h + th - 1) / th;
        long tiles = across * down;
        Entry offsets = entries.get(TILE_OFFSETS);
        Entry counts = entries.get(TILE_BYTE_COUNTS);
        if (offsets == null || counts == null) {
            throw new MapFormatException(file, where, tagName(offsets == null ? TILE_OFFSETS : TILE_BYTE_COUNTS)
                    + " is missing");
        }
        checkBlockCount("tiles", tiles, offsets, where);
        long[] off = values(offsets, tiles, where);
        long[] cnt = values(counts, tiles, where);
        for (int i = 0; i < tiles; i++) {
            TiffBlocks.check(channel, file, where + ", tile " + (i + 1) + " of " + tiles, size, off[i], cnt[i],
                    tw * th * type.bytes, tw * th * type.bytes, (int) compression);
        }
    }

    private void checkBlockCount(String what, long n, Entry tag, String where) throws MapFormatException {
        if (n > MAX_BLOCKS) {
            throw new MapFormatException(file, where + ", " + tagName(tag.tag) + " at byte " + tag.entryPos,
                    "the image is split into " + n + " " + what + "; at most " + MAX_BLOCKS + " are supported");
        }
    }

    private long required(Map<Integer, Entry> entries, int tag, String where) throws MapFormatException {
        Entry e = entries.get(tag);
        if (e == null) {
            throw new MapFormatException(file, where, tagName(tag) + " is missing");
        }
        return single(e, where);
    }

    private long optional(Map<Integer, Entry> entries, int tag, long absent, String where)
            throws MapFormatException {
        Entry e = entries.get(tag);
        return e == null ? absent : single(e, where);
    }

    private static String at(Map<Integer, Entry> entries, int tag, String where) {
        Entry e = entries.get(tag);
        return where + ", " + tagName(tag) + (e == null ? "" : " at byte " + e.entryPos);
    }

    /** The one unsigned integer value of a SHORT, LONG or BYTE entry. */
    private long single(Entry e, String where) throws MapFormatException {
        if (e.count != 1) {
            throw new MapFormatException(file, where + ", " + tagName(e.tag) + " at byte " + e.entryPos,
                    "holds " + e.count + " values; expected 1");
        }
        return values(e, 1, where)[0];
    }

    /** Exactly {@code expected} unsigned integer values of a SHORT, LONG or BYTE entry. */
    private long[] values(Entry e, long expected, String where) throws MapFormatException {
        String loc = where + ", " + tagName(e.tag) + " at byte " + e.entryPos;
        if (e.type != 1 && e.type != 3 && e.type != 4) {
            throw new MapFormatException(file, loc, "has field type " + e.type + "; expected an unsigned integer"
                    + " (BYTE, SHORT or LONG)");
        }
        if (e.count != expected) {
            throw new MapFormatException(file, loc, "holds " + e.count + " values; expected " + expected);
        }
        int size1 = TYPE_SIZE[e.type];
        long bytes = e.count * size1;
        long at = bytes <= 4 ? e.valuePos : u32(read(e.valuePos, 4), 0);
        if (bytes > Integer.MAX_VALUE - 16) {
            throw new MapFormatException(file, loc, "holds too many values (" + e.count + ")");
        }
        byte[] raw = read(at, (int) bytes);
        long[] v = new long[(int) e.count];
        for (int i = 0; i < v.length; i++) {
            v[i] = size1 == 1 ? raw[i] & 0xFF : size1 == 2 ? u16(raw, 2 * i) : u32(raw, 4 * i);
        }
        return v;
    }

    private double rational(Entry e, String where) throws MapFormatException {
        if (e == null || e.type != 5 || e.count != 1) {
            return Double.NaN;
        }
        byte[] raw = read(u32(read(e.valuePos, 4), 0), 8);
        long num = u32(raw, 0);
        long den = u32(raw, 4);
        return den == 0 ? Double.NaN : (double) num / den;
    }

    private String description(Entry e, String where) throws MapFormatException {
        if (e == null || (e.type != 2 && e.type != 1 && e.type != 7) || e.count == 0) {
            return null;
        }
        if (e.count > MAX_DESCRIPTION_BYTES) {
            throw new MapFormatException(file, where + ", " + tagName(e.tag) + " at byte " + e.entryPos, "holds "
                    + e.count + " bytes; at most " + MAX_DESCRIPTION_BYTES + " are read");
        }
        int len = (int) e.count;
        byte[] raw = read(len <= 4 ? e.valuePos : u32(read(e.valuePos, 4), 0), len);
        int end = 0;
        while (end < raw.length && raw[end] != 0) {
            end++;
        }
        return new String(raw, 0, end, StandardCharsets.UTF_8);
    }

    private int u16(byte[] b, int p) {
        return order == ByteOrder.LITTLE_ENDIAN ? (b[p] & 0xFF) | (b[p + 1] & 0xFF) << 8
                : (b[p] & 0xFF) << 8 | (b[p + 1] & 0xFF);
    }

    private long u32(byte[] b, int p) {
        long v = order == ByteOrder.LITTLE_ENDIAN
                ? (b[p] & 0xFF) | (b[p + 1] & 0xFF) << 8 | (b[p + 2] & 0xFF) << 16 | (long) (b[p + 3] & 0xFF) << 24
                : (long) (b[p] & 0xFF) << 24 | (b[p + 1] & 0xFF) << 16 | (b[p + 2] & 0xFF) << 8 | (b[p + 3] & 0xFF);
        return v & 0xFFFFFFFFL;
    }

    private byte[] read(long pos, int len) throws MapFormatException {
        if (pos < 0 || pos + len > size) {
            throw new MapFormatException(file, "byte " + pos, len + " bytes needed at byte " + pos
                    + " lie past the end of the file (" + size + " bytes); the file is truncated");
        }
        ByteBuffer buf = ByteBuffer.allocate(len);
        try {
            while (buf.hasRemaining()) {
                int r = channel.read(buf, pos + buf.position());
                if (r < 0) {
                    throw new MapFormatException(file, "byte " + (pos + buf.position()), "the file ended early;"
                            + " it is truncated or changed while being read");
                }
            }
        } catch (MapFormatException e) {
            throw e;
        } catch (IOException e) {
            throw new MapFormatException(file, "byte " + pos, "cannot be read (" + e.getMessage() + ")", "", e);
        }
        return buf.array();
    }
}
