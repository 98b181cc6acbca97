package trapmap.maps.demo;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import java.util.TreeMap;
import java.util.function.DoubleBinaryOperator;
import trapmap.maps.geometry.WaferFormat;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.material.ConductivityType;
import trapmap.physics.material.Doping;
import trapmap.physics.pl.PlCalibration;

/**
 * An invented supplier batch with planted defects, generated deterministically from a fixed seed: lifetime maps
 * (and one PL image) of multicrystalline p-type wafers with grains, iron-rich crucible edge zones and handling
 * marks, n-type monocrystalline wafers with a ring, a gettering pair, an FeB-dissociation pair and an IC-grade
 * monitor wafer with boat-contact spots.
 *
 * <p>Every map is computed from a planted trap-density map through the same physics the conversion inverts: at a
 * fixed injection Δn, 1/τ_eff = N_t/K(Δn) + 1/τ_intr(Δn) + 1/τ_surf
 * ({@link TrapDensityConverter#lifetimeAtInjectionUs}); at a fixed generation rate G the injection solves
 * Δn = G·τ_eff(Δn). A small multiplicative measurement noise (1.5 %, seeded) is added. Converting a map with the
 * conditions of its sidecar therefore gives back the planted density; {@code truth.json} lists the planted
 * defects with a probe pixel where the planted density holds.
 *
 * <p>This class holds the wafer list and what is planted in each; {@link PlantedField} is the planted density,
 * {@link LifetimeDrawing} draws the maps from it, {@link DemoSetFiles} writes the files.
 *
 * <p>All names (lots, wafers, supplier) are invented. Nothing here is measured data.
 */
public final class DemoScenario {
    /** The seed of the whole set. */
    public static final long SEED = 20_240_611L;
    /** Relative standard deviation of the simulated measurement noise. */
    public static final double NOISE = 0.015;
    /** Name of the truth file. */
    public static final String TRUTH = "truth.json";
    /** Name of the description file. */
    public static final String README = "README.md";

    private static final String SOURCE = "trapmap demo generator (invented data, seed " + SEED + ")";
    private static final double MC_INJECTION = 1e14;
    private static final double FEB_INJECTION = 1e13;

    private DemoScenario() {
    }

    /** The maps of the set, in file order. The same on every call. */
    public static List<DemoFile> build() {
        List<DemoFile> files = new ArrayList<>();
        for (int w = 1; w <= 8; w++) {
            files.add(multiWafer(w));
        }
        files.add(gettering(false));
        files.add(gettering(true));
        files.add(ironPair(false));
        files.add(ironPair(true));
        files.add(plImage());
        int[] ringWafer = {1, 2, 3};
        for (int w : ringWafer) {
            files.add(ringWafer(w));
        }
        files.add(monitor());
        return files;
    }

    /**
     * Writes the set into {@code dir} (created when missing): per map a TIFF with embedded metadata and a JSON
     * sidecar, then {@code truth.json} and {@code README.md}, then the injection stack of {@link InjectionStackDemo}
     * in the subfolder {@value InjectionStackDemo#FOLDER}. Every file is written atomically; files of the same names
     * are replaced. Two runs give byte-identical files.
     *
     * @return the files written, in order
     */
    public static List<Path> write(Path dir) throws IOException {
        List<Path> written = new ArrayList<>(DemoSetFiles.write(dir, build()));
        written.addAll(InjectionStackDemo.write(dir.resolve(InjectionStackDemo.FOLDER)));
        return written;
    }

    /** Reads the planted defects of every file back from a {@code truth.json}. */
    public static Map<String, List<PlantedDefect>> readTruth(Path file) throws IOException {
        return DemoSetFiles.readTruth(file);
    }

    // ---------------------------------------------------------------- wafers

    /** A multicrystalline p-type wafer of lot A01: grains, one or two iron-rich edge zones, maybe a handling mark. */
    private static DemoFile multiWafer(int w) {
        String id = String.format(Locale.ROOT, "LOT-A01-W%02d", w);
        Random rnd = new Random(SEED * 31 + w);
        WaferFormat format = WaferFormat.M2;
        PixelGrid grid = grid(format.sizeMm(), 0.6);
        PlantedField.Grains grains = new PlantedField.Grains(rnd, format.sizeMm() / 2, 45, 2e10, 1e11);
        List<PlantedField.Edge> edges = new ArrayList<>();
        edges.add(new PlantedField.Edge("left", format.sizeMm() / 2, 1.5e12 + 1e11 * w, 4.0));
        if (w % 3 == 0) {
            edges.add(new PlantedField.Edge("bottom", format.sizeMm() / 2, 8e11, 3.0));
        }
        List<PlantedField.Spot> spots = new ArrayList<>();
        boolean mark = w == 2 || w == 4 || w == 5 || w == 7;
        if (mark) {
            spots.add(new PlantedField.Spot("handling-mark", 20, 70, 3.0, 2.5e12));
        }
        PlantedField f = new PlantedField(grains, edges, spots, null, 1);
        MeasurementConditions c = conditions(Doping.fromResistivity(ConductivityType.P, 1.5), 180, 10, MC_INJECTION,
                null, Map.of("material", "multicrystalline, as cut", "supplier", "ingot supplier A (invented)",
                        "lot", "LOT-A01", "resistivity", "p:1.5ohmcm"));
        String what = "mc p-type 1.5 Ω·cm, edge zone " + (edges.size() == 2 ? "left and bottom" : "left")
                + (mark ? ", handling mark near the top edge" : "");
        return LifetimeDrawing.lifetimeFile(id + ".tif", id, format, grid, c, f, "fe-i", rnd, what);
    }

    /** The gettering pair of wafer LOT-A02-W05: Fe_i reduced ×20 except in a dislocated cluster. */
    private static DemoFile gettering(boolean after) {
        String id = "LOT-A02-W05";
        Random grainRnd = new Random(SEED * 37 + 5);
        WaferFormat format = WaferFormat.SQUARE_156_75;
        PixelGrid grid = grid(format.sizeMm(), 0.6);
        PlantedField.Grains grains = new PlantedField.Grains(grainRnd, format.sizeMm() / 2, 40, 2e10, 1e11);
        List<PlantedField.Edge> edges = List.of(new PlantedField.Edge("right", format.sizeMm() / 2, 2e12, 4.0));
        List<PlantedField.Spot> spots = List.of(new PlantedField.Spot("cluster", -25, -20, 6.0, 4e11));
        PlantedField f = new PlantedField(grains, edges, spots, null, after ? 20 : 1);
        MeasurementConditions c = conditions(Doping.fromResistivity(ConductivityType.P, 1.5), 180, 10, MC_INJECTION,
                null, Map.of("history", after ? "after phosphorus gettering" : "before gettering", "lot", "LOT-A02",
                        "material", "multicrystalline", "resistivity", "p:1.5ohmcm"));
        Random noise = new Random(SEED * 41 + (after ? 1 : 0));
        String name = id + (after ? "-after-gettering" : "-before-gettering") + ".tif";
        String what = after ? "after gettering: Fe_i ×1/20 except the dislocated cluster"
                : "before gettering: grains, iron-rich right edge, dislocated cluster";
        return LifetimeDrawing.lifetimeFile(name, id, format, grid, c, f, "fe-i", noise, what);
    }

    /** The FeB-dissociation pair of LOT-A03-W02: one iron map, lifetimes in the FeB and in the Fe_i state. */
    private static DemoFile ironPair(boolean dissociated) {
        String id = "LOT-A03-W02";
        Random grainRnd = new Random(SEED * 43 + 2);
        WaferFormat format = WaferFormat.M2;
        PixelGrid grid = grid(format.sizeMm(), 0.6);
        PlantedField.Grains grains = new PlantedField.Grains(grainRnd, format.sizeMm() / 2, 45, 2e10, 1e11);
        List<PlantedField.Edge> edges = List.of(new PlantedField.Edge("bottom", format.sizeMm() / 2, 2e12, 4.0));
        List<PlantedField.Spot> spots = List.of(new PlantedField.Spot("spot", -30, 20, 4.0, 1.5e12));
        PlantedField f = new PlantedField(grains, edges, spots, null, 1);
        MeasurementConditions c = conditions(Doping.fromResistivity(ConductivityType.P, 1.5), 180, 10, FEB_INJECTION,
                null, Map.of("iron_state", dissociated ? "Fe_i (after FeB dissociation by illumination)"
                        : "FeB (paired, after 24 h in the dark)", "lot", "LOT-A03", "material", "multicrystalline",
                        "resistivity", "p:1.5ohmcm"));
        Random noise = new Random(SEED * 47 + (dissociated ? 1 : 0));
        String name = id + (dissociated ? "-fe-i-state" : "-feb-state") + ".tif";
        String what = dissociated ? "FeB pair, after dissociation (Fe_i state), same iron map"
                : "FeB pair, before dissociation (FeB state)";
        return LifetimeDrawing.lifetimeFile(name, id, format, grid, c, f, dissociated ? "fe-i" : "fe-b", noise, what);
    }

    /** A calibrated PL image of LOT-A04-W01 at a fixed generation rate. */
    private static DemoFile plImage() {
        String id = "LOT-A04-W01";
        Random rnd = new Random(SEED * 53 + 1);
        WaferFormat format = WaferFormat.M2;
        PixelGrid grid = grid(format.sizeMm(), 0.6);
        PlantedField.Grains grains = new PlantedField.Grains(rnd, format.sizeMm() / 2, 45, 2e10, 1e11);
        List<PlantedField.Edge> edges = List.of(new PlantedField.Edge("left", format.sizeMm() / 2, 1.8e12, 4.0));
        List<PlantedField.Spot> spots = List.of(new PlantedField.Spot("handling-mark", 20, 70, 3.0, 2.5e12));
        PlantedField f = new PlantedField(grains, edges, spots, null, 1);
        Doping doping = Doping.fromResistivity(ConductivityType.P, 1.5);
        double g = 2e19;
        double a = 2e-28;
        MeasurementConditions c = conditions(doping, 180, 10, null, g, Map.of("lot", "LOT-A04",
                "material", "multicrystalline", "camera", "InGaAs line camera (invented)", "resistivity", "p:1.5ohmcm"))
                .withPlCalibration(a);
        TrapDensityConverter forward = LifetimeDrawing.forward(c, "fe-i");
        PlCalibration cal = new PlCalibration(a, doping.densityPerCm3());
        float[] counts = LifetimeDrawing.plCounts(grid, format.shape(), f, forward, cal, g, rnd);
        List<PlantedDefect> defects = LifetimeDrawing.truth(f, grid, forward, "fe-i", g);
        WaferMap map = new WaferMap(FloatRaster.wrap(grid.width(), grid.height(), counts), grid, Quantity.PL_COUNTS,
                id, c, provenance("fe-i", id));
        return new DemoFile(id + "-pl.tif", map, "PL image (counts) at G = 2e19 cm⁻³ s⁻¹ with calibration constant",
                defects);
    }

    /** An n-type monocrystalline wafer of lot N01 with a concentric low-lifetime ring. */
    private static DemoFile ringWafer(int w) {
        String id = String.format(Locale.ROOT, "LOT-N01-W%02d", w);
        Random rnd = new Random(SEED * 59 + w);
        WaferFormat format = w == 3 ? WaferFormat.G12 : WaferFormat.M10;
        PixelGrid grid = grid(format.sizeMm(), w == 3 ? 0.85 : 0.75);
        double ringRadius = new double[] {55, 62, 80}[w - 1];
        DoubleBinaryOperator bg = (x, y) -> 1e11 * (1 + 0.3 * (x * x + y * y) / 1e4);
        PlantedField.Ring ring = new PlantedField.Ring(ringRadius, 4.0, 2e12);
        PlantedField f = new PlantedField(bg, List.of(), List.of(), ring, 1);
        MeasurementConditions c = conditions(Doping.fromResistivity(ConductivityType.N, 2), 150, 2, 1e15, null,
                Map.of("material", "Czochralski monocrystalline, n-type", "lot", "LOT-N01", "resistivity",
                        "n:2ohmcm"));
        String what = "mono n-type 2 Ω·cm (" + format.id() + "), ring at r = " + (int) ringRadius + " mm";
        return LifetimeDrawing.lifetimeFile(id + ".tif", id, format, grid, c, f, "midgap", rnd, what);
    }

    /** A 200 mm IC-grade monitor wafer with three boat-contact spots near the edge. */
    private static DemoFile monitor() {
        String id = "MON-200-W01";
        Random rnd = new Random(SEED * 61);
        WaferFormat format = WaferFormat.ROUND_200_NOTCH;
        PixelGrid grid = grid(format.sizeMm(), 0.8);
        DoubleBinaryOperator bg = (x, y) -> 4.5e10 * (1 + 0.8 * (x * x + y * y) / 1e4) * (1 + 0.1 * x / 100);
        List<PlantedField.Spot> spots = new ArrayList<>();
        double r = 90;
        for (int clock : new int[] {12, 4, 8}) {
            double angle = StrictMath.toRadians(30.0 * (clock % 12));
            spots.add(new PlantedField.Spot("boat-contact", round(r * StrictMath.sin(angle)),
                    round(r * StrictMath.cos(angle)), 2.5, 5e11));
        }
        PlantedField f = new PlantedField(bg, List.of(), spots, null, 1);
        MeasurementConditions c = conditions(Doping.fromResistivity(ConductivityType.P, 10), 725, 1, 1e14, null,
                Map.of("material", "IC-grade Czochralski, p-type", "history", "after furnace oxidation, oxide"
                        + " stripped, surfaces re-passivated", "boat", "quartz boat, three-point contact", "resistivity",
                        "p:10ohmcm"));
        return LifetimeDrawing.lifetimeFile(id + ".tif", id, format, grid, c, f, "fe-i", rnd,
                "200 mm monitor p-type 10 Ω·cm, boat-contact spots at 12, 4 and 8 o'clock");
    }

    // ---------------------------------------------------------------- grids, conditions, provenance

    static PixelGrid grid(double sizeMm, double pitchMm) {
        int n = (int) StrictMath.ceil(sizeMm / pitchMm) + 6;
        return PixelGrid.centred(n, n, pitchMm);
    }

    private static double round(double v) {
        return StrictMath.rint(v * 10) / 10;
    }

    static MeasurementConditions conditions(Doping doping, double thicknessUm, double srv, Double injection,
                                                    Double generation, Map<String, String> extra) {
        Map<String, String> facts = new TreeMap<>(extra);
        facts.put("data", "invented demonstration data, not a measurement");
        return new MeasurementConditions(doping, thicknessUm, 300.0, injection, generation, srv, null, null, facts);
    }

    static Provenance provenance(String defect, String id) {
        return Provenance.of(SOURCE).then(ProcessingStep.of("demo-generate", "wafer", id, "defect", defect,
                "noise", Double.toString(NOISE)));
    }
}
