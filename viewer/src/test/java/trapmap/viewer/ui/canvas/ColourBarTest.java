package trapmap.viewer.ui.canvas;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.awt.image.BufferedImage;
import org.junit.jupiter.api.Test;
import trapmap.maps.io.ColourMap;
import trapmap.viewer.graphics.Categories;
import trapmap.viewer.graphics.DisplayStyle;

class ColourBarTest {
    @Test
    void linearTicksAreRoundMultiples() {
        assertThat(ColourBar.linearTicks(0, 1, 8)).containsExactly(0, 0.2, 0.4, 0.6, 0.8, 1);
        assertThat(ColourBar.linearTicks(3, 17, 8)).containsExactly(4, 6, 8, 10, 12, 14, 16);
        assertThat(ColourBar.linearTicks(-0.35, 0.35, 8)).containsExactly(-0.3, -0.2, -0.1, 0, 0.1, 0.2, 0.3);
        assertThat(ColourBar.linearTicks(0, 1000, 4)).containsExactly(0, 500, 1000);
    }

    @Test
    void logTicksAreDecadesOrOneTwoFiveWithinOneDecadeOrTwo() {
        assertThat(ColourBar.logTicks(1e10, 1e15, 8)).containsExactly(1e10, 1e11, 1e12, 1e13, 1e14, 1e15);
        assertThat(ColourBar.logTicks(3e9, 2e13, 8)).containsExactly(1e10, 1e11, 1e12, 1e13);
        assertThat(ColourBar.logTicks(1e0, 1e20, 8)).containsExactly(1e0, 1e3, 1e6, 1e9, 1e12, 1e15, 1e18);
        double[] t = ColourBar.logTicks(30, 1000, 8);
        assertThat(t).hasSize(5);
        assertThat(t[0]).isCloseTo(50, within(1e-9));
        assertThat(t[4]).isCloseTo(1000, within(1e-9));
    }

    @Test
    void tickLabelsUseSuperscriptPowersForLargeAndSmallValues() {
        assertThat(ColourBar.format(1e15, 1e15)).isEqualTo("10¹⁵");
        assertThat(ColourBar.format(2e-6, 2e-6)).isEqualTo("2×10⁻⁶");
        assertThat(ColourBar.format(0.4, 0.2)).isEqualTo("0.4");
        assertThat(ColourBar.format(500, 100)).isEqualTo("500");
        assertThat(ColourBar.format(0, 0.1)).isEqualTo("0");
    }

    @Test
    void positionsFollowTheScale() {
        DisplayStyle log = new DisplayStyle(ColourMap.BLUE_YELLOW, true, 1e10, 1e14);
        assertThat(ColourBar.position(log, 1e12)).isCloseTo(0.5, within(1e-12));
        DisplayStyle lin = new DisplayStyle(ColourMap.BLUE_YELLOW, false, -1, 3);
        assertThat(ColourBar.position(lin, 0)).isCloseTo(0.25, within(1e-12));
    }

    @Test
    void paintsTheColoursFromLowAtTheBottomToHighAtTheTop() {
        ColourBar bar = new ColourBar(new DisplayStyle(ColourMap.HEAT, true, 1e10, 1e14), "N_t (cm⁻³)");
        bar.setSize(100, 300);
        BufferedImage img = new BufferedImage(100, 300, BufferedImage.TYPE_INT_RGB);
        var g = img.createGraphics();
        bar.paint(g);
        g.dispose();
        int x = 6 + ColourBar.BAR_WIDTH / 2;
        int topRgb = -1;
        int bottomRgb = -1;
        for (int y = 0; y < 300; y++) {
            int c = img.getRGB(x, y) & 0xFFFFFF;
            if (c == ColourMap.HEAT.rgb(255) && topRgb < 0) {
                topRgb = y;
            }
            if (c == ColourMap.HEAT.rgb(0)) {
                bottomRgb = y;
            }
        }
        assertThat(topRgb).isPositive();
        assertThat(bottomRgb).isGreaterThan(topRgb + 200);
        assertThat(bar.label()).isEqualTo("N_t (cm⁻³)");
    }

    @Test
    void preferredWidthHoldsTheWidestLabelAndItsMargins() {
        ColourBar bar = new ColourBar(new DisplayStyle(ColourMap.DIVERGING, false, -5e11, 5e11), "cm⁻³");
        java.awt.FontMetrics fm = bar.getFontMetrics(bar.getFont() != null ? bar.getFont()
                : new java.awt.Font(java.awt.Font.SANS_SERIF, java.awt.Font.PLAIN, 12));
        assertThat(bar.tickLabels()).contains("-4×10¹¹", "4×10¹¹");
        int widest = bar.tickLabels().stream().mapToInt(fm::stringWidth).max().orElseThrow();
        int need = ColourBar.PAD + ColourBar.BAR_WIDTH + ColourBar.LABEL_GAP + widest + ColourBar.PAD;
        assertThat(bar.getPreferredSize().width).isGreaterThanOrEqualTo(need);
        assertThat(bar.getMinimumSize().width).isEqualTo(bar.getPreferredSize().width);
        // a longer label above the bar widens it too
        bar.setLabel("interstitial iron [Fe_i] (cm⁻³)");
        assertThat(bar.getPreferredSize().width).isGreaterThanOrEqualTo(
                2 * ColourBar.PAD + fm.stringWidth("interstitial iron [Fe_i] (cm⁻³)"));
    }

    @Test
    void fractionsReadAsPercentages() {
        ColourBar bar = new ColourBar(new DisplayStyle(ColourMap.BLUE_YELLOW, false, 0, 1), "%");
        bar.setPercent(true);
        assertThat(bar.tickLabels()).containsExactly("0 %", "20 %", "40 %", "60 %", "80 %", "100 %");
    }

    @Test
    void aMapOfCategoriesListsOneSwatchPerCategoryInsteadOfAScale() {
        Categories cats = new Categories(java.util.List.of(new Categories.Category(1, "1 fe-i", 0xE69F00),
                new Categories.Category(2, "2 cr-i", 0x56B4E9), new Categories.Category(-1, "no single defect",
                        Categories.UNDECIDED_RGB)));
        ColourBar bar = new ColourBar(new DisplayStyle(ColourMap.GREY, false, 0, 1), "best defect");
        bar.setCategories(cats);
        assertThat(bar.tickLabels()).containsExactly("1 fe-i", "2 cr-i", "no single defect", "no data");
        bar.setSize(200, 300);
        BufferedImage img = new BufferedImage(200, 300, BufferedImage.TYPE_INT_RGB);
        var g = img.createGraphics();
        bar.paint(g);
        g.dispose();
        int x = ColourBar.PAD + ColourBar.BAR_WIDTH / 2;
        java.util.List<Integer> seen = new java.util.ArrayList<>();
        for (int y = 0; y < 300; y++) {
            int c = img.getRGB(x, y) & 0xFFFFFF;
            if (seen.isEmpty() || seen.get(seen.size() - 1) != c) {
                seen.add(c);
            }
        }
        // the swatches top to bottom in the categories' order, and no grey-scale ramp of the style
        assertThat(seen).containsSubsequence(0xE69F00, 0x56B4E9, Categories.UNDECIDED_RGB,
                Colouring.noDataRgb(ColourMap.GREY));
        assertThat(seen).doesNotContain(ColourMap.GREY.rgb(128));
        bar.setCategories(null);
        assertThat(bar.tickLabels()).contains("0", "1.0");
    }
}
