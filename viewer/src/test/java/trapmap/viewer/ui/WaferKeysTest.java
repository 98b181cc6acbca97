package trapmap.viewer.ui;

import static org.assertj.core.api.Assertions.assertThat;

import java.awt.event.InputEvent;
import java.awt.event.KeyEvent;
import org.junit.jupiter.api.Test;

class WaferKeysTest {
    @Test
    void pageKeysAndAltArrowsStepAndOtherCombinationsDoNot() {
        assertThat(WaferKeys.step(KeyEvent.VK_PAGE_DOWN, 0)).isEqualTo(1);
        assertThat(WaferKeys.step(KeyEvent.VK_PAGE_UP, 0)).isEqualTo(-1);
        assertThat(WaferKeys.step(KeyEvent.VK_RIGHT, InputEvent.ALT_DOWN_MASK)).isEqualTo(1);
        assertThat(WaferKeys.step(KeyEvent.VK_LEFT, InputEvent.ALT_DOWN_MASK)).isEqualTo(-1);
        assertThat(WaferKeys.step(KeyEvent.VK_KP_LEFT, InputEvent.ALT_DOWN_MASK)).isEqualTo(-1);
        // plain arrows move carets and lists; Ctrl+PageDown switches tabs; Shift+PageDown selects text
        assertThat(WaferKeys.step(KeyEvent.VK_RIGHT, 0)).isZero();
        assertThat(WaferKeys.step(KeyEvent.VK_PAGE_DOWN, InputEvent.CTRL_DOWN_MASK)).isZero();
        assertThat(WaferKeys.step(KeyEvent.VK_PAGE_UP, InputEvent.SHIFT_DOWN_MASK)).isZero();
        assertThat(WaferKeys.step(KeyEvent.VK_LEFT, InputEvent.ALT_DOWN_MASK | InputEvent.SHIFT_DOWN_MASK)).isZero();
        // mouse-button masks do not count as modifiers
        assertThat(WaferKeys.step(KeyEvent.VK_PAGE_DOWN, InputEvent.BUTTON1_DOWN_MASK)).isEqualTo(1);
    }
}
