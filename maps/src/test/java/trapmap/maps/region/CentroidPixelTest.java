package trapmap.maps.region;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.Random;
import org.junit.jupiter.api.Test;

/** {@link Region.CentroidPixel#of} against a plain search over every pixel, ties and regions of many calls' length. */
class CentroidPixelTest {
    /** The nearest pixel to (cx, cy): least squared distance, then least index; and whether the centroid lies in it. */
    private static Region.CentroidPixel reference(int[] pixels, int count, int width, double cx, double cy) {
        int best = -1;
        double bestD = Double.POSITIVE_INFINITY;
        for (int k = 0; k < count; k++) {
            int i = pixels[k];
            double dx = i % width - cx;
            double dy = i / width - cy;
            double d = dx * dx + dy * dy;
            if (d < bestD || d == bestD && i < best) {
                bestD = d;
                best = i;
            }
        }
        boolean inside = Math.abs(best % width - cx) <= 0.5 && Math.abs(best / width - cy) <= 0.5;
        return new Region.CentroidPixel(best, inside);
    }

    @Test
    void theNearestPixelIsThatOfAPlainSearch() {
        Random rnd = new Random(5);
        for (int trial = 0; trial < 300; trial++) {
            int width = 1 + rnd.nextInt(60);
            int count = 1 + rnd.nextInt(trial % 3 == 0 ? 600 : 70);
            int[] pixels = new int[count];
            for (int k = 0; k < count; k++) {
                pixels[k] = rnd.nextInt(width * 40); // any order, repeats allowed
            }
            // centroids on pixel centres and half-way between them (ties), or anywhere
            double cx = rnd.nextBoolean() ? rnd.nextInt(2 * width) / 2.0 : rnd.nextDouble() * width;
            double cy = rnd.nextBoolean() ? rnd.nextInt(80) / 2.0 : rnd.nextDouble() * 40;
            assertThat(Region.CentroidPixel.of(pixels, count, width, cx, cy)).as("trial %d", trial)
                    .isEqualTo(reference(pixels, count, width, cx, cy));
        }
    }

    @Test
    void ofEquallyNearPixelsTheFirstInIndexOrderIsTaken() {
        // a ring of 200 pixels around (50, 50) in a 101-wide raster, the four nearest at distance 1, listed from the
        // largest index down and spread over several calls' worth of pixels
        int[] pixels = new int[200];
        int n = 0;
        for (int k = 0; k < 196; k++) {
            pixels[n++] = (10 + k / 14) * 101 + 10 + k % 14; // farther pixels
        }
        pixels[n++] = 51 * 101 + 50;
        pixels[n++] = 50 * 101 + 51;
        pixels[n++] = 50 * 101 + 49;
        pixels[n++] = 49 * 101 + 50;
        Region.CentroidPixel at = Region.CentroidPixel.of(pixels, n, 101, 50, 50);
        assertThat(at.nearestIndex()).isEqualTo(49 * 101 + 50);
        assertThat(at.inside()).isFalse();
    }
}
