package trapmap.viewer.ui;

import java.awt.Component;
import java.awt.Container;
import java.awt.Dimension;
import java.awt.FlowLayout;
import java.awt.Insets;

/**
 * A left-aligned flow of components that asks for the height of all its lines: {@link FlowLayout} wraps a row that
 * is too wide onto a second line but asks for one line's height, so in a narrow window the second line (the history
 * window's Chart and Export buttons) is laid out below the panel's edge, out of sight and out of reach.
 */
final class WrapLayout extends FlowLayout {
    private static final long serialVersionUID = 1L;

    WrapLayout(int hgap, int vgap) {
        super(FlowLayout.LEFT, hgap, vgap);
    }

    @Override
    public Dimension preferredLayoutSize(Container target) {
        return size(target, true);
    }

    @Override
    public Dimension minimumLayoutSize(Container target) {
        Dimension d = size(target, false);
        d.width -= getHgap() + 1;
        return d;
    }

    /** The size of the lines the components fill at the width the container has (one line while it has none). */
    private Dimension size(Container target, boolean preferred) {
        synchronized (target.getTreeLock()) {
            int width = target.getWidth();
            if (width <= 0 && target.getParent() != null) {
                width = target.getParent().getWidth();
            }
            if (width <= 0) {
                width = Integer.MAX_VALUE;
            }
            Insets in = target.getInsets();
            int room = width == Integer.MAX_VALUE ? width : width - in.left - in.right - 2 * getHgap();
            int lineWidth = 0;
            int lineHeight = 0;
            int widest = 0;
            int height = 0;
            for (Component c : target.getComponents()) {
                if (!c.isVisible()) {
                    continue;
                }
                Dimension d = preferred ? c.getPreferredSize() : c.getMinimumSize();
                if (lineWidth > 0 && lineWidth + getHgap() + d.width > room) {
                    widest = Math.max(widest, lineWidth);
                    height += lineHeight + getVgap();
                    lineWidth = 0;
                    lineHeight = 0;
                }
                lineWidth += (lineWidth > 0 ? getHgap() : 0) + d.width;
                lineHeight = Math.max(lineHeight, d.height);
            }
            widest = Math.max(widest, lineWidth);
            height += lineHeight;
            return new Dimension(widest + in.left + in.right + 2 * getHgap(),
                    height + in.top + in.bottom + 2 * getVgap());
        }
    }
}
