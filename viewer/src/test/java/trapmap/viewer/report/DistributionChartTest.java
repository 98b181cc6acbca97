package trapmap.viewer.report;

import static org.assertj.core.api.Assertions.assertThat;

import org.jfree.chart.JFreeChart;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/** The distribution charts of the batch summary. */
class DistributionChartTest {
    @BeforeAll
    static void headless() {
        System.setProperty("java.awt.headless", "true");
    }

    @Test
    void aFigureThatIsZeroOnEveryWaferHasNoNegativeAxis() {
        JFreeChart c = DistributionChart.of("below_limit_area_fraction", "", new double[] {0, 0, 0, 0, 0, 0},
                new double[0]);
        double low = c.getXYPlot().getDomainAxis().getLowerBound();
        assertThat(low).isGreaterThan(-0.1).isLessThanOrEqualTo(0);
        assertThat(c.getXYPlot().getDomainAxis().getUpperBound()).isGreaterThanOrEqualTo(1);
    }
}
