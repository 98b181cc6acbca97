package trapmap.store;

import java.math.BigDecimal;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import trapmap.maps.batch.Footprint;
import trapmap.maps.batch.HotSpots;
import trapmap.maps.batch.Recurrence;
import trapmap.maps.batch.RecurrenceFiles;
import trapmap.maps.batch.RecurrenceMap;
import trapmap.maps.io.NumberText;
import trapmap.maps.raster.PitchPrecision;
import trapmap.shared.error.InvalidValueException;

/**
 * The recurrence maps of the wafers of a results-store query: the footprints the batch stored
 * ({@link ResultsStore#footprints}) added up per family ({@link RecurrenceMap}), or per value of a grouping and family,
 * so that a defect that returns at one position (a boat slot's contamination) shows in its group's map. The maps,
 * pictures and tables are written by {@link RecurrenceFiles}, as a batch writes its own.
 */
public final class StoreRecurrence {
    private StoreRecurrence() {
    }

    /**
     * A query's recurrence.
     *
     * @param filter  the wafers taken
     * @param by      the grouping ({@code lot}, {@code day}, {@code week} or a sidecar fact), null for none
     * @param wafers  the stored wafers with a footprint that the query gave
     * @param entries one recurrence per group and family, groups in {@link #GROUP_ORDER}, then families by name
     * @param refused footprints left out of the maps and why ({@link RecurrenceMap#refused})
     * @param notes   what the reader should know, e.g. that the cells are finer than the wafers' pixels
     */
    public record Outcome(StoreFilter filter, String by, int wafers, List<RecurrenceFiles.Entry> entries,
                          List<String> refused, List<String> notes) {
        public Outcome {
            entries = List.copyOf(entries);
            refused = List.copyOf(refused);
            notes = List.copyOf(notes);
        }

        /** Whether the maps are grouped (one per group and family). */
        public boolean grouped() {
            return by != null;
        }

        /** The query in words, for captions: the filter, the grouping and the wafers. */
        public String describe() {
            return filter.describe() + (by == null ? "" : "; by " + by) + "; " + wafers + " wafers with a footprint";
        }

        /**
         * One line per map: its group, family and wafers and its hot spots under {@code criteria} (each with cells,
         * highest share and centroid, with the decimals its cell size resolves, as the batch summary gives it:
         * {@link PitchPrecision#mm}), or why there is none.
         */
        public List<String> lines(HotSpots.Criteria criteria) {
            List<String> out = new ArrayList<>();
            for (RecurrenceFiles.Entry e : entries) {
                Recurrence r = e.recurrence();
                HotSpots.Result hot = HotSpots.find(r, criteria);
                StringBuilder s = new StringBuilder();
                if (e.group() != null) {
                    s.append(by).append(' ').append(e.group()).append(", ");
                }
                s.append(r.family()).append(": ").append(r.wafers()).append(r.wafers() == 1 ? " wafer" : " wafers");
                if (hot.tooFewWafers()) {
                    s.append(", too few to judge (a cell needs ").append(hot.wafersNeeded()).append(')');
                } else if (hot.regions().size() == 0) {
                    s.append(", no hot spot");
                } else {
                    s.append(", ").append(hot.regions().size()).append(hot.regions().size() == 1 ? " hot spot:"
                            : " hot spots:");
                    String sep = " ";
                    double cell = r.fraction().grid().pitchMm();
                    for (var g : hot.regions().byArea()) {
                        s.append(sep).append('#').append(g.id()).append(' ').append(g.pixelCount())
                                .append(g.pixelCount() == 1 ? " cell," : " cells,")
                                .append(" peak ").append(Math.round(g.peakValue() * 100)).append(" % of wafers,")
                                .append(" centroid (").append(PitchPrecision.mm(g.centroidXMm(), cell))
                                .append(", ").append(PitchPrecision.mm(g.centroidYMm(), cell)).append(") mm");
                        sep = "; ";
                    }
                }
                out.add(s.toString());
            }
            return out;
        }
    }

    /**
     * The smallest odd cell factor at least the usual distance between the covered cells of a row (the 90th
     * percentile over the footprints' rows): 1 where neighbouring cells are covered, 3 for footprints of one cell
     * per pixel of 2 to 3 mm.
     */
    static int suggestedFactor(List<StoredFootprint> stored) {
        int[] gaps = new int[8]; // gaps 1..7, and longer ones (holes) in the last
        long n = 0;
        for (StoredFootprint sf : stored) {
            Footprint f = sf.footprint();
            java.util.BitSet c = f.covered();
            for (int j = 0; j < f.height(); j++) {
                int last = -1;
                for (int b = c.nextSetBit(j * f.width()); b >= 0 && b < (j + 1) * f.width(); b = c.nextSetBit(b + 1)) {
                    if (last >= 0) {
                        gaps[Math.min(b - last, 8) - 1]++;
                        n++;
                    }
                    last = b;
                }
            }
        }
        long seen = 0;
        for (int g = 1; g <= gaps.length; g++) {
            seen += gaps[g - 1];
            if (seen >= 0.9 * n) {
                return g % 2 == 1 ? g : g + 1;
            }
        }
        return 1;
    }

    /**
     * The order of groups: numbers by value (slot 2 before slot 10), then other values as text,
     * {@value ResultsStore#NO_GROUP} last.
     */
    public static final Comparator<String> GROUP_ORDER = (a, b) -> {
        boolean na = ResultsStore.NO_GROUP.equals(a);
        boolean nb = ResultsStore.NO_GROUP.equals(b);
        if (na || nb) {
            return Boolean.compare(na, nb);
        }
        BigDecimal x = number(a);
        BigDecimal y = number(b);
        if (x != null && y != null) {
            int c = x.compareTo(y);
            return c != 0 ? c : a.compareTo(b);
        }
        if (x != null || y != null) {
            return x != null ? -1 : 1;
        }
        return a.compareTo(b);
    };

    private static BigDecimal number(String s) {
        try {
            return new BigDecimal(s.trim());
        } catch (NumberFormatException e) {
            return null;
        }
    }

    /**
     * Reads the footprints of the wafers {@code filter} takes and adds them up, per family or (with {@code by}) per
     * group and family.
     *
     * @param by {@code lot}, {@code day}, {@code week}, a sidecar fact such as {@code boat_slot}, or null/{@code none}
     * @throws StoreException        when the store cannot be read
     * @throws InvalidValueException (field {@code store}) when the query gives no wafer with a footprint
     */
    public static Outcome analyse(ResultsStore store, StoreFilter filter, String by) {
        return analyse(store, filter, by, 1);
    }

    /**
     * As {@link #analyse(ResultsStore, StoreFilter, String)} on cells {@code cellFactor} times the stored ones
     * ({@link Footprint#coarsened}: odd, 1 for the stored cells): coarser maps, and a remedy for footprints that cover
     * only some of the stored cells, one cell per pixel of a map coarser than the cells, so that one spot falls apart
     * into single cells (the batch's footprints mark every cell whose centre a pixel's square holds, so that only
     * footprints made otherwise need it; {@link #suggestedFactor} tells them).
     *
     * @throws InvalidValueException (field {@code cell}) when the factor is not a positive odd number
     */
    public static Outcome analyse(ResultsStore store, StoreFilter filter, String by, int cellFactor) {
        if (cellFactor < 1 || cellFactor % 2 == 0) {
            throw new InvalidValueException("cell", "mm", "the cell must be the stored cell times an odd number"
                    + " (1, 3, 5, ...), so that the stored cells nest in it, but the factor was " + cellFactor);
        }
        String g = by == null || by.isBlank() || by.trim().equals("none") ? null : by.trim();
        List<StoredFootprint> stored = store.footprints(filter, g);
        if (stored.isEmpty()) {
            throw new InvalidValueException("store", "", store.name() + " holds no wafer with a footprint for "
                    + filter.describe());
        }
        Map<String, RecurrenceMap> groups = new TreeMap<>(GROUP_ORDER);
        for (StoredFootprint f : stored) {
            groups.computeIfAbsent(g == null ? ResultsStore.ALL : f.group(), k -> new RecurrenceMap())
                    .add(f.footprint().coarsened(cellFactor));
        }
        List<RecurrenceFiles.Entry> entries = new ArrayList<>();
        List<String> refused = new ArrayList<>();
        List<String> notes = new ArrayList<>();
        int suggested = cellFactor == 1 ? suggestedFactor(stored) : 1;
        if (suggested > 1) {
            notes.add("the wafers' pixels are larger than the " + NumberText.mm(Footprint.PITCH_MM) + " mm cells:"
                    + " they cover about one cell in " + suggested + " along a row, so that one spot shows as"
                    + " scattered single cells; cells " + suggested + " times as large (--cell " + suggested
                    + ") join them");
        }
        groups.forEach((group, m) -> {
            for (Recurrence r : m.families().values()) {
                entries.add(g == null ? new RecurrenceFiles.Entry(null, r)
                        : new RecurrenceFiles.Entry(group, r, r.family() + ", " + g + " " + group));
            }
            for (String why : m.refused()) {
                refused.add(g == null ? why : by + " " + group + ": " + why);
            }
        });
        return new Outcome(filter, g, stored.size(), entries, refused, notes);
    }
}
