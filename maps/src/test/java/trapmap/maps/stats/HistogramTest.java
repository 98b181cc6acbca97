package trapmap.maps.stats;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.util.Random;
import org.junit.jupiter.api.Test;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.error.InvalidValueException;

class HistogramTest {
    private static final float NAN = Float.NaN;

    @Test
    void linearBinsCountHalfOpenIntervalsWithTheLastClosed() {
        FloatRaster r = FloatRaster.wrap(12, 1,
                new float[] {-1, 0, 0.5f, 1, 1.5f, 2, 2.5f, 3, 3.99f, 4, 5, NAN});
        Histogram h = Histogram.of(r, null, PixelGrid.centred(12, 1, 0.1), Histogram.Binning.linear(0, 4, 4));
        assertThat(h.edges()).containsExactly(0, 1, 2, 3, 4);
        assertThat(h.counts()).containsExactly(2, 2, 2, 3);
        assertThat(h.underflow()).isEqualTo(1);
        assertThat(h.overflow()).isEqualTo(1);
        assertThat(h.total()).isEqualTo(11);
        assertThat(h.areaFraction(3)).isCloseTo(3.0 / 11, within(1e-15));
        assertThat(h.areaMm2(3)).isCloseTo(3 * 0.01, within(1e-15));
        assertThat(h.binCentre(0)).isEqualTo(0.5);
    }

    @Test
    void logarithmicBinsPutDecadeValuesInTheBinTheyOpen() {
        FloatRaster r = FloatRaster.wrap(10, 1,
                new float[] {0, -5, 0.05f, 0.1f, 0.9f, 1, 10, 99, 100, 1000});
        Histogram h = Histogram.of(r, null, PixelGrid.centred(10, 1, 1), Histogram.Binning.logDecades(0.1, 1000, 1));
        assertThat(h.binCount()).isEqualTo(4);
        assertThat(h.edges()).containsExactly(0.1, 1, 10, 100, 1000);
        assertThat(h.counts()).containsExactly(2, 1, 2, 2);
        assertThat(h.underflow()).isEqualTo(3); // 0, −5 and 0.05: non-positive values are underflow in log bins
        assertThat(h.overflow()).isZero();
        assertThat(h.binCentre(1)).isCloseTo(Math.sqrt(10), within(1e-12));
    }

    @Test
    void countsMatchABruteForceCountAgainstTheEdges() {
        Random rnd = new Random(17);
        int w = 97;
        int hgt = 61;
        float[] s = new float[w * hgt];
        for (int i = 0; i < s.length; i++) {
            s[i] = rnd.nextDouble() < 0.05 ? NAN : (float) Math.pow(10, -2 + 6 * rnd.nextDouble());
        }
        FloatRaster r = FloatRaster.wrap(w, hgt, s);
        Mask mask = Mask.of(w, hgt, i -> i % 7 != 0);
        PixelGrid grid = PixelGrid.centred(w, hgt, 0.3);
        for (Histogram.Binning b : new Histogram.Binning[] {Histogram.Binning.logarithmic(0.1, 1000, 37),
                Histogram.Binning.linear(0, 5000, 23), Histogram.Binning.logDecades(0.01, 1e4, 10)}) {
            Histogram h = Histogram.of(r, mask, grid, b);
            double[] e = h.edges();
            long[] expected = new long[b.binCount()];
            long under = 0;
            long over = 0;
            long total = 0;
            for (int i = 0; i < s.length; i++) {
                if (!mask.containsIndex(i) || Float.isNaN(s[i])) {
                    continue;
                }
                double v = s[i];
                total++;
                if (v < e[0]) {
                    under++;
                } else if (v > e[e.length - 1]) {
                    over++;
                } else {
                    for (int k = 0; k < expected.length; k++) {
                        if (v >= e[k] && (v < e[k + 1] || k == expected.length - 1)) {
                            expected[k]++;
                            break;
                        }
                    }
                }
            }
            assertThat(h.counts()).as(b.toString()).containsExactly(expected);
            assertThat(h.underflow()).isEqualTo(under);
            assertThat(h.overflow()).isEqualTo(over);
            assertThat(h.total()).isEqualTo(total);
            double sum = h.underflowFraction() + h.overflowFraction();
            for (int k = 0; k < h.binCount(); k++) {
                sum += h.areaFraction(k);
            }
            assertThat(sum).isCloseTo(1, within(1e-12));
            assertThat(h.cumulativeFraction(h.binCount() - 1)).isCloseTo(1 - h.overflowFraction(), within(1e-12));
        }
    }

    @Test
    void logarithmicEdgesAreEvenInLogSpace() {
        double[] e = Histogram.Binning.logarithmic(0.5, 5000, 8).edges();
        for (int k = 1; k < e.length - 1; k++) {
            assertThat(e[k] * e[k]).isCloseTo(e[k - 1] * e[k + 1], within(1e-9 * e[k] * e[k]));
        }
        assertThat(e[0]).isEqualTo(0.5);
        assertThat(e[8]).isEqualTo(5000);
    }

    @Test
    void emptyHistogramHasNaNFractions() {
        FloatRaster r = FloatRaster.filled(3, 2, NAN);
        Histogram h = Histogram.of(r, null, PixelGrid.centred(3, 2, 1), Histogram.Binning.linear(0, 1, 2));
        assertThat(h.total()).isZero();
        assertThat(h.areaFraction(0)).isNaN();
    }

    @Test
    void invalidBinningsNameTheField() {
        assertThatThrownBy(() -> Histogram.Binning.logarithmic(0, 10, 5)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("histogramMin");
        assertThatThrownBy(() -> Histogram.Binning.linear(5, 1, 5)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("histogramMax");
        assertThatThrownBy(() -> Histogram.Binning.linear(0, 1, 0)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("binCount");
    }
}
