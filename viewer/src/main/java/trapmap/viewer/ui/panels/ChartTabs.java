package trapmap.viewer.ui.panels;

import java.awt.BorderLayout;
import java.awt.FlowLayout;
import javax.swing.JComponent;
import javax.swing.JLabel;
import javax.swing.JPanel;
import javax.swing.JSpinner;
import javax.swing.JTabbedPane;
import javax.swing.SpinnerNumberModel;
import javax.swing.SwingConstants;
import trapmap.viewer.model.ViewerModel;

/**
 * The bottom tabs: histogram, line profile (with its band width), radial profile and the injection curve at the
 * probed pixel. Each tab holds a chart component set by {@link #setChart}.
 */
public final class ChartTabs extends JTabbedPane {
    private static final long serialVersionUID = 1L;
    /** Tab titles, in order. */
    public static final String HISTOGRAM = "Histogram";
    public static final String LINE = "Line profile";
    public static final String RADIAL = "Radial profile";
    public static final String INJECTION = "Injection curve";

    private final JPanel[] holders = new JPanel[4];
    private final JSpinner band = new JSpinner(new SpinnerNumberModel(1.0, 0.0, 50.0, 0.5));
    private boolean updating;

    public ChartTabs(ViewerModel model) {
        String[] titles = {HISTOGRAM, LINE, RADIAL, INJECTION};
        String[] tips = {"Distribution of the displayed quantity inside the edge exclusion, with the threshold",
            "Values along the drawn line (L: line tool), averaged across the band width (mm)",
            "Ring means about the wafer centre against radius (mm)",
            "Lifetime against injection level at the probed pixel for the chosen defect (µs vs cm⁻³)"};
        for (int i = 0; i < titles.length; i++) {
            holders[i] = new JPanel(new BorderLayout());
            JLabel wait = new JLabel("no chart yet", SwingConstants.CENTER);
            holders[i].add(wait, BorderLayout.CENTER);
            addTab(titles[i], null, holders[i], tips[i]);
        }
        JPanel bandRow = new JPanel(new FlowLayout(FlowLayout.LEFT, 6, 2));
        JLabel l = new JLabel("Band width");
        bandRow.add(l);
        band.setName("bandWidth");
        bandRow.add(band);
        bandRow.add(new JLabel("mm"));
        String tip = "Width of the band averaged across the profile line, mm";
        l.setToolTipText(tip);
        band.setToolTipText(tip);
        holders[1].add(bandRow, BorderLayout.NORTH);
        band.addChangeListener(e -> {
            if (!updating && model.analysis().line() != null) {
                model.setAnalysis(model.analysis().withLine(model.analysis().line().withBandWidth(
                        (Double) band.getValue())), "line");
            }
        });
    }

    /** The band width for a new line, mm. */
    public double bandWidthMm() {
        return (Double) band.getValue();
    }

    /** Shows the band width of the model's line. */
    public void showBandWidth(double mm) {
        updating = true;
        band.setValue(mm);
        updating = false;
    }

    /** Puts {@code chart} into tab {@code index} (0 histogram, 1 line, 2 radial, 3 injection). */
    public void setChart(int index, JComponent chart) {
        JPanel h = holders[index];
        java.awt.Component north = ((BorderLayout) h.getLayout()).getLayoutComponent(BorderLayout.NORTH);
        h.removeAll();
        if (north != null) {
            h.add(north, BorderLayout.NORTH);
        }
        h.add(chart, BorderLayout.CENTER);
        h.revalidate();
        h.repaint();
    }
}
