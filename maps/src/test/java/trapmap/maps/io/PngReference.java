package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;

import java.awt.image.BufferedImage;
import java.awt.image.IndexColorModel;
import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.IOException;
import javax.imageio.IIOImage;
import javax.imageio.ImageIO;
import javax.imageio.ImageWriteParam;
import javax.imageio.ImageWriter;
import javax.imageio.stream.ImageOutputStream;
import javax.imageio.stream.MemoryCacheImageOutputStream;

/**
 * The earlier way of writing a picture of at most 256 colours, as a reference for {@link PlainPng}: an 8-bit
 * {@link IndexColorModel} picture of {@link PngFiles#palette}'s colours, stored (compression quality 1) by the JDK's
 * PNG writer; and the check that two PNG files decode (JDK reader) to the same palette and pixels.
 */
public final class PngReference {
    private PngReference() {
    }

    /** {@code img} as an 8-bit indexed picture of its palette, or null when it has none. */
    public static BufferedImage indexed(BufferedImage img) {
        PngFiles.Indexed p = PngFiles.palette(img);
        if (p == null) {
            return null;
        }
        int colours = p.colours();
        byte[] r = new byte[colours];
        byte[] g = new byte[colours];
        byte[] b = new byte[colours];
        byte[] a = new byte[colours];
        for (int k = 0; k < colours; k++) {
            a[k] = (byte) (p.argb()[k] >>> 24);
            r[k] = (byte) (p.argb()[k] >>> 16);
            g[k] = (byte) (p.argb()[k] >>> 8);
            b[k] = (byte) p.argb()[k];
        }
        IndexColorModel model = new IndexColorModel(8, colours, r, g, b, a);
        BufferedImage out = new BufferedImage(img.getWidth(), img.getHeight(), BufferedImage.TYPE_BYTE_INDEXED,
                model);
        out.getRaster().setDataElements(0, 0, img.getWidth(), img.getHeight(), p.pixels());
        return out;
    }

    /** The PNG the JDK writer made of {@link #indexed}{@code (img)}, stored without deflate. */
    public static byte[] jdkStored(BufferedImage img) throws IOException {
        BufferedImage indexed = indexed(img);
        assertThat(indexed).as("a picture of at most 256 colours").isNotNull();
        ImageWriter writer = ImageIO.getImageWritersByFormatName("png").next();
        ImageWriteParam param = writer.getDefaultWriteParam();
        param.setCompressionMode(ImageWriteParam.MODE_EXPLICIT);
        param.setCompressionQuality(1f);
        ByteArrayOutputStream bytes = new ByteArrayOutputStream();
        try (ImageOutputStream out = new MemoryCacheImageOutputStream(bytes)) {
            writer.setOutput(out);
            writer.write(null, new IIOImage(indexed, null, null), param);
        } finally {
            writer.dispose();
        }
        return bytes.toByteArray();
    }

    /**
     * Both files decode to the same ARGB at every pixel, {@code actual} to a palette picture; when {@code expected}
     * decodes to one too (the JDK writer stores a palette of grey colours as a grey picture), with the same palette
     * (every entry's ARGB) and the same index at every pixel. Returns the decoded {@code actual}.
     */
    public static BufferedImage assertSameDecoded(byte[] actual, byte[] expected) throws IOException {
        BufferedImage a = ImageIO.read(new ByteArrayInputStream(actual));
        BufferedImage e = ImageIO.read(new ByteArrayInputStream(expected));
        assertThat(a.getWidth()).isEqualTo(e.getWidth());
        assertThat(a.getHeight()).isEqualTo(e.getHeight());
        assertThat(a.getColorModel()).isInstanceOf(IndexColorModel.class);
        int w = e.getWidth();
        int h = e.getHeight();
        if (e.getColorModel() instanceof IndexColorModel palette) {
            assertThat(palette((IndexColorModel) a.getColorModel())).containsExactly(palette(palette));
            assertThat(a.getRaster().getPixels(0, 0, w, h, (int[]) null)).as("palette indices")
                    .containsExactly(e.getRaster().getPixels(0, 0, w, h, (int[]) null));
        }
        assertThat(a.getRGB(0, 0, w, h, null, 0, w)).as("ARGB").containsExactly(e.getRGB(0, 0, w, h, null, 0, w));
        return a;
    }

    private static int[] palette(IndexColorModel m) {
        int[] argb = new int[m.getMapSize()];
        m.getRGBs(argb);
        return argb;
    }
}
