package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;

import java.awt.image.BufferedImage;
import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.nio.file.Path;
import java.util.Random;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * PNG files decode (JDK ImageIO reader as reference) to exactly the pixels drawn; pictures of at most 256 colours to
 * the same palette and pixels as the JDK writer's file of the same indexed picture.
 */
class PngFilesTest {

    private static BufferedImage randomPicture(int w, int h, long seed) {
        Random rnd = new Random(seed);
        BufferedImage img = new BufferedImage(w, h, BufferedImage.TYPE_INT_ARGB);
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                int kind = rnd.nextInt(4);
                int argb = switch (kind) {
                    case 0 -> 0; // transparent, as pixels without data
                    case 1 -> 0xFF000000 | rnd.nextInt(1 << 24);
                    case 2 -> rnd.nextInt(); // any alpha
                    default -> 0xFF000000 | (x * 255 / w) << 16 | (y * 255 / h) << 8; // smooth ramp
                };
                img.setRGB(x, y, argb);
            }
        }
        return img;
    }

    private static void assertSamePixels(BufferedImage actual, BufferedImage expected) {
        assertThat(actual.getWidth()).isEqualTo(expected.getWidth());
        assertThat(actual.getHeight()).isEqualTo(expected.getHeight());
        for (int y = 0; y < expected.getHeight(); y++) {
            for (int x = 0; x < expected.getWidth(); x++) {
                assertThat(actual.getRGB(x, y)).as("(%d, %d)", x, y).isEqualTo(expected.getRGB(x, y));
            }
        }
    }

    @Test
    void decodedPixelsEqualTheDrawnOnes() throws Exception {
        for (int[] size : new int[][] {{1, 1}, {256, 171}, {33, 256}}) {
            BufferedImage img = randomPicture(size[0], size[1], size[0] * 31L + size[1]);
            BufferedImage back = ImageIO.read(new ByteArrayInputStream(PngFiles.encode(img)));
            assertSamePixels(back, img);
        }
    }

    @Test
    void decodesAsTheJdkWritersFileDoes(@TempDir Path dir) throws Exception {
        BufferedImage img = randomPicture(120, 90, 7);
        ByteArrayOutputStream jdk = new ByteArrayOutputStream();
        ImageIO.write(img, "png", jdk);
        Path mine = dir.resolve("p.png");
        PngFiles.write(img, mine);
        assertSamePixels(ImageIO.read(mine.toFile()), ImageIO.read(new ByteArrayInputStream(jdk.toByteArray())));
    }

    /** At most {@code colours} ARGB values, transparent and half-transparent ones among them, in smooth runs. */
    private static BufferedImage fewColours(int w, int h, int colours, long seed) {
        Random rnd = new Random(seed);
        int[] palette = new int[colours];
        for (int k = 0; k < colours; k++) {
            palette[k] = k == 0 ? 0 : k == 1 ? 0x80123456 : k == 2 ? 0x00FFFFFF : 0xFF000000 | rnd.nextInt(1 << 24);
        }
        BufferedImage img = new BufferedImage(w, h, BufferedImage.TYPE_INT_ARGB);
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                img.setRGB(x, y, palette[rnd.nextInt(8) == 0 ? rnd.nextInt(colours) : (x + y) % colours]);
            }
        }
        return img;
    }

    @Test
    void picturesOfAtMost256ColoursGetAPaletteOfExactlyTheirColours() throws Exception {
        for (int colours : new int[] {1, 3, 200, 256}) {
            BufferedImage img = fewColours(256, 190, colours, colours);
            BufferedImage indexed = PngReference.indexed(img);
            assertThat(indexed).as("%d colours", colours).isNotNull();
            assertSamePixels(indexed, img);
            BufferedImage back = ImageIO.read(new ByteArrayInputStream(PngFiles.encode(img)));
            assertSamePixels(back, img);
        }
        // one colour more: the four-channel picture, also the same pixels
        BufferedImage many = fewColours(256, 190, 257, 257);
        assertThat(PngReference.indexed(many)).isNull();
        assertSamePixels(ImageIO.read(new ByteArrayInputStream(PngFiles.encode(many))), many);
    }

    @Test
    void otherImageTypesAndSubimagesGoThroughTheirArgbValues() throws Exception {
        BufferedImage whole = randomPicture(64, 48, 9);
        BufferedImage sub = whole.getSubimage(5, 7, 40, 30);
        assertSamePixels(ImageIO.read(new ByteArrayInputStream(PngFiles.encode(sub))), sub);
        BufferedImage rgb = new BufferedImage(20, 10, BufferedImage.TYPE_INT_RGB);
        rgb.setRGB(3, 4, 0x123456);
        assertSamePixels(ImageIO.read(new ByteArrayInputStream(PngFiles.encode(rgb))), rgb);
    }

    @Test
    void palettePicturesDecodeAsTheJdkWritersStoredFileDoes() throws Exception {
        int[][] sizes = {{1, 1}, {1, 37}, {37, 1}, {256, 256}, {256, 171}, {17, 256}, {300, 5}};
        int[] colourCounts = {1, 2, 3, 16, 17, 200, 255, 256};
        long seed = 1;
        for (int[] size : sizes) {
            for (int colours : colourCounts) {
                BufferedImage img = fewColours(size[0], size[1], colours, seed++);
                byte[] mine = PngFiles.encode(img);
                byte[] jdk = PngReference.jdkStored(img);
                assertSamePixels(PngReference.assertSameDecoded(mine, jdk), img);
                if (coloured(PngFiles.palette(img))) {
                    assertThat(ImageIO.read(new ByteArrayInputStream(jdk)).getColorModel())
                            .isInstanceOf(java.awt.image.IndexColorModel.class);
                }
            }
        }
        // all opaque (no transparency chunk), and transparent colours after opaque ones
        Random rnd = new Random(5);
        for (int variant = 0; variant < 4; variant++) {
            BufferedImage img = new BufferedImage(64 + variant, 48, BufferedImage.TYPE_INT_ARGB);
            for (int y = 0; y < img.getHeight(); y++) {
                for (int x = 0; x < img.getWidth(); x++) {
                    int c = 0xFF000000 | rnd.nextInt(50) * 0x030507;
                    if (variant >= 2 && y > 40 && x % 7 == 0) {
                        c = variant == 2 ? 0 : 0x7F00FF00;
                    }
                    img.setRGB(x, y, c);
                }
            }
            assertSamePixels(PngReference.assertSameDecoded(PngFiles.encode(img), PngReference.jdkStored(img)), img);
        }
    }

    @Test
    void rgbPicturesDecodeAsTheJdkWritersFileDoes() throws Exception {
        Random rnd = new Random(17);
        for (int[] size : new int[][] {{1, 1}, {1, 40}, {40, 1}, {581, 519}, {97, 63}}) {
            BufferedImage img = new BufferedImage(size[0], size[1], BufferedImage.TYPE_INT_RGB);
            for (int y = 0; y < size[1]; y++) {
                for (int x = 0; x < size[0]; x++) {
                    // flat areas, a ramp and noise: more than 256 colours
                    int c = x < size[0] / 3 ? 0xE6E6E6 : x < 2 * size[0] / 3 ? (x * 255 / size[0]) << 8 | y % 256
                            : rnd.nextInt(1 << 24);
                    img.setRGB(x, y, c);
                }
            }
            assertThat(PngFiles.palette(img)).isNull();
            ByteArrayOutputStream jdk = new ByteArrayOutputStream();
            ImageIO.write(img, "png", jdk);
            BufferedImage mine = ImageIO.read(new ByteArrayInputStream(PngFiles.encode(img)));
            assertSamePixels(mine, img);
            assertSamePixels(mine, ImageIO.read(new ByteArrayInputStream(jdk.toByteArray())));
        }
    }

    /** Whether some colour of the palette is not grey (the JDK writer keeps a palette only then). */
    private static boolean coloured(PngFiles.Indexed p) {
        for (int k = 0; k < p.colours(); k++) {
            int c = p.argb()[k];
            if ((c >>> 16 & 0xFF) != (c >>> 8 & 0xFF) || (c >>> 8 & 0xFF) != (c & 0xFF)) {
                return true;
            }
        }
        return false;
    }
}
