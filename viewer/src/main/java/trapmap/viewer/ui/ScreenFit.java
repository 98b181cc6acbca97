package trapmap.viewer.ui;

import java.awt.Dimension;
import java.awt.GraphicsConfiguration;
import java.awt.Insets;
import java.awt.Rectangle;
import java.awt.Toolkit;
import java.awt.Window;

/**
 * Keeps a window on the screen it opens on: no larger than the screen's usable area (the screen less its task bars
 * and panels) and moved inside it. The windows ask for room for a desktop monitor (the main window 1600 × 1000 px);
 * on a laptop screen of 1280 × 800 or 1024 × 700 they would otherwise open with their right side (the conditions,
 * the verdict) and their bottom (the charts, the status line) off the screen, out of reach.
 */
final class ScreenFit {
    private ScreenFit() {
    }

    /**
     * The bounds of a window of size {@code size} at {@code at} on a screen whose usable area is {@code usable}: each
     * side shrunk to the usable area where it is larger, then the window moved so that it lies inside it.
     */
    static Rectangle bounds(Rectangle at, Rectangle usable) {
        int w = Math.min(at.width, usable.width);
        int h = Math.min(at.height, usable.height);
        int x = Math.max(usable.x, Math.min(at.x, usable.x + usable.width - w));
        int y = Math.max(usable.y, Math.min(at.y, usable.y + usable.height - h));
        return new Rectangle(x, y, w, h);
    }

    /** True when a window of {@code size} does not fit into {@code usable} as it is. */
    static boolean tooLarge(Dimension size, Rectangle usable) {
        return size.width > usable.width || size.height > usable.height;
    }

    /** The usable area of the screen {@code w} is on (its bounds less the insets of task bars). */
    static Rectangle usable(Window w) {
        GraphicsConfiguration gc = w.getGraphicsConfiguration();
        Rectangle screen = gc.getBounds();
        Insets in = Toolkit.getDefaultToolkit().getScreenInsets(gc);
        return new Rectangle(screen.x + in.left, screen.y + in.top,
                screen.width - in.left - in.right, screen.height - in.top - in.bottom);
    }

    /**
     * Shrinks and moves {@code w} (packed and placed) to lie inside its screen's usable area.
     *
     * @return true when it had to shrink
     */
    static boolean fit(Window w) {
        Rectangle usable = usable(w);
        boolean shrunk = tooLarge(w.getSize(), usable);
        Rectangle b = bounds(w.getBounds(), usable);
        if (!b.equals(w.getBounds())) {
            w.setBounds(b);
            w.validate();
        }
        return shrunk;
    }

    /**
     * The widths of the gallery and of the side panel in a window {@code width} px wide: 285 and 400 px, or on a
     * narrow screen 22 % of the width for the gallery and 350 px for the side panel (its form laid out narrower cuts
     * the doping value field to a few characters), so that the map in between keeps the rest.
     */
    static int[] sideWidths(int width) {
        return new int[] {Math.min(285, (int) (0.22 * width)), Math.min(400, Math.max(350, (int) (0.32 * width)))};
    }
}
