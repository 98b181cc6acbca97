package trapmap.maps.batch;

import java.util.BitSet;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.region.RegionCriteria;
import trapmap.maps.region.RegionTable;
import trapmap.maps.region.ThresholdRegions;

/**
 * Hot spots of a {@link Recurrence}: cells flagged on more than a share of the wafers that were evaluated there,
 * counted only where enough of the family's wafers were evaluated, so that one wafer's mark in a corner few wafers
 * reach is not taken for a recurring defect. The one computation behind every report of hot spots.
 */
public final class HotSpots {
    /**
     * When a cell is a hot spot.
     *
     * @param share          a cell is hot when flagged on more than this share of the wafers evaluated there, (0, 1)
     * @param minWafers      and when at least this many wafers were evaluated there (≥ 1)
     * @param minFamilyShare and when at least this share of the family's wafers were evaluated there, [0, 1]
     */
    public record Criteria(double share, int minWafers, double minFamilyShare) {
        /**
         * This program's defaults: flagged on more than one wafer in four, on cells covered by at least 5 wafers
         * and at least half of the family. Below 5 wafers a share moves in steps of 20 % or more, too coarse to tell
         * a recurring defect from one wafer's mark.
         */
        public static final Criteria DEFAULT = new Criteria(0.25, 5, 0.5);

        public Criteria {
            if (!(share > 0 && share < 1)) {
                throw new IllegalArgumentException("hot-spot share must be in (0, 1) but was " + share);
            }
            if (minWafers < 1) {
                throw new IllegalArgumentException("hot-spot minimum wafers must be >= 1 but was " + minWafers);
            }
            if (!(minFamilyShare >= 0 && minFamilyShare <= 1)) {
                throw new IllegalArgumentException("hot-spot minimum family share must be in [0, 1] but was "
                        + minFamilyShare);
            }
        }

        /** The wafers a cell of a family of {@code familyWafers} needs to be judged. */
        public int wafersNeeded(int familyWafers) {
            return Math.max(minWafers, (int) Math.ceil(minFamilyShare * familyWafers - 1e-9));
        }
    }

    /**
     * The hot spots of one family.
     *
     * @param criteria      the rule applied
     * @param wafersNeeded  wafers a cell needed to be judged
     * @param tooFewWafers  the family has fewer wafers than that: no cell can be judged
     * @param cells         the hot cells (pixel index of the fraction map)
     * @param regions       the hot spots: 8-connected groups of hot cells, values the share of wafers flagged
     * @param thinCells     cells above the share but covered by too few wafers to be judged
     */
    public record Result(Criteria criteria, int wafersNeeded, boolean tooFewWafers, BitSet cells, RegionTable regions,
                         int thinCells) {
        public Result {
            cells = (BitSet) cells.clone();
        }

        @Override
        public BitSet cells() {
            return (BitSet) cells.clone();
        }
    }

    /**
     * The results found so far, by recurrence (weakly: dropped with it) and criteria: after the last wafer of a batch
     * its recurrence picture and the summary's recurrence page ask for the same ones on two threads, and the second
     * takes (or waits for) the first's. A result is immutable; a recurrence equals only itself (its cell counts are
     * its own copy).
     */
    private static final java.util.Map<Recurrence, java.util.Map<Criteria, Result>> FOUND =
            java.util.Collections.synchronizedMap(new java.util.WeakHashMap<>());

    private HotSpots() {
    }

    /** The hot spots of {@code r} under {@code c}; found once per recurrence and criteria. */
    public static Result find(Recurrence r, Criteria c) {
        return FOUND.computeIfAbsent(r, k -> new java.util.concurrent.ConcurrentHashMap<>())
                .computeIfAbsent(c, k -> compute(r, k));
    }

    /** The hot spots of {@code r} under {@code c}, found anew. */
    static Result compute(Recurrence r, Criteria c) {
        WaferMap m = r.fraction();
        int needed = c.wafersNeeded(r.wafers());
        float[] s = m.raster().samples();
        float[] judged = new float[s.length];
        BitSet hot = new BitSet(s.length);
        int thin = 0;
        for (int i = 0; i < s.length; i++) {
            boolean enough = r.wafersAt(i) >= needed;
            judged[i] = enough ? s[i] : Float.NaN;
            if (s[i] > c.share()) {
                if (enough) {
                    hot.set(i);
                } else {
                    thin++;
                }
            }
        }
        WaferMap judgedMap = new WaferMap(FloatRaster.wrap(m.width(), m.height(), judged), m.grid(), m.quantity(),
                m.waferId(), m.conditions(), m.provenance());
        RegionTable regions = ThresholdRegions.find(judgedMap, null, RegionCriteria.above(c.share(), 0), null);
        return new Result(c, needed, r.wafers() < needed, hot, regions, thin);
    }
}
