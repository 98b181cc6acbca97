package trapmap.viewer.ui;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.BufferedReader;
import java.io.File;
import java.io.InputStreamReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;

/**
 * Starts the real window on a display in a child JVM ({@link GuiScenario}): on the machine's display when DISPLAY is
 * set, otherwise on a private Xvfb started here; skipped when there is neither.
 */
class ViewerWindowGuiTest {
    private static final Path DEMO = Path.of("..", "demo-data").toAbsolutePath().normalize();

    @Test
    void thresholdTypedIntoTheWindowFlagsTheRegionsOfThresholdRegions() throws Exception {
        String display = System.getenv("DISPLAY");
        Process xvfb = null;
        try {
            if (display == null || display.isBlank()) {
                Path bin = onPath("Xvfb");
                Assumptions.assumeTrue(bin != null, "no DISPLAY and no Xvfb on the PATH: the window cannot be shown");
                xvfb = new ProcessBuilder(bin.toString(), "-displayfd", "1", "-screen", "0", "1600x1000x24",
                        "-nolisten", "tcp").redirectError(ProcessBuilder.Redirect.DISCARD).start();
                BufferedReader r = new BufferedReader(new InputStreamReader(xvfb.getInputStream(),
                        StandardCharsets.US_ASCII));
                String n = r.readLine();
                assertThat(n).as("display number from Xvfb -displayfd").isNotNull().matches("\\d+");
                display = ":" + n.trim();
            }
            String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
            List<String> cmd = new ArrayList<>(List.of(java, "-cp", System.getProperty("java.class.path"),
                    "-Djava.awt.headless=false", GuiScenario.class.getName(), DEMO.toString(), "120", "LOT-A01-W05"));
            ProcessBuilder pb = new ProcessBuilder(cmd).redirectErrorStream(true);
            pb.environment().put("DISPLAY", display);
            Path log = Files.createTempFile("trapmap-gui", ".log");
            pb.redirectOutput(log.toFile());
            Process child = pb.start();
            boolean finished = child.waitFor(120, TimeUnit.SECONDS);
            if (!finished) {
                child.destroyForcibly();
            }
            String out = Files.readString(log);
            Files.deleteIfExists(log);
            assertThat(finished).as("GUI scenario finished; output:%n%s", out).isTrue();
            assertThat(child.exitValue()).as("exit status; output:%n%s", out).isZero();

            Matcher m = Pattern.compile("GUI-RESULT wafers=(\\d+) table=(\\d+) expected=(\\d+) model=(\\d+)"
                    + " threshold=([0-9.]+)").matcher(out);
            assertThat(m.find()).as("result line in:%n%s", out).isTrue();
            int table = Integer.parseInt(m.group(2));
            assertThat(Integer.parseInt(m.group(1))).as("demo maps opened").isEqualTo(17);
            assertThat(table).as("region table rows").isEqualTo(Integer.parseInt(m.group(3)))
                    .isEqualTo(Integer.parseInt(m.group(4))).isGreaterThan(1);
            assertThat(Double.parseDouble(m.group(5))).isEqualTo(120.0);
            assertThat(out).contains("title=trapmap — LOT-A01-W05.tif");
            Matcher v = Pattern.compile("GUI-VIEW colours=(\\d+)").matcher(out);
            assertThat(v.find()).as("view line in:%n%s", out).isTrue();
            assertThat(Integer.parseInt(v.group(1))).as("distinct colours in the exported view").isGreaterThan(50);
            Matcher u = Pattern.compile("GUI-UNDO threshold=([0-9.]+) table=(\\d+) model=(\\d+)").matcher(out);
            assertThat(u.find()).as("undo line in:%n%s", out).isTrue();
            assertThat(Double.parseDouble(u.group(1))).as("threshold after Edit ▸ Undo").isEqualTo(20.0);
            assertThat(u.group(2)).isEqualTo(u.group(3));
            assertThat(Integer.parseInt(u.group(2))).as("fewer regions at 20 µs than at 120 µs").isLessThan(table);
        } finally {
            if (xvfb != null) {
                xvfb.destroy();
                xvfb.waitFor(5, TimeUnit.SECONDS);
            }
        }
    }

    private static Path onPath(String name) {
        String path = System.getenv("PATH");
        if (path == null) {
            return null;
        }
        for (String dir : path.split(File.pathSeparator)) {
            Path p = Path.of(dir, name);
            if (Files.isExecutable(p)) {
                return p;
            }
        }
        return null;
    }

}
