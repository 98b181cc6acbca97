package trapmap.maps.io;

import java.io.ByteArrayOutputStream;
import java.nio.charset.StandardCharsets;
import java.util.zip.CRC32;
import java.util.zip.Deflater;

/**
 * The bytes of a PNG (PNG specification, 2nd edition, W3C/ISO 15948) with filter type 0 on every row, one IDAT
 * chunk of {@link Deflater}'s zlib stream: 8-bit palette pictures (IHDR with colour type 3, PLTE, tRNS when a colour
 * is not opaque) with the rows stored without compression, and opaque 8-bit RGB pictures (colour type 2) deflated
 * at the fastest level. Palette: at one byte per pixel a 256² thumbnail stored (66 kB) is about as small as the
 * four-channel picture deflated, and deflating at the fastest level (40 kB on the benchmark maps) would triple the
 * encoding time (1.3 ms instead of 0.4 ms of CPU per picture).
 *
 * <p>Why not the JDK's PNG writer: a batch writes one thumbnail per wafer and a recurrence picture per wafer family,
 * and the JDK writer's per-row loop ({@code PNGImageWriter.encodePass}, a 70–85 kB compiled method) was compiled by
 * C2 three to four times in a run, plus its metadata set-up and row filter: about 1.2 s of the compiler threads'
 * 4.8 s CPU in a 200-wafer run, and 3.4–3.8 ms of CPU per thumbnail besides. This writer takes 0.4 ms per thumbnail;
 * the palette, indices and pixels decoded are the same ({@code PngFilesTest}, {@code ThumbnailPngTest}).
 */
final class PlainPng {
    private static final byte[] SIGNATURE = {(byte) 0x89, 'P', 'N', 'G', '\r', '\n', 0x1A, '\n'};
    /** Colour type of palette images. */
    private static final int PALETTE = 3;
    /** Colour type of red, green, blue images. */
    private static final int TRUECOLOUR = 2;
    /** Filter type "None" before each row. */
    private static final byte NO_FILTER = 0;

    private PlainPng() {
    }

    /**
     * The PNG of {@code width} × {@code height} pixels given by their palette indices {@code pixels} (rows from the
     * top, {@code width} bytes each) and the palette's ARGB colours {@code argb[0..colours)}, 1 to 256 of them.
     */
    static byte[] palette(int width, int height, byte[] pixels, int[] argb, int colours) {
        if (width <= 0 || height <= 0 || colours <= 0 || colours > 256 || pixels.length < (long) width * height) {
            throw new IllegalArgumentException("palette PNG of " + width + " x " + height + " px, " + colours
                    + " colours, " + pixels.length + " index bytes");
        }
        // the colours that are not opaque first, so that the transparency chunk is as short as can be (as the JDK's
        // PNG writer orders them); each group keeps its order
        int[] order = new int[colours]; // new position → old index
        int[] position = new int[256]; // old index → new position
        int translucent = 0;
        for (int pass = 0, at = 0; pass < 2; pass++) {
            for (int k = 0; k < colours; k++) {
                boolean opaque = argb[k] >>> 24 == 0xFF;
                if (opaque == (pass == 1)) {
                    order[at] = k;
                    position[k] = at++;
                    translucent += pass == 0 ? 1 : 0;
                }
            }
        }
        byte[] deflated = deflated(rows(width, height, pixels, position, colours), Deflater.NO_COMPRESSION);
        ByteArrayOutputStream out = new ByteArrayOutputStream(deflated.length + 4 * colours + 128);
        out.writeBytes(SIGNATURE);
        chunk(out, "IHDR", header(width, height, PALETTE), 13);
        byte[] plte = new byte[3 * colours];
        for (int k = 0; k < colours; k++) {
            int c = argb[order[k]];
            plte[3 * k] = (byte) (c >>> 16);
            plte[3 * k + 1] = (byte) (c >>> 8);
            plte[3 * k + 2] = (byte) c;
        }
        chunk(out, "PLTE", plte, plte.length);
        if (translucent > 0) {
            // alpha of the entries that are not opaque; the later entries are opaque
            byte[] alpha = new byte[translucent];
            for (int k = 0; k < translucent; k++) {
                alpha[k] = (byte) (argb[order[k]] >>> 24);
            }
            chunk(out, "tRNS", alpha, alpha.length);
        }
        chunk(out, "IDAT", deflated, deflated.length);
        chunk(out, "IEND", new byte[0], 0);
        return out.toByteArray();
    }

    /**
     * The PNG of an opaque picture of {@code width} × {@code height} pixels, {@code rgb} holding each pixel's red,
     * green and blue in its low 24 bits (rows from the top), 8 bits a sample, deflated at the fastest level (a
     * picture drawn of flat areas, such as a recurrence map, shrinks to a few per cent; stored it would be three
     * bytes a pixel).
     */
    static byte[] rgb(int width, int height, int[] rgb) {
        if (width <= 0 || height <= 0 || rgb.length < (long) width * height) {
            throw new IllegalArgumentException("RGB PNG of " + width + " x " + height + " px, " + rgb.length
                    + " pixels");
        }
        int rowBytes = 3 * width + 1;
        byte[] raw = new byte[rowBytes * height];
        for (int y = 0; y < height; y++) {
            rgbRow(rgb, y * width, width, raw, y * rowBytes);
        }
        byte[] deflated = deflated(raw, Deflater.BEST_SPEED);
        ByteArrayOutputStream out = new ByteArrayOutputStream(deflated.length + 128);
        out.writeBytes(SIGNATURE);
        chunk(out, "IHDR", header(width, height, TRUECOLOUR), 13);
        chunk(out, "IDAT", deflated, deflated.length);
        chunk(out, "IEND", new byte[0], 0);
        return out.toByteArray();
    }

    /** One scanline of an RGB picture: the filter type byte, then red, green, blue of each pixel. */
    private static void rgbRow(int[] rgb, int from, int width, byte[] raw, int to) {
        raw[to++] = NO_FILTER;
        for (int x = 0; x < width; x++) {
            int c = rgb[from + x];
            raw[to++] = (byte) (c >>> 16);
            raw[to++] = (byte) (c >>> 8);
            raw[to++] = (byte) c;
        }
    }

    /** The 13 bytes of an IHDR chunk: 8 bits a sample, deflate, filter method 0, no interlace. */
    private static byte[] header(int width, int height, int colourType) {
        byte[] header = new byte[13];
        putInt(header, 0, width);
        putInt(header, 4, height);
        header[8] = 8;
        header[9] = (byte) colourType;
        return header;
    }

    /**
     * The scanlines: each row's filter type byte, then its indices, index k (below {@code colours}) written as
     * {@code position[k]} (copied as they are when no index moves, as in a thumbnail, whose only colour that is not
     * opaque comes first).
     */
    private static byte[] rows(int width, int height, byte[] pixels, int[] position, int colours) {
        boolean same = true;
        for (int k = 0; k < colours; k++) {
            same &= position[k] == k;
        }
        byte[] raw = new byte[(width + 1) * height];
        for (int y = 0; y < height; y++) {
            int from = y * width;
            int to = y * (width + 1);
            raw[to++] = NO_FILTER;
            if (same) {
                System.arraycopy(pixels, from, raw, to, width);
            } else {
                for (int x = 0; x < width; x++) {
                    raw[to + x] = (byte) position[pixels[from + x] & 0xFF];
                }
            }
        }
        return raw;
    }

    /** A zlib stream of {@code raw} at deflate {@code level}. */
    private static byte[] deflated(byte[] raw, int level) {
        Deflater deflater = new Deflater(level);
        try {
            deflater.setInput(raw);
            deflater.finish();
            ByteArrayOutputStream out = new ByteArrayOutputStream(raw.length / 4 + 64);
            byte[] buffer = new byte[Math.min(raw.length + 64, 64 * 1024)];
            while (!deflater.finished()) {
                int n = deflater.deflate(buffer);
                out.write(buffer, 0, n);
            }
            return out.toByteArray();
        } finally {
            deflater.end();
        }
    }

    /** Length, type, data and the CRC-32 of type and data. */
    private static void chunk(ByteArrayOutputStream out, String type, byte[] data, int length) {
        byte[] head = new byte[8];
        putInt(head, 0, length);
        byte[] name = type.getBytes(StandardCharsets.US_ASCII);
        System.arraycopy(name, 0, head, 4, 4);
        CRC32 crc = new CRC32();
        crc.update(name);
        crc.update(data, 0, length);
        byte[] tail = new byte[4];
        putInt(tail, 0, (int) crc.getValue());
        out.write(head, 0, head.length);
        out.write(data, 0, length);
        out.write(tail, 0, tail.length);
    }

    private static void putInt(byte[] b, int at, int v) {
        b[at] = (byte) (v >>> 24);
        b[at + 1] = (byte) (v >>> 16);
        b[at + 2] = (byte) (v >>> 8);
        b[at + 3] = (byte) v;
    }
}
