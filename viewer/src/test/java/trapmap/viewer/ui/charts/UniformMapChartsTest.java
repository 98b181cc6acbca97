package trapmap.viewer.ui.charts;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import org.jfree.chart.JFreeChart;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.profile.RadialProfile;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.viewer.graphics.ChartExport;
import trapmap.viewer.graphics.HistogramChart;

/** A uniform map (every pixel equal) gives charts, not exceptions. */
class UniformMapChartsTest {
    @TempDir
    Path dir;

    @BeforeAll
    static void headless() {
        System.setProperty("java.awt.headless", "true");
    }

    private WaferMap uniform(Quantity q, float v) throws Exception {
        int n = 41;
        float[] s = new float[n * n];
        java.util.Arrays.fill(s, v);
        Path f = dir.resolve("uniform.tif");
        MapFiles.write(new WaferMap(FloatRaster.wrap(n, n, s), PixelGrid.centred(n, n, 1.0), q, "U",
                MeasurementConditions.UNKNOWN, Provenance.of("test")), f);
        return MapFiles.readSingle(f);
    }

    @Test
    void uniformTrapDensityMapGetsALogarithmicRadialProfileAroundItsValue() throws Exception {
        // every ring has the same mean: JFreeChart's log axis alone asks for a zero-length range and throws
        WaferMap m = uniform(Quantity.TRAP_DENSITY, 1.5e12f);
        Mask mask = Mask.valid(m.raster());
        RadialProfile rp = RadialProfile.of(m, mask, 2.0);
        double[] spread = RadialProfileView.ringStandardDeviations(m, mask, rp);
        JFreeChart c = RadialProfileView.createChart(rp, m.quantity(), spread);
        org.jfree.chart.axis.ValueAxis y = c.getXYPlot().getRangeAxis();
        assertThat(y).isInstanceOf(org.jfree.chart.axis.LogAxis.class);
        double v = (double) 1.5e12f;
        assertThat(y.getLowerBound()).isCloseTo(v / 1.1, org.assertj.core.api.Assertions.within(v * 1e-9));
        assertThat(y.getUpperBound()).isCloseTo(v * 1.1, org.assertj.core.api.Assertions.within(v * 1e-9));
        assertThat(ChartExport.image(c, 400, 200, 1).getWidth()).isEqualTo(400);
        HistogramChart.Data d = HistogramChart.compute(m, mask, Double.NaN);
        assertThat(d.histogram().total()).isEqualTo(mask.count());
        ChartExport.image(HistogramChart.createChart(d), 400, 200, 1);
    }

    @Test
    void uniformLifetimeMapDrawsItsHistogramAndRadialProfile() throws Exception {
        for (float v : new float[] {80f, 0f}) {
            WaferMap m = uniform(Quantity.EFFECTIVE_LIFETIME, v);
            Mask mask = Mask.valid(m.raster());
            HistogramChart.Data d = HistogramChart.compute(m, mask, 50);
            JFreeChart c = HistogramChart.createChart(d);
            assertThat(ChartExport.image(c, 400, 200, 1).getWidth()).isEqualTo(400);
            RadialProfile rp = RadialProfile.of(m, mask, 2.0);
            double[] spread = RadialProfileView.ringStandardDeviations(m, mask, rp);
            // every pixel equals v: each ring of two or more pixels spreads by nothing
            assertThat(spread).hasSize(rp.ringCount());
            assertThat(java.util.Arrays.stream(spread).filter(sd -> !Double.isNaN(sd)).boxed().toList()).isNotEmpty()
                    .allSatisfy(sd -> assertThat(sd).isCloseTo(0, org.assertj.core.api.Assertions.within(1e-6 * v)));
            RadialProfileView view = new RadialProfileView();
            view.show(rp, m.quantity(), spread);
        }
    }
}
