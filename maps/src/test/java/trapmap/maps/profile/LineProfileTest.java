package trapmap.maps.profile;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.error.InvalidValueException;

class LineProfileTest {

    /** f = 2 + 0.25·x + 0.5·y at pixel (x, y): exact in float at every pixel centre. */
    private static FloatRaster ramp(int w, int h) {
        float[] s = new float[w * h];
        for (int i = 0; i < s.length; i++) {
            s[i] = 2 + 0.25f * (i % w) + 0.5f * (i / w);
        }
        return FloatRaster.wrap(w, h, s);
    }

    private static double rampAt(double xPx, double yPx) {
        return 2 + 0.25 * xPx + 0.5 * yPx;
    }

    @Test
    void bilinearSamplingReproducesALinearRampExactly() {
        PixelGrid grid = new PixelGrid(60, 40, 0.4, 29.3, 18.7);
        FloatRaster r = ramp(60, 40);
        LineProfile p = LineProfile.of(r, grid, -9.1, 5.3, 11.7, -4.9, 0.13, 0);
        assertThat(p.size()).isGreaterThan(100);
        for (int i = 0; i < p.size(); i++) {
            double expected = rampAt(grid.xPx(p.xMm(i)), grid.yPx(p.yMm(i)));
            assertThat(p.value(i)).isCloseTo(expected, within(1e-12));
            assertThat(p.sampleCount(i)).isEqualTo(1);
        }
    }

    @Test
    void distanceAxisIsEvenlySpacedFromStartToEnd() {
        PixelGrid grid = PixelGrid.centred(50, 50, 1);
        LineProfile p = LineProfile.of(ramp(50, 50), grid, -10, 0, 20, 0, 1.0, 0);
        assertThat(p.size()).isEqualTo(31);
        assertThat(p.distanceMm(0)).isZero();
        assertThat(p.lengthMm()).isCloseTo(30, within(1e-12));
        for (int i = 1; i < p.size(); i++) {
            assertThat(p.distanceMm(i) - p.distanceMm(i - 1)).isCloseTo(1, within(1e-12));
        }
        assertThat(p.xMm(30)).isCloseTo(20, within(1e-12));
    }

    @Test
    void aBandOverALinearRampAveragesToTheCentreLine() {
        PixelGrid grid = PixelGrid.centred(80, 80, 0.5);
        FloatRaster r = ramp(80, 80);
        LineProfile p = LineProfile.of(r, grid, -12, -7, 10, 9, 0.5, 3.0);
        for (int i = 0; i < p.size(); i++) {
            assertThat(p.sampleCount(i)).isEqualTo(6);
            assertThat(p.value(i)).isCloseTo(rampAt(grid.xPx(p.xMm(i)), grid.yPx(p.yMm(i))), within(1e-12));
        }
    }

    @Test
    void aStepAcrossTheLineIsInterpolatedBetweenPixelCentres() {
        int w = 21;
        float[] s = new float[w * 5];
        for (int i = 0; i < s.length; i++) {
            s[i] = i % w <= 10 ? 0f : 1f;
        }
        PixelGrid grid = new PixelGrid(w, 5, 1, 0, 2); // x_mm = column, y_mm = 2 − row
        LineProfile p = LineProfile.of(FloatRaster.wrap(w, 5, s), grid, 0, 0, 20, 0, 0.25, 0);
        for (int i = 0; i < p.size(); i++) {
            double x = p.xMm(i);
            double expected = x <= 10 ? 0 : x >= 11 ? 1 : x - 10;
            assertThat(p.value(i)).as("x = %s mm", x).isCloseTo(expected, within(1e-12));
        }
        assertThat(p.value(42)).isCloseTo(0.5, within(1e-12)); // x = 10.5 mm, half-way up the step
    }

    @Test
    void aBandAveragesAStepThatRunsAlongTheLine() {
        int w = 30;
        int h = 100;
        float[] s = new float[w * h];
        for (int i = 0; i < s.length; i++) {
            s[i] = i / w < 50 ? 0f : 1f; // rows 0–49: 0, rows 50–99: 1
        }
        PixelGrid grid = new PixelGrid(w, h, 1, 0, 50); // y_mm = 50 − row: the step lies between y = 1 and y = 0
        LineProfile p = LineProfile.of(FloatRaster.wrap(w, h, s), grid, 5, 0, 25, 0, 1, 4);
        // band samples at y = −1.5, −0.5, 0.5, 1.5 mm: rows 51.5, 50.5, 49.5, 48.5 → 1, 1, 0.5, 0
        for (int i = 0; i < p.size(); i++) {
            assertThat(p.sampleCount(i)).isEqualTo(4);
            assertThat(p.value(i)).isCloseTo(2.5 / 4, within(1e-12));
        }
    }

    @Test
    void missingDataIsSkippedAcrossTheBandAndNaNWhereNothingIsLeft() {
        FloatRaster r = ramp(40, 40);
        float[] s = r.samples();
        for (int y = 0; y < 40; y++) {
            for (int x = 20; x < 40; x++) {
                s[y * 40 + x] = Float.NaN; // right half without data
            }
        }
        PixelGrid grid = new PixelGrid(40, 40, 1, 0, 0);
        LineProfile p = LineProfile.of(r, grid, 5, -20, 35, -20, 1, 0);
        assertThat(p.value(0)).isCloseTo(rampAt(5, 20), within(1e-12));
        assertThat(p.value(14)).isCloseTo(rampAt(19, 20), within(1e-12)); // last column with data
        assertThat(p.value(14 + 1)).isNaN(); // x = 20 px: no data at or beyond
        assertThat(p.sampleCount(20)).isZero();
        assertThat(p.value(30)).isNaN();
    }

    @Test
    void samplesBeyondTheRasterAreNaN() {
        PixelGrid grid = PixelGrid.centred(10, 10, 1);
        LineProfile p = LineProfile.of(ramp(10, 10), grid, -20, 0, 20, 0, 1, 0);
        assertThat(p.value(0)).isNaN();
        assertThat(p.value(20)).isNotNaN();
        assertThat(p.value(40)).isNaN();
    }

    @Test
    void bilinearRenormalisesNearAGapOnlyWhenMostlyOnData() {
        FloatRaster r = FloatRaster.wrap(2, 1, new float[] {4, Float.NaN});
        assertThat(Bilinear.sample(r, 0.25, 0)).isEqualTo(4);
        assertThat(Bilinear.sample(r, 0.5, 0)).isEqualTo(4);
        assertThat(Bilinear.sample(r, 0.75, 0)).isNaN();
        assertThat(Bilinear.sample(r, -0.4, 0)).isEqualTo(4);
        assertThat(Bilinear.sample(r, -0.6, 0)).isNaN();
    }

    @Test
    void degenerateLinesAndBadWidthsAreRefused() {
        PixelGrid grid = PixelGrid.centred(10, 10, 1);
        FloatRaster r = ramp(10, 10);
        assertThatThrownBy(() -> LineProfile.of(r, grid, 1, 1, 1, 1, 1, 0)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("line").hasMessageContaining("mm");
        assertThatThrownBy(() -> LineProfile.of(r, grid, 0, 0, 1, 1, 1, -2))
                .isInstanceOf(InvalidValueException.class).hasMessageContaining("bandWidth");
        assertThatThrownBy(() -> LineProfile.of(r, grid, 0, 0, 1, 1, 0, 0))
                .isInstanceOf(InvalidValueException.class).hasMessageContaining("step");
    }
}
