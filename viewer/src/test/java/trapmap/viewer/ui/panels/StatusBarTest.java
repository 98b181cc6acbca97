package trapmap.viewer.ui.panels;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

class StatusBarTest {
    @Test
    void theReadoutKeepsItsWidthAndALongMessageIsCutInstead() {
        StatusBar bar = new StatusBar(() -> { });
        bar.setReadout("x 12.3 mm, y -45.6 mm: τ_eff 183.2 µs · Δn 1.00e14 cm⁻³ · N_t 1.38e12 [1.38e12 – 1.48e12]"
                + " cm⁻³ · f_t 0.41 · ok");
        String caution = "pass · grade A — caution: surface-limited: surface lifetime within 2x of the effective"
                + " lifetime; temperature outside the model's range";
        bar.setMessage(caution);
        bar.setSize(900, 28);
        bar.doLayout();
        assertThat(bar.readoutLabel().getWidth()).isGreaterThanOrEqualTo(
                bar.readoutLabel().getPreferredSize().width);
        assertThat(bar.messageLabel().getWidth()).isLessThan(bar.messageLabel().getPreferredSize().width);
        assertThat(bar.messageLabel().getToolTipText()).isEqualTo(caution);
    }
}
