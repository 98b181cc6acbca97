package trapmap.maps.raster;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.BitSet;
import org.junit.jupiter.api.Test;

class MaskEdgeTest {
    /** Rows of '#' (in the mask) and '.' as a mask. */
    private static Mask parse(String... rows) {
        int w = rows[0].length();
        return Mask.of(w, rows.length, i -> rows[i / w].charAt(i % w) == '#');
    }

    private static String render(Mask m) {
        StringBuilder b = new StringBuilder();
        for (int y = 0; y < m.height(); y++) {
            for (int x = 0; x < m.width(); x++) {
                b.append(m.contains(x, y) ? '#' : '.');
            }
            b.append('\n');
        }
        return b.toString();
    }

    @Test
    void aFilledSquareKeepsItsRingAndLosesItsInside() {
        Mask m = parse(
                ".......",
                ".#####.",
                ".#####.",
                ".#####.",
                ".#####.",
                ".......");
        assertThat(render(m.edge())).isEqualTo(String.join("\n",
                ".......",
                ".#####.",
                ".#...#.",
                ".#...#.",
                ".#####.",
                ".......") + "\n");
        assertThat(m.edge().count()).isEqualTo(14);
    }

    @Test
    void holesAreOutlinedAndTheRasterBorderClosesRegions() {
        Mask m = parse(
                "#####",
                "#####",
                "##.##",
                "#####",
                "#####");
        assertThat(render(m.edge())).isEqualTo(String.join("\n",
                "#####",
                "#.#.#",
                "##.##",
                "#.#.#",
                "#####") + "\n");
    }

    @Test
    void thinLinesAndSinglePixelsAreTheirOwnEdge() {
        Mask m = parse(
                "......",
                ".####.",
                "......",
                "....#.");
        assertThat(render(m.edge())).isEqualTo(render(m));
    }

    @Test
    void bitsOutsideTheRasterAreIgnoredAndBadSizesRefused() {
        BitSet b = new BitSet();
        b.set(0, 9);
        b.set(20);
        BitSet e = Mask.edgePixels(b, 3, 3);
        assertThat(e.cardinality()).isEqualTo(8);
        assertThat(e.get(4)).isFalse();
        assertThatThrownBy(() -> Mask.edgePixels(b, 0, 3)).hasMessageContaining("0x3 px");
    }
}
