package trapmap.viewer.report;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.List;
import org.jfree.chart.axis.CategoryLabelPositions;
import org.jfree.chart.plot.CategoryPlot;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import trapmap.maps.trend.GroupYield;
import trapmap.maps.trend.ParetoEntry;

/** The yield and Pareto charts of the trend report read as the summary does. */
class TrendChartsTest {
    @BeforeAll
    static void headless() {
        System.setProperty("java.awt.headless", "true");
    }

    @Test
    void theParetoNamesFiguresAsTheSummaryDoesAndKeepsItsLastPointInside() {
        CategoryPlot plot = TrendReport.paretoChart(List.of(
                new ParetoEntry("largest_interior_region_mm2", 63, 0.72, 0.72),
                new ParetoEntry("trap_density_p50_cm3", 25, 0.28, 1.0))).getCategoryPlot();
        assertThat(plot.getCategories()).containsExactly("largest interior region", "trap density P50");
        assertThat(plot.getDomainAxis().getCategoryLabelPositions()).isEqualTo(CategoryLabelPositions.STANDARD);
        assertThat(plot.getRangeAxis(1).getUpperBound()).isGreaterThan(100);
    }

    @Test
    void twoTubesAreLabelledAcrossAndTwentyDaysUpright() {
        CategoryPlot two = TrendReport.yieldChart(List.of(new GroupYield("T1", 10, 7), new GroupYield("T2", 10, 5)))
                .getCategoryPlot();
        assertThat(two.getDomainAxis().getCategoryLabelPositions()).isEqualTo(CategoryLabelPositions.STANDARD);
        List<GroupYield> days = new java.util.ArrayList<>();
        for (int d = 1; d <= 20; d++) {
            days.add(new GroupYield("2026-10-" + (d < 10 ? "0" : "") + d, 9, 6));
        }
        assertThat(TrendReport.yieldChart(days).getCategoryPlot().getDomainAxis().getCategoryLabelPositions())
                .isEqualTo(CategoryLabelPositions.UP_90);
    }
}
