package trapmap.maps.io;

import java.io.ByteArrayOutputStream;
import java.nio.charset.StandardCharsets;
import java.util.zip.CRC32;
import java.util.zip.Deflater;

/**
 * The bytes of an 8-bit palette PNG (PNG specification, 2nd edition, W3C/ISO 15948: signature, IHDR with colour type
 * 3, PLTE, tRNS when a colour is not opaque, one IDAT, IEND), the zlib stream of {@link Deflater} storing the rows
 * without compression, filter type 0 on every row (the filter the specification recommends for palette images). At
 * one byte per pixel a 256² thumbnail stored (66 kB) is about as small as the four-channel picture deflated, and
 * deflating at the fastest level (40 kB on the benchmark maps) would triple the encoding time (1.3 ms instead of
 * 0.4 ms of CPU per picture).
 *
 * <p>Why not the JDK's PNG writer, which {@link PngFiles} uses for every other picture: a batch writes one thumbnail
 * per wafer, and the JDK writer's per-row loop ({@code PNGImageWriter.encodePass}, a 70–85 kB compiled method) was
 * compiled by C2 three to four times in a run, plus its metadata set-up and row filter: about 1.5 s of CPU of a
 * 200-wafer run (a quarter of all compiling), and 3.4–3.8 ms of CPU per picture besides. This writer takes 0.4 ms
 * per picture; the palette, indices and pixels decoded are the same ({@code PngFilesTest}, {@code ThumbnailPngTest}).
 */
final class IndexedPng {
    private static final byte[] SIGNATURE = {(byte) 0x89, 'P', 'N', 'G', '\r', '\n', 0x1A, '\n'};
    /** Colour type of palette images. */
    private static final int PALETTE = 3;
    /** Filter type "None" before each row. */
    private static final byte NO_FILTER = 0;

    private IndexedPng() {
    }

    /**
     * The PNG of {@code width} × {@code height} pixels given by their palette indices {@code pixels} (rows from the
     * top, {@code width} bytes each) and the palette's ARGB colours {@code argb[0..colours)}, 1 to 256 of them.
     */
    static byte[] encode(int width, int height, byte[] pixels, int[] argb, int colours) {
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
        byte[] deflated = deflated(rows(width, height, pixels, position, colours));
        ByteArrayOutputStream out = new ByteArrayOutputStream(deflated.length + 4 * colours + 128);
        out.writeBytes(SIGNATURE);
        byte[] header = new byte[13];
        putInt(header, 0, width);
        putInt(header, 4, height);
        header[8] = 8; // bits per index
        header[9] = PALETTE;
        // compression 0 (deflate), filter method 0, no interlace
        chunk(out, "IHDR", header, header.length);
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
     * The scanlines: each row's filter type byte, then its indices, index k (below {@code colours}) written as {@code position[k]} (copied
     * as they are when no index moves, as in a thumbnail, whose only colour that is not opaque comes first).
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

    /** A zlib stream of {@code raw}, stored. */
    private static byte[] deflated(byte[] raw) {
        Deflater deflater = new Deflater(Deflater.NO_COMPRESSION);
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
