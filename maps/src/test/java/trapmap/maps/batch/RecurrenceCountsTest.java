package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;

/**
 * A recurrence map moved as {@link RecurrenceMap#counts} and put together again with {@link RecurrenceMap#addCounts}
 * from several parts (as a cluster job's partitions do) equals the map of all footprints added to one: every
 * family's fraction map, its grid and the wafers per cell.
 */
class RecurrenceCountsTest {
    private static final Path DEMO = Path.of("..", "demo-data");

    @Test
    void countsOfPartsAddUpToTheWholeMap() throws Exception {
        WaferInspection in = new WaferInspection(Rules.read(DEMO.resolve("rules-example.json")));
        List<Footprint> footprints = new ArrayList<>();
        try (Stream<Path> s = Files.list(DEMO)) {
            for (Path p : s.filter(p -> p.toString().endsWith(".tif")).sorted().toList()) {
                Footprint f = in.inspect(p).footprint();
                if (f != null) {
                    footprints.add(f);
                }
            }
        }
        RecurrenceMap whole = new RecurrenceMap();
        footprints.forEach(whole::add);
        RecurrenceMap[] parts = {new RecurrenceMap(), new RecurrenceMap(), new RecurrenceMap()};
        for (int i = 0; i < footprints.size(); i++) {
            parts[(i * 7) % 3].add(footprints.get(i));
        }
        RecurrenceMap joined = new RecurrenceMap();
        for (RecurrenceMap p : parts) {
            p.counts().forEach(joined::addCounts);
        }
        Map<String, Recurrence> want = whole.families();
        Map<String, Recurrence> got = joined.families();
        assertThat(want.size()).isGreaterThanOrEqualTo(2); // the demonstration set has several wafer families
        assertThat(got.keySet()).containsExactlyElementsOf(want.keySet());
        want.forEach((family, w) -> {
            Recurrence g = got.get(family);
            assertThat(g.wafers()).as(family).isEqualTo(w.wafers());
            assertThat(g.fraction().grid()).as(family).isEqualTo(w.fraction().grid());
            assertThat(g.fraction().raster().samples()).as(family).containsExactly(w.fraction().raster().samples());
            assertThat(g.wafersPerCell()).as(family).containsExactly(w.wafersPerCell());
        });
    }
}
