package trapmap.store;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.time.Instant;
import java.time.ZoneOffset;
import java.util.BitSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.Footprint;
import trapmap.maps.batch.WaferResult;

/** {@link ResultsStore#footprints}: the footprints come back as written, filtered ({@link StoreFilter}) and grouped. */
class StoreFootprintsTest {
    @TempDir
    Path dir;

    private ResultsStore open() {
        return ResultsStore.open(dir.resolve("results.db").toString(), Map.of(),
                Clock.fixed(Instant.parse("2026-12-01T00:00:00Z"), ZoneOffset.UTC));
    }

    /** A wafer's map and sidecar with lot, measured time, slot; its result with {@code footprint} (null: error). */
    private WaferRecord wafer(String id, String lot, String at, String slot, String profile, Footprint footprint)
            throws Exception {
        Path f = dir.resolve(id + ".tif");
        Files.writeString(f, "content of " + id);
        Files.writeString(dir.resolve(id + ".json"), "{\"wafer_id\": \"" + id + "\", \"conditions\": {\"lot\": \""
                + lot + "\", \"measured_at\": \"" + at + "\", \"boat_slot\": " + slot + "}}");
        Map<String, Double> figures = new LinkedHashMap<>();
        figures.put("median_density_cm3", 1e11);
        WaferResult.Status status = footprint == null ? WaferResult.Status.ERROR : WaferResult.Status.PASS;
        WaferResult r = new WaferResult(f.toString(), id, status, "A", profile, "fe-i", figures, List.of(), List.of(),
                List.of(), footprint == null ? "unreadable" : "", footprint);
        return WaferRecord.of(r, null);
    }

    /** A footprint of {@code w}×{@code h} cells from (i0, j0), all covered but the last, {@code flagged} bits set. */
    private static Footprint footprint(String family, int i0, int j0, int w, int h, int... flagged) {
        BitSet covered = new BitSet();
        covered.set(0, w * h - 1);
        BitSet f = new BitSet();
        for (int b : flagged) {
            f.set(b);
        }
        return new Footprint(family, 1.0, i0, j0, w, h, covered, f);
    }

    @Test
    void footprintsComeBackAsWrittenOldestFirstFilteredAndGrouped() throws Exception {
        Footprint a = footprint("round-156", -2, -1, 4, 3, 0, 5, 10);
        Footprint b = footprint("round-156", -3, 0, 5, 2, 4);
        Footprint c = footprint("round-200", 0, 0, 2, 2);
        Footprint d = footprint("round-156", -1, -1, 3, 3, 1, 2);
        try (ResultsStore s = open()) {
            String run = s.startRun(new RunInfo(Instant.parse("2026-11-30T10:00:00Z"), "rules.json", "r1", "{}",
                    "s1", "test"));
            s.write(run, wafer("W3", "L2", "2026-11-03T08:00:00Z", "7", "default", c));
            s.write(run, wafer("W1", "L1", "2026-11-01T08:00:00Z", "7", "default", a));
            s.write(run, wafer("W2", "L1", "2026-11-02T08:00:00Z", "3", "thin", b));
            s.write(run, wafer("W4", "L3", "2026-11-04T08:00:00Z", "7", "default", d));
            s.write(run, wafer("W5", "L3", "2026-11-05T08:00:00Z", "7", "default", null)); // error: no footprint

            List<StoredFootprint> all = s.footprints(StoreFilter.ALL);
            assertThat(all).extracting(StoredFootprint::waferId).containsExactly("W1", "W2", "W3", "W4");
            assertThat(all).extracting(StoredFootprint::footprint).containsExactly(a, b, c, d);
            assertThat(all).extracting(StoredFootprint::group).containsOnly(ResultsStore.ALL);
            assertThat(all.get(0).lot()).isEqualTo("L1");
            assertThat(all.get(0).time()).isEqualTo(Instant.parse("2026-11-01T08:00:00Z"));
            assertThat(all.get(0).measured()).isTrue();
            assertThat(all.get(1).profile()).isEqualTo("thin");

            assertThat(s.footprints(StoreFilter.ALL, "boat_slot")).extracting(StoredFootprint::group)
                    .containsExactly("7", "3", "7", "7");
            assertThat(s.footprints(StoreFilter.ALL, "day")).extracting(StoredFootprint::group)
                    .containsExactly("2026-11-01", "2026-11-02", "2026-11-03", "2026-11-04");
            assertThat(s.footprints(StoreFilter.ALL, "furnace_tube")).extracting(StoredFootprint::group)
                    .containsOnly(ResultsStore.NO_GROUP);

            // since inclusive, until exclusive
            assertThat(ids(s, new StoreFilter(Instant.parse("2026-11-02T08:00:00Z"),
                    Instant.parse("2026-11-04T08:00:00Z"), null, List.of(), Map.of()))).containsExactly("W2", "W3");
            assertThat(ids(s, new StoreFilter(null, null, "default", List.of(), Map.of())))
                    .containsExactly("W1", "W3", "W4");
            assertThat(ids(s, new StoreFilter(null, null, null, List.of("L1", "L3"), Map.of())))
                    .containsExactly("W1", "W2", "W4");
            assertThat(ids(s, new StoreFilter(null, null, null, List.of(), Map.of("boat_slot", "7"))))
                    .containsExactly("W1", "W3", "W4");
            assertThat(ids(s, new StoreFilter(null, null, "default", List.of("L1", "L2"),
                    Map.of("boat_slot", "7", "lot", "L2")))).containsExactly("W3");
            assertThat(ids(s, new StoreFilter(null, null, null, List.of(), Map.of("boat_slot", "9")))).isEmpty();
        }
    }

    private static List<String> ids(ResultsStore s, StoreFilter f) {
        return s.footprints(f).stream().map(StoredFootprint::waferId).toList();
    }

    @Test
    void aFilterWhoseStartIsNotBeforeItsEndIsRefused() {
        Instant t = Instant.parse("2026-11-02T00:00:00Z");
        assertThatThrownBy(() -> new StoreFilter(t, t, null, List.of(), Map.of()))
                .isInstanceOf(IllegalArgumentException.class).hasMessageContaining("before until");
        assertThat(StoreFilter.ALL.describe()).isEqualTo("all wafers");
        assertThat(new StoreFilter(t, null, "p", List.of("L1", "L2"), Map.of("boat_slot", "7")).describe())
                .isEqualTo("since 2026-11-02T00:00:00Z; profile p; lot L1, L2; boat_slot=7");
    }
}
