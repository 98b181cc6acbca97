package trapmap.viewer.ui.panels;

import java.awt.Font;
import java.awt.GridBagConstraints;
import java.awt.GridBagLayout;
import java.awt.Insets;
import javax.swing.BorderFactory;
import javax.swing.JComponent;
import javax.swing.JLabel;
import javax.swing.JSeparator;

/** A two- or three-column form (label, field, unit) on a grid-bag layout. */
final class Form extends WidthTrackingPanel {
    private static final long serialVersionUID = 1L;
    private int row;

    Form() {
        super(new GridBagLayout());
        setBorder(BorderFactory.createEmptyBorder(4, 8, 4, 8));
    }

    /** A section heading across the form. */
    JLabel section(String title) {
        JLabel l = new JLabel(title);
        l.setFont(l.getFont().deriveFont(Font.BOLD));
        GridBagConstraints c = constraints(0, 3);
        c.insets = new Insets(row == 0 ? 2 : 10, 0, 2, 0);
        add(l, c);
        row++;
        GridBagConstraints s = constraints(0, 3);
        s.insets = new Insets(0, 0, 4, 0);
        add(new JSeparator(), s);
        row++;
        return l;
    }

    /** A row: label, field, unit; the tooltip goes on all three. */
    void row(String label, JComponent field, String unit, String tooltip) {
        rowWithUnit(label, field, unit == null ? null : new JLabel(unit), tooltip);
    }

    /** A row whose unit label may change later. */
    void rowWithUnit(String label, JComponent field, JLabel unitLabel, String tooltip) {
        JLabel l = new JLabel(label);
        l.setLabelFor(field);
        GridBagConstraints c0 = constraints(0, 1);
        c0.weightx = 0;
        c0.fill = GridBagConstraints.NONE;
        add(l, c0);
        GridBagConstraints c1 = constraints(1, unitLabel == null ? 2 : 1);
        c1.weightx = 1;
        add(field, c1);
        JLabel u = unitLabel;
        if (u != null) {
            GridBagConstraints c2 = constraints(2, 1);
            c2.weightx = 0;
            c2.fill = GridBagConstraints.NONE;
            add(u, c2);
        }
        if (tooltip != null) {
            l.setToolTipText(tooltip);
            field.setToolTipText(tooltip);
            if (u != null) {
                u.setToolTipText(tooltip);
            }
        }
        row++;
    }

    /** A component across the whole row. */
    void wide(JComponent comp) {
        GridBagConstraints c = constraints(0, 3);
        add(comp, c);
        row++;
    }

    /** Pushes the rows to the top. */
    void end() {
        GridBagConstraints c = constraints(0, 3);
        c.weighty = 1;
        add(new JLabel(), c);
    }


    private GridBagConstraints constraints(int col, int span) {
        GridBagConstraints c = new GridBagConstraints();
        c.gridx = col;
        c.gridy = row;
        c.gridwidth = span;
        c.fill = GridBagConstraints.HORIZONTAL;
        c.anchor = GridBagConstraints.WEST;
        c.insets = new Insets(2, col == 0 ? 0 : 6, 2, 0);
        c.weightx = 1;
        return c;
    }
}
