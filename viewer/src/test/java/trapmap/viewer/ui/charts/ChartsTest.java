package trapmap.viewer.ui.charts;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import javax.imageio.ImageIO;
import org.apache.commons.math3.stat.descriptive.moment.StandardDeviation;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.LogAxis;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.Marker;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.ui.Layer;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.profile.LineProfile;
import trapmap.maps.profile.RadialProfile;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.maps.stats.Histogram;
import trapmap.viewer.graphics.ChartExport;
import trapmap.viewer.graphics.HistogramChart;
import trapmap.viewer.graphics.Labels;

/** The charts' data and pictures, headless. */
public class ChartsTest {
    @BeforeAll
    static void headless() {
        System.setProperty("java.awt.headless", "true");
    }

    /** 60×50 px at 0.5 mm of log-normal values around {@code centre}, with a NaN corner (no data). */
    public static WaferMap map(Quantity q, double centre, double sigmaDecades, long seed) {
        int w = 60;
        int h = 50;
        Random rnd = new Random(seed);
        float[] s = new float[w * h];
        for (int i = 0; i < s.length; i++) {
            s[i] = (float) (centre * Math.pow(10, sigmaDecades * rnd.nextGaussian()));
        }
        for (int y = 0; y < 8; y++) {
            for (int x = 0; x < 8; x++) {
                s[y * w + x] = Float.NaN;
            }
        }
        return new WaferMap(FloatRaster.wrap(w, h, s), PixelGrid.centred(w, h, 0.5), q, "W-TEST",
                MeasurementConditions.UNKNOWN, Provenance.of("test"));
    }

    @Test
    void histogramBinCountsEqualABruteForceCountOverTheMask() {
        WaferMap m = map(Quantity.EFFECTIVE_LIFETIME, 80, 0.4, 1);
        Mask mask = Mask.of(m.width(), m.height(), i -> (i / m.width()) % 3 != 0);
        HistogramChart.Data d = HistogramChart.compute(m, mask, 50);
        Histogram h = d.histogram();
        double[] e = h.edges();
        float[] s = m.raster().samples();
        for (int b = 0; b < h.binCount(); b++) {
            long n = 0;
            for (int i = 0; i < s.length; i++) {
                boolean last = b == h.binCount() - 1;
                if (mask.containsIndex(i) && s[i] >= e[b] && (s[i] < e[b + 1] || last && s[i] <= e[b + 1])) {
                    n++;
                }
            }
            assertThat(h.count(b)).as("bin %d", b).isEqualTo(n);
        }
    }

    @Test
    void logBinsCoverTheDataRangeWithNothingOutside() {
        WaferMap m = map(Quantity.TRAP_DENSITY, 3e11, 0.8, 2);
        HistogramChart.Data d = HistogramChart.compute(m, null, Double.NaN);
        Histogram h = d.histogram();
        assertThat(h.binning().spacing()).isEqualTo(Histogram.Spacing.LOGARITHMIC);
        assertThat(h.edges()[0]).isLessThanOrEqualTo(d.statistics().min());
        assertThat(h.edges()[h.binCount()]).isGreaterThanOrEqualTo(d.statistics().max());
        assertThat(h.underflow() + h.overflow()).isZero();
        assertThat(h.total()).isEqualTo(d.statistics().count());
        // equal widths in log x: every bin spans the same ratio
        double ratio = h.edges()[1] / h.edges()[0];
        assertThat(h.edges()[h.binCount()] / h.edges()[h.binCount() - 1]).isCloseTo(ratio, within(1e-9 * ratio));
        assertThat(d.statistics().max() / d.statistics().min()).isGreaterThan(100);
    }

    @Test
    void occupancyGetsLinearBins() {
        WaferMap m = map(Quantity.OCCUPANCY, 0.3, 0.05, 3);
        HistogramChart.Data d = HistogramChart.compute(m, null, Double.NaN);
        assertThat(d.histogram().binning().spacing()).isEqualTo(Histogram.Spacing.LINEAR);
        assertThat(d.histogram().binCount()).isEqualTo(HistogramChart.LINEAR_BINS);
        assertThat(HistogramChart.createChart(d).getXYPlot().getDomainAxis()).isInstanceOf(NumberAxis.class);
    }

    @Test
    void aThresholdNearTheRightEdgeHasItsLabelLeftOfTheLine() {
        WaferMap m = map(Quantity.EXCEEDANCE_PROBABILITY, 0.3, 0.2, 5);
        HistogramChart.Data d = HistogramChart.compute(m, null, d0(m) * 0.98);
        ValueMarker right = (ValueMarker) HistogramChart.createChart(d).getXYPlot().getDomainMarkers(Layer.FOREGROUND)
                .iterator().next();
        assertThat(right.getLabelTextAnchor()).isEqualTo(org.jfree.chart.ui.TextAnchor.TOP_RIGHT);
        assertThat(right.getLabelAnchor()).isEqualTo(org.jfree.chart.ui.RectangleAnchor.TOP_LEFT);
        HistogramChart.Data low = HistogramChart.compute(m, null, 0.01);
        ValueMarker left = (ValueMarker) HistogramChart.createChart(low).getXYPlot().getDomainMarkers(
                Layer.FOREGROUND).iterator().next();
        assertThat(left.getLabelTextAnchor()).isEqualTo(org.jfree.chart.ui.TextAnchor.TOP_LEFT);
    }

    private static double d0(WaferMap m) {
        return HistogramChart.compute(m, null, Double.NaN).statistics().max();
    }

    @Test
    void onlyLifetimesGetAHarmonicMeanAndCategoriesNoValueStatistics() {
        List<String> probability = names(HistogramChart.compute(map(Quantity.EXCEEDANCE_PROBABILITY, 0.3, 0.2, 6),
                null, 0.5));
        assertThat(probability).contains("mean", "median", "P95").doesNotContain("harmonic mean", "geometric mean");
        assertThat(probability).noneMatch(n -> n.contains("harmonic"));
        List<String> density = names(HistogramChart.compute(map(Quantity.TRAP_DENSITY, 1e11, 0.3, 6), null,
                Double.NaN));
        assertThat(density).contains("geometric mean").doesNotContain("harmonic mean");
        assertThat(names(HistogramChart.compute(map(Quantity.SRH_LIFETIME, 80, 0.3, 6), null, Double.NaN)))
                .contains("harmonic mean", "geometric mean");
        List<String> index = names(HistogramChart.compute(map(Quantity.DEFECT_INDEX, 3, 0.1, 6), null, Double.NaN));
        assertThat(index).contains("pixels counted", "area").doesNotContain("mean", "harmonic mean", "median",
                "standard deviation", "P50");
    }

    private static List<String> names(HistogramChart.Data d) {
        return d.rows().stream().map(HistogramChart.Row::name).toList();
    }

    @Test
    void thresholdIsMarkedAtItsValueAndReportedWithUnits() {
        WaferMap m = map(Quantity.EFFECTIVE_LIFETIME, 80, 0.3, 4);
        HistogramChart.Data d = HistogramChart.compute(m, null, 42.5);
        JFreeChart chart = HistogramChart.createChart(d);
        XYPlot plot = chart.getXYPlot();
        assertThat(plot.getDomainAxis()).isInstanceOf(LogAxis.class);
        List<Marker> markers = new ArrayList<>(plot.getDomainMarkers(Layer.FOREGROUND));
        assertThat(markers).hasSize(1);
        assertThat(((ValueMarker) markers.get(0)).getValue()).isEqualTo(42.5);
        assertThat(markers.get(0).getLabel()).contains("42.5 µs");
        assertThat(d.rows()).anySatisfy(r -> {
            assertThat(r.name()).isEqualTo("harmonic mean");
            assertThat(r.unit()).isEqualTo("µs");
        });
        assertThat(d.rows()).anySatisfy(r -> assertThat(r.name() + r.value() + r.unit()).isEqualTo("threshold42.5µs"));
        assertThat(d.rows()).anySatisfy(r -> {
            assertThat(r.name()).isEqualTo("area");
            assertThat(r.unit()).isEqualTo("mm²");
        });
    }

    @Test
    void lineProfileOfALifetimeMapUsesALogAxisAndNamesTheBand() {
        WaferMap m = map(Quantity.EFFECTIVE_LIFETIME, 80, 0.2, 5);
        LineProfile p = LineProfile.of(m, -10, 0, 10, 0, 2);
        JFreeChart chart = LineProfileView.createChart(p, Quantity.EFFECTIVE_LIFETIME);
        assertThat(chart.getXYPlot().getRangeAxis()).isInstanceOf(LogAxis.class);
        assertThat(chart.getXYPlot().getDataset().getItemCount(0)).isEqualTo(p.size());
        assertThat(((org.jfree.chart.title.TextTitle) chart.getSubtitle(0)).getText()).contains("band 2 mm wide");
    }

    @Test
    void ringSpreadEqualsCommonsMathStandardDeviationOfTheRingsPixels() {
        WaferMap m = map(Quantity.EFFECTIVE_LIFETIME, 80, 0.2, 6);
        RadialProfile p = RadialProfile.of(m, null, 3);
        double[] sd = RadialProfileView.ringStandardDeviations(m, null, p);
        int ring = 2;
        List<Double> values = new ArrayList<>();
        for (int y = 0; y < m.height(); y++) {
            for (int x = 0; x < m.width(); x++) {
                double r = Math.hypot(m.grid().xMm(x), m.grid().yMm(y));
                float v = m.raster().get(x, y);
                if (v == v && r >= p.innerRadiusMm(ring) && r < p.outerRadiusMm(ring)) {
                    values.add((double) v);
                }
            }
        }
        double expected = new StandardDeviation(true).evaluate(values.stream().mapToDouble(Double::doubleValue)
                .toArray());
        assertThat(sd[ring]).isCloseTo(expected, within(1e-9 * expected));
        JFreeChart chart = RadialProfileView.createChart(p, Quantity.EFFECTIVE_LIFETIME, sd);
        assertThat(chart.getXYPlot().getDataset().getItemCount(0)).isEqualTo(p.ringCount());
    }

    @Test
    void pngExportWritesADecodableImageOfTheRequestedSize(@TempDir Path dir) throws IOException {
        HistogramChart.Data d = HistogramChart.compute(map(Quantity.EFFECTIVE_LIFETIME, 80, 0.3, 7), null, 40);
        Path f = dir.resolve("sub").resolve("histogram.png");
        ChartExport.writePng(HistogramChart.createChart(d), f, 640, 360);
        BufferedImage img = ImageIO.read(f.toFile());
        assertThat(img.getWidth()).isEqualTo(640);
        assertThat(img.getHeight()).isEqualTo(360);
        try (var s = Files.list(f.getParent())) {
            assertThat(s.map(p -> p.getFileName().toString()).toList()).containsExactly("histogram.png");
        }
        // something was drawn: not a blank picture
        int first = img.getRGB(0, 0);
        boolean varied = false;
        for (int y = 0; y < img.getHeight() && !varied; y += 7) {
            for (int x = 0; x < img.getWidth(); x += 7) {
                varied |= img.getRGB(x, y) != first;
            }
        }
        assertThat(varied).isTrue();
    }

    @Test
    void numbersReadWithFourSignificantDigits() {
        assertThat(Labels.number(12.3456)).isEqualTo("12.35");
        assertThat(Labels.number(2.5e14)).isEqualTo("2.5e14");
        assertThat(Labels.number(100)).isEqualTo("100");
        assertThat(Labels.number(Double.NaN)).isEqualTo("n/a");
        assertThat(Labels.number(3e11, "cm^-3")).isEqualTo("3e11 cm⁻³");
    }

    @Test
    void inANarrowTabTheHistogramKeepsHalfTheWidthForTheChart() {
        HistogramView v = new HistogramView();
        v.setSize(480, 250); // the chart tab of a 1024 px wide window
        v.doLayout();
        v.doLayout(); // the table's width follows the tab's
        java.awt.Component chart = v.getComponent(0);
        assertThat(chart).isInstanceOf(org.jfree.chart.ChartPanel.class);
        assertThat(chart.getWidth()).as("chart width of 480 px").isGreaterThanOrEqualTo(480 / 2 - 6);
        assertThat(((org.jfree.chart.ChartPanel) chart).getMinimumDrawWidth()).as("drawn unscaled")
                .isLessThanOrEqualTo(chart.getWidth());
        v.setSize(1200, 250); // a desktop window: the table at its full width
        v.doLayout();
        assertThat(v.getComponent(1).getWidth()).isEqualTo(370);
    }

    @Test
    void anEmptyProfileOrInjectionChartSaysHowToFillIt() {
        JFreeChart line = LineProfileView.createChart(null, Quantity.UNKNOWN);
        assertThat(line.getTitle().getText()).isEqualTo("Line profile");
        assertThat(((org.jfree.chart.title.TextTitle) line.getSubtitle(0)).getText()).contains("press L")
                .contains("drag across the map");
        JFreeChart injection = InjectionCurveView.createChart(null);
        assertThat(injection.getSubtitles()).filteredOn(t -> t instanceof org.jfree.chart.title.TextTitle tt
                && tt.getText().contains("point at the map")).hasSize(1);
    }
}
