package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.shared.progress.ProgressListener;

/**
 * A batch told not to draw the recurrence pictures (a runtime that cannot draw text) writes the recurrence maps, the
 * tables and results.json as a batch that draws them, asks once, and records what its summary step said in run.json.
 */
class RecurrencePicturesOffTest {
    @TempDir
    Path dir;

    private static final String RULES = """
            {"edge_exclusion_mm": 2,
             "flag": {"quantity": "lifetime", "threshold": 10, "min_area_mm2": 1},
             "limits": {"flagged_area_fraction": {"max": 0.001}}}
            """;

    private static List<String> names(Path out) throws Exception {
        try (Stream<Path> s = Files.list(out)) {
            return s.map(p -> p.getFileName().toString()).filter(n -> !n.startsWith(".")).sorted().toList();
        }
    }

    @Test
    void withoutPicturesTheMapsAndTablesAreTheSame() throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        SyntheticWafers.clean(in, "w1", 80);
        SyntheticWafers.spot(in, "w2", 80, 20, -10, 5, 4);
        List<Path> files;
        try (Stream<Path> s = Files.list(in)) {
            files = s.filter(p -> p.toString().endsWith(".tif")).sorted().toList();
        }
        Rules rules = Rules.parse(RULES, "rules.json");
        Path drawn = dir.resolve("drawn");
        BatchInspection.Summary a = new BatchInspection(rules)
                .run(files, drawn, new BatchInspection.Options(2, false, false, ProgressListener.NONE));
        Path off = dir.resolve("off");
        AtomicInteger asked = new AtomicInteger();
        BatchInspection.Summary b = new BatchInspection(rules)
                .withRecurrencePictures(() -> asked.incrementAndGet() < 0)
                .recordingSummary(() -> "missing: for the test")
                .run(files, off, new BatchInspection.Options(2, false, false, ProgressListener.NONE));

        assertThat(asked.get()).isEqualTo(1);
        List<String> pictures = names(drawn).stream().filter(n -> n.endsWith(".png")).toList();
        assertThat(pictures).isNotEmpty();
        List<String> without = names(drawn).stream().filter(n -> !n.endsWith(".png")).toList();
        assertThat(names(off)).isEqualTo(without);
        for (String f : without) {
            if (!f.equals(RunManifest.FILE_NAME)) {
                assertThat(Files.readAllBytes(off.resolve(f))).as(f).isEqualTo(Files.readAllBytes(drawn.resolve(f)));
            }
        }
        assertThat(b.recurrence()).hasSize(a.recurrence().size() - pictures.size())
                .allMatch(p -> p.toString().endsWith(".tif"));
        assertThat(Files.readString(off.resolve(RunManifest.FILE_NAME)))
                .contains("\"summary_pdf\" : \"missing: for the test\"");
        assertThat(Files.readString(drawn.resolve(RunManifest.FILE_NAME))).doesNotContain("summary_pdf");
        assertThat(RunManifest.read(off).summaryPdf()).isEqualTo("missing: for the test");
        assertThat(RunManifest.read(off).differences(RunManifest.read(drawn))).as("resume is not refused").isEmpty();

        // resumed without pictures, a folder keeps no picture of an earlier run
        new BatchInspection(rules).withRecurrencePictures(() -> false)
                .run(files, drawn, new BatchInspection.Options(2, true, false, ProgressListener.NONE));
        assertThat(names(drawn)).isEqualTo(without);
    }
}
