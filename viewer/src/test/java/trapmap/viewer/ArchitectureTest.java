package trapmap.viewer;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;

/**
 * Package dependencies read from the sources: the headless PDF reports and the shared graphics never reach into the
 * desktop viewer's packages, and the command line never imports Swing or AWT.
 */
class ArchitectureTest {
    private static final Path MAIN = Path.of("src", "main", "java");
    /** A fully qualified name in code: imports and names written out in full (comments are left out first). */
    private static final Pattern NAME = Pattern.compile("\\b(trapmap\\.viewer\\.ui|java\\.awt|javax\\.swing)\\b[\\w.]*");

    /** Every use of a name under {@code forbidden} in the sources of {@code pkg}, as "File: name". */
    static List<String> uses(String pkg, String forbidden) throws IOException {
        Path dir = MAIN.resolve(pkg.replace('.', '/'));
        assertThat(dir).as("sources of " + pkg).isDirectory();
        List<String> found = new ArrayList<>();
        try (Stream<Path> files = Files.walk(dir)) {
            for (Path f : files.filter(p -> p.toString().endsWith(".java")).toList()) {
                String code = withoutComments(Files.readString(f));
                Matcher m = NAME.matcher(code);
                while (m.find()) {
                    if (m.group().startsWith(forbidden)) {
                        found.add(dir.relativize(f) + ": " + m.group());
                    }
                }
            }
        }
        return found;
    }

    static String withoutComments(String s) {
        return s.replaceAll("(?s)/\\*.*?\\*/", " ").replaceAll("//[^\\n]*", " ");
    }

    @Test
    void reportsUseNothingOfTheDesktopViewer() throws IOException {
        assertThat(uses("trapmap.viewer.report", "trapmap.viewer.ui")).isEmpty();
    }

    @Test
    void viewerModelIsHeadless() throws IOException {
        assertThat(uses("trapmap.viewer.model", "trapmap.viewer.ui")).isEmpty();
        assertThat(uses("trapmap.viewer.model", "javax.swing")).isEmpty();
        assertThat(uses("trapmap.viewer.model", "java.awt")).isEmpty();
    }

    @Test
    void sharedGraphicsUseNothingOfTheDesktopViewer() throws IOException {
        assertThat(uses("trapmap.viewer.graphics", "trapmap.viewer.ui")).isEmpty();
        assertThat(uses("trapmap.viewer.graphics", "javax.swing")).isEmpty();
    }

    @Test
    void commandLineUsesNeitherSwingNorAwt() throws IOException {
        assertThat(uses("trapmap.cli", "javax.swing")).isEmpty();
        assertThat(uses("trapmap.cli", "java.awt")).isEmpty();
    }

    @Test
    void theCheckFindsAForbiddenImport() {
        String code = "package trapmap.viewer.report;\n// import trapmap.viewer.ui.Old;\n"
                + "import trapmap.viewer.ui.canvas.DisplayStyle;\n";
        Matcher m = NAME.matcher(withoutComments(code));
        assertThat(m.find()).isTrue();
        assertThat(m.group()).isEqualTo("trapmap.viewer.ui.canvas.DisplayStyle");
        assertThat(m.find()).isFalse();
    }
}
