package trapmap.viewer.ui.charts;

import static org.assertj.core.api.Assertions.assertThat;

import java.awt.FontMetrics;
import java.awt.Graphics2D;
import java.awt.geom.Rectangle2D;
import java.awt.image.BufferedImage;
import java.util.ArrayList;
import java.util.List;
import org.jfree.chart.ChartRenderingInfo;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.AxisState;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.axis.ValueTick;
import org.jfree.chart.ui.RectangleEdge;
import trapmap.viewer.graphics.DecadeAxis;
import org.jfree.chart.axis.LogAxis;
import org.junit.jupiter.api.Test;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.InjectionSweep;
import trapmap.physics.conversion.Surface;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

/** The injection chart draws the physics module's sweep. */
class InjectionCurveTest {


    private static InjectionSweep sweep() {
        Conditions cond = Conditions.of(Doping.pType(1e16), Injection.fixed(1e15)).withSurface(Surface.sproul(180, 20));
        return InjectionSweep.of(new TrapDensityConverter(cond, DefectLibrary.byId("fe-i")), 50.0);
    }

    /** The tick labels the axis draws in the chart drawn at {@code w}×{@code h} px, in axis order. */
    private static List<String> labelsWithoutOverlap(JFreeChart chart, int w, int h, boolean domain) {
        BufferedImage img = new BufferedImage(w, h, BufferedImage.TYPE_INT_RGB);
        Graphics2D g2 = img.createGraphics();
        try {
            ChartRenderingInfo info = new ChartRenderingInfo();
            chart.draw(g2, new Rectangle2D.Double(0, 0, w, h), info);
            Rectangle2D area = info.getPlotInfo().getDataArea();
            ValueAxis axis = domain ? chart.getXYPlot().getDomainAxis() : chart.getXYPlot().getRangeAxis();
            RectangleEdge edge = domain ? RectangleEdge.BOTTOM : RectangleEdge.LEFT;
            FontMetrics fm = g2.getFontMetrics(axis.getTickLabelFont());
            List<String> labels = new ArrayList<>();
            double previousEnd = Double.NEGATIVE_INFINITY;
            for (Object o : axis.refreshTicks(g2, new AxisState(), area, edge)) {
                ValueTick t = (ValueTick) o;
                if (t.getText() == null || t.getText().isEmpty()) {
                    continue;
                }
                double p = axis.valueToJava2D(t.getValue(), area, edge);
                double half = (domain ? fm.stringWidth(t.getText()) : fm.getHeight()) / 2.0;
                // pixel positions grow to the right and downwards: sort along the axis by value order
                double start = domain ? p - half : -(p + half);
                double end = domain ? p + half : -(p - half);
                assertThat(start).as("label %s at %d×%d px starts after the previous label %s", t.getText(), w, h,
                        labels).isGreaterThan(previousEnd);
                if (domain) {
                    assertThat(p + half).as("label %s inside the %d px wide picture", t.getText(), w)
                            .isLessThanOrEqualTo(w);
                }
                previousEnd = end;
                labels.add(t.getText());
            }
            return labels;
        } finally {
            g2.dispose();
        }
    }

    @Test
    void injectionTickLabelsAreDecadesWhoseBoxesNeverOverlap() {
        JFreeChart chart = InjectionCurveView.createChart(sweep());
        List<String> wide = labelsWithoutOverlap(chart, 1200, 400, true);
        assertThat(wide).containsExactly("10¹²", "10¹³", "10¹⁴", "10¹⁵", "10¹⁶", "10¹⁷");
        for (int w : new int[] {180, 260, 360, 520, 800}) {
            List<String> x = labelsWithoutOverlap(chart, w, 300, true);
            assertThat(x).as("x labels at %d px", w).hasSizeGreaterThanOrEqualTo(2).isSubsetOf(wide);
        }
        for (int h : new int[] {220, 280, 340}) {
            List<String> y = labelsWithoutOverlap(chart, 520, h, false);
            assertThat(y).as("y labels at %d px", h).hasSizeGreaterThanOrEqualTo(2);
        }
    }

    @Test
    void decadeLabelsArePlainNearOneAndPowersOfTenElsewhere() {
        assertThat(DecadeAxis.label(1, 12)).isEqualTo("10¹²");
        assertThat(DecadeAxis.label(5, 13)).isEqualTo("5×10¹³");
        assertThat(DecadeAxis.label(1, -5)).isEqualTo("10⁻⁵");
        assertThat(DecadeAxis.label(2, -3)).isEqualTo("0.002");
        assertThat(DecadeAxis.label(1, 3)).isEqualTo("1000");
        assertThat(DecadeAxis.label(1, 0)).isEqualTo("1");
    }

    @Test
    void chartDrawsTheSweepOnLogAxesWithTheOperatingPoint() {
        Conditions cond = Conditions.of(Doping.pType(1e16), Injection.fixed(1e15)).withSurface(Surface.sproul(180, 20));
        TrapDensityConverter conv = new TrapDensityConverter(cond, DefectLibrary.byId("fe-i"));
        InjectionSweep c = InjectionSweep.of(conv, 50.0);
        JFreeChart chart = InjectionCurveView.createChart(c);
        assertThat(chart.getXYPlot().getDomainAxis()).isInstanceOf(LogAxis.class);
        assertThat(chart.getXYPlot().getRangeAxis()).isInstanceOf(LogAxis.class);
        assertThat(chart.getXYPlot().getDataset(0).getSeriesCount()).isEqualTo(4);
        assertThat(chart.getXYPlot().getDataset(0).getItemCount(0)).isEqualTo(InjectionSweep.POINTS);
        assertThat(chart.getXYPlot().getDataset(1).getXValue(0, 0)).isEqualTo(1e15);
        assertThat(chart.getXYPlot().getDataset(1).getYValue(0, 0)).isEqualTo(50.0);
    }
}
