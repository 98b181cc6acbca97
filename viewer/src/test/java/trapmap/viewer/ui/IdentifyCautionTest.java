package trapmap.viewer.ui;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;
import trapmap.maps.model.Caution;

/** The identification dialog says what the command line says of a ranking, and the caution of its densities. */
class IdentifyCautionTest {
    @Test
    void theDialogsLineIsTheCommandLinesNoteAndTheCaution() {
        assertThat(IdentifyDialog.cautionText())
                .isEqualTo("A hint, not a proof: the ranking knows only the library's defects. Caution: "
                        + Caution.TEXT);
    }
}
