package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.concurrent.atomic.AtomicReference;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.shared.progress.ProgressListener;

/**
 * The recurrence a batch hands to its summary step holds the same counts as the one rebuilt from the folder's
 * footprints.csv, for a new run (wafers inspected now) and a resumed one (every wafer kept from the first run).
 */
class FinisherRecurrenceTest {
    @TempDir
    Path dir;

    private static final String RULES = """
            {"edge_exclusion_mm": 2,
             "flag": {"quantity": "lifetime", "threshold": 10, "min_area_mm2": 1},
             "limits": {"flagged_area_fraction": {"max": 0.001}},
             "grades": [{"grade": "A"}]}
            """;

    @Test
    void theRecurrenceGivenToTheSummaryEqualsTheOneReadFromTheFootprints() throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        SyntheticWafers.clean(in, "w1", 80);
        SyntheticWafers.spot(in, "w2", 80, 20, -10, 5, 4);
        SyntheticWafers.spot(in, "w3", 80, 18, -8, 6, 4);
        SyntheticWafers.spot(in, "w4", 80, -15, 5, 5, 4);
        List<Path> files;
        try (Stream<Path> s = Files.list(in)) {
            files = s.filter(p -> p.toString().endsWith(".tif")).sorted().toList();
        }
        Path out = dir.resolve("out");
        for (boolean resume : new boolean[] {false, true}) {
            AtomicReference<RecurrenceMap> given = new AtomicReference<>();
            new BatchInspection(Rules.parse(RULES, "rules.json"))
                    .finishingWith((d, recurrence) -> given.set(recurrence))
                    .run(files, out, new BatchInspection.Options(2, resume, false, ProgressListener.NONE));
            RecurrenceMap read = RecurrenceMap.read(out.resolve(BatchInspection.FOOTPRINTS_NAME));
            assertThat(given.get()).as("resume " + resume).isNotNull();
            assertSame(given.get(), read);
            assertThat(read.families().values().iterator().next().wafers()).isEqualTo(4);
        }
    }

    private static void assertSame(RecurrenceMap built, RecurrenceMap read) throws IOException {
        Map<String, Recurrence> a = built.families();
        Map<String, Recurrence> b = read.families();
        assertThat(a.keySet()).containsExactlyElementsOf(b.keySet()).isNotEmpty();
        for (String family : a.keySet()) {
            Recurrence x = a.get(family);
            Recurrence y = b.get(family);
            assertThat(x.wafers()).isEqualTo(y.wafers());
            assertThat(x.wafersPerCell()).isEqualTo(y.wafersPerCell());
            assertThat(x.fraction().raster().samples()).isEqualTo(y.fraction().raster().samples());
            assertThat(x.fraction().grid()).isEqualTo(y.fraction().grid());
            assertThat(x.fraction().width()).isEqualTo(y.fraction().width());
            assertThat(x.fraction().height()).isEqualTo(y.fraction().height());
        }
        assertThat(built.refused()).isEqualTo(read.refused());
    }
}
