package trapmap.viewer.graphics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.HashSet;
import java.util.List;
import java.util.Set;
import org.junit.jupiter.api.Test;

/** The colours of categorical maps: distinct, not grey, and each value its own. */
class CategoriesTest {
    private static final int CANVAS_NO_DATA = 0x505050;

    @Test
    void thePaletteColoursAreDistinctAndNoneIsAGreyOfTheSpecialCategories() {
        Set<Integer> seen = new HashSet<>();
        for (int rgb : Categories.QUALITATIVE) {
            assertThat(seen.add(rgb)).as("colour %06X twice", rgb).isTrue();
            int r = rgb >> 16 & 0xFF;
            int g = rgb >> 8 & 0xFF;
            int b = rgb & 0xFF;
            // no neutral grey: the greys mean "no single defect", "too few levels" and "no data"
            assertThat(Math.max(r, Math.max(g, b)) - Math.min(r, Math.min(g, b))).as("%06X", rgb)
                    .isGreaterThan(40);
        }
        assertThat(seen).doesNotContain(Categories.UNDECIDED_RGB, Categories.TOO_FEW_RGB, Categories.MIXED_RGB,
                CANVAS_NO_DATA);
        assertThat(Set.of(Categories.UNDECIDED_RGB, Categories.TOO_FEW_RGB, Categories.MIXED_RGB, CANVAS_NO_DATA))
                .hasSize(4);
        assertThat(Categories.qualitative(0)).isEqualTo(0xE69F00);
        assertThat(Categories.qualitative(Categories.QUALITATIVE.length)).isEqualTo(Categories.qualitative(0));
    }

    @Test
    void eachWholeValueTakesItsCategorysColourAndMeansBetweenThemAreMixed() {
        Categories c = new Categories(List.of(new Categories.Category(1, "1 fe-i", 0x112233),
                new Categories.Category(2, "2 cr-i", 0x445566), new Categories.Category(-1, "no single defect",
                        Categories.UNDECIDED_RGB)));
        assertThat(c.rgb(1.0, CANVAS_NO_DATA)).isEqualTo(0x112233);
        assertThat(c.rgb(2.0000001, CANVAS_NO_DATA)).isEqualTo(0x445566);
        assertThat(c.rgb(-1, CANVAS_NO_DATA)).isEqualTo(Categories.UNDECIDED_RGB);
        assertThat(c.rgb(1.5, CANVAS_NO_DATA)).isEqualTo(Categories.MIXED_RGB);
        assertThat(c.rgb(Double.NaN, CANVAS_NO_DATA)).isEqualTo(CANVAS_NO_DATA);
        assertThat(c.rgb(7, CANVAS_NO_DATA)).isEqualTo(CANVAS_NO_DATA);
        assertThat(c.of(2).label()).isEqualTo("2 cr-i");
        assertThat(c.of(3)).isNull();
        assertThatThrownBy(() -> new Categories(List.of(new Categories.Category(1, "a", 1),
                new Categories.Category(1, "b", 2)))).hasMessageContaining("value 1 is listed twice");
    }
}
