package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.BitSet;
import org.junit.jupiter.api.Test;
import trapmap.maps.model.WaferMap;

class RecurrenceMapTest {
    /** A footprint of w × h cells from (i0, j0) with every cell evaluated and the cells of {@code hits} flagged. */
    private static Footprint footprint(int i0, int j0, int w, int h, int... hits) {
        BitSet covered = new BitSet();
        covered.set(0, w * h);
        BitSet flagged = new BitSet();
        for (int c : hits) {
            flagged.set(c);
        }
        return new Footprint("f", 1.0, i0, j0, w, h, covered, flagged);
    }

    private static float at(WaferMap m, int i, int j) {
        int x = (int) Math.round(m.grid().xPx(i));
        int y = (int) Math.round(m.grid().yPx(j));
        return m.raster().samples()[y * m.width() + x];
    }

    @Test
    void footprintsOfDifferentExtentsAddUpCellByCell() {
        RecurrenceMap r = new RecurrenceMap();
        r.add(footprint(0, 0, 3, 2, 0));      // flags cell (0, 0)
        r.add(footprint(-2, 1, 3, 3, 2, 8));  // grows left and up; flags (0, 1) and (0, 3)
        r.add(footprint(0, 0, 1, 1, 0));      // flags (0, 0) again
        WaferMap m = r.maps().get("f");
        assertThat(m.width()).isEqualTo(5);   // i from -2 to 2
        assertThat(m.height()).isEqualTo(4);  // j from 0 to 3
        assertThat(at(m, 0, 0)).isEqualTo(1f);        // 2 of 2
        assertThat(at(m, 1, 0)).isEqualTo(0f);        // 0 of 1
        assertThat(at(m, 0, 1)).isEqualTo(0.5f);      // 1 of 2
        assertThat(at(m, -2, 3)).isEqualTo(0f);       // 0 of 1
        assertThat(at(m, 0, 3)).isEqualTo(1f);        // 1 of 1
        assertThat(at(m, 2, 3)).isNaN();              // no wafer there
        assertThat(at(m, -2, 0)).isNaN();
    }

    @Test
    void eachFamilyCountsItsWafersAndAFamilyWithNoEvaluatedCellHasNoMap() {
        RecurrenceMap r = new RecurrenceMap();
        r.add(footprint(0, 0, 2, 2, 0));
        r.add(footprint(0, 0, 2, 2));
        r.add(new Footprint("g", 1.0, 0, 0, 1, 1, bits(0), new BitSet()));
        r.add(new Footprint("empty", 1.0, 0, 0, 1, 1, new BitSet(), new BitSet()));
        assertThat(r.waferCounts()).containsExactly(java.util.Map.entry("f", 2), java.util.Map.entry("g", 1));
        assertThat(r.waferCounts().keySet()).containsExactlyElementsOf(r.maps().keySet());
    }

    @Test
    void mapsAddedTogetherEqualOneMapOfAllTheirFootprintsInAnyOrder() {
        java.util.Random random = new java.util.Random(7);
        java.util.List<Footprint> all = new java.util.ArrayList<>();
        for (int k = 0; k < 40; k++) {
            int w = 1 + random.nextInt(6);
            int h = 1 + random.nextInt(6);
            BitSet covered = new BitSet();
            BitSet flagged = new BitSet();
            for (int c = 0; c < w * h; c++) {
                if (random.nextInt(5) > 0) {
                    covered.set(c);
                    if (random.nextInt(3) == 0) {
                        flagged.set(c);
                    }
                }
            }
            all.add(new Footprint(k % 3 == 0 ? "g" : "f", 1.0, random.nextInt(11) - 5, random.nextInt(11) - 5, w, h,
                    covered, flagged));
        }
        all.add(new Footprint("f", 1.0, 2000, 0, 1, 1, bits(0), new BitSet())); // too far out: left out
        RecurrenceMap one = new RecurrenceMap();
        all.forEach(one::add);
        // as a batch does: three workers take footprints in some order, the far one is told in input order
        RecurrenceMap merged = new RecurrenceMap();
        RecurrenceMap[] workers = {new RecurrenceMap(), new RecurrenceMap(), new RecurrenceMap()};
        for (int k = all.size() - 1; k >= 0; k--) {
            Footprint f = all.get(k);
            if (RecurrenceMap.accepts(f)) {
                workers[(k * 7) % 3].add(f);
            }
        }
        all.stream().filter(f -> !RecurrenceMap.accepts(f)).forEach(merged::add);
        for (RecurrenceMap w : workers) {
            merged.addAll(w);
        }
        assertThat(merged.waferCounts()).isEqualTo(one.waferCounts());
        assertThat(merged.refused()).isEqualTo(one.refused()).hasSize(1);
        one.families().forEach((name, r) -> {
            Recurrence m = merged.families().get(name);
            assertThat(m.fraction().width()).isEqualTo(r.fraction().width());
            assertThat(m.fraction().height()).isEqualTo(r.fraction().height());
            assertThat(m.fraction().grid()).isEqualTo(r.fraction().grid());
            assertThat(m.fraction().raster().samples()).containsExactly(r.fraction().raster().samples());
            assertThat(m.wafersPerCell()).containsExactly(r.wafersPerCell());
        });
    }

    private static BitSet bits(int... set) {
        BitSet b = new BitSet();
        for (int i : set) {
            b.set(i);
        }
        return b;
    }

    @Test
    void eachCellCountsTheWafersThatEvaluatedItAndThoseThatFlaggedIt() {
        // partly covered footprints of several extents, some flagged cells not covered (not counted): every cell's
        // fraction is the one counted cell by cell over all footprints
        java.util.Random random = new java.util.Random(11);
        RecurrenceMap r = new RecurrenceMap();
        java.util.Map<Long, int[]> counts = new java.util.HashMap<>(); // (i, j) -> {evaluated, flagged}
        for (int k = 0; k < 30; k++) {
            int w = 1 + random.nextInt(90);
            int h = 1 + random.nextInt(40);
            int i0 = random.nextInt(21) - 10;
            int j0 = random.nextInt(21) - 10;
            BitSet covered = new BitSet();
            BitSet flagged = new BitSet();
            for (int c = 0; c < w * h; c++) {
                if (random.nextInt(4) != 0) {
                    covered.set(c);
                }
                if (random.nextInt(5) == 0) {
                    flagged.set(c);
                }
            }
            r.add(new Footprint("f", 1.0, i0, j0, w, h, covered, flagged));
            for (int c = 0; c < w * h; c++) {
                if (covered.get(c)) {
                    int[] n = counts.computeIfAbsent(((long) (i0 + c % w) << 32) ^ (j0 + c / w & 0xFFFFFFFFL),
                            key -> new int[2]);
                    n[0]++;
                    n[1] += flagged.get(c) ? 1 : 0;
                }
            }
        }
        WaferMap m = r.maps().get("f");
        int seen = 0;
        for (int j = -10; j < 50; j++) {
            for (int i = -10; i < 100; i++) {
                int[] n = counts.get(((long) i << 32) ^ (j & 0xFFFFFFFFL));
                double x = m.grid().xPx(i);
                double y = m.grid().yPx(j);
                if (x < 0 || y < 0 || x > m.width() - 1 || y > m.height() - 1) {
                    assertThat(n).isNull();
                    continue;
                }
                if (n == null) {
                    assertThat(at(m, i, j)).isNaN();
                } else {
                    assertThat(at(m, i, j)).isEqualTo((float) ((double) n[1] / n[0]));
                    seen++;
                }
            }
        }
        assertThat(seen).isEqualTo(counts.size());
    }

    /** The families are made once until a footprint is added (alone or merged): then made again with it. */
    @Test
    void familiesMadeOnceAreMadeAgainAfterEachAddition() {
        RecurrenceMap r = new RecurrenceMap();
        r.add(footprint(0, 0, 2, 1, 0));
        java.util.Map<String, Recurrence> first = r.families();
        assertThat(r.families()).isSameAs(first);
        assertThat(first.get("f").wafers()).isEqualTo(1);
        r.add(footprint(0, 0, 2, 1, 1));
        java.util.Map<String, Recurrence> second = r.families();
        assertThat(second).isNotSameAs(first);
        assertThat(second.get("f").wafers()).isEqualTo(2);
        assertThat(at(second.get("f").fraction(), 1, 0)).isEqualTo(0.5f);
        RecurrenceMap other = new RecurrenceMap();
        other.add(footprint(1, 0, 1, 1, 0));
        r.addAll(other);
        java.util.Map<String, Recurrence> third = r.families();
        assertThat(third.get("f").wafers()).isEqualTo(3);
        assertThat(at(third.get("f").fraction(), 1, 0)).isEqualTo(2f / 3);
        assertThat(first.get("f").wafers()).as("what was handed out stays as it was").isEqualTo(1);
        org.assertj.core.api.Assertions.assertThatThrownBy(() -> third.remove("f"))
                .isInstanceOf(UnsupportedOperationException.class);
    }
}
