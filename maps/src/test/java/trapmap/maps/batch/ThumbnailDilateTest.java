package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.Random;
import org.junit.jupiter.api.Test;

/** The thumbnail's square dilation against the definition, also on pictures narrower than the radius. */
class ThumbnailDilateTest {
    @Test
    void dilationMarksExactlyThePixelsWithinTheRadius() {
        Random rnd = new Random(11);
        for (int[] size : new int[][] {{1, 1}, {1, 6}, {6, 1}, {2, 3}, {5, 4}, {13, 9}, {40, 31}}) {
            int w = size[0];
            int h = size[1];
            for (int density : new int[] {2, 9, 60}) {
                boolean[] b = new boolean[w * h];
                for (int i = 0; i < b.length; i++) {
                    b[i] = rnd.nextInt(density) == 0;
                }
                for (int r = 0; r <= 4; r++) {
                    boolean[] d = Thumbnails.dilate(b, w, h, r);
                    for (int y = 0; y < h; y++) {
                        for (int x = 0; x < w; x++) {
                            boolean expected = false;
                            for (int yy = Math.max(0, y - r); yy <= Math.min(h - 1, y + r); yy++) {
                                for (int xx = Math.max(0, x - r); xx <= Math.min(w - 1, x + r); xx++) {
                                    expected |= b[yy * w + xx];
                                }
                            }
                            assertThat(d[y * w + x]).as("%dx%d (%d, %d) r=%d", w, h, x, y, r).isEqualTo(expected);
                        }
                    }
                }
            }
        }
    }
}
