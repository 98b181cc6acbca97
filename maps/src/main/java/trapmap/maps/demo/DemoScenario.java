package trapmap.maps.demo;

import com.fasterxml.jackson.core.util.DefaultIndenter;
import com.fasterxml.jackson.core.util.DefaultPrettyPrinter;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.attribute.PosixFilePermissions;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import java.util.TreeMap;
import java.util.function.DoubleBinaryOperator;
import trapmap.maps.geometry.WaferFormat;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.Sidecar;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.DefectLibrary;
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
    private static final ObjectMapper JSON = new ObjectMapper();
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
     * sidecar, then {@code truth.json} and {@code README.md}. Every file is written atomically; files of the same
     * names are replaced. Two runs give byte-identical files.
     *
     * @return the files written, in order
     */
    public static List<Path> write(Path dir) throws IOException {
        Files.createDirectories(dir);
        List<DemoFile> files = build();
        List<Path> written = new ArrayList<>();
        for (DemoFile f : files) {
            Path tif = dir.resolve(f.file());
            MapFiles.write(f.map(), tif);
            written.add(tif);
            Path json = dir.resolve(f.stem() + ".json");
            writeText(json, pretty(JSON.readTree(Sidecar.toJson(f.map()))));
            written.add(json);
        }
        Path truth = dir.resolve(TRUTH);
        writeText(truth, truthJson(files));
        written.add(truth);
        Path readme = dir.resolve(README);
        writeText(readme, readme(files));
        written.add(readme);
        return written;
    }

    // ---------------------------------------------------------------- wafers

    /** A multicrystalline p-type wafer of lot A01: grains, one or two iron-rich edge zones, maybe a handling mark. */
    private static DemoFile multiWafer(int w) {
        String id = String.format(Locale.ROOT, "LOT-A01-W%02d", w);
        Random rnd = new Random(SEED * 31 + w);
        WaferFormat format = WaferFormat.M2;
        PixelGrid grid = grid(format.sizeMm(), 0.6);
        Grains grains = new Grains(rnd, format.sizeMm() / 2, 45, 2e10, 1e11);
        List<Edge> edges = new ArrayList<>();
        edges.add(new Edge("left", format.sizeMm() / 2, 1.5e12 + 1e11 * w, 4.0));
        if (w % 3 == 0) {
            edges.add(new Edge("bottom", format.sizeMm() / 2, 8e11, 3.0));
        }
        List<Spot> spots = new ArrayList<>();
        boolean mark = w == 2 || w == 4 || w == 5 || w == 7;
        if (mark) {
            spots.add(new Spot("handling-mark", 20, 70, 3.0, 2.5e12));
        }
        Field f = new Field(grains, edges, spots, null, 1);
        MeasurementConditions c = conditions(Doping.fromResistivity(ConductivityType.P, 1.5), 180, 10, MC_INJECTION,
                null, Map.of("material", "multicrystalline, as cut", "supplier", "Northwind Ingot (invented)",
                        "lot", "LOT-A01", "resistivity", "p:1.5ohmcm"));
        String what = "mc p-type 1.5 Ω·cm, edge zone " + (edges.size() == 2 ? "left and bottom" : "left")
                + (mark ? ", handling mark near the top edge" : "");
        return lifetimeFile(id + ".tif", id, format, grid, c, f, "fe-i", rnd, what);
    }

    /** The gettering pair of wafer LOT-A02-W05: Fe_i reduced ×20 except in a dislocated cluster. */
    private static DemoFile gettering(boolean after) {
        String id = "LOT-A02-W05";
        Random grainRnd = new Random(SEED * 37 + 5);
        WaferFormat format = WaferFormat.SQUARE_156_75;
        PixelGrid grid = grid(format.sizeMm(), 0.6);
        Grains grains = new Grains(grainRnd, format.sizeMm() / 2, 40, 2e10, 1e11);
        List<Edge> edges = List.of(new Edge("right", format.sizeMm() / 2, 2e12, 4.0));
        List<Spot> spots = List.of(new Spot("cluster", -25, -20, 6.0, 4e11));
        Field f = new Field(grains, edges, spots, null, after ? 20 : 1);
        MeasurementConditions c = conditions(Doping.fromResistivity(ConductivityType.P, 1.5), 180, 10, MC_INJECTION,
                null, Map.of("history", after ? "after phosphorus gettering" : "before gettering", "lot", "LOT-A02",
                        "material", "multicrystalline", "resistivity", "p:1.5ohmcm"));
        Random noise = new Random(SEED * 41 + (after ? 1 : 0));
        String name = id + (after ? "-after-gettering" : "-before-gettering") + ".tif";
        String what = after ? "after gettering: Fe_i ×1/20 except the dislocated cluster"
                : "before gettering: grains, iron-rich right edge, dislocated cluster";
        return lifetimeFile(name, id, format, grid, c, f, "fe-i", noise, what);
    }

    /** The FeB-dissociation pair of LOT-A03-W02: one iron map, lifetimes in the FeB and in the Fe_i state. */
    private static DemoFile ironPair(boolean dissociated) {
        String id = "LOT-A03-W02";
        Random grainRnd = new Random(SEED * 43 + 2);
        WaferFormat format = WaferFormat.M2;
        PixelGrid grid = grid(format.sizeMm(), 0.6);
        Grains grains = new Grains(grainRnd, format.sizeMm() / 2, 45, 2e10, 1e11);
        List<Edge> edges = List.of(new Edge("bottom", format.sizeMm() / 2, 2e12, 4.0));
        List<Spot> spots = List.of(new Spot("spot", -30, 20, 4.0, 1.5e12));
        Field f = new Field(grains, edges, spots, null, 1);
        MeasurementConditions c = conditions(Doping.fromResistivity(ConductivityType.P, 1.5), 180, 10, FEB_INJECTION,
                null, Map.of("iron_state", dissociated ? "Fe_i (after FeB dissociation by illumination)"
                        : "FeB (paired, after 24 h in the dark)", "lot", "LOT-A03", "material", "multicrystalline",
                        "resistivity", "p:1.5ohmcm"));
        Random noise = new Random(SEED * 47 + (dissociated ? 1 : 0));
        String name = id + (dissociated ? "-fe-i-state" : "-feb-state") + ".tif";
        String what = dissociated ? "FeB pair, after dissociation (Fe_i state), same iron map"
                : "FeB pair, before dissociation (FeB state)";
        return lifetimeFile(name, id, format, grid, c, f, dissociated ? "fe-i" : "fe-b", noise, what);
    }

    /** A calibrated PL image of LOT-A04-W01 at a fixed generation rate. */
    private static DemoFile plImage() {
        String id = "LOT-A04-W01";
        Random rnd = new Random(SEED * 53 + 1);
        WaferFormat format = WaferFormat.M2;
        PixelGrid grid = grid(format.sizeMm(), 0.6);
        Grains grains = new Grains(rnd, format.sizeMm() / 2, 45, 2e10, 1e11);
        List<Edge> edges = List.of(new Edge("left", format.sizeMm() / 2, 1.8e12, 4.0));
        List<Spot> spots = List.of(new Spot("handling-mark", 20, 70, 3.0, 2.5e12));
        Field f = new Field(grains, edges, spots, null, 1);
        Doping doping = Doping.fromResistivity(ConductivityType.P, 1.5);
        double g = 2e19;
        double a = 2e-28;
        MeasurementConditions c = conditions(doping, 180, 10, null, g, Map.of("lot", "LOT-A04",
                "material", "multicrystalline", "camera", "InGaAs line camera (invented)", "resistivity", "p:1.5ohmcm"))
                .withPlCalibration(a);
        TrapDensityConverter forward = forward(c, "fe-i");
        PlCalibration cal = new PlCalibration(a, doping.densityPerCm3());
        WaferShape shape = format.shape();
        float[] counts = new float[grid.width() * grid.height()];
        for (int y = 0; y < grid.height(); y++) {
            for (int x = 0; x < grid.width(); x++) {
                double xm = grid.xMm(x);
                double ym = grid.yMm(y);
                int i = y * grid.width() + x;
                if (!shape.contains(xm, ym)) {
                    counts[i] = Float.NaN;
                    continue;
                }
                double dn = steadyStateInjection(forward, f.total(xm, ym), g);
                counts[i] = (float) (cal.counts(dn) * noise(rnd));
            }
        }
        List<PlantedDefect> defects = truth(f, grid, forward, "fe-i", g);
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
        Ring ring = new Ring(ringRadius, 4.0, 2e12);
        Field f = new Field(bg, List.of(), List.of(), ring, 1);
        MeasurementConditions c = conditions(Doping.fromResistivity(ConductivityType.N, 2), 150, 2, 1e15, null,
                Map.of("material", "Czochralski monocrystalline, n-type", "lot", "LOT-N01", "resistivity",
                        "n:2ohmcm"));
        String what = "mono n-type 2 Ω·cm (" + format.id() + "), ring at r = " + (int) ringRadius + " mm";
        return lifetimeFile(id + ".tif", id, format, grid, c, f, "midgap", rnd, what);
    }

    /** A 200 mm IC-grade monitor wafer with three boat-contact spots near the edge. */
    private static DemoFile monitor() {
        String id = "MON-200-W01";
        Random rnd = new Random(SEED * 61);
        WaferFormat format = WaferFormat.ROUND_200_NOTCH;
        PixelGrid grid = grid(format.sizeMm(), 0.8);
        DoubleBinaryOperator bg = (x, y) -> 4.5e10 * (1 + 0.8 * (x * x + y * y) / 1e4) * (1 + 0.1 * x / 100);
        List<Spot> spots = new ArrayList<>();
        double r = 90;
        for (int clock : new int[] {12, 4, 8}) {
            double angle = StrictMath.toRadians(30.0 * (clock % 12));
            spots.add(new Spot("boat-contact", round(r * StrictMath.sin(angle)), round(r * StrictMath.cos(angle)),
                    2.5, 5e11));
        }
        Field f = new Field(bg, List.of(), spots, null, 1);
        MeasurementConditions c = conditions(Doping.fromResistivity(ConductivityType.P, 10), 725, 1, 1e14, null,
                Map.of("material", "IC-grade Czochralski, p-type", "history", "after furnace oxidation, oxide"
                        + " stripped, surfaces re-passivated", "boat", "quartz boat, three-point contact", "resistivity",
                        "p:10ohmcm"));
        return lifetimeFile(id + ".tif", id, format, grid, c, f, "fe-i", rnd,
                "200 mm monitor p-type 10 Ω·cm, boat-contact spots at 12, 4 and 8 o'clock");
    }

    // ---------------------------------------------------------------- physics

    private static DemoFile lifetimeFile(String name, String id, WaferFormat format, PixelGrid grid,
                                         MeasurementConditions c, Field f, String defect, Random rnd, String what) {
        TrapDensityConverter forward = forward(c, defect);
        double dn = c.injectionPerCm3();
        WaferShape shape = format.shape();
        float[] tau = new float[grid.width() * grid.height()];
        for (int y = 0; y < grid.height(); y++) {
            for (int x = 0; x < grid.width(); x++) {
                double xm = grid.xMm(x);
                double ym = grid.yMm(y);
                int i = y * grid.width() + x;
                tau[i] = shape.contains(xm, ym)
                        ? (float) (forward.lifetimeAtInjectionUs(f.total(xm, ym), dn) * noise(rnd)) : Float.NaN;
            }
        }
        WaferMap map = new WaferMap(FloatRaster.wrap(grid.width(), grid.height(), tau), grid,
                Quantity.EFFECTIVE_LIFETIME, id, c, provenance(defect, id));
        return new DemoFile(name, map, what, truth(f, grid, forward, defect, Double.NaN));
    }

    /** The converter whose exact inverse generates the lifetimes: same conditions as the conversion reads. */
    private static TrapDensityConverter forward(MeasurementConditions c, String defect) {
        MeasurementConditions fixed = c.injectionPerCm3() != null ? c : c.withGeneration(null).withInjection(1e14);
        Conditions pc = MapConversion.physicsConditions(fixed, ConversionSettings.DEFAULTS);
        return new TrapDensityConverter(pc.withInjection(Injection.fixed(fixed.injectionPerCm3())),
                DefectLibrary.byId(defect));
    }

    /** Δn with Δn = G·τ_eff(Δn), by bisection on a log scale (τ_eff falls or stays as Δn rises here). */
    static double steadyStateInjection(TrapDensityConverter forward, double nt, double g) {
        double lo = StrictMath.log(1e6);
        double hi = StrictMath.log(1e19);
        for (int k = 0; k < 200 && hi - lo > 1e-13; k++) {
            double mid = 0.5 * (lo + hi);
            double dn = StrictMath.exp(mid);
            double tauS = forward.lifetimeAtInjectionUs(nt, dn) * 1e-6;
            if (dn < g * tauS) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        return StrictMath.exp(0.5 * (lo + hi));
    }

    private static double noise(Random rnd) {
        return 1 + NOISE * StrictMath.max(-3, StrictMath.min(3, rnd.nextGaussian()));
    }

    // ---------------------------------------------------------------- truth

    private static List<PlantedDefect> truth(Field f, PixelGrid grid, TrapDensityConverter forward, String defect,
                                             double generation) {
        List<PlantedDefect> out = new ArrayList<>();
        for (Edge e : f.edges) {
            double[] centre = e.centre();
            double[] probe = snap(grid, e.probe(2.0));
            out.add(planted(f, forward, defect, generation, "edge-zone", centre[0], centre[1], Double.NaN,
                    e.decayMm, e.side, probe, f.total(probe[0], probe[1]) - e.density(probe[0], probe[1]) / f.divisor));
        }
        if (f.ring != null) {
            double[] probe = snap(grid, new double[] {f.ring.radiusMm, 0});
            out.add(planted(f, forward, defect, generation, "ring", 0, 0, f.ring.radiusMm, f.ring.widthMm, null,
                    probe, f.base(probe[0], probe[1]) / f.divisor));
        }
        for (Spot s : f.spots) {
            double[] probe = snap(grid, new double[] {s.xMm, s.yMm});
            out.add(planted(f, forward, defect, generation, s.kind, s.xMm, s.yMm, s.radiusMm, Double.NaN, null, probe,
                    f.base(probe[0], probe[1]) / f.divisor));
        }
        return out;
    }

    private static PlantedDefect planted(Field f, TrapDensityConverter forward, String defect, double generation,
                                         String kind, double cx, double cy, double radius, double width, String side,
                                         double[] probe, double background) {
        double nt = f.total(probe[0], probe[1]);
        double tau = Double.isNaN(generation)
                ? forward.lifetimeAtInjectionUs(nt, forward.conditions().injection() instanceof Injection.Fixed fx
                        ? fx.excessPerCm3() : Double.NaN)
                : steadyStateInjection(forward, nt, generation) / generation * 1e6;
        return new PlantedDefect(kind, defect, cx, cy, radius, width, side, probe[0], probe[1], nt, background, tau);
    }

    /** The pixel centre nearest to a point, in mm. */
    private static double[] snap(PixelGrid grid, double[] p) {
        double x = StrictMath.rint(grid.xPx(p[0]));
        double y = StrictMath.rint(grid.yPx(p[1]));
        return new double[] {grid.xMm(x), grid.yMm(y)};
    }

    // ---------------------------------------------------------------- density fields

    /** Grain structure: Voronoi cells with log-uniform background density, grain boundaries ×2.5. */
    private static final class Grains implements DoubleBinaryOperator {
        private final double[] sx;
        private final double[] sy;
        private final double[] level;

        Grains(Random rnd, double half, int n, double min, double max) {
            sx = new double[n];
            sy = new double[n];
            level = new double[n];
            for (int i = 0; i < n; i++) {
                sx[i] = (rnd.nextDouble() * 2 - 1) * half;
                sy[i] = (rnd.nextDouble() * 2 - 1) * half;
                level[i] = min * StrictMath.pow(max / min, rnd.nextDouble());
            }
        }

        @Override
        public double applyAsDouble(double x, double y) {
            double d1 = Double.POSITIVE_INFINITY;
            double d2 = Double.POSITIVE_INFINITY;
            int best = 0;
            for (int i = 0; i < sx.length; i++) {
                double d = StrictMath.hypot(x - sx[i], y - sy[i]);
                if (d < d1) {
                    d2 = d1;
                    d1 = d;
                    best = i;
                } else if (d < d2) {
                    d2 = d;
                }
            }
            // (d2 − d1)/2 is close to the distance to the boundary between the two nearest grains.
            return level[best] * ((d2 - d1) / 2 < 0.4 ? 2.5 : 1);
        }
    }

    /** Iron diffused in from one side of the wafer: density·exp(−d/λ), d the distance from that side. */
    private record Edge(String side, double half, double densityAtEdge, double decayMm) {
        double distance(double x, double y) {
            return switch (side) {
                case "left" -> x + half;
                case "right" -> half - x;
                case "bottom" -> y + half;
                default -> half - y;
            };
        }

        double density(double x, double y) {
            return densityAtEdge * StrictMath.exp(-StrictMath.max(0, distance(x, y)) / decayMm);
        }

        double[] centre() {
            return switch (side) {
                case "left" -> new double[] {-half, 0};
                case "right" -> new double[] {half, 0};
                case "bottom" -> new double[] {0, -half};
                default -> new double[] {0, half};
            };
        }

        double[] probe(double inset) {
            double[] c = centre();
            return new double[] {c[0] - StrictMath.signum(c[0]) * inset, c[1] - StrictMath.signum(c[1]) * inset};
        }
    }

    /** A flat-topped disc of density {@code level} with an edge one pixel wide. */
    private record Spot(String kind, double xMm, double yMm, double radiusMm, double level) {
        double weight(double x, double y) {
            double r = StrictMath.hypot(x - xMm, y - yMm);
            double h = 0.3;
            return StrictMath.max(0, StrictMath.min(1, (radiusMm + h - r) / (2 * h)));
        }
    }

    /** A concentric ring: Gaussian in radius around {@code radiusMm}, added to the background. */
    private record Ring(double radiusMm, double widthMm, double peak) {
        double density(double x, double y) {
            double u = (StrictMath.hypot(x, y) - radiusMm) / widthMm;
            return peak * StrictMath.exp(-0.5 * u * u);
        }
    }

    /**
     * A planted density map: background + edge zones + ring, divided by {@code divisor} (gettering) except inside
     * spots, which blend to their own level.
     */
    private record Field(DoubleBinaryOperator background, List<Edge> edges, List<Spot> spots, Ring ring,
                         double divisor) {
        double base(double x, double y) {
            double n = background.applyAsDouble(x, y);
            for (Edge e : edges) {
                n += e.density(x, y);
            }
            if (ring != null) {
                n += ring.density(x, y);
            }
            return n;
        }

        double total(double x, double y) {
            double n = base(x, y) / divisor;
            for (Spot s : spots) {
                double w = s.weight(x, y);
                n = n * (1 - w) + s.level * w;
            }
            return n;
        }
    }

    // ---------------------------------------------------------------- files

    private static PixelGrid grid(double sizeMm, double pitchMm) {
        int n = (int) StrictMath.ceil(sizeMm / pitchMm) + 6;
        return PixelGrid.centred(n, n, pitchMm);
    }

    private static double round(double v) {
        return StrictMath.rint(v * 10) / 10;
    }

    private static MeasurementConditions conditions(Doping doping, double thicknessUm, double srv, Double injection,
                                                    Double generation, Map<String, String> extra) {
        Map<String, String> facts = new TreeMap<>(extra);
        facts.put("data", "invented demonstration data, not a measurement");
        return new MeasurementConditions(doping, thicknessUm, 300.0, injection, generation, srv, null, null, facts);
    }

    private static Provenance provenance(String defect, String id) {
        return Provenance.of(SOURCE).then(ProcessingStep.of("demo-generate", "wafer", id, "defect", defect,
                "noise", Double.toString(NOISE)));
    }

    private static String truthJson(List<DemoFile> files) throws IOException {
        ObjectNode root = JSON.createObjectNode();
        root.put("description", "defects planted in the trapmap demonstration set (invented data)");
        root.put("tolerance", PlantedDefect.TOLERANCE);
        root.put("seed", SEED);
        ArrayNode list = root.putArray("files");
        for (DemoFile f : files) {
            ObjectNode o = list.addObject();
            o.put("file", f.file());
            o.put("wafer_id", f.map().waferId());
            o.put("quantity", f.map().quantity().key());
            ArrayNode ds = o.putArray("defects");
            for (PlantedDefect d : f.defects()) {
                ObjectNode n = ds.addObject();
                n.put("kind", d.kind());
                n.put("defect", d.defect());
                n.put("centre_x_mm", d.centreXMm());
                n.put("centre_y_mm", d.centreYMm());
                if (!Double.isNaN(d.radiusMm())) {
                    n.put("radius_mm", d.radiusMm());
                }
                if (d.kind().equals("ring")) {
                    n.put("width_mm", d.widthMm());
                }
                if (d.side() != null) {
                    n.put("side", d.side());
                    n.put("decay_length_mm", d.widthMm());
                }
                n.put("probe_x_mm", digits(d.probeXMm(), 9));
                n.put("probe_y_mm", digits(d.probeYMm(), 9));
                n.put("density_cm3", digits(d.densityPerCm3(), 6));
                n.put("background_cm3", digits(d.backgroundPerCm3(), 6));
                n.put("lifetime_us", digits(d.lifetimeUs(), 6));
                n.put("tolerance", PlantedDefect.TOLERANCE);
            }
        }
        return pretty(root);
    }

    /** {@code v} rounded to {@code n} significant digits, so that the truth file reads plainly. */
    private static double digits(double v, int n) {
        return v == 0 || !Double.isFinite(v) ? v
                : new BigDecimal(v).round(new MathContext(n, RoundingMode.HALF_EVEN)).doubleValue();
    }

    /** Reads the planted defects of every file back from a {@code truth.json}. */
    public static Map<String, List<PlantedDefect>> readTruth(Path file) throws IOException {
        JsonNode root = JSON.readTree(Files.readString(file, StandardCharsets.UTF_8));
        Map<String, List<PlantedDefect>> out = new TreeMap<>();
        for (JsonNode f : root.get("files")) {
            List<PlantedDefect> ds = new ArrayList<>();
            for (JsonNode d : f.get("defects")) {
                String kind = d.get("kind").asText();
                double width = d.has("width_mm") ? d.get("width_mm").asDouble()
                        : d.has("decay_length_mm") ? d.get("decay_length_mm").asDouble() : Double.NaN;
                ds.add(new PlantedDefect(kind, d.get("defect").asText(), d.get("centre_x_mm").asDouble(),
                        d.get("centre_y_mm").asDouble(), d.has("radius_mm") ? d.get("radius_mm").asDouble()
                        : Double.NaN, width, d.has("side") ? d.get("side").asText() : null,
                        d.get("probe_x_mm").asDouble(), d.get("probe_y_mm").asDouble(),
                        d.get("density_cm3").asDouble(), d.get("background_cm3").asDouble(),
                        d.get("lifetime_us").asDouble()));
            }
            out.put(f.get("file").asText(), ds);
        }
        return out;
    }

    private static String pretty(JsonNode node) throws IOException {
        DefaultPrettyPrinter p = new DefaultPrettyPrinter();
        DefaultIndenter indent = new DefaultIndenter("  ", "\n");
        p.indentObjectsWith(indent);
        p.indentArraysWith(indent);
        return JSON.writer(p).writeValueAsString(node) + "\n";
    }

    private static void writeText(Path target, String text) throws IOException {
        Path abs = target.toAbsolutePath();
        Path tmp = Files.createTempFile(abs.getParent(), "." + abs.getFileName() + ".", ".tmp");
        try {
            Files.writeString(tmp, text, StandardCharsets.UTF_8);
            if (Files.getFileStore(tmp).supportsFileAttributeView("posix")) {
                Files.setPosixFilePermissions(tmp, PosixFilePermissions.fromString("rw-r--r--"));
            }
            try {
                Files.move(tmp, abs, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
            } catch (AtomicMoveNotSupportedException e) {
                Files.move(tmp, abs, StandardCopyOption.REPLACE_EXISTING);
            }
        } finally {
            Files.deleteIfExists(tmp);
        }
    }

    private static String readme(List<DemoFile> files) {
        StringBuilder sb = new StringBuilder();
        sb.append("# Demonstration data\n\n");
        sb.append("An invented supplier batch generated by `trapmap demo --out DIR` (seed ").append(SEED)
                .append("). Every lot, wafer and\nsupplier name is made up and **nothing here is measured data**."
                        + " Regenerate with `./trapmap demo --out demo-data --force`;\nthe output is"
                        + " byte-identical on every run.\n\n");
        sb.append("## How the maps were made\n\n");
        sb.append("Each map starts from a planted trap-density map (grains, edge zones, marks, rings, spots)."
                + " The effective lifetime\nof every pixel follows from it with the same physics `trapmap convert`"
                + " inverts: at the map's injection level Δn,\n\n"
                + "    1/τ_eff = N_t/K(Δn) + 1/τ_intr(Δn) + 1/τ_surf\n\n"
                + "(SRH of the named defect, Richter 2012 intrinsic recombination, Sproul surface term with the"
                + " sidecar's thickness\nand SRV). The PL image solves Δn = G·τ_eff(Δn) at its generation rate and"
                + " stores I = A·Δn·(Δn + N_dop). A\n1.5 % multiplicative noise is added. Converting a map with the"
                + " conditions of its sidecar gives back the planted\ndensity, for example\n\n"
                + "    ./trapmap convert demo-data/LOT-A01-W02.tif --defect fe-i -o w02-fe.tif\n"
                + "    ./trapmap stats w02-fe.tif --threshold 1e12\n"
                + "    ./trapmap compare demo-data/LOT-A02-W05-before-gettering.tif"
                + " demo-data/LOT-A02-W05-after-gettering.tif --defect fe-i --quantity reduction -o g.tif\n\n");
        sb.append("Each `NAME.tif` (32-bit float, metadata embedded) has a `NAME.json` sidecar with the same"
                + " conditions\n(schema: [maps/SIDECAR.md](../maps/SIDECAR.md)).\n\n");
        sb.append("## Files\n\n| file | wafer | defect used | content |\n|---|---|---|---|\n");
        for (DemoFile f : files) {
            String defect = f.defects().isEmpty() ? "" : f.defects().get(0).defect();
            sb.append("| `").append(f.file()).append("` | ").append(f.map().waferId()).append(" | ").append(defect)
                    .append(" | ").append(f.description()).append(" |\n");
        }
        sb.append("\n## truth.json\n\n");
        sb.append("```\n{ \"tolerance\": \"").append(PlantedDefect.TOLERANCE).append("\", \"seed\": ..., \"files\": [\n"
                + "  { \"file\": \"LOT-A01-W02.tif\", \"wafer_id\": \"LOT-A01-W02\", \"quantity\": \"effective-lifetime\",\n"
                + "    \"defects\": [ { \"kind\": \"handling-mark\", \"defect\": \"fe-i\", \"centre_x_mm\": 20.0,"
                + " \"centre_y_mm\": 70.0,\n"
                + "                   \"radius_mm\": 3.0, \"probe_x_mm\": .., \"probe_y_mm\": .., \"density_cm3\": ..,\n"
                + "                   \"background_cm3\": .., \"lifetime_us\": .., \"tolerance\": \"...\" } ] } ] }\n```\n\n");
        sb.append("| field | meaning |\n|---|---|\n"
                + "| `kind` | `edge-zone` (iron from the crucible wall), `handling-mark`, `ring`, `boat-contact`,"
                + " `cluster` (dislocated, not gettered), `spot` |\n"
                + "| `defect` | library id the lifetimes were computed with (`fe-i`, `fe-b` for the paired state,"
                + " `midgap`) |\n"
                + "| `centre_x_mm`, `centre_y_mm` | centre of the feature in wafer coordinates (mm from the wafer"
                + " centre, x right, y up); for an edge zone the middle of its side, for a ring the ring centre |\n"
                + "| `radius_mm` | radius of a spot, mark or cluster (flat top), or of the ring's centre line |\n"
                + "| `width_mm` | ring: Gaussian σ of the ring across its radius |\n"
                + "| `side`, `decay_length_mm` | edge zone: side it starts from, and λ of N = N_edge·exp(−d/λ) |\n"
                + "| `probe_x_mm`, `probe_y_mm` | the pixel centre where `density_cm3` holds (spot centre, 2 mm"
                + " inside an edge, on the ring) |\n"
                + "| `density_cm3` | planted trap density at the probe, cm⁻³ |\n"
                + "| `background_cm3` | the density the probe would have without this defect, cm⁻³ |\n"
                + "| `lifetime_us` | noiseless effective lifetime at the probe, µs |\n"
                + "| `tolerance` | what a conversion must reach: density within a factor 1.5, positions within 2 mm |\n\n");
        sb.append("The FeB pair (`LOT-A03-W02-feb-state.tif`, `LOT-A03-W02-fe-i-state.tif`) shares one iron map: "
                + "`trapmap calc iron`\nwith the two lifetimes of a pixel at Δn = 1e13 cm⁻³ gives the planted [Fe]."
                + " The PL image converts to lifetime with\nits own `pl_calibration_counts_cm6`,"
                + " `generation_cm3_s` and `doping`.\n");
        return sb.toString();
    }
}
