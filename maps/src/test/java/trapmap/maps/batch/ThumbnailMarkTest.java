package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.BitSet;
import java.util.Random;
import org.junit.jupiter.api.Test;

/**
 * The thumbnail pixels marked for flagged map pixels are those of the plain rule, each flagged pixel's own column
 * and row divided by the scale ({@code (int) (x / scale)}, at most the last one), for reduced and enlarged maps and
 * scales that are not whole numbers.
 */
class ThumbnailMarkTest {
    @Test
    void marksTheCellOfEveryFlaggedPixelAsThePlainRule() {
        Random rnd = new Random(3);
        for (int[] size : new int[][] {{1024, 1024}, {1000, 700}, {333, 517}, {100, 37}, {7, 3}, {1, 1}}) {
            int w = size[0];
            int h = size[1];
            double scale = (double) Math.max(w, h) / Thumbnails.THUMBNAIL_PX;
            int tw = Math.max(1, (int) Math.round(w / scale));
            int th = Math.max(1, (int) Math.round(h / scale));
            for (int density : new int[] {2, 50, 5000}) {
                BitSet flagged = new BitSet(w * h);
                for (int i = 0; i < w * h; i++) {
                    if (rnd.nextInt(density) == 0) {
                        flagged.set(i);
                    }
                }
                flagged.set(w * h - 1); // the last pixel, in a last row of its own chunk or not
                boolean[] got = new boolean[tw * th];
                Thumbnails.markFlagged(flagged, w, scale, tw, th, got);
                boolean[] want = new boolean[tw * th];
                for (int i = flagged.nextSetBit(0); i >= 0; i = flagged.nextSetBit(i + 1)) {
                    int tx = Math.min(tw - 1, (int) ((i % w) / scale));
                    int ty = Math.min(th - 1, (int) ((i / w) / scale));
                    want[ty * tw + tx] = true;
                }
                assertThat(got).as("%dx%d, 1 in %d flagged", w, h, density).isEqualTo(want);
            }
        }
    }
}
