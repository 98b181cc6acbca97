package trapmap.viewer.model;

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
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.recombination.SrhRecombination;

/**
 * Effective-lifetime maps of one made-up p 1e15 cm⁻³ wafer (180 µm, 300 K, ideal surfaces) at fixed injection levels,
 * from the physics: 1/τ_eff = 1/τ_intr(Δn) + Σ N_t/K(Δn) over the defects planted at each pixel (Shockley &amp; Read
 * 1952; Hall 1952), with seeded Gaussian relative noise. Fe_i in an upper left square, Cr_i in a smaller upper right
 * rectangle, both in a lower left one (no symmetry that a registration could take for a mirror); elsewhere intrinsic recombination only.
 */
public final class SyntheticLevels {
    public static final int SIZE = 40;
    public static final Doping DOPING = Doping.pType(1e15);
    public static final double NT_CM3 = 2e11;
    /** Boxes as {x0, y0, x1, y1} (exclusive ends). */
    public static final int[] FE_BOX = {4, 4, 16, 16};
    public static final int[] CR_BOX = {26, 6, 34, 12};
    public static final int[] BOTH_BOX = {6, 24, 20, 34};

    private SyntheticLevels() {
    }

    public static boolean in(int[] box, int x, int y) {
        return x >= box[0] && y >= box[1] && x < box[2] && y < box[3];
    }

    /** The maps at {@code levels} (cm⁻³) with relative noise {@code noise}, wafer id {@code waferId}. */
    public static List<WaferMap> maps(double[] levels, double noise, long seed, String waferId) {
        return maps(levels, noise, seed, waferId, false);
    }

    /** As {@link #maps(double[], double, long, String)}; {@code round}: no data outside a centred disc. */
    public static List<WaferMap> maps(double[] levels, double noise, long seed, String waferId, boolean round) {
        Random rnd = new Random(seed);
        List<WaferMap> out = new ArrayList<>();
        for (double dn : levels) {
            MeasurementConditions c = new MeasurementConditions(DOPING, 180.0, 300.0, dn, null, null, null, null,
                    Map.of());
            Conditions pc = MapConversion.physicsConditions(c, ConversionSettings.DEFAULTS);
            TrapDensityConverter fe = new TrapDensityConverter(pc, DefectLibrary.byId("fe-i"));
            SrhRecombination cr = SrhRecombination.of(DefectLibrary.byId("cr-i"), DOPING, pc.silicon());
            float[] tau = new float[SIZE * SIZE];
            for (int y = 0; y < SIZE; y++) {
                for (int x = 0; x < SIZE; x++) {
                    boolean hasFe = in(FE_BOX, x, y) || in(BOTH_BOX, x, y);
                    boolean hasCr = in(CR_BOX, x, y) || in(BOTH_BOX, x, y);
                    double rate = 1e6 / fe.lifetimeAtInjectionUs(hasFe ? NT_CM3 : 0, dn)
                            + (hasCr ? NT_CM3 * cr.ratePerTrapCm3PerS(dn) : 0);
                    tau[y * SIZE + x] = (float) (1e6 / rate * (1 + noise * rnd.nextGaussian()));
                    double rx = x + 0.5 - SIZE / 2.0;
                    double ry = y + 0.5 - SIZE / 2.0;
                    if (round && rx * rx + ry * ry > SIZE * SIZE / 4.0) {
                        tau[y * SIZE + x] = Float.NaN;
                    }
                }
            }
            out.add(new WaferMap(FloatRaster.wrap(SIZE, SIZE, tau), PixelGrid.centred(SIZE, SIZE, 1.0),
                    Quantity.EFFECTIVE_LIFETIME, waferId, c, Provenance.of("synthetic injection levels")));
        }
        return out;
    }
}
