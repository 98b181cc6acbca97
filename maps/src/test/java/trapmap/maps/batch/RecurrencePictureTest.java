package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.awt.image.BufferedImage;
import java.nio.file.Path;
import java.util.BitSet;
import java.util.HashSet;
import java.util.Set;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class RecurrencePictureTest {
    @BeforeAll
    static void headless() {
        System.setProperty("java.awt.headless", "true");
    }

    /** One wafer over 40 × 40 cells, flagged on the left half: every share is 0 or 1. */
    private static Recurrence zeroOne() {
        int n = 40;
        BitSet covered = new BitSet();
        covered.set(0, n * n);
        BitSet flagged = new BitSet();
        for (int c = 0; c < n * n; c++) {
            if (c % n < n / 2) {
                flagged.set(c);
            }
        }
        RecurrenceMap r = new RecurrenceMap();
        r.add(new Footprint("f", 1.0, 0, 0, n, n, covered, flagged));
        return r.families().get("f");
    }

    @Test
    void zeroOneMapShowsBothEndsOfTheFixedScale(@TempDir Path dir) throws Exception {
        Recurrence r = zeroOne();
        Path png = dir.resolve("recurrence-f.png");
        RecurrencePicture.write(r, HotSpots.find(r, HotSpots.Criteria.DEFAULT), png);
        BufferedImage img = ImageIO.read(png.toFile());
        int k = RecurrencePicture.cellPx(40, 40);
        Set<Integer> mapColours = new HashSet<>();
        for (int y = 34; y < 34 + 40 * k; y += k) {
            for (int x = 12; x < 12 + 40 * k; x += k) {
                mapColours.add(img.getRGB(x + k / 2, y + k / 2) & 0xFFFFFF);
            }
        }
        // 0 % and 100 % take the two ends of the colour map: not one flat colour
        assertThat(mapColours).containsExactlyInAnyOrder(RecurrencePicture.colourOf(0) & 0xFFFFFF,
                RecurrencePicture.colourOf(1) & 0xFFFFFF);
    }

    @Test
    void writtenFileDecodesToTheDrawnPixelsAsTheJdkWritersFileDoes(@TempDir Path dir) throws Exception {
        Recurrence r = zeroOne();
        HotSpots.Result hot = HotSpots.find(r, HotSpots.Criteria.DEFAULT);
        Path png = dir.resolve("recurrence-f.png");
        RecurrencePicture.write(r, hot, png);
        BufferedImage drawn = RecurrencePicture.render(r, hot);
        Path jdk = dir.resolve("jdk.png");
        assertThat(ImageIO.write(drawn, "png", jdk.toFile())).isTrue();
        BufferedImage mine = ImageIO.read(png.toFile());
        BufferedImage theirs = ImageIO.read(jdk.toFile());
        int w = drawn.getWidth();
        int h = drawn.getHeight();
        assertThat(mine.getWidth()).isEqualTo(w);
        assertThat(mine.getHeight()).isEqualTo(h);
        assertThat(mine.getRGB(0, 0, w, h, null, 0, w)).containsExactly(drawn.getRGB(0, 0, w, h, null, 0, w))
                .containsExactly(theirs.getRGB(0, 0, w, h, null, 0, w));
    }

    /** The largest difference of the red, green and blue channels. */
    private static int distance(int a, int b) {
        int d = 0;
        for (int shift = 0; shift <= 16; shift += 8) {
            d = Math.max(d, Math.abs(((a >> shift) & 0xFF) - ((b >> shift) & 0xFF)));
        }
        return d;
    }

    @Test
    void pictureHasAColourBarFromZeroToHundredPercent() {
        Recurrence r = zeroOne();
        BufferedImage img = RecurrencePicture.render(r, null);
        int k = RecurrencePicture.cellPx(40, 40);
        int barX = 12 + 40 * k + 16 + RecurrencePicture.BAR_WIDTH_PX / 2;
        int top = 34;
        int h = 40 * k;
        // the bar runs from 100 % at the top to 0 % at the bottom, through many colours
        assertThat(distance(img.getRGB(barX, top + 1), RecurrencePicture.colourOf(1))).isLessThan(12);
        assertThat(distance(img.getRGB(barX, top + h - 1), RecurrencePicture.colourOf(0))).isLessThan(12);
        Set<Integer> bar = new HashSet<>();
        for (int y = top + 1; y < top + h; y++) {
            bar.add(img.getRGB(barX, y));
        }
        assertThat(bar.size()).isGreaterThan(50);
        // and its label: dark text pixels right of the tick labels
        int dark = 0;
        for (int y = top; y < top + h; y++) {
            for (int x = barX + 40; x < img.getWidth(); x++) {
                if ((img.getRGB(x, y) & 0xFF) < 100) {
                    dark++;
                }
            }
        }
        assertThat(dark).isGreaterThan(100);
    }

    /**
     * The cells are set into the raster directly: the pixels (and the PNG's bytes) are those of filling each cell's
     * square with its colour through {@code Graphics2D}, the straightforward way.
     */
    @Test
    void cellsSetDirectlyEqualCellsFilledOneByOne() throws Exception {
        int w = 23;
        int h = 17;
        int k = 3;
        float[] s = new float[w * h];
        for (int i = 0; i < s.length; i++) {
            s[i] = i % 7 == 0 ? Float.NaN : i % 11 == 0 ? 1.5f : i % 13 == 0 ? -0.25f : (float) (i % 101) / 100;
        }
        BufferedImage direct = new BufferedImage(w * k + 30, h * k + 40, BufferedImage.TYPE_INT_RGB);
        BufferedImage filled = new BufferedImage(w * k + 30, h * k + 40, BufferedImage.TYPE_INT_RGB);
        java.awt.Graphics2D g = filled.createGraphics();
        try {
            for (int y = 0; y < h; y++) {
                for (int x = 0; x < w; x++) {
                    float v = s[y * w + x];
                    g.setColor(Float.isFinite(v) ? new java.awt.Color(RecurrencePicture.colourOf(v))
                            : RecurrencePicture.NO_DATA);
                    g.fillRect(12 + x * k, 34 + y * k, k, k);
                }
            }
        } finally {
            g.dispose();
        }
        RecurrencePicture.cells(direct, s, w, h, k, 12, 34);
        int[] a = direct.getRaster().getPixels(0, 0, direct.getWidth(), direct.getHeight(), (int[]) null);
        int[] b = filled.getRaster().getPixels(0, 0, filled.getWidth(), filled.getHeight(), (int[]) null);
        assertThat(a).isEqualTo(b);
        assertThat(((java.awt.image.DataBufferInt) direct.getRaster().getDataBuffer()).getData())
                .isEqualTo(((java.awt.image.DataBufferInt) filled.getRaster().getDataBuffer()).getData());
        assertThat(trapmap.maps.io.PngFiles.encode(direct)).isEqualTo(trapmap.maps.io.PngFiles.encode(filled));
    }
}
