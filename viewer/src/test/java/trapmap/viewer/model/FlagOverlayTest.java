package trapmap.viewer.model;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import org.junit.jupiter.api.Test;

class FlagOverlayTest {
    @Test
    void defaultIsAnOutlineAndTheKeyCyclesOutlineFillOff() {
        assertThat(FlagOverlay.DEFAULT.mode()).isEqualTo(FlagOverlay.Mode.OUTLINE);
        FlagOverlay o = FlagOverlay.DEFAULT.withOpacity(0.5);
        assertThat(o.next().mode()).isEqualTo(FlagOverlay.Mode.FILL);
        assertThat(o.next().next().mode()).isEqualTo(FlagOverlay.Mode.OFF);
        assertThat(o.next().next().next()).isEqualTo(o);
    }

    @Test
    void storedFormReadsBackAndUnreadableEntriesGiveTheDefault() {
        FlagOverlay o = new FlagOverlay(FlagOverlay.Mode.FILL, 0.25);
        assertThat(o.text()).isEqualTo("fill 0.25");
        assertThat(FlagOverlay.parse(o.text())).isEqualTo(o);
        assertThat(FlagOverlay.parse(null)).isEqualTo(FlagOverlay.DEFAULT);
        assertThat(FlagOverlay.parse("hatched 0.5")).isEqualTo(FlagOverlay.DEFAULT);
        assertThat(FlagOverlay.parse("fill 7")).isEqualTo(FlagOverlay.DEFAULT);
        assertThat(FlagOverlay.parse("fill x")).isEqualTo(FlagOverlay.DEFAULT);
        assertThatThrownBy(() -> new FlagOverlay(FlagOverlay.Mode.FILL, 0)).hasMessageContaining("overlay opacity");
    }

    @Test
    void alphaFollowsModeShareAndOpacity() {
        FlagOverlay outline = new FlagOverlay(FlagOverlay.Mode.OUTLINE, 0.5);
        assertThat(outline.alpha(0)).isZero();
        assertThat(outline.alpha(0.01)).isEqualTo(128);
        assertThat(outline.alpha(1)).isEqualTo(128);
        FlagOverlay fill = new FlagOverlay(FlagOverlay.Mode.FILL, 1);
        assertThat(fill.alpha(1)).isEqualTo(255);
        assertThat(fill.alpha(0.5)).isEqualTo(179); // 255 × (0.4 + 0.6 × 0.5)
        assertThat(new FlagOverlay(FlagOverlay.Mode.OFF, 1).alpha(1)).isZero();
    }

    @Test
    void theChoiceIsKeptWithTheRecentFiles() {
        RecentFiles r = RecentFiles.inMemory();
        assertThat(r.flagOverlay()).isEqualTo(FlagOverlay.DEFAULT);
        FlagOverlay o = new FlagOverlay(FlagOverlay.Mode.OFF, 0.75);
        r.setFlagOverlay(o);
        assertThat(r.flagOverlay()).isEqualTo(o);
    }
}
