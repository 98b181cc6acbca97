package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.BitSet;
import java.util.Random;
import org.junit.jupiter.api.Test;
import trapmap.maps.raster.PixelGrid;

/**
 * {@link Footprint#coarsened}: equal to the footprint made from the pixels on the larger cells directly when the pixels
 * are no larger than the stored cells, holding it when they are larger.
 */
class FootprintCoarsenedTest {
    @Test
    void aCoarsenedFootprintEqualsTheFootprintOnTheLargerCells() {
        for (double pitch : new double[] {0.8, 2.6, 3.1}) {
            for (double[] centre : new double[][] {{31.5, 31.5}, {20.25, 40.7}, {-3, 70}}) {
                Random rnd = new Random(Double.hashCode(pitch) * 31L + Double.hashCode(centre[0]));
                int w = 64;
                int h = 57;
                PixelGrid g = new PixelGrid(w, h, pitch, centre[0], centre[1]);
                int[] indices = new int[w * h];
                int count = 0;
                BitSet flagged = new BitSet();
                for (int i = 0; i < w * h; i++) {
                    if (rnd.nextInt(10) > 0) { // evaluated, with random holes
                        indices[count++] = i;
                        if (rnd.nextInt(25) == 0) {
                            flagged.set(i);
                        }
                    }
                }
                Footprint fine = Footprint.of("round-156", g, indices, count, flagged, 1.0);
                for (int k : new int[] {1, 3, 5}) {
                    Footprint direct = Footprint.of("round-156", g, indices, count, flagged, k);
                    if (pitch <= 1) {
                        assertThat(fine.coarsened(k)).as("pitch %s, centre %s/%s, factor %d", pitch, centre[0],
                                centre[1], k).isEqualTo(direct);
                    } else {
                        // pixels larger than the fine cells reach more of them: every cell of the direct footprint
                        // is among the coarsened one's
                        assertThat(contains(fine.coarsened(k), direct)).as("pitch %s, centre %s/%s, factor %d",
                                pitch, centre[0], centre[1], k).isTrue();
                    }
                }
            }
        }
    }

    /** Whether every covered and every flagged cell of {@code inner} is one of {@code outer}, on the same cells. */
    private static boolean contains(Footprint outer, Footprint inner) {
        assertThat(outer.pitchMm()).isEqualTo(inner.pitchMm());
        for (int pass = 0; pass < 2; pass++) {
            BitSet cells = pass == 0 ? inner.covered() : inner.flagged();
            BitSet of = pass == 0 ? outer.covered() : outer.flagged();
            for (int b = cells.nextSetBit(0); b >= 0; b = cells.nextSetBit(b + 1)) {
                int i = inner.minI() + b % inner.width() - outer.minI();
                int j = inner.minJ() + b / inner.width() - outer.minJ();
                if (i < 0 || j < 0 || i >= outer.width() || j >= outer.height() || !of.get(j * outer.width() + i)) {
                    return false;
                }
            }
        }
        return true;
    }

    @Test
    void aRecurrenceMapTakesOrRefusesACoarsenedFootprintByItsReachInMm() {
        BitSet covered = new BitSet();
        covered.set(0, 25);
        Footprint near = new Footprint("x", 1.0, 900, -2, 5, 5, covered, new BitSet()); // reaches 905 mm
        Footprint far = new Footprint("x", 1.0, 1100, -2, 5, 5, covered, new BitSet()); // reaches 1105 mm
        assertThat(RecurrenceMap.accepts(near)).isTrue();
        assertThat(RecurrenceMap.accepts(near.coarsened(3))).isTrue();
        assertThat(RecurrenceMap.accepts(far)).isFalse();
        assertThat(RecurrenceMap.accepts(far.coarsened(3))).as("cells 367 and 368 of 3 mm reach 1107 mm").isFalse();
    }

    @Test
    void onlyPositiveOddFactorsNest() {
        Footprint f = new Footprint("x", 1.0, -2, -2, 4, 4, new BitSet(), new BitSet());
        assertThatThrownBy(() -> f.coarsened(2)).isInstanceOf(IllegalArgumentException.class)
                .hasMessageContaining("odd");
        assertThatThrownBy(() -> f.coarsened(0)).isInstanceOf(IllegalArgumentException.class);
        assertThat(f.coarsened(1)).isSameAs(f);
    }
}
