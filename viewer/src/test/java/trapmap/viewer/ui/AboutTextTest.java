package trapmap.viewer.ui;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;
import trapmap.shared.Version;

class AboutTextTest {
    @Test
    void aboutBoxNamesVersionJavaAndLicence() {
        String about = AboutText.html();
        assertThat(about).contains("trapmap " + Version.NUMBER)
                .contains("Java " + System.getProperty("java.version"))
                .contains("Licence:")
                .contains(trapmap.maps.model.Caution.TEXT);
    }
}
