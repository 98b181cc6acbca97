package trapmap.maps.profile;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.Test;
import trapmap.maps.geometry.RoundWafer;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.error.InvalidValueException;

class RadialProfileTest {

    private static FloatRaster radial(PixelGrid grid, double cxMm, double cyMm,
                                      java.util.function.DoubleUnaryOperator f) {
        int w = grid.width();
        float[] s = new float[w * grid.height()];
        for (int i = 0; i < s.length; i++) {
            s[i] = (float) f.applyAsDouble(Math.hypot(grid.xMm(i % w) - cxMm, grid.yMm(i / w) - cyMm));
        }
        return FloatRaster.wrap(w, grid.height(), s);
    }

    @Test
    void ringMeansOfARadiallySymmetricFunction() {
        PixelGrid grid = PixelGrid.centred(401, 401, 0.25);
        // f = 3 + 0.01 r²: its mean over the annulus [r0, r1) is 3 + 0.01 (r0² + r1²) / 2
        FloatRaster r = radial(grid, 0, 0, rho -> 3 + 0.01 * rho * rho);
        Mask wafer = RoundWafer.disk(99.9).mask(grid, 0); // no pixel centre on r = 50 mm
        RadialProfile p = RadialProfile.of(r, grid, wafer, 2.0, 0, 0);
        assertThat(p.ringCount()).isEqualTo(25);
        for (int k = 2; k < p.ringCount(); k++) {
            double r0 = p.innerRadiusMm(k);
            double r1 = p.outerRadiusMm(k);
            double exact = 3 + 0.01 * (r0 * r0 + r1 * r1) / 2;
            // the pixel lattice samples each annulus unevenly near its rims: allow 5 % of the rise of f across it
            double rise = 0.01 * (r1 * r1 - r0 * r0);
            assertThat(p.mean(k)).as("ring %d", k).isCloseTo(exact, within(0.05 * rise));
            // and the count follows the annulus area, within the digitisation of its two rims
            double annulusPx = Math.PI * (r1 * r1 - r0 * r0) / grid.pixelAreaMm2();
            assertThat((double) p.count(k)).isCloseTo(annulusPx, within(0.05 * annulusPx + 20));
        }
        long total = 0;
        for (int k = 0; k < p.ringCount(); k++) {
            total += p.count(k);
        }
        assertThat(total).isEqualTo(wafer.count());
    }

    @Test
    void ringMeansEqualABruteForceAverageOfTheirPixels() {
        PixelGrid grid = new PixelGrid(97, 83, 0.5, 40.2, 45.9);
        FloatRaster r = radial(grid, 3, -2, rho -> Math.cos(rho / 4));
        r.samples()[1234] = Float.NaN;
        RadialProfile p = RadialProfile.of(r, grid, null, 1.5, 3, -2);
        for (int k = 0; k < p.ringCount(); k++) {
            double sum = 0;
            int n = 0;
            for (int i = 0; i < r.size(); i++) {
                double rho = Math.hypot(grid.xMm(i % 97) - 3, grid.yMm(i / 97) + 2);
                if ((int) (rho / 1.5) == k && !Float.isNaN(r.samples()[i])) {
                    sum += r.samples()[i];
                    n++;
                }
            }
            assertThat(p.count(k)).isEqualTo(n);
            assertThat(p.mean(k)).isCloseTo(sum / n, within(1e-12));
        }
    }

    @Test
    void aConstantMapHasAFlatProfileAndEmptyRingsAreNaN() {
        PixelGrid grid = PixelGrid.centred(101, 101, 1);
        FloatRaster r = FloatRaster.filled(101, 101, 5);
        Mask ring = Mask.of(101, 101, i -> {
            double rho = Math.hypot(i % 101 - 50, i / 101 - 50);
            return rho < 10 || rho >= 20;
        });
        RadialProfile p = RadialProfile.of(r, grid, ring, 5, 0, 0);
        assertThat(p.mean(0)).isEqualTo(5);
        assertThat(p.mean(2)).isNaN();
        assertThat(p.count(3)).isZero();
        assertThat(p.mean(5)).isEqualTo(5);
        assertThat(p.radiusMm(2)).isEqualTo(12.5);
    }

    @Test
    void ringWidthMustBePositive() {
        PixelGrid grid = PixelGrid.centred(3, 3, 1);
        assertThatThrownBy(() -> RadialProfile.of(FloatRaster.filled(3, 3, 1), grid, null, 0, 0, 0))
                .isInstanceOf(InvalidValueException.class).hasMessageContaining("ringWidth")
                .hasMessageContaining("mm");
    }
}
