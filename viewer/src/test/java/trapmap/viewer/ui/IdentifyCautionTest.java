package trapmap.viewer.ui;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;
import trapmap.maps.model.Caution;

/**
 * The identification dialog says what the command line says of a ranking, and the caution of its densities; on a low
 * screen its charts keep room to be read.
 */
class IdentifyCautionTest {
    @Test
    void theDialogsLineIsTheCommandLinesNoteAndTheCaution() {
        assertThat(IdentifyDialog.cautionText())
                .isEqualTo("A hint, not a proof: the ranking knows only the library's defects. Caution: "
                        + Caution.TEXT);
    }

    @Test
    void onALowScreenTheChartsKeepRoomAndOnATallOneTheDividerStays() {
        // 1024 × 700: the split is about 520 px high and the packed divider left the charts 190 px
        int at = IdentifyDialog.chartDivider(520, 330);
        assertThat(520 - at).as("chart height").isGreaterThanOrEqualTo(300);
        assertThat(at).as("map and tables").isGreaterThanOrEqualTo((int) (0.4 * 520));
        assertThat(IdentifyDialog.chartDivider(800, 450)).isEqualTo(450);
    }
}
