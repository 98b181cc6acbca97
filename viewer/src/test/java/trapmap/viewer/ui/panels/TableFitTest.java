package trapmap.viewer.ui.panels;

import static org.assertj.core.api.Assertions.assertThat;

import java.awt.FontMetrics;
import javax.swing.JTable;
import javax.swing.table.DefaultTableModel;
import org.junit.jupiter.api.Test;

class TableFitTest {
    private static final String[] HEADERS = {"id", "area mm²", "x mm", "y mm", "peak cm⁻³"};

    @Test
    void columnsNeverShrinkBelowTheirHeadersEvenInANarrowTable() {
        JTable t = new JTable(new DefaultTableModel(HEADERS, 3));
        TableFit.fitHeaders(t);
        t.setSize(120, 100); // far narrower than the headers need
        t.doLayout();
        FontMetrics fm = t.getTableHeader().getFontMetrics(t.getTableHeader().getFont());
        for (int c = 0; c < HEADERS.length; c++) {
            assertThat(t.getColumnModel().getColumn(c).getWidth()).as(HEADERS[c])
                    .isGreaterThanOrEqualTo(fm.stringWidth(HEADERS[c]));
        }
    }

    @Test
    void contentFitCoversTheWidestCell() {
        DefaultTableModel m = new DefaultTableModel(new Object[] {"figure", "value", "unit"}, 0);
        m.addRow(new Object[] {"placement kept", "as the maps lie (search: 0.9956)", ""});
        m.addRow(new Object[] {"overlap", "68224", "px"});
        JTable t = new JTable(m);
        int sum = TableFit.fitContent(t);
        FontMetrics fm = t.getFontMetrics(t.getFont());
        assertThat(t.getColumnModel().getColumn(1).getPreferredWidth())
                .isGreaterThanOrEqualTo(fm.stringWidth("as the maps lie (search: 0.9956)"));
        int preferred = 0;
        for (int c = 0; c < t.getColumnCount(); c++) {
            preferred += t.getColumnModel().getColumn(c).getPreferredWidth();
        }
        assertThat(sum).isEqualTo(preferred);
    }
}
