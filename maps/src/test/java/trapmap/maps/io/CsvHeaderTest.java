package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.List;
import org.junit.jupiter.api.Test;
import trapmap.maps.model.Quantity;

class CsvHeaderTest {
    @Test
    void keyValueCommentsGiveSidecarFieldsConditionsAndRasterSize() throws Exception {
        CsvHeader h = CsvHeader.parse(List.of("# trapmap map", "", "# quantity=trap-density", "# unit = cm^-3",
                "# pixel_pitch_mm=0.5", "# width=40", "# height=30", "# doping=p:1e16", "# thickness_um=180"), "w.csv");

        assertThat(h.meta().quantity()).isEqualTo(Quantity.TRAP_DENSITY);
        assertThat(h.meta().unit()).isEqualTo("cm^-3");
        assertThat(h.meta().pixelPitchMm()).isEqualTo(0.5);
        assertThat(h.meta().conditions().doping().densityPerCm3()).isEqualTo(1e16);
        assertThat(h.meta().conditions().thicknessUm()).isEqualTo(180.0);
        assertThat(h.width()).isEqualTo(40L);
        assertThat(h.height()).isEqualTo(30L);
        assertThat(h.lineOf()).containsEntry("quantity", 3).containsEntry("width", 6);
        assertThat(h.meta().warnings()).isEmpty();
    }

    @Test
    void unknownKeysAreWarnedAboutWithTheirLine() throws Exception {
        CsvHeader h = CsvHeader.parse(List.of("# operator=someone"), "w.csv");

        assertThat(h.meta().warnings()).containsExactly("line 1: comment field 'operator' ignored");
    }

    @Test
    void aKeyGivenTwiceIsRefusedNamingTheSecondLine() {
        assertThatThrownBy(() -> CsvHeader.parse(List.of("# unit=us", "# unit=ms"), "w.csv"))
                .isInstanceOf(MapFormatException.class).hasMessageContaining("line 2")
                .hasMessageContaining("metadata 'unit' is given twice");
    }

    @Test
    void aSizeThatIsNotAWholeNumberOfPixelsIsRefusedInPx() {
        assertThatThrownBy(() -> CsvHeader.parse(List.of("# width=2.5"), "w.csv"))
                .isInstanceOf(MapFormatException.class).hasMessageContaining("line 1")
                .hasMessageContaining("'width' must be a whole number of pixels >= 1 but is '2.5'")
                .hasMessageContaining("px");
    }

    @Test
    void anInvalidConditionNamesItsCommentLine() {
        assertThatThrownBy(() -> CsvHeader.parse(List.of("# note", "# thickness_um=-5"), "w.csv"))
                .isInstanceOf(MapFormatException.class).hasMessageContaining("line 2")
                .hasMessageContaining("thickness_um");
    }
}
