package trapmap.viewer.ui.panels;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

/** The gallery's header counts the open wafers in words that agree with the number. */
class GalleryHeaderTest {
    @Test
    void oneWaferIsSingular() {
        assertThat(GalleryPanel.waferCount(1)).isEqualTo("1 wafer");
        assertThat(GalleryPanel.waferCount(0)).isEqualTo("0 wafers");
        assertThat(GalleryPanel.waferCount(17)).isEqualTo("17 wafers");
    }
}
