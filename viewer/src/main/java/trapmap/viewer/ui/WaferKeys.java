package trapmap.viewer.ui;

import java.awt.Component;
import java.awt.KeyEventDispatcher;
import java.awt.KeyboardFocusManager;
import java.awt.Window;
import java.awt.event.InputEvent;
import java.awt.event.KeyEvent;
import javax.swing.SwingUtilities;
import trapmap.viewer.model.ViewerModel;

/**
 * The wafer-navigation keys of the window (PageDown / PageUp, Alt+→ / Alt+←), seen before any component: a focused
 * combo box, list, table or text field binds PageUp/PageDown itself (a combo box would change its choice), so the
 * keys are taken at the keyboard focus manager while the focus is inside the window, and never reach the component.
 */
final class WaferKeys implements KeyEventDispatcher {
    private final Window window;
    private final ViewerModel model;

    private WaferKeys(Window window, ViewerModel model) {
        this.window = window;
        this.model = model;
    }

    /** Installs the keys for {@code window}; they are removed when the window is closed. */
    static void install(Window window, ViewerModel model) {
        WaferKeys keys = new WaferKeys(window, model);
        KeyboardFocusManager kfm = KeyboardFocusManager.getCurrentKeyboardFocusManager();
        kfm.addKeyEventDispatcher(keys);
        window.addWindowListener(new java.awt.event.WindowAdapter() {
            @Override
            public void windowClosed(java.awt.event.WindowEvent e) {
                kfm.removeKeyEventDispatcher(keys);
            }
        });
    }

    /**
     * The step a key asks for: +1 next wafer (PageDown, Alt+→, also on the keypad), −1 previous wafer (PageUp,
     * Alt+←), 0 for any other key or modifier combination.
     */
    static int step(int keyCode, int modifiersEx) {
        int mods = modifiersEx & (InputEvent.SHIFT_DOWN_MASK | InputEvent.CTRL_DOWN_MASK | InputEvent.ALT_DOWN_MASK
                | InputEvent.META_DOWN_MASK | InputEvent.ALT_GRAPH_DOWN_MASK);
        if (mods == 0) {
            return keyCode == KeyEvent.VK_PAGE_DOWN ? 1 : keyCode == KeyEvent.VK_PAGE_UP ? -1 : 0;
        }
        if (mods == InputEvent.ALT_DOWN_MASK) {
            return switch (keyCode) {
                case KeyEvent.VK_RIGHT, KeyEvent.VK_KP_RIGHT -> 1;
                case KeyEvent.VK_LEFT, KeyEvent.VK_KP_LEFT -> -1;
                default -> 0;
            };
        }
        return 0;
    }

    @Override
    public boolean dispatchKeyEvent(KeyEvent e) {
        int step = step(e.getKeyCode(), e.getModifiersEx());
        if (step == 0 || !inWindow(e.getComponent())) {
            return false;
        }
        if (e.getID() == KeyEvent.KEY_PRESSED) {
            if (step > 0) {
                model.next();
            } else {
                model.previous();
            }
        }
        e.consume();
        return true;
    }

    private boolean inWindow(Component c) {
        if (c == null || !window.isShowing()) {
            return false;
        }
        Window w = c instanceof Window cw ? cw : SwingUtilities.getWindowAncestor(c);
        // a combo box's heavyweight popup is a window owned by this one
        while (w != null && w != window && !(w instanceof java.awt.Dialog)) {
            w = w.getOwner();
        }
        return w == window;
    }
}
