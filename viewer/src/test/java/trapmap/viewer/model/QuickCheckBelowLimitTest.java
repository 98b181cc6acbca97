package trapmap.viewer.model;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

/** The viewer's quick threshold check on trap densities uses the OK pixels, as the batch and {@code stats} do. */
class QuickCheckBelowLimitTest {
    @Test
    void belowLimitPixelsAreNotFlaggedNorInTheShownStatistics() {
        TrapDensityConverter fe = new TrapDensityConverter(Conditions.of(Doping.pType(1e16), Injection.fixed(1e15)),
                DefectLibrary.byId("fe-i"));
        double tauLim = fe.convert(100).intrinsicLifetimeUs();
        int n = 101;
        PixelGrid g = PixelGrid.centred(n, n, 1.0);
        float[] s = new float[n * n];
        for (int y = 0; y < n; y++) {
            for (int x = 0; x < n; x++) {
                double xm = g.xMm(x);
                s[y * n + x] = Math.hypot(xm, g.yMm(y)) > 50 ? Float.NaN
                        : (float) ((xm < -17 ? 0.9 : xm > 17 ? 1.0 : 0.99) * tauLim);
            }
        }
        WaferMap map = new WaferMap(FloatRaster.wrap(n, n, s), g, Quantity.EFFECTIVE_LIFETIME, "bands",
                MeasurementConditions.UNKNOWN.withDoping(Doping.pType(1e16)).withInjection(1e15),
                Provenance.of("test"));
        Analysis a = Analysis.DEFAULT.withQuantity(DisplayedQuantity.TRAP_DENSITY).withEdgeExclusion(0);
        a = a.withThreshold(a.threshold().withValue(5e8).withMinArea(1));
        WaferAnalysis r = WaferAnalyzer.analyse(map, a, DefectLibrary.byId("fe-i"), null, null);
        assertThat(r.regions().regions()).hasSize(1);
        assertThat(r.regions().regions().get(0).bounds().maxXMm()).isLessThan(-17);
        double worse = fe.convert((float) (0.9 * tauLim)).trapDensityPerCm3();
        assertThat(r.displayedStats().max()).isCloseTo(worse, org.assertj.core.api.Assertions.within(1e-6 * worse));
        // the shown map still holds the bound at the below-limit pixels
        assertThat(r.displayed().raster().samples()[(n / 2) * n + n - 10]).isGreaterThan(8e8f);
    }
}
