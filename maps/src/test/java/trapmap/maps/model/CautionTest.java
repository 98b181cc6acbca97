package trapmap.maps.model;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;

class CautionTest {
    @Test
    void readmeQuotesTheOneCaution() throws Exception {
        Path readme = Path.of("..", "README.md");
        assertThat(Files.readString(readme).replaceAll("\\s*\\R>?\\s*", " ")).contains(Caution.TEXT);
    }
}
