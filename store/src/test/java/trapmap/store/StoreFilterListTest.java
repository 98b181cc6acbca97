package trapmap.store;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Path;
import java.time.Instant;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.WaferResult;
import trapmap.shared.error.InvalidValueException;

/**
 * The list fields of a store query ({@link StoreFilter#items}, read by {@link StoreFilter#parse} for lots and facts):
 * plain text splits at its commas as before; an item holding a comma is written in double quotes, as in a CSV file.
 */
class StoreFilterListTest {
    @TempDir
    Path dir;

    @Test
    void plainListsSplitAtCommasAndQuotedItemsKeepTheirs() {
        assertThat(StoreFilter.items(" L1, L2,, ", "lot", "")).containsExactly("L1", "L2");
        assertThat(StoreFilter.items("L1,L3", "lot", "")).containsExactly("L1", "L3");
        assertThat(StoreFilter.items(" , ", "lot", "")).isEmpty();
        assertThat(StoreFilter.items(null, "lot", "")).isEmpty();
        assertThat(StoreFilter.items("L1, \"A,1\"", "lot", "")).containsExactly("L1", "A,1");
        assertThat(StoreFilter.items("\"A,1\",\"B, 2\"", "lot", "")).containsExactly("A,1", "B, 2");
        assertThat(StoreFilter.items("\"say \"\"x\"\", then\"", "lot", "")).containsExactly("say \"x\", then");
        assertThat(StoreFilter.items("O'Brien lot", "lot", "")).containsExactly("O'Brien lot");

        StoreFilter f = StoreFilter.parse(null, null, null, List.of("L1, \"A,1\"", "L9"),
                List.of("\"recipe=B,2\", furnace_tube = T2"), "--");
        assertThat(f.lots()).containsExactly("L1", "A,1", "L9");
        assertThat(f.attributes()).containsExactly(Map.entry("recipe", "B,2"), Map.entry("furnace_tube", "T2"));
    }

    @Test
    void aQuoteThatDoesNotCloseItsItemIsToldWithTheField() {
        assertThatThrownBy(() -> StoreFilter.parse(null, null, null, List.of("\"A,1"), List.of(), "--"))
                .isInstanceOf(InvalidValueException.class)
                .hasMessage("--lot has a quote that does not close its item: write an item holding a comma in double"
                        + " quotes, a quote inside it doubled (\"A,1\", L2), but was \"A,1")
                .extracting(e -> ((InvalidValueException) e).field()).isEqualTo("lot");
        assertThatThrownBy(() -> StoreFilter.parse(null, null, null, List.of(), List.of("\"a=b\"c"), ""))
                .isInstanceOf(InvalidValueException.class).hasMessageStartingWith("where has a quote")
                .extracting(e -> ((InvalidValueException) e).field()).isEqualTo("where");
    }

    @Test
    void aLotHoldingACommaIsFoundAndThePlainListFindsTheOthers() {
        try (ResultsStore s = ResultsStore.open(dir.resolve("r.db").toString())) {
            Instant t0 = Instant.parse("2026-11-02T08:00:00Z");
            String run = s.startRun(new RunInfo(t0, "rules.json", "r", "{}", "s", "test"));
            String[] lots = {"A,1", "A,1", "A", "1", "1"};
            for (int i = 0; i < lots.length; i++) {
                String id = "W" + i;
                WaferResult r = new WaferResult(dir.resolve(id + ".tif").toString(), id, WaferResult.Status.PASS,
                        "A", "p-type", "fe-i", Map.of("median_density_cm3", 1e11 + i), List.of(), List.of(),
                        List.of(), null, null);
                s.write(run, new WaferRecord(r, WaferRecord.sha256(id), Map.of("lot", lots[i], "recipe",
                        i == 0 ? "B,2" : "B"), lots[i], t0.plusSeconds(3600L * i), List.of()));
            }
            assertThat(ids(s, List.of("\"A,1\""), List.of())).containsExactly("W0", "W1");
            assertThat(ids(s, List.of("A,1"), List.of())).containsExactly("W2", "W3", "W4");
            assertThat(ids(s, List.of("A, \"A,1\""), List.of())).containsExactly("W0", "W1", "W2");
            assertThat(ids(s, List.of(), List.of("\"recipe=B,2\""))).containsExactly("W0");
            assertThat(ids(s, List.of(), List.of("recipe=B"))).containsExactly("W1", "W2", "W3", "W4");
        }
    }

    private static List<String> ids(ResultsStore s, List<String> lots, List<String> where) {
        return s.points("median_density_cm3", "lot", StoreFilter.parse(null, null, null, lots, where, ""))
                .stream().map(StoredPoint::waferId).toList();
    }
}
