package trapmap.viewer.ui;

import static org.assertj.core.api.Assertions.assertThat;

import java.awt.Dimension;
import java.awt.Rectangle;
import org.junit.jupiter.api.Test;

/** Windows shrink and move onto the usable area of a small screen; on a large one they stay as packed. */
class ScreenFitTest {
    @Test
    void theMainWindowOnALaptopScreenTakesTheUsableAreaAndNoMore() {
        Rectangle usable = new Rectangle(0, 27, 1280, 773); // 1280 × 800 less a top panel
        Rectangle b = ScreenFit.bounds(new Rectangle(0, 0, 1600, 1000), usable);
        assertThat(b).isEqualTo(usable);
        assertThat(ScreenFit.tooLarge(new Dimension(1600, 1000), usable)).isTrue();
    }

    @Test
    void aDialogCentredOverItsOwnerIsMovedBackOntoTheScreen() {
        Rectangle usable = new Rectangle(0, 0, 1024, 700);
        // Compare asks for at least 1200 × 800 and is centred over a 1024 × 700 owner: it starts at (-88, -50)
        Rectangle b = ScreenFit.bounds(new Rectangle(-88, -50, 1200, 800), usable);
        assertThat(b).isEqualTo(new Rectangle(0, 0, 1024, 700));
        // a small dialog near the right edge moves left, keeping its size
        assertThat(ScreenFit.bounds(new Rectangle(900, 600, 400, 300), usable))
                .isEqualTo(new Rectangle(624, 400, 400, 300));
    }

    @Test
    void aWindowThatFitsKeepsItsPlaceAndSize() {
        Rectangle usable = new Rectangle(0, 0, 1920, 1080);
        Rectangle at = new Rectangle(100, 40, 1600, 1000);
        assertThat(ScreenFit.bounds(at, usable)).isEqualTo(at);
        assertThat(ScreenFit.tooLarge(at.getSize(), usable)).isFalse();
        // on a second screen to the right of the first
        Rectangle right = new Rectangle(1920, 0, 1280, 800);
        assertThat(ScreenFit.bounds(new Rectangle(1900, 0, 1600, 1000), right)).isEqualTo(right);
    }

    @Test
    void onANarrowScreenTheMapKeepsRoomBetweenTheGalleryAndTheSidePanel() {
        assertThat(ScreenFit.sideWidths(1600)).containsExactly(285, 400);
        int[] laptop = ScreenFit.sideWidths(1024);
        assertThat(laptop[1]).as("side panel").isGreaterThanOrEqualTo(350);
        assertThat(1024 - laptop[0] - laptop[1]).as("map column").isGreaterThanOrEqualTo(400);
    }
}
