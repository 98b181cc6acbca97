package trapmap.viewer.graphics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;
import trapmap.maps.io.ColourMap;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.viewer.ui.charts.ChartsTest;

class AutoStyleTest {
    @Test
    void lifetimesUseTheSequentialMapOnALogScale() {
        DisplayStyle s = AutoStyle.of(ChartsTest.map(Quantity.EFFECTIVE_LIFETIME, 100, 0.3, 1));
        assertThat(s.colours()).isEqualTo(ColourMap.BLUE_YELLOW);
        assertThat(s.logarithmic()).isTrue();
        assertThat(s.low()).isLessThan(100);
        assertThat(s.high()).isGreaterThan(100);
    }

    @Test
    void ratiosUseTheDivergingMapSymmetricAboutOneOnALogScale() {
        DisplayStyle s = AutoStyle.of(ChartsTest.map(Quantity.RATIO, 2, 0.2, 2));
        assertThat(s.colours()).isEqualTo(ColourMap.DIVERGING);
        assertThat(s.logarithmic()).isTrue();
        assertThat(s.low() * s.high()).isCloseTo(1, within(1e-12));
        assertThat(s.high()).isGreaterThan(2);
    }

    @Test
    void beforeAndAfterShareARangeCoveringBoth() {
        WaferMap before = ChartsTest.map(Quantity.EFFECTIVE_LIFETIME, 50, 0.1, 3);
        WaferMap after = ChartsTest.map(Quantity.EFFECTIVE_LIFETIME, 600, 0.1, 4);
        DisplayStyle s = AutoStyle.common(before, after);
        assertThat(s.low()).isEqualTo(AutoStyle.of(before).low());
        assertThat(s.high()).isEqualTo(AutoStyle.of(after).high());
    }

    @Test
    void reductionsKeepTheFixedZeroToOneScaleWhateverTheData() {
        // a reduction map of 0.92–0.96 would auto-scale to its own narrow range; fractions keep 0–1 (0–100 %)
        WaferMap reduction = ChartsTest.map(Quantity.FRACTION, 0.94, 0.01, 5);
        DisplayStyle s = AutoStyle.of(reduction);
        assertThat(s.low()).isZero();
        assertThat(s.high()).isEqualTo(1);
        assertThat(s.logarithmic()).isFalse();
        assertThat(AutoStyle.of(ChartsTest.map(Quantity.DIFFERENCE, 0.94, 0.005, 5)).high()).isLessThan(1);
    }
}
