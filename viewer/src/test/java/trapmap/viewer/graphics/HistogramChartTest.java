package trapmap.viewer.graphics;

import static org.assertj.core.api.Assertions.assertThat;

import org.jfree.chart.JFreeChart;
import org.jfree.chart.plot.Marker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.ui.Layer;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;

/** The threshold's label on the histogram stands above the bars and hides none of them. */
class HistogramChartTest {
    @BeforeAll
    static void headless() {
        System.setProperty("java.awt.headless", "true");
    }

    private static WaferMap map() {
        int n = 40;
        float[] s = new float[n * n];
        for (int i = 0; i < s.length; i++) {
            s[i] = 1e10f * (1 + i % 37);
        }
        return new WaferMap(FloatRaster.wrap(n, n, s), PixelGrid.centred(n, n, 1), Quantity.TRAP_DENSITY, "W",
                MeasurementConditions.UNKNOWN, Provenance.of("test"));
    }

    @Test
    void theThresholdLabelHasNoBoxAndABandAboveTheTallestBar() {
        JFreeChart chart = HistogramChart.createChart(HistogramChart.compute(map(), null, 2e11));
        XYPlot plot = chart.getXYPlot();
        Marker m = (Marker) plot.getDomainMarkers(Layer.FOREGROUND).iterator().next();
        assertThat(m.getLabel()).startsWith("threshold");
        assertThat(m.getLabelBackgroundColor().getAlpha()).isZero();
        double tallest = 0;
        for (int i = 0; i < plot.getDataset().getItemCount(0); i++) {
            tallest = Math.max(tallest, plot.getDataset().getYValue(0, i));
        }
        // the label's band: the top fifth of the plot at least is above every bar
        assertThat(plot.getRangeAxis().getUpperBound()).isGreaterThanOrEqualTo(tallest / 0.8);
    }
}
