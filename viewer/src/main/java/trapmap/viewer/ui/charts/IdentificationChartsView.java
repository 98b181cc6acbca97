package trapmap.viewer.ui.charts;

import java.awt.Dimension;
import java.awt.GridLayout;
import javax.swing.JPanel;
import org.jfree.chart.ChartPanel;
import org.jfree.chart.JFreeChart;
import trapmap.physics.spectroscopy.DpssResult;
import trapmap.viewer.graphics.FitCurves;
import trapmap.viewer.graphics.IdentificationCharts;

/**
 * The two identification charts side by side: τ_SRH against Δn with the fitted candidates, and the DPSS k(E_t)
 * ({@link IdentificationCharts}). Methods run on the Event Dispatch Thread.
 */
public class IdentificationChartsView extends JPanel {
    private static final long serialVersionUID = 1L;
    private final ChartPanel fit;
    private final ChartPanel dpss;

    public IdentificationChartsView() {
        super(new GridLayout(1, 2, 6, 0));
        fit = new ChartPanel(IdentificationCharts.lifetimeFit(null), false, true, false, true, true);
        dpss = new ChartPanel(IdentificationCharts.dpss(null), false, true, false, true, true);
        fit.setName("fitChart");
        dpss.setName("dpssChart");
        for (ChartPanel p : new ChartPanel[] {fit, dpss}) {
            p.setPreferredSize(new Dimension(520, 360));
            p.setMouseWheelEnabled(true);
            add(p);
        }
    }

    /** Shows the curves of one pixel, block or region (nulls clear). */
    public void show(FitCurves curves, DpssResult surface) {
        fit.setChart(IdentificationCharts.lifetimeFit(curves));
        dpss.setChart(IdentificationCharts.dpss(surface));
    }

    /** The lifetime chart shown, for export. */
    public JFreeChart fitChart() {
        return fit.getChart();
    }

    /** The DPSS chart shown, for export. */
    public JFreeChart dpssChart() {
        return dpss.getChart();
    }
}
