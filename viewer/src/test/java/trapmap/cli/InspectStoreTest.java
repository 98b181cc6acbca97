package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.store.ResultsStore;
import trapmap.store.StoredPoint;

/** {@code inspect --store}: each wafer in the store, the folder's results unchanged, a bad store refused. */
class InspectStoreTest {
    @TempDir
    Path dir;

    private static final String RULES = """
            {"edge_exclusion_mm": 1,
             "flag": {"quantity": "lifetime", "threshold": 10, "min_area_mm2": 1},
             "limits": {"flagged_area_fraction": {"max": 0.001}},
             "lot_pattern": "^(L[0-9]+)-"}
            """;

    @Test
    void eachWaferIsStoredOnceAndTheResultsAreTheSameAsWithoutTheStore() throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        InspectCommandTest.wafer(in, "L1-w1", false);
        InspectCommandTest.wafer(in, "L1-w2", true);
        Files.writeString(in.resolve("L1-w2.json"), "{\"wafer_id\": \"L1-w2\", \"conditions\": {\"measured_at\":"
                + " \"2026-11-02T08:15:00Z\", \"furnace_tube\": \"T2\"}}");
        Path rules = dir.resolve("rules.json");
        Files.writeString(rules, RULES);
        Path db = dir.resolve("results.db");
        Cli.Run plain = Cli.run("inspect", in.toString(), "--rules", rules.toString(), "--out",
                dir.resolve("plain").toString(), "--no-pdf", "--no-thumbnails");
        for (int i = 0; i < 2; i++) { // twice: the second run replaces the rows
            Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules.toString(), "--out",
                    dir.resolve("stored").toString(), "--no-pdf", "--no-thumbnails", "--overwrite", "--store",
                    db.toString());
            assertThat(r.code()).isEqualTo(plain.code()).isEqualTo(1); // one wafer fails
            assertThat(r.err()).isEqualTo(plain.err().replace(dir.resolve("plain").toString(),
                    dir.resolve("stored").toString()));
        }
        assertThat(Files.readString(dir.resolve("stored/results.csv")))
                .isEqualTo(Files.readString(dir.resolve("plain/results.csv")));
        try (ResultsStore s = ResultsStore.open(db.toString())) {
            List<StoredPoint> points = s.points("flagged_area_fraction", "furnace_tube", null, null);
            assertThat(points).extracting(StoredPoint::waferId).containsExactlyInAnyOrder("L1-w1", "L1-w2");
            StoredPoint spot = points.stream().filter(p -> p.waferId().equals("L1-w2")).findFirst().orElseThrow();
            assertThat(spot.pass()).isFalse();
            assertThat(spot.failedRules()).containsExactly("flagged_area_fraction");
            assertThat(spot.group()).isEqualTo("T2");
            assertThat(spot.measured()).isTrue();
            assertThat(spot.lot()).isEqualTo("L1");
            assertThat(spot.value()).isGreaterThan(0);
        }
    }

    @Test
    void aStoreThatCannotBeOpenedStopsBeforeAnyWaferNamingIt() throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        InspectCommandTest.wafer(in, "w1", false);
        Path rules = dir.resolve("rules.json");
        Files.writeString(rules, RULES);
        Path db = dir.resolve("missing").resolve("results.db");
        Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules.toString(), "--out",
                dir.resolve("out").toString(), "--store", db.toString());
        assertThat(r.code()).isEqualTo(2);
        assertThat(r.err()).contains("--store " + db + ": folder " + db.getParent() + " does not exist");
        assertThat(Files.exists(dir.resolve("out"))).isFalse();
    }
}
