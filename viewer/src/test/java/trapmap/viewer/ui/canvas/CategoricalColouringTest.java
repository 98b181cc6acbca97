package trapmap.viewer.ui.canvas;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.List;
import org.junit.jupiter.api.Test;
import trapmap.maps.io.ColourMap;
import trapmap.viewer.graphics.Categories;
import trapmap.viewer.graphics.DisplayStyle;

/** A map of categories is coloured by its categories, not by the style's ramp. */
class CategoricalColouringTest {
    @Test
    void everyPixelTakesItsCategorysColour() {
        Categories cats = new Categories(List.of(new Categories.Category(1, "1", 0xE69F00),
                new Categories.Category(2, "2", 0x56B4E9), new Categories.Category(-2, "too few levels",
                        Categories.TOO_FEW_RGB)));
        DisplayStyle style = new DisplayStyle(ColourMap.BLUE_YELLOW, true, 0.5, 2.5);
        Colouring c = new Colouring(style, cats);
        float[] src = {1, 2, -2, Float.NaN, 1.5f, 2};
        int[] out = new int[src.length];
        c.colourise(src, 3, 0, 0, 3, 2, out);
        assertThat(out).containsExactly(0xE69F00, 0x56B4E9, Categories.TOO_FEW_RGB, c.noData(), Categories.MIXED_RGB,
                0x56B4E9);
        // without categories the same style colours by its (log) ramp
        Colouring ramp = new Colouring(style);
        assertThat(ramp.rgb(2)).isNotEqualTo(0x56B4E9);
        MapCanvas canvas = new MapCanvas();
        canvas.setStyle(style, cats);
        assertThat(canvas.categories()).isSameAs(cats);
        canvas.setStyle(style);
        assertThat(canvas.categories()).isNull();
    }
}
