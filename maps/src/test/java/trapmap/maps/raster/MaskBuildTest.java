package trapmap.maps.raster;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.Random;
import org.junit.jupiter.api.Test;

/** Masks built word by word, in parallel blocks, against a pixel-by-pixel loop. */
class MaskBuildTest {

    @Test
    void builtMasksHoldExactlyThePixelsOfTheirTest() {
        Random rnd = new Random(9);
        for (int[] size : new int[][] {{1, 1}, {63, 1}, {65, 3}, {1000, 701}, {4099, 37}}) {
            int w = size[0];
            int h = size[1];
            float[] s = new float[w * h];
            boolean[] pick = new boolean[w * h];
            for (int i = 0; i < s.length; i++) {
                s[i] = rnd.nextInt(5) == 0 ? Float.NaN : rnd.nextFloat();
                pick[i] = rnd.nextBoolean();
            }
            Mask of = Mask.of(w, h, i -> pick[i]);
            Mask valid = Mask.valid(FloatRaster.wrap(w, h, s));
            int ofCount = 0;
            int validCount = 0;
            int wrong = 0;
            for (int i = 0; i < s.length; i++) {
                wrong += of.containsIndex(i) != pick[i] || valid.containsIndex(i) == Float.isNaN(s[i]) ? 1 : 0;
                ofCount += pick[i] ? 1 : 0;
                validCount += Float.isNaN(s[i]) ? 0 : 1;
            }
            assertThat(wrong).isZero();
            assertThat(of.count()).isEqualTo(ofCount);
            assertThat(valid.count()).isEqualTo(validCount);
            assertThat(of.nextIndex(w * h)).isEqualTo(-1);
            long[] words = of.words();
            assertThat(words).hasSize((w * h + 63) / 64);
            Mask again = Mask.ofWords(w, h, words);
            assertThat(again.count()).isEqualTo(ofCount);
            for (int i = 0; i < s.length; i++) {
                wrong += again.containsIndex(i) != pick[i] ? 1 : 0;
            }
            assertThat(wrong).isZero();
        }
    }

    @Test
    void setRangeSetsExactlyTheBitsOfTheRange() {
        Random rnd = new Random(11);
        for (int k = 0; k < 2000; k++) {
            int n = 1 + rnd.nextInt(400);
            long[] words = new long[(n + 63) / 64];
            long[] expected = new long[words.length];
            for (int j = 0; j < words.length; j++) { // bits already set stay set
                words[j] = rnd.nextInt(4) == 0 ? rnd.nextLong() : 0;
                expected[j] = words[j];
            }
            int from = rnd.nextInt(n + 1);
            int to = from + rnd.nextInt(n - from + 1);
            for (int b = from; b < to; b++) {
                expected[b >>> 6] |= 1L << b;
            }
            Mask.setRange(words, from, to);
            assertThat(words).as("bits [%d, %d) of %d", from, to, n).containsExactly(expected);
        }
    }
}
