package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;

class ViewerLaunchTest {
    @Test
    void theJarCarriesTheDemonstrationSetsExampleRules() throws IOException {
        String committed = Files.readString(Path.of("..", "demo-data", "rules-example.json"), StandardCharsets.UTF_8);
        assertThat(ViewerLaunch.exampleRules()).isEqualTo(committed);
    }
}
