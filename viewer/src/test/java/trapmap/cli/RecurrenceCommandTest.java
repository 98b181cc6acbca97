package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.BitSet;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.Footprint;
import trapmap.maps.batch.WaferResult;
import trapmap.store.ResultsStore;
import trapmap.store.RunInfo;
import trapmap.store.WaferRecord;

/**
 * {@code trapmap recurrence} on a SQLite store written here: 18 wafers of family round-156 covering the 1 mm cells
 * [-10, 10]², one a day from 2026-11-02, slots 1 to 3 in turn; every slot-2 wafer is flagged at the 2×2 cells
 * i in {4, 5}, j in {-6, -5} (centroid (4.5, -5.5) mm), and wafer 0 (slot 1) once at cell (-8, 8).
 */
class RecurrenceCommandTest {
    static final Instant T0 = Instant.parse("2026-11-02T08:00:00Z");

    @TempDir
    static Path dir;
    static Path store;

    @BeforeAll
    static void writeStore() {
        store = dir.resolve("results.sqlite");
        try (ResultsStore s = ResultsStore.open(store.toString())) {
            String run = s.startRun(new RunInfo(T0, "rules.json", "r".repeat(64), "{}", "s".repeat(64), "test"));
            for (int k = 0; k < 18; k++) {
                int slot = k % 3 + 1;
                BitSet covered = new BitSet();
                covered.set(0, 21 * 21);
                BitSet flagged = new BitSet();
                if (slot == 2) {
                    for (int j = -6; j <= -5; j++) {
                        for (int i = 4; i <= 5; i++) {
                            flagged.set((j + 10) * 21 + (i + 10));
                        }
                    }
                }
                if (k == 0) {
                    flagged.set((8 + 10) * 21 + (-8 + 10));
                }
                Footprint f = new Footprint("round-156", 1.0, -10, -10, 21, 21, covered, flagged);
                String id = "W" + k;
                WaferResult r = new WaferResult(dir.resolve(id + ".tif").toString(), id, WaferResult.Status.PASS,
                        "A", "p-type", "fe-i", Map.of(), List.of(), List.of(), List.of(), null, f);
                Instant at = T0.plus(Duration.ofDays(k));
                String lot = "L" + (k / 3 + 1);
                s.write(run, new WaferRecord(r, WaferRecord.sha256(id), Map.of("lot", lot, "boat_slot",
                        Integer.toString(slot), "measured_at", at.toString()), lot, at, List.of()));
            }
        }
    }

    @Test
    void groupedBySlotOnlyTheSlotFlaggedEveryTimeHasAHotSpot() throws Exception {
        Path out = dir.resolve("by-slot");
        Cli.Run r = Cli.run("recurrence", "--store", store.toString(), "--by", "boat_slot", "-o", out.toString());
        assertThat(r.code()).as(r.err()).isEqualTo(Exit.OK);
        assertThat(Files.readString(out.resolve("recurrence.csv"))).isEqualTo("group,family,wafers,file\n"
                + "1,round-156,6,recurrence-1-round-156.tif\n" + "2,round-156,6,recurrence-2-round-156.tif\n"
                + "3,round-156,6,recurrence-3-round-156.tif\n");
        // slot 1: one wafer of 6 at (-8, 8) is 17 %, not above 25 %; slot 2: 6 of 6 on 4 cells
        assertThat(Files.readString(out.resolve("hotspots.csv"))).isEqualTo(
                "group,family,wafers,spot,cells,peak_share,centroid_x_mm,centroid_y_mm\n"
                        + "2,round-156,6,1,4,1,4.5,-5.5\n");
        assertThat(r.out().lines().toList()).containsExactly(
                "store " + store + "; all wafers; by boat_slot; 18 wafers with a footprint",
                "  boat_slot 1, round-156: 6 wafers, no hot spot",
                // the centroid (4.5, -5.5) mm to the 1 mm of the cells
                "  boat_slot 2, round-156: 6 wafers, 1 hot spot: #1 4 cells, peak 100 % of wafers, centroid (5,"
                        + " -6) mm",
                "  boat_slot 3, round-156: 6 wafers, no hot spot",
                "written: " + out.resolve("recurrence.csv") + ", " + out.resolve("hotspots.csv") + " and 6 map files");
        for (int slot = 1; slot <= 3; slot++) {
            assertThat(out.resolve("recurrence-" + slot + "-round-156.png")).isRegularFile();
        }
    }

    @Test
    void theFiltersAndTheJsonTellTheWafersTaken() {
        // lots L1 and L2 are wafers 0 to 5; until 2026-11-05 (the whole day) keeps wafers 0 to 3; slot 2: W1
        JsonNode j = Cli.json("recurrence", "--store", store.toString(), "--lot", "L1", "--lot", "L2", "--until",
                "2026-11-05", "--where", "boat_slot=2", "-o", dir.resolve("some").toString(), "--json");
        assertThat(j.get("wafers").asInt()).isEqualTo(1);
        assertThat(j.get("query").asText()).isEqualTo("until 2026-11-06T00:00:00Z; lot L1, L2; boat_slot=2");
        assertThat(j.get("maps")).singleElement().satisfies(m -> {
            assertThat(m.get("group").isNull()).isTrue();
            assertThat(m.get("wafers").asInt()).isEqualTo(1);
            assertThat(m.get("wafers_needed").asInt()).isEqualTo(5);
            assertThat(m.get("hot_spots")).isEmpty();
        });
        JsonNode late = Cli.json("recurrence", "--store", store.toString(), "--since", "2026-11-14", "--by", "lot",
                "-o", dir.resolve("late").toString(), "--json");
        assertThat(late.get("wafers").asInt()).isEqualTo(6); // days 12 to 17: wafers 12 to 17, lots L5 and L6
        assertThat(late.get("maps")).extracting(m -> m.get("group").asText()).containsExactly("L5", "L6");
    }

    @Test
    void aSecondQueryIntoTheSameFolderLeavesNoMapOfTheFirst() throws Exception {
        Path out = dir.resolve("again");
        assertThat(Cli.run("recurrence", "--store", store.toString(), "--by", "boat_slot", "-o", out.toString())
                .code()).isZero();
        assertThat(Cli.run("recurrence", "--store", store.toString(), "-o", out.toString()).code()).isZero();
        try (var files = Files.list(out)) {
            assertThat(files.map(p -> p.getFileName().toString()).sorted()).containsExactly("hotspots.csv",
                    "recurrence-round-156.png", "recurrence-round-156.tif", "recurrence.csv");
        }
    }

    @Test
    void badOptionsAndEmptyQueriesAreOneLineNamingTheOption() throws Exception {
        Path out = dir.resolve("bad");
        assertThat(err("--cell", "2", "-o", out.toString()))
                .startsWith("trapmap recurrence: --cell must be 1 or an odd");
        assertThat(err("--where", "boat_slot", "-o", out.toString()))
                .isEqualTo("trapmap recurrence: --where must be NAME=VALUE (e.g. furnace_tube=T2) but was boat_slot");
        assertThat(err("--since", "2026-11-10", "--until", "2026-11-09", "-o", out.toString()))
                .isEqualTo("trapmap recurrence: --until 2026-11-09 must be after --since 2026-11-10");
        assertThat(err("--since", "yesterday", "-o", out.toString()))
                .startsWith("trapmap recurrence: --since must be a UTC");
        assertThat(err("--lot", "L9", "-o", out.toString())).isEqualTo("trapmap recurrence: --store " + store
                + " holds no wafer with a footprint for lot L9");
        Path batch = Files.createDirectories(dir.resolve("batch"));
        Files.writeString(batch.resolve("run.json"), "{}");
        assertThat(err("-o", batch.toString())).startsWith("trapmap recurrence: -o " + batch + ": is a batch's output");
        assertThat(out).doesNotExist();
    }

    private static String err(String... args) {
        List<String> all = new java.util.ArrayList<>(List.of("recurrence", "--store", store.toString()));
        all.addAll(List.of(args));
        Cli.Run r = Cli.run(all.toArray(String[]::new));
        assertThat(r.code()).as(r.out() + r.err()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(r.errLines()).hasSize(1);
        return r.errLines().get(0);
    }

    @Test
    void anOutputFolderThatCannotBeMadeSaysWhy() throws Exception {
        Path dangling = dir.resolve("dangling");
        java.nio.file.Files.createSymbolicLink(dangling, dir.resolve("removed-folder"));
        Path out = dangling.resolve("maps");
        Cli.Run r = Cli.run("recurrence", "--store", store.toString(), "-o", out.toString());
        assertThat(r.code()).isEqualTo(Exit.OUTPUT_NOT_WRITTEN);
        assertThat(r.errLines()).containsExactly("trapmap recurrence: -o " + out + ": cannot be made: " + dangling
                + " exists and is not a folder");
    }

    @Test
    void aGroupingByAFactNoWaferHasIsRefusedNamingTheFacts() {
        Path out = dir.resolve("by-typo");
        Cli.Run r = Cli.run("recurrence", "--store", store.toString(), "--by", "boat_slt", "-o", out.toString());
        assertThat(r.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(r.errLines()).hasSize(1).first().asString().startsWith("trapmap recurrence: --by boat_slt is"
                + " neither lot, day, week, none nor a sidecar fact of the stored wafers (their facts: ")
                .contains("boat_slot");
        assertThat(out).doesNotExist();
    }
}
