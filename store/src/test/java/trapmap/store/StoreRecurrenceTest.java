package trapmap.store;

import static org.assertj.core.api.Assertions.assertThat;

import java.time.Instant;
import java.util.ArrayList;
import java.util.BitSet;
import java.util.List;
import org.junit.jupiter.api.Test;
import trapmap.maps.batch.Footprint;

/** The parts of {@link StoreRecurrence} below the store query: the group order and the suggested cell. */
class StoreRecurrenceTest {
    /** A 60×60-cell footprint whose covered cells are those holding the centres of pixels {@code pitchMm} apart. */
    private static StoredFootprint grid(double pitchMm) {
        BitSet covered = new BitSet();
        for (int y = 0; y * pitchMm < 60; y++) {
            int j = (int) Math.floor(y * pitchMm + 0.5);
            for (int x = 0; x * pitchMm < 60; x++) {
                int i = (int) Math.floor(x * pitchMm + 0.5);
                if (i < 60 && j < 60) {
                    covered.set(j * 60 + i);
                }
            }
        }
        return new StoredFootprint("W", null, Instant.EPOCH, true, "W.tif", "p", ResultsStore.ALL,
                new Footprint("f", 1.0, 0, 0, 60, 60, covered, new BitSet()));
    }

    @Test
    void theSuggestedCellIsTheSmallestOddFactorSpanningThePixels() {
        assertThat(StoreRecurrence.suggestedFactor(List.of(grid(0.8)))).isEqualTo(1);
        assertThat(StoreRecurrence.suggestedFactor(List.of(grid(1.0)))).isEqualTo(1);
        assertThat(StoreRecurrence.suggestedFactor(List.of(grid(2.6)))).isEqualTo(3); // gaps of 2 and 3 cells
        assertThat(StoreRecurrence.suggestedFactor(List.of(grid(4.2)))).isEqualTo(5); // gaps of 4 and 5
        assertThat(StoreRecurrence.suggestedFactor(List.of())).isEqualTo(1);
    }

    @Test
    void groupsAreOrderedNumbersByValueThenTextsThenNone() {
        List<String> g = new ArrayList<>(List.of("14", ResultsStore.NO_GROUP, "T2", "7", "2", "T1", "2.5"));
        g.sort(StoreRecurrence.GROUP_ORDER);
        assertThat(g).containsExactly("2", "2.5", "7", "14", "T1", "T2", ResultsStore.NO_GROUP);
    }
}
