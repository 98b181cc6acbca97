package trapmap.maps.spectroscopy;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Random;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.recombination.SrhRecombination;

/**
 * Lifetime maps of one made-up p 1e15 wafer (ideal surfaces, 300 K) at several fixed injection levels, computed with
 * the physics: 1/τ_eff = 1/τ_intr(Δn) + Σ N_t,d / K_d(Δn) over the defects planted at each pixel (Shockley &amp;
 * Read 1952; Hall 1952), with seeded Gaussian relative noise on τ_eff, on a round wafer (no data outside). Three rectangles: fe-i, cr-i, and both.
 */
final class SyntheticStack {
    static final int SIZE = 48;
    static final double PITCH_MM = 1.0;
    static final Doping DOPING = Doping.pType(1e15);
    static final double FE_CM3 = 2e11;
    static final double CR_CM3 = 2e11;
    /** fe-i alone: columns 10..19, rows 10..19. */
    static final int[] FE_BOX = {10, 10, 20, 20};
    /** cr-i alone: columns 28..37, rows 10..19. */
    static final int[] CR_BOX = {28, 10, 38, 20};
    /** both: columns 16..29, rows 28..35. */
    static final int[] BOTH_BOX = {16, 28, 30, 36};

    /** True for the pixels on the wafer. */
    static boolean onWafer(int x, int y) {
        return Math.hypot(x - (SIZE - 1) / 2.0, y - (SIZE - 1) / 2.0) <= SIZE / 2.0;
    }

    private SyntheticStack() {
    }

    static boolean in(int[] box, int x, int y) {
        return x >= box[0] && y >= box[1] && x < box[2] && y < box[3];
    }

    /** The maps at {@code levels} (cm^-3) with relative noise {@code noise}, seed {@code seed}, wafer id "w1". */
    static List<WaferMap> maps(double[] levels, double noise, long seed) {
        Random rnd = new Random(seed);
        Defect fe = DefectLibrary.byId("fe-i");
        Defect cr = DefectLibrary.byId("cr-i");
        List<WaferMap> maps = new ArrayList<>();
        for (double dn : levels) {
            MeasurementConditions c = conditions(dn);
            Conditions pc = MapConversion.physicsConditions(c, ConversionSettings.DEFAULTS);
            TrapDensityConverter feConv = new TrapDensityConverter(pc, fe);
            SrhRecombination crSrh = SrhRecombination.of(cr, DOPING, pc.silicon());
            float[] tau = new float[SIZE * SIZE];
            for (int y = 0; y < SIZE; y++) {
                for (int x = 0; x < SIZE; x++) {
                    boolean hasFe = in(FE_BOX, x, y) || in(BOTH_BOX, x, y);
                    boolean hasCr = in(CR_BOX, x, y) || in(BOTH_BOX, x, y);
                    double rate = 1e6 / feConv.lifetimeAtInjectionUs(hasFe ? FE_CM3 : 0, dn)
                            + (hasCr ? CR_CM3 * crSrh.ratePerTrapCm3PerS(dn) : 0);
                    double t = 1e6 / rate * (1 + noise * rnd.nextGaussian());
                    tau[y * SIZE + x] = onWafer(x, y) ? (float) t : Float.NaN;
                }
            }
            maps.add(map(tau, c, "w1"));
        }
        return maps;
    }

    static MeasurementConditions conditions(double dn) {
        return new MeasurementConditions(DOPING, 180.0, 300.0, dn, null, null, null, null, Map.of());
    }

    static WaferMap map(float[] tau, MeasurementConditions c, String waferId) {
        return new WaferMap(FloatRaster.wrap(SIZE, SIZE, tau), PixelGrid.centred(SIZE, SIZE, PITCH_MM),
                Quantity.EFFECTIVE_LIFETIME, waferId, c, Provenance.of("synthetic"));
    }

    static List<String> names(int n) {
        List<String> s = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            s.add("level" + i + ".tif");
        }
        return s;
    }
}
