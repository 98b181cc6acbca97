package trapmap.maps.batch;

import java.io.IOException;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.BitSet;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.TreeMap;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;

/**
 * The fraction of wafers flagged at each position: per wafer family (outline format), on cells of
 * {@link Footprint#PITCH_MM} in wafer coordinates, the number of wafers with a flagged pixel in the
 * cell over the number of wafers evaluated there. Cells no wafer covers are NaN. Not thread-safe.
 */
public final class RecurrenceMap {
    /** Counts of one family on a dense grid of cells that grows to hold every footprint. */
    private static final class Family {
        int minI;
        int minJ;
        int width;
        int height;
        int[] evaluated = new int[0];
        int[] flagged = new int[0];
        int wafers;
        double pitchMm;

        /** Makes room for cells [i0, i0 + w) × [j0, j0 + h). */
        void cover(int i0, int j0, int w, int h) {
            if (width > 0 && i0 >= minI && j0 >= minJ && i0 + w <= minI + width && j0 + h <= minJ + height) {
                return;
            }
            int ni = width == 0 ? i0 : Math.min(minI, i0);
            int nj = width == 0 ? j0 : Math.min(minJ, j0);
            int nw = (width == 0 ? i0 + w : Math.max(minI + width, i0 + w)) - ni;
            int nh = (width == 0 ? j0 + h : Math.max(minJ + height, j0 + h)) - nj;
            int[] e = new int[nw * nh];
            int[] f = new int[nw * nh];
            for (int y = 0; y < height; y++) {
                int to = (minJ + y - nj) * nw + (minI - ni);
                System.arraycopy(evaluated, y * width, e, to, width);
                System.arraycopy(flagged, y * width, f, to, width);
            }
            minI = ni;
            minJ = nj;
            width = nw;
            height = nh;
            evaluated = e;
            flagged = f;
        }
    }

    /**
     * The farthest a footprint's cells may lie from the wafer centre, mm: twice the diameter of the largest wafer
     * (450 mm) with room to spare. A wafer evaluated beyond it has a placement (a centre far outside its data) that no
     * recurrence map can show: it would stretch its family's map over kilometres of empty cells and give it a centre
     * that map files cannot hold ({@link trapmap.maps.io.Sidecar#MAX_CENTRE_PX}).
     */
    public static final double MAX_OFFSET_MM = 1000;

    private final Map<String, Family> families = new TreeMap<>();
    private final java.util.List<String> refused = new java.util.ArrayList<>();
    /** {@link #families()} as last made, until a footprint is added; null: to be made. */
    private Map<String, Recurrence> made;

    /**
     * Adds one wafer, unless its cells lie beyond {@link #MAX_OFFSET_MM} from the wafer centre: such a footprint is
     * left out and its reason kept in {@link #refused()}.
     *
     * @return true when the wafer was added
     */
    public synchronized boolean add(Footprint f) {
        double reach = reachMm(f);
        if (!(reach <= MAX_OFFSET_MM)) {
            refused.add("family " + f.family() + ": a wafer evaluated up to " + reach + " mm from its centre,"
                    + " beyond the " + MAX_OFFSET_MM + " mm a recurrence map covers (check the map's centre_x_px,"
                    + " centre_y_px and pixel pitch); left out of the recurrence map");
            return false;
        }
        made = null;
        Family fam = families.computeIfAbsent(f.family(), k -> new Family());
        fam.wafers++;
        fam.pitchMm = f.pitchMm();
        fam.cover(f.minI(), f.minJ(), f.width(), f.height());
        int di = f.minI() - fam.minI;
        int dj = f.minJ() - fam.minJ;
        // row by row, a small method per row: compiled once by HotSpot, instead of the whole of this method while
        // a loop over all cells runs (on-stack replacement)
        for (int y = 0; y < f.height(); y++) {
            addRow(f.covered(), f.flagged(), y * f.width(), f.width(), fam.evaluated, fam.flagged,
                    (dj + y) * fam.width + di);
        }
        return true;
    }

    /**
     * Counts the cells {@code [from, from + n)} of a footprint's {@code covered} and {@code flagged} sets (a flagged
     * cell counts only when covered) into {@code evaluated} and {@code flaggedCounts} from {@code at}.
     */
    private static void addRow(BitSet covered, BitSet flagged, int from, int n, int[] evaluated, int[] flaggedCounts,
                               int at) {
        for (int x = 0; x < n; x++) {
            if (covered.get(from + x)) {
                evaluated[at + x]++;
                if (flagged.get(from + x)) {
                    flaggedCounts[at + x]++;
                }
            }
        }
    }

    /** How far the footprint's cells reach from the wafer centre, mm. */
    private static double reachMm(Footprint f) {
        return f.pitchMm() * Math.max(Math.max(Math.abs((double) f.minI()),
                Math.abs((double) f.minI() + f.width())), Math.max(Math.abs((double) f.minJ()),
                Math.abs((double) f.minJ() + f.height())));
    }

    /** True when {@link #add} takes the footprint in (its cells lie within {@link #MAX_OFFSET_MM}). */
    public static boolean accepts(Footprint f) {
        return reachMm(f) <= MAX_OFFSET_MM;
    }

    /**
     * Adds the counts of {@code other} (footprints added to it in another thread, say): afterwards this map holds
     * what adding all footprints of both to one map gives, in any order, the counts being sums; the reasons of
     * {@code other}'s left-out footprints follow this map's. A family's cell pitch is that of the map added last
     * (all footprints of a batch have {@link Footprint#PITCH_MM}).
     */
    public synchronized void addAll(RecurrenceMap other) {
        if (other == this) {
            throw new IllegalArgumentException("a recurrence map cannot be added to itself");
        }
        made = null;
        other.families.forEach((name, o) -> {
            if (o.wafers == 0) {
                return;
            }
            Family fam = families.computeIfAbsent(name, k -> new Family());
            fam.wafers += o.wafers;
            fam.pitchMm = o.pitchMm;
            fam.cover(o.minI, o.minJ, o.width, o.height);
            for (int y = 0; y < o.height; y++) {
                int to = (o.minJ + y - fam.minJ) * fam.width + (o.minI - fam.minI);
                int from = y * o.width;
                for (int x = 0; x < o.width; x++) {
                    fam.evaluated[to + x] += o.evaluated[from + x];
                    fam.flagged[to + x] += o.flagged[from + x];
                }
            }
        });
        refused.addAll(other.refused);
    }

    /** Why footprints were left out ({@link #add}), one line each, in the order they came. */
    public java.util.List<String> refused() {
        return java.util.List.copyOf(refused);
    }

    /**
     * The recurrence maps of the footprints in a batch's {@code footprints.csv} (every wafer of the batch, including
     * those kept from a resumed run); empty when the file does not exist. Rows cut short are left out.
     */
    public static RecurrenceMap read(Path footprintsCsv) throws IOException {
        Map<String, Footprint> all = new LinkedHashMap<>();
        FootprintStore.read(footprintsCsv, all, f -> f);
        RecurrenceMap r = new RecurrenceMap();
        all.values().forEach(r::add);
        return r;
    }

    /**
     * The number of wafers in each family that has a map in {@link #maps()}, by family name, in the same order: the
     * denominator a reader needs before trusting a fraction (one wafer of three is 33 %).
     */
    public Map<String, Integer> waferCounts() {
        Map<String, Integer> out = new LinkedHashMap<>();
        families().forEach((name, r) -> out.put(name, r.wafers()));
        return out;
    }

    /** One fraction map per family, by family name. */
    public Map<String, WaferMap> maps() {
        Map<String, WaferMap> out = new LinkedHashMap<>();
        families().forEach((name, r) -> out.put(name, r.fraction()));
        return out;
    }

    /**
     * One recurrence (fraction map and the wafers covering each cell) per family, by family name; unmodifiable. Made
     * once until the next footprint is added (the batch's tables, its recurrence files and the summary, on another
     * thread, all ask for them after the last wafer).
     */
    public synchronized Map<String, Recurrence> families() {
        if (made == null) {
            Map<String, Recurrence> out = new LinkedHashMap<>();
            families.forEach((name, fam) -> {
                if (Arrays.stream(fam.evaluated).anyMatch(n -> n > 0)) {
                    out.put(name, recurrence(name, fam));
                }
            });
            made = java.util.Collections.unmodifiableMap(out);
        }
        return made;
    }

    /**
     * One family's counts, for moving a recurrence map between processes (a cluster job's partitions): the wafers
     * added, and per cell of {@code [minI, minI + width) × [minJ, minJ + height)} (row by row) the wafers evaluated
     * there and those flagged there.
     */
    public record Counts(String family, double pitchMm, int wafers, int minI, int minJ, int width, int height,
                         int[] evaluated, int[] flagged) implements java.io.Serializable {
        private static final long serialVersionUID = 1L;

        public Counts {
            if (evaluated.length != width * height || flagged.length != width * height) {
                throw new IllegalArgumentException("counts must have one entry per cell (" + width * height + ")");
            }
            evaluated = evaluated.clone();
            flagged = flagged.clone();
        }

        @Override
        public int[] evaluated() {
            return evaluated.clone();
        }

        @Override
        public int[] flagged() {
            return flagged.clone();
        }
    }

    /** The counts of every family that holds a wafer, by family name ({@link #addCounts} adds them elsewhere). */
    public synchronized java.util.List<Counts> counts() {
        java.util.List<Counts> out = new java.util.ArrayList<>();
        families.forEach((name, f) -> {
            if (f.wafers > 0) {
                out.add(new Counts(name, f.pitchMm, f.wafers, f.minI, f.minJ, f.width, f.height, f.evaluated,
                        f.flagged));
            }
        });
        return out;
    }

    /**
     * Adds one family's counts ({@link #counts} of another map): afterwards this map holds what {@link #addAll} of
     * that map gives for the family.
     */
    public synchronized void addCounts(Counts c) {
        RecurrenceMap other = new RecurrenceMap();
        Family f = new Family();
        f.minI = c.minI();
        f.minJ = c.minJ();
        f.width = c.width();
        f.height = c.height();
        f.evaluated = c.evaluated();
        f.flagged = c.flagged();
        f.wafers = c.wafers();
        f.pitchMm = c.pitchMm();
        other.families.put(c.family(), f);
        addAll(other);
    }

    private static Recurrence recurrence(String name, Family fam) {
        int minI = Integer.MAX_VALUE;
        int maxI = Integer.MIN_VALUE;
        int minJ = Integer.MAX_VALUE;
        int maxJ = Integer.MIN_VALUE;
        for (int y = 0; y < fam.height; y++) {
            for (int x = 0; x < fam.width; x++) {
                if (fam.evaluated[y * fam.width + x] > 0) {
                    minI = Math.min(minI, fam.minI + x);
                    maxI = Math.max(maxI, fam.minI + x);
                    minJ = Math.min(minJ, fam.minJ + y);
                    maxJ = Math.max(maxJ, fam.minJ + y);
                }
            }
        }
        int w = maxI - minI + 1;
        int h = maxJ - minJ + 1;
        float[] s = new float[w * h];
        int[] wafers = new int[w * h];
        Arrays.fill(s, Float.NaN);
        for (int j = minJ; j <= maxJ; j++) {
            for (int i = minI; i <= maxI; i++) {
                int at = (j - fam.minJ) * fam.width + (i - fam.minI);
                int n = fam.evaluated[at];
                if (n > 0) {
                    s[(maxJ - j) * w + (i - minI)] = (float) ((double) fam.flagged[at] / n);
                    wafers[(maxJ - j) * w + (i - minI)] = n;
                }
            }
        }
        PixelGrid grid = new PixelGrid(w, h, fam.pitchMm, -minI, maxJ);
        WaferMap fraction = new WaferMap(FloatRaster.wrap(w, h, s), grid, Quantity.FRACTION, "recurrence-" + name,
                MeasurementConditions.UNKNOWN, Provenance.of("batch inspection").then(ProcessingStep.of(
                        "recurrence", "family", name, "wafers", Integer.toString(fam.wafers), "pitch_mm",
                        Double.toString(fam.pitchMm))));
        return new Recurrence(name, fraction, wafers, fam.wafers);
    }
}
