package trapmap.viewer.graphics;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.awt.FontMetrics;
import java.awt.image.BufferedImage;
import org.junit.jupiter.api.Test;

class LogTicksTest {
    @Test
    void oneTwoFiveValuesWhereTheyFit() {
        assertThat(LogTicks.ticks(15.8, 501, 12)).containsExactly(20, 50, 100, 200, 500);
        assertThat(LogTicks.ticks(8, 1200, 12)).containsExactly(10, 20, 50, 100, 200, 500, 1000);
        assertThat(LogTicks.ticks(0.003, 0.6, 12)).containsExactly(0.005, 0.01, 0.02, 0.05, 0.1, 0.2, 0.5);
        assertThat(LogTicks.ticks(1e12, 1e13, 8)).containsExactly(1e12, 2e12, 5e12, 1e13);
    }

    @Test
    void decadesWhenOneTwoFiveAreTooMany() {
        assertThat(LogTicks.ticks(15.8, 501, 4)).containsExactly(100);
        assertThat(LogTicks.ticks(1e10, 1e15, 8)).containsExactly(1e10, 1e11, 1e12, 1e13, 1e14, 1e15);
        assertThat(LogTicks.ticks(1e0, 1e20, 8)).containsExactly(1e0, 1e3, 1e6, 1e9, 1e12, 1e15, 1e18);
        assertThat(LogTicks.ticks(3e9, 2e13, 6)).containsExactly(1e10, 1e11, 1e12, 1e13);
    }

    @Test
    void narrowRangesGetRoundLinearSteps() {
        assertThat(LogTicks.ticks(150, 400, 8)).containsExactly(150, 200, 250, 300, 350, 400);
        assertThat(LogTicks.ticks(0.92, 0.96, 5)).containsExactly(0.92, 0.93, 0.94, 0.95, 0.96);
    }

    @Test
    void noTickIsAnUnevenPowerOfTen() {
        for (double[] range : new double[][] {{15.8, 501}, {1.3, 9e4}, {2e11, 7e14}, {0.04, 3}}) {
            for (int max = 3; max <= 12; max++) {
                for (double t : LogTicks.ticks(range[0], range[1], max)) {
                    double mant = t / Math.pow(10, Math.floor(Math.log10(t) + 1e-12));
                    assertThat(Math.round(mant * 1e6) / 1e6).as("tick %s of %s", t, range[0]).isIn(1.0, 2.0, 5.0);
                }
            }
        }
    }

    @Test
    void badRangesAreRefused() {
        assertThatThrownBy(() -> LogTicks.ticks(0, 10, 5)).hasMessageContaining("low 0.0");
        assertThatThrownBy(() -> LogTicks.ticks(10, 1, 5)).hasMessageContaining("high 1.0");
    }

    @Test
    void chartAxesTakeAsManyTicksAsTheirLabelsFit() {
        BufferedImage img = new BufferedImage(1, 1, BufferedImage.TYPE_INT_RGB);
        FontMetrics fm = img.createGraphics().getFontMetrics(ChartStyle.TICKS);
        double[] wide = ChartStyle.fittingLogTicks(15.8, 501, 420, fm::stringWidth, 10);
        assertThat(wide).containsExactly(20, 50, 100, 200, 500);
        double[] narrow = ChartStyle.fittingLogTicks(15.8, 501, 60, fm::stringWidth, 10);
        assertThat(narrow).containsExactly(20, 100);
        double[] decades = ChartStyle.fittingLogTicks(1e10, 1e16, 300, fm::stringWidth, 10);
        double need = 0;
        for (double v : decades) {
            need += fm.stringWidth(ChartStyle.TICK_FORMAT.format(v)) + 10;
        }
        assertThat(need).isLessThanOrEqualTo(300);
        assertThat(decades.length).isGreaterThanOrEqualTo(3);
    }

    @Test
    void neighbouringLabelsOfANarrowLogRangeDoNotTouch() {
        // a batch's P50 densities 2.5e10-9e10: round steps of 1e10 crowd towards 9e10 on the log scale
        BufferedImage img = new BufferedImage(1, 1, BufferedImage.TYPE_INT_RGB);
        FontMetrics fm = img.createGraphics().getFontMetrics(ChartStyle.TICKS);
        double low = 2.5e10;
        double high = 9e10;
        // where room allows, the ticks keep one step (4e10, 6e10, 8e10), not 3e10, 4e10, 5e10, 6.5e10, 8.5e10
        double[] even = ChartStyle.fittingLogTicks(low, high, 215, fm::stringWidth, 10);
        assertThat(even.length).isGreaterThanOrEqualTo(3);
        for (int i = 2; i < even.length; i++) {
            assertThat(even[i] - even[i - 1]).isCloseTo(even[1] - even[0], org.assertj.core.data.Offset.offset(1e6));
        }
        for (double length = 120; length <= 600; length += 10) {
            double[] t = ChartStyle.fittingLogTicks(low, high, length, fm::stringWidth, 10);
            assertThat(t.length).as("ticks along %s px", length).isGreaterThanOrEqualTo(2);
            for (int i = 1; i < t.length; i++) {
                double distance = length * Math.log10(t[i] / t[i - 1]) / Math.log10(high / low);
                double half = (fm.stringWidth(ChartStyle.TICK_FORMAT.format(t[i - 1]))
                        + fm.stringWidth(ChartStyle.TICK_FORMAT.format(t[i]))) / 2.0;
                assertThat(distance).as("%s and %s along %s px", t[i - 1], t[i], length)
                        .isGreaterThanOrEqualTo(half + 10);
            }
        }
    }
}
