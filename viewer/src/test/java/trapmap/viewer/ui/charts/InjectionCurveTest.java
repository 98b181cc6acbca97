package trapmap.viewer.ui.charts;

import static org.assertj.core.api.Assertions.assertThat;

import org.jfree.chart.JFreeChart;
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
