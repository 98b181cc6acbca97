package trapmap.maps.batch;

import java.util.HashMap;
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
 * {@link WaferInspection#FOOTPRINT_PITCH_MM} in wafer coordinates, the number of wafers with a flagged pixel in the
 * cell over the number of wafers evaluated there. Cells no wafer covers are NaN. Not thread-safe.
 */
public final class RecurrenceMap {
    private static final class Family {
        final Map<Long, int[]> cells = new HashMap<>();
        int wafers;
        double pitchMm;
    }

    private final Map<String, Family> families = new TreeMap<>();

    /** Adds one wafer. */
    public void add(Footprint f) {
        Family fam = families.computeIfAbsent(f.family(), k -> new Family());
        fam.wafers++;
        fam.pitchMm = f.pitchMm();
        for (int c = f.covered().nextSetBit(0); c >= 0; c = f.covered().nextSetBit(c + 1)) {
            int i = f.minI() + c % f.width();
            int j = f.minJ() + c / f.width();
            int[] n = fam.cells.computeIfAbsent(key(i, j), k -> new int[2]);
            n[0]++;
            if (f.flagged().get(c)) {
                n[1]++;
            }
        }
    }

    private static long key(int i, int j) {
        return ((long) i << 32) | (j & 0xFFFFFFFFL);
    }

    /** One fraction map per family, by family name. */
    public Map<String, WaferMap> maps() {
        Map<String, WaferMap> out = new LinkedHashMap<>();
        families.forEach((name, fam) -> {
            if (!fam.cells.isEmpty()) {
                out.put(name, map(name, fam));
            }
        });
        return out;
    }

    private static WaferMap map(String name, Family fam) {
        int minI = Integer.MAX_VALUE;
        int maxI = Integer.MIN_VALUE;
        int minJ = Integer.MAX_VALUE;
        int maxJ = Integer.MIN_VALUE;
        for (long k : fam.cells.keySet()) {
            int i = (int) (k >> 32);
            int j = (int) k;
            minI = Math.min(minI, i);
            maxI = Math.max(maxI, i);
            minJ = Math.min(minJ, j);
            maxJ = Math.max(maxJ, j);
        }
        int w = maxI - minI + 1;
        int h = maxJ - minJ + 1;
        float[] s = new float[w * h];
        java.util.Arrays.fill(s, Float.NaN);
        for (Map.Entry<Long, int[]> e : fam.cells.entrySet()) {
            int i = (int) (e.getKey() >> 32);
            int j = (int) (long) e.getKey();
            int[] n = e.getValue();
            s[(maxJ - j) * w + (i - minI)] = (float) ((double) n[1] / n[0]);
        }
        PixelGrid grid = new PixelGrid(w, h, fam.pitchMm, -minI, maxJ);
        return new WaferMap(FloatRaster.wrap(w, h, s), grid, Quantity.FRACTION, "recurrence-" + name,
                MeasurementConditions.UNKNOWN, Provenance.of("batch inspection").then(ProcessingStep.of(
                        "recurrence", "family", name, "wafers", Integer.toString(fam.wafers), "pitch_mm",
                        Double.toString(fam.pitchMm))));
    }
}
