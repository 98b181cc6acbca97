package trapmap.viewer.ui.charts;

import java.awt.BorderLayout;
import java.awt.Dimension;
import java.util.ArrayList;
import java.util.List;
import javax.swing.JPanel;
import javax.swing.JScrollPane;
import javax.swing.JTable;
import javax.swing.table.AbstractTableModel;
import org.jfree.chart.ChartPanel;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.StandardXYBarPainter;
import org.jfree.chart.renderer.xy.XYBarRenderer;
import org.jfree.chart.title.TextTitle;
import org.jfree.chart.ui.RectangleAnchor;
import org.jfree.chart.ui.TextAnchor;
import org.jfree.data.xy.XYIntervalSeries;
import org.jfree.data.xy.XYIntervalSeriesCollection;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.Mask;
import trapmap.maps.stats.Histogram;
import trapmap.maps.stats.MapStatistics;
import trapmap.maps.stats.StatisticsRequest;
import trapmap.viewer.graphics.HistogramChart;

/**
 * The {@link HistogramChart} of a map with, beside it, a table of the statistics with their units. {@link #show} runs
 * on the Event Dispatch Thread; {@link HistogramChart#compute} may run anywhere (it is the heavy part).
 */
public class HistogramView extends JPanel {
    private final ChartPanel chartPanel;
    private final RowModel rows = new RowModel();
    private HistogramChart.Data data;

    public HistogramView() {
        super(new BorderLayout(6, 0));
        chartPanel = new ChartPanel(HistogramChart.createChart(null), false, true, false, true, true);
        chartPanel.setPreferredSize(new Dimension(480, 300));
        chartPanel.setMouseWheelEnabled(true);
        JTable table = new JTable(rows);
        table.setFillsViewportHeight(true);
        table.getColumnModel().getColumn(0).setPreferredWidth(210);
        table.getColumnModel().getColumn(1).setPreferredWidth(110);
        table.getColumnModel().getColumn(2).setPreferredWidth(50);
        // in a narrow table the names give way: a value or a unit cut to "…" cannot be read at all
        table.getColumnModel().getColumn(1).setMinWidth(70);
        table.getColumnModel().getColumn(2).setMinWidth(40);
        JScrollPane side = new JScrollPane(table) {
            private static final long serialVersionUID = 1L;

            /** 370 px, or less in a narrow tab: the chart keeps at least half the width, drawn unscaled. */
            @Override
            public Dimension getPreferredSize() {
                int room = HistogramView.this.getWidth();
                return new Dimension(room > 0 ? Math.min(370, room / 2) : 370, 300);
            }
        };
        chartPanel.setMinimumDrawWidth(200); // a narrower chart is drawn shrunk, its labels too small to read
        add(chartPanel, BorderLayout.CENTER);
        add(side, BorderLayout.EAST);
    }

    /** Computes and shows (on the Event Dispatch Thread; for large maps compute elsewhere and call show(Data)). */
    public void show(WaferMap map, Mask mask, double threshold) {
        show(HistogramChart.compute(map, mask, threshold));
    }

    /** Shows computed data (null clears). */
    public void show(HistogramChart.Data d) {
        this.data = d;
        chartPanel.setChart(HistogramChart.createChart(d));
        rows.set(d == null ? List.of() : d.rows());
    }

    public HistogramChart.Data data() {
        return data;
    }

    /** The chart shown, for export. */
    public JFreeChart chart() {
        return chartPanel.getChart();
    }

    private static final class RowModel extends AbstractTableModel {
        private static final String[] COLUMNS = {"statistic", "value", "unit"};
        private List<HistogramChart.Row> rows = List.of();

        void set(List<HistogramChart.Row> r) {
            rows = List.copyOf(r);
            fireTableDataChanged();
        }

        @Override
        public int getRowCount() {
            return rows.size();
        }

        @Override
        public int getColumnCount() {
            return 3;
        }

        @Override
        public String getColumnName(int c) {
            return COLUMNS[c];
        }

        @Override
        public Object getValueAt(int r, int c) {
            HistogramChart.Row row = rows.get(r);
            return switch (c) {
                case 0 -> row.name();
                case 1 -> row.value();
                default -> row.unit();
            };
        }
    }
}
