package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.BitSet;
import org.junit.jupiter.api.Test;

class HotSpotsTest {
    /**
     * A footprint of a w × h block of cells from (i0, 0), every cell evaluated, the cells at indices {@code hits}
     * flagged.
     */
    private static Footprint footprint(int i0, int w, int h, int... hits) {
        BitSet covered = new BitSet();
        covered.set(0, w * h);
        BitSet flagged = new BitSet();
        for (int c : hits) {
            flagged.set(c);
        }
        return new Footprint("f", 1.0, i0, 0, w, h, covered, flagged);
    }

    private static Recurrence only(RecurrenceMap r) {
        return r.families().get("f");
    }

    @Test
    void cellFlaggedOnMoreThanTheShareOfEnoughWafersIsHot() {
        RecurrenceMap r = new RecurrenceMap();
        // 8 wafers over 4 × 1 cells; cell 0 flagged on 3 of 8 (37.5 %), cell 1 on 2 of 8 (25 %: not more than)
        for (int k = 0; k < 8; k++) {
            r.add(k < 2 ? footprint(0, 4, 1, 0, 1) : k < 3 ? footprint(0, 4, 1, 0) : footprint(0, 4, 1));
        }
        HotSpots.Result hot = HotSpots.find(only(r), HotSpots.Criteria.DEFAULT);
        assertThat(hot.wafersNeeded()).isEqualTo(5);
        assertThat(hot.tooFewWafers()).isFalse();
        assertThat(hot.cells().cardinality()).isEqualTo(1);
        assertThat(hot.regions().size()).isEqualTo(1);
        assertThat(hot.regions().regions().get(0).peakValue()).isEqualTo(0.375, org.assertj.core.data.Offset.offset(1e-6));
        assertThat(hot.thinCells()).isZero();
    }

    @Test
    void cellCoveredByTooFewWafersIsNotHotHoweverOftenFlagged() {
        RecurrenceMap r = new RecurrenceMap();
        // 10 wafers cover cells 0..3; 3 of them also reach cell 4 (i = 4), and one of those three is flagged there:
        // 33 % of the wafers there, but 3 < max(5, half of 10)
        for (int k = 0; k < 10; k++) {
            r.add(k == 0 ? footprint(0, 5, 1, 4) : k < 3 ? footprint(0, 5, 1) : footprint(0, 4, 1));
        }
        Recurrence rec = only(r);
        HotSpots.Result hot = HotSpots.find(rec, HotSpots.Criteria.DEFAULT);
        assertThat(hot.cells().isEmpty()).isTrue();
        assertThat(hot.regions().size()).isZero();
        assertThat(hot.thinCells()).isEqualTo(1);
        // with the coverage rule relaxed the same cell is a hot spot: the coverage rule alone kept it out
        HotSpots.Result loose = HotSpots.find(rec, new HotSpots.Criteria(0.25, 1, 0));
        assertThat(loose.cells().cardinality()).isEqualTo(1);
    }

    @Test
    void halfTheFamilyIsNeededInALargeFamily() {
        assertThat(HotSpots.Criteria.DEFAULT.wafersNeeded(4)).isEqualTo(5);
        assertThat(HotSpots.Criteria.DEFAULT.wafersNeeded(10)).isEqualTo(5);
        assertThat(HotSpots.Criteria.DEFAULT.wafersNeeded(11)).isEqualTo(6);
        assertThat(HotSpots.Criteria.DEFAULT.wafersNeeded(40)).isEqualTo(20);
    }

    @Test
    void familySmallerThanTheMinimumHasNoHotSpotsAndSaysSo() {
        RecurrenceMap r = new RecurrenceMap();
        r.add(footprint(0, 3, 1, 0, 1, 2)); // one wafer, flagged everywhere: 100 %
        HotSpots.Result hot = HotSpots.find(only(r), HotSpots.Criteria.DEFAULT);
        assertThat(hot.tooFewWafers()).isTrue();
        assertThat(hot.cells().isEmpty()).isTrue();
        assertThat(hot.thinCells()).isEqualTo(3);
    }

    @Test
    void criteriaOutsideTheirRangesAreRejected() {
        assertThatThrownBy(() -> new HotSpots.Criteria(1, 5, 0.5)).hasMessageContaining("share");
        assertThatThrownBy(() -> new HotSpots.Criteria(0.25, 0, 0.5)).hasMessageContaining("minimum wafers");
        assertThatThrownBy(() -> new HotSpots.Criteria(0.25, 5, 1.5)).hasMessageContaining("family share");
    }

    /**
     * A recurrence's hot spots are found once per criteria and shared (the batch's picture and the summary's page ask
     * for the same ones): what is handed out equals what is found anew, other criteria and a recurrence made again
     * after one more wafer are found anew, and two threads asking at once get the one result.
     */
    @Test
    void foundOncePerRecurrenceAndCriteriaAndEqualToFindingAnew() throws Exception {
        RecurrenceMap r = new RecurrenceMap();
        for (int k = 0; k < 8; k++) {
            r.add(k < 4 ? footprint(0, 4, 1, 0, 1) : footprint(0, 4, 1, 0));
        }
        Recurrence rec = only(r);
        HotSpots.Result first = HotSpots.find(rec, HotSpots.Criteria.DEFAULT);
        assertThat(HotSpots.find(rec, HotSpots.Criteria.DEFAULT)).isSameAs(first);
        assertThat(first).isEqualTo(HotSpots.compute(rec, HotSpots.Criteria.DEFAULT));
        assertThat(first.cells().cardinality()).isEqualTo(2);
        HotSpots.Criteria strict = new HotSpots.Criteria(0.75, 5, 0.5);
        HotSpots.Result strictResult = HotSpots.find(rec, strict);
        assertThat(strictResult.cells().cardinality()).isEqualTo(1); // cell 0 on 8 of 8; cell 1 on 4 of 8
        assertThat(strictResult).isEqualTo(HotSpots.compute(rec, strict));
        r.add(footprint(0, 4, 1, 2, 3));
        Recurrence again = only(r);
        assertThat(again).isNotSameAs(rec);
        HotSpots.Result later = HotSpots.find(again, HotSpots.Criteria.DEFAULT);
        assertThat(later).isNotSameAs(first).isEqualTo(HotSpots.compute(again, HotSpots.Criteria.DEFAULT));
        RecurrenceMap big = new RecurrenceMap();
        for (int k = 0; k < 6; k++) {
            big.add(footprint(0, 64, 64, 5, 6, 70, 71, 4000));
        }
        Recurrence shared = only(big);
        java.util.concurrent.ExecutorService two = java.util.concurrent.Executors.newFixedThreadPool(2);
        try {
            java.util.concurrent.Future<HotSpots.Result> a = two.submit(
                    () -> HotSpots.find(shared, HotSpots.Criteria.DEFAULT));
            java.util.concurrent.Future<HotSpots.Result> b = two.submit(
                    () -> HotSpots.find(shared, HotSpots.Criteria.DEFAULT));
            assertThat(a.get()).isSameAs(b.get()).isEqualTo(HotSpots.compute(shared, HotSpots.Criteria.DEFAULT));
        } finally {
            two.shutdownNow();
        }
    }
}
