package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;

/** The command line stays headless: no Swing, no AWT, no viewer UI in {@code trapmap.cli}. */
class CliArchitectureTest {
    private static final Path SOURCES = Path.of("src", "main", "java", "trapmap", "cli");
    private static final Pattern FORBIDDEN = Pattern.compile(
            "^\\s*import\\s+(static\\s+)?(javax\\.swing|java\\.awt|trapmap\\.viewer\\.ui)\\b.*");
    private static final Pattern QUALIFIED_USE = Pattern.compile("\\b(javax\\.swing|java\\.awt)\\.");

    @Test
    void noSourceImportsSwingOrAwt() throws IOException {
        assertThat(SOURCES).as("run from the viewer module directory").isDirectory();
        List<Path> files;
        try (Stream<Path> s = Files.walk(SOURCES)) {
            files = s.filter(p -> p.toString().endsWith(".java")).toList();
        }
        assertThat(files).as("sources found").hasSizeGreaterThan(5);
        List<String> offending = new ArrayList<>();
        for (Path f : files) {
            List<String> lines = Files.readAllLines(f);
            for (int i = 0; i < lines.size(); i++) {
                String line = lines.get(i);
                String code = line.replaceAll("//.*$", "");
                if (FORBIDDEN.matcher(line).matches() || QUALIFIED_USE.matcher(code).find()) {
                    offending.add(f + ":" + (i + 1) + ": " + line.trim());
                }
            }
        }
        assertThat(offending).isEmpty();
    }
}
