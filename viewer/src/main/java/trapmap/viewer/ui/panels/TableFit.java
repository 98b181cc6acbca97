package trapmap.viewer.ui.panels;

import java.awt.Component;
import javax.swing.JTable;
import javax.swing.event.TableModelEvent;
import javax.swing.table.TableCellRenderer;
import javax.swing.table.TableColumn;

/**
 * Column widths that show every header (and, on request, every cell) in full, measured with the renderers' own
 * fonts and insets, kept when the table's columns are made again (a new unit in a header).
 */
public final class TableFit {
    /** Room beside the text for the cell's margins and the sort arrow of a header, pixels. */
    static final int SLACK = 8;

    private TableFit() {
    }

    /** The width that shows the header of column {@code c} in full. */
    public static int headerWidth(JTable t, int c) {
        TableColumn col = t.getColumnModel().getColumn(c);
        TableCellRenderer r = col.getHeaderRenderer() != null ? col.getHeaderRenderer()
                : t.getTableHeader().getDefaultRenderer();
        Component comp = r.getTableCellRendererComponent(t, col.getHeaderValue(), false, false, -1, c);
        return comp.getPreferredSize().width + SLACK;
    }

    /** The width that shows every cell of column {@code c} in full (0 for an empty table). */
    public static int cellWidth(JTable t, int c) {
        int w = 0;
        for (int row = 0; row < t.getRowCount(); row++) {
            Component comp = t.prepareRenderer(t.getCellRenderer(row, c), row, c);
            w = Math.max(w, comp.getPreferredSize().width + t.getIntercellSpacing().width + SLACK);
        }
        return w;
    }

    /**
     * Gives every column at least its header's width (as its minimum, so resizing never cuts a header) and again
     * whenever the columns are made anew.
     */
    public static void fitHeaders(JTable t) {
        applyHeaders(t);
        t.getModel().addTableModelListener(e -> {
            if (e.getFirstRow() == TableModelEvent.HEADER_ROW) {
                javax.swing.SwingUtilities.invokeLater(() -> applyHeaders(t));
            }
        });
    }

    private static void applyHeaders(JTable t) {
        for (int c = 0; c < t.getColumnCount(); c++) {
            TableColumn col = t.getColumnModel().getColumn(c);
            int w = headerWidth(t, c);
            col.setMinWidth(w);
            col.setPreferredWidth(Math.max(w, col.getPreferredWidth()));
        }
    }

    /**
     * Sets every column's preferred width to its widest header or cell; returns the sum, the width the table needs
     * to show all of them in full.
     */
    public static int fitContent(JTable t) {
        int sum = 0;
        for (int c = 0; c < t.getColumnCount(); c++) {
            int w = Math.max(headerWidth(t, c), cellWidth(t, c));
            TableColumn col = t.getColumnModel().getColumn(c);
            col.setMinWidth(Math.min(w, headerWidth(t, c)));
            col.setPreferredWidth(w);
            sum += w;
        }
        return sum;
    }
}
