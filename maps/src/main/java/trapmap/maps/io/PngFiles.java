package trapmap.maps.io;

import java.awt.image.BufferedImage;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import javax.imageio.IIOImage;
import javax.imageio.ImageIO;
import javax.imageio.ImageWriteParam;
import javax.imageio.ImageWriter;
import javax.imageio.stream.ImageOutputStream;
import javax.imageio.stream.MemoryCacheImageOutputStream;

/**
 * PNG pictures written quickly, for the many small pictures of a batch. A picture of at most 256 colours gets a
 * palette and goes through {@link PlainPng}, as does an opaque RGB picture; any other through the JDK's PNG writer,
 * encoding in memory (no temporary cache file), with explicit compression quality 0.9, a fast low deflate level
 * (quality 1 would store the data uncompressed), about a quarter larger than with the writer's default setting.
 * Either way the file decodes to the same pixels.
 */
public final class PngFiles {
    /** Compression quality of the JDK PNG writer: lower quality means stronger, slower deflate. */
    private static final float FAST_QUALITY = 0.9f;

    private PngFiles() {
    }

    /** Writes {@code img} to {@code file} (not atomically: callers write to a temporary name and move). */
    public static void write(BufferedImage img, Path file) throws IOException {
        Files.write(file, encode(img));
    }

    /**
     * The PNG bytes of {@code img}. A {@code TYPE_INT_ARGB} picture of at most 256 colours (a thumbnail: the colour
     * scale, transparency and an outline colour) is written by {@link PlainPng} with a palette of exactly its
     * colours, in the order they first appear: one byte per pixel, stored, and the same pixels when decoded. A
     * {@code TYPE_INT_RGB} picture of more colours (a recurrence picture) is written by {@link PlainPng} as 8-bit RGB,
     * deflated. Any other picture goes through the JDK's PNG writer.
     */
    public static byte[] encode(BufferedImage img) {
        Indexed indexed = palette(img);
        if (indexed != null) {
            return PlainPng.palette(img.getWidth(), img.getHeight(), indexed.pixels(), indexed.argb(),
                    indexed.colours());
        }
        if (img.getType() == BufferedImage.TYPE_INT_RGB) {
            return PlainPng.rgb(img.getWidth(), img.getHeight(),
                    (int[]) img.getRaster().getDataElements(0, 0, img.getWidth(), img.getHeight(), null));
        }
        return encode(img, FAST_QUALITY);
    }

    /** Largest palette of a PNG image with 8-bit indices. */
    private static final int PALETTE = 256;

    /**
     * A picture as palette indices.
     *
     * @param argb    the palette's colours, {@code argb[0..colours)}, in the order they first appear
     * @param colours number of colours
     * @param pixels  each pixel's palette index, rows from the top
     */
    record Indexed(int[] argb, int colours, byte[] pixels) {
    }

    /**
     * {@code img} as 8-bit palette indices whose palette holds its ARGB values exactly (alpha included), or null
     * when it is not {@code TYPE_INT_ARGB} or has more than {@value #PALETTE} colours.
     */
    static Indexed palette(BufferedImage img) {
        if (img.getType() != BufferedImage.TYPE_INT_ARGB) {
            return null;
        }
        int w = img.getWidth();
        int h = img.getHeight();
        int[] argb = (int[]) img.getRaster().getDataElements(0, 0, w, h, null);
        byte[] pixels = new byte[w * h];
        Colours colours = new Colours();
        // row by row, a small method per row: HotSpot compiles it once, instead of compiling this whole method while
        // a loop over every pixel of a picture runs (on-stack replacement) and again at its next call
        for (int y = 0; y < h; y++) {
            if (!colours.index(argb, y * w, y * w + w, pixels)) {
                return null;
            }
        }
        return new Indexed(colours.palette, colours.count, pixels);
    }

    /** The colours of a picture met so far, in the order they first appear, and the last one met. */
    private static final class Colours {
        /** Slots of the open addressing: colour → palette index + 1 (0: empty). */
        private static final int SLOTS = 4 * PALETTE;
        final int[] keys = new int[SLOTS];
        final int[] index = new int[SLOTS];
        final int[] palette = new int[PALETTE];
        int count;
        int lastColour;
        int lastIndex = -1;

        /**
         * The palette indices of the pixels {@code argb[from..to)} into {@code pixels}, new colours added to the
         * palette; false when there are more than {@value #PALETTE} colours.
         */
        boolean index(int[] argb, int from, int to, byte[] pixels) {
            int[] keys = this.keys;
            int[] index = this.index;
            int colours = count;
            int lastColour = this.lastColour;
            int lastIndex = this.lastIndex;
            for (int i = from; i < to; i++) {
                int c = argb[i];
                if (c != lastColour || lastIndex < 0) {
                    int slot = (c * 0x9E3779B1 >>> 22) & (SLOTS - 1);
                    while (index[slot] != 0 && keys[slot] != c) {
                        slot = (slot + 1) & (SLOTS - 1);
                    }
                    if (index[slot] == 0) {
                        if (colours == PALETTE) {
                            return false;
                        }
                        keys[slot] = c;
                        palette[colours] = c;
                        index[slot] = ++colours;
                    }
                    lastColour = c;
                    lastIndex = index[slot] - 1;
                }
                pixels[i] = (byte) lastIndex;
            }
            count = colours;
            this.lastColour = lastColour;
            this.lastIndex = lastIndex;
            return true;
        }
    }

    private static byte[] encode(BufferedImage img, float quality) {
        ImageWriter writer = ImageIO.getImageWritersByFormatName("png").next();
        ImageWriteParam param = writer.getDefaultWriteParam();
        param.setCompressionMode(ImageWriteParam.MODE_EXPLICIT);
        param.setCompressionQuality(quality);
        ByteArrayOutputStream bytes = new ByteArrayOutputStream(64 * 1024);
        // straight into memory: ImageIO.createImageOutputStream would buffer through a temporary file on disk
        try (ImageOutputStream out = new MemoryCacheImageOutputStream(bytes)) {
            writer.setOutput(out);
            writer.write(null, new IIOImage(img, null, null), param);
        } catch (IOException e) {
            throw new UncheckedIOException("PNG encoding in memory failed: " + e.getMessage(), e);
        } finally {
            writer.dispose();
        }
        return bytes.toByteArray();
    }
}
