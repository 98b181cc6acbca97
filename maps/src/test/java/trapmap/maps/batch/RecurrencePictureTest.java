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
}
