package trapmap.physics;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.regex.Pattern;
import java.util.stream.Collectors;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;

/** The physics module is pure numerics: no file or network I/O, no Swing or AWT, no other trapmap module. */
class PhysicsBoundaryTest {
    private static final Pattern FORBIDDEN = Pattern.compile(
            "^import\\s+(static\\s+)?(java\\.io\\.|java\\.nio\\.|java\\.net\\.|javax\\.swing|java\\.awt|javax\\.imageio"
                    + "|trapmap\\.maps|trapmap\\.viewer|trapmap\\.cli)");

    @Test
    void physicsSourcesImportNoIoNoUiAndNoHigherModule() throws IOException {
        Path root = Path.of("src/main/java");
        List<String> offenders;
        try (Stream<Path> files = Files.walk(root)) {
            offenders = files.filter(p -> p.toString().endsWith(".java")).flatMap(p -> {
                try {
                    return Files.readAllLines(p).stream().map(String::trim)
                            .filter(line -> FORBIDDEN.matcher(line).find())
                            .map(line -> root.relativize(p) + ": " + line);
                } catch (IOException e) {
                    throw new IllegalStateException(e);
                }
            }).collect(Collectors.toList());
        }
        assertThat(offenders).isEmpty();
        assertThat(root.resolve("trapmap/physics/conversion/TrapDensityConverter.java")).exists();
    }
}
