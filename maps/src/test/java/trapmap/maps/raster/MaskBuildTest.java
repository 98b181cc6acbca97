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
}
