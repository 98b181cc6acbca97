package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Test;
import trapmap.shared.Version;

/** One version: the Maven project's, printed by --version and shown in the viewer's About box. */
class VersionTest {
    @Test
    void versionOptionPrintsTheSharedVersionLine() {
        Cli.Run r = Cli.run("--version");
        assertThat(r.code()).isZero();
        assertThat(r.out().trim()).isEqualTo(Version.LINE).isEqualTo("trapmap " + Version.NUMBER);
        assertThat(Cli.run("convert", "--version").out().trim()).isEqualTo(Version.LINE);
    }

    @Test
    void sharedVersionIsTheMavenProjectVersion() throws Exception {
        String pom = Files.readString(Path.of("..", "pom.xml"));
        // the project's own version: the first <version> after the parent pom's artifactId
        Matcher m = Pattern.compile("<artifactId>trapmap-parent</artifactId>\\s*<version>([^<]+)</version>").matcher(pom);
        assertThat(m.find()).as("project version in the parent pom.xml").isTrue();
        assertThat(m.group(1).replace("-SNAPSHOT", "")).isEqualTo(Version.NUMBER);
    }
}
