package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import java.util.TreeMap;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;
import org.apache.pdfbox.Loader;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.text.PDFTextStripper;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.Rules;
import trapmap.viewer.report.BatchReport;

/**
 * {@code trapmap inspect} in a child JVM, killed (SIGKILL) or stopped (SIGTERM) at seeded random moments, the
 * finishing step (summary) included, and then resumed: the folder must end exactly as an uninterrupted run's, and a
 * folder whose run record says complete must always be complete. Also: a second run into a folder in use is refused
 * at once and the first finishes intact.
 */
@Tag("slow")
class InspectCrashTest {
    private static final int MAPS = 30;
    private static final ObjectMapper JSON = new ObjectMapper();
    private static final String RULES = """
            {"edge_exclusion_mm": 1,
             "flag": {"quantity": "lifetime", "threshold": 10, "min_area_mm2": 1},
             "limits": {"flagged_area_fraction": {"max": 0.001}},
             "grades": [{"grade": "A", "when": {"median_lifetime_us": {"min": 80}}}, {"grade": "B"}]}
            """;

    @TempDir
    static Path dir;
    private static Path in;
    private static Path rules;
    private static Path reference;
    private static int referenceCode;

    @BeforeAll
    static void referenceRun() throws Exception {
        in = Files.createDirectories(dir.resolve("in"));
        CrashTestMaps.write(in, MAPS, 20261204L);
        rules = dir.resolve("rules.json");
        Files.writeString(rules, RULES);
        reference = dir.resolve("reference");
        Cli.Run r = Cli.run(args(reference));
        referenceCode = r.code();
        assertThat(referenceCode).as(r.err()).isEqualTo(Exit.SOME_WAFERS_NOT_PASSED);
    }

    private static String[] args(Path out, String... more) {
        List<String> a = new ArrayList<>(List.of("inspect", in.toString(), "--rules", rules.toString(), "--out",
                out.toString(), "--threads", "2"));
        a.addAll(List.of(more));
        return a.toArray(String[]::new);
    }

    private static Process child(Path out, Path log, String... more) throws IOException {
        String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        List<String> cmd = new ArrayList<>(List.of(java, "-Xshare:auto", "-XX:TieredStopAtLevel=1", "-cp",
                System.getProperty("java.class.path"), TrapmapCommand.class.getName()));
        cmd.addAll(List.of(args(out, more)));
        return new ProcessBuilder(cmd).redirectErrorStream(true).redirectOutput(log.toFile()).start();
    }

    /** The state in the folder's run.json, or "" when there is none yet (or it cannot be read). */
    private static String state(Path out) {
        try {
            Path f = out.resolve("run.json");
            return Files.isRegularFile(f) ? JSON.readTree(f.toFile()).path("state").asText() : "";
        } catch (IOException e) {
            return "";
        }
    }

    private static void awaitState(Process p, Path out, String wanted) throws InterruptedException {
        long end = System.nanoTime() + TimeUnit.SECONDS.toNanos(60);
        while (p.isAlive() && !state(out).equals(wanted) && System.nanoTime() < end) {
            Thread.sleep(2);
        }
    }

    @Test
    void killedAtRandomMomentsAndResumedTheFolderEqualsAnUninterruptedRuns() throws Exception {
        Random rnd = new Random(Long.getLong("trapmap.crashSeed", 42L));
        int duringFinishing = 0;
        int duringRunning = 0;
        for (int cycle = 0; cycle < 10; cycle++) {
            Path out = dir.resolve("killed-" + cycle);
            Path log = dir.resolve("killed-" + cycle + ".log");
            Process p = child(out, log);
            boolean signal = cycle == 0 || cycle == 9; // SIGTERM: the shutdown hook removes the temporaries
            if (cycle >= 6) {
                awaitState(p, out, "finishing");
                Thread.sleep(rnd.nextInt(120));
            } else {
                awaitState(p, out, "running");
                Thread.sleep(rnd.nextInt(500));
            }
            String stateAtKill = state(out);
            if (signal) {
                p.destroy();
            } else {
                p.destroyForcibly();
            }
            assertThat(p.waitFor(30, TimeUnit.SECONDS)).isTrue();
            String after = state(out);
            if (p.exitValue() != referenceCode) { // really interrupted
                duringFinishing += stateAtKill.equals("finishing") && after.equals("finishing") ? 1 : 0;
                duringRunning += after.equals("running") ? 1 : 0;
            }
            if (after.equals("complete")) {
                assertSameFolder(out, "cycle " + cycle + " (complete when killed)");
            } else if (after.equals("running")) {
                Rules r = Rules.read(rules);
                org.assertj.core.api.Assertions.assertThatThrownBy(() -> BatchReport.read(out, r))
                        .hasMessageContaining("unfinished run");
            }
            if (signal) {
                try (Stream<Path> s = Files.walk(out)) {
                    assertThat(s.map(f -> f.getFileName().toString())
                            .filter(n -> n.endsWith(".tmp") || n.endsWith(".new")))
                            .as("temporaries after SIGTERM in cycle %d", cycle).isEmpty();
                }
            }
            Cli.Run resumed = Cli.run(args(out, "--resume"));
            assertThat(resumed.code()).as("cycle %d: %s", cycle, resumed.err()).isEqualTo(referenceCode);
            assertSameFolder(out, "cycle " + cycle + " (killed in state '" + stateAtKill + "', left '" + after
                    + "')");
        }
        assertThat(duringRunning).as("runs killed while inspecting").isGreaterThanOrEqualTo(3);
        assertThat(duringFinishing).as("runs killed while writing the summary").isGreaterThanOrEqualTo(1);
    }

    @Test
    void aSecondRunIntoAFolderInUseIsRefusedAtOnceAndTheFirstFinishesIntact() throws Exception {
        Path out = dir.resolve("busy");
        Path log = dir.resolve("busy.log");
        Process first = child(out, log);
        awaitState(first, out, "running");
        assertThat(first.isAlive()).isTrue();
        Cli.Run second = Cli.run(args(out, "--resume"));
        Cli.Run third = Cli.run(args(out, "--overwrite"));
        assertThat(first.waitFor(60, TimeUnit.SECONDS)).isTrue();
        assertThat(first.exitValue()).as(Files.readString(log)).isEqualTo(referenceCode);
        for (Cli.Run r : List.of(second, third)) {
            assertThat(r.code()).isEqualTo(Exit.INVALID_INPUT);
            assertThat(r.errLines()).singleElement().asString()
                    .contains(out.toString()).contains("in use by another trapmap inspect run (pid " + first.pid());
        }
        assertSameFolder(out, "the first run");
    }

    /** {@code out} holds what the uninterrupted reference run wrote. */
    private static void assertSameFolder(Path out, String what) throws IOException {
        TreeMap<String, Path> expected = files(reference);
        TreeMap<String, Path> actual = files(out);
        assertThat(actual.keySet()).as("files of %s", what).containsExactlyElementsOf(expected.keySet());
        for (String name : expected.keySet()) {
            Path e = expected.get(name);
            Path a = actual.get(name);
            switch (name) {
                case ".inspect.lock" -> { }
                case "run.json" -> {
                    JsonNode je = JSON.readTree(e.toFile());
                    JsonNode ja = JSON.readTree(a.toFile());
                    assertThat(ja.path("state").asText()).as("%s: state", what).isEqualTo("complete");
                    for (String k : List.of("version", "rules_sha256", "physics_sha256", "inputs", "inputs_sha256",
                            "thumbnails")) {
                        assertThat(ja.get(k)).as("%s: run.json %s", what, k).isEqualTo(je.get(k));
                    }
                }
                case "results.json" -> {
                    ObjectNode je = (ObjectNode) JSON.readTree(e.toFile());
                    ObjectNode ja = (ObjectNode) JSON.readTree(a.toFile());
                    ((ObjectNode) je.get("summary")).remove("skipped");
                    ((ObjectNode) ja.get("summary")).remove("skipped");
                    assertThat(ja).as("%s: results.json", what).isEqualTo(je);
                }
                case "summary.pdf" -> assertThat(pdfText(a, out)).as("%s: summary.pdf", what)
                        .isEqualTo(pdfText(e, reference));
                default -> {
                    if (name.endsWith(".csv")) {
                        assertThat(Files.readAllLines(a)).as("%s: %s", what, name)
                                .containsExactlyElementsOf(Files.readAllLines(e));
                    } else {
                        assertThat(Files.readAllBytes(a)).as("%s: %s", what, name).isEqualTo(Files.readAllBytes(e));
                    }
                }
            }
        }
    }

    private static TreeMap<String, Path> files(Path root) throws IOException {
        TreeMap<String, Path> m = new TreeMap<>();
        try (Stream<Path> s = Files.walk(root)) {
            s.filter(Files::isRegularFile).forEach(p -> m.put(root.relativize(p).toString(), p));
        }
        return m;
    }

    /** The summary's text without its folder and dates. */
    private static String pdfText(Path pdf, Path folder) throws IOException {
        try (PDDocument d = Loader.loadPDF(pdf.toFile())) {
            return new PDFTextStripper().getText(d).replace(folder.toString(), "DIR")
                    .replaceAll("\\d{4}-\\d{2}-\\d{2}[ T]?\\d{0,2}:?\\d{0,2}(:\\d{2})?", "DATE");
        }
    }
}
