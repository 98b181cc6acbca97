package trapmap.maps.demo;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import trapmap.maps.geometry.WaferFormat;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.io.AtomicFiles;
import trapmap.maps.io.InputFiles;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.Sidecar;
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

/**
 * The injection stack of the demonstration set: effective-lifetime maps of one invented p-type Czochralski wafer
 * ({@value #WAFER_ID}) measured at three injection levels Δn = 1e13, 1e14 and 1e15 cm^-3, one file per level with
 * its sidecar ({@code injection_cm3}), and a {@code truth.json} of what was planted. It is the input of defect
 * identification from the injection dependence of τ_SRH (lifetime spectroscopy, Rein, Lifetime Spectroscopy,
 * Springer (2005), ch. 5).
 *
 * <p>The wafer: boron-doped p-type, N_A = 1e15 cm^-3 (about 13 Ω·cm), 180 µm thick, both surfaces well passivated
 * (SRV 2 cm/s). The background has no SRH defect planted: its lifetime is limited by surface recombination
 * (Sproul, JAP 76, 2851 (1994): about 4.5 ms) and intrinsic recombination (Richter et al., PRB 86, 165202 (2012)).
 * Three flat-topped discs with sharp edges carry the defects: interstitial iron alone, interstitial chromium
 * alone, and both together (the overlap, where no single library defect explains the curve). The densities are
 * chosen so that SRH carries most of 1/τ_eff at every level (at least about 70 %) while each defect's N_t stays at
 * or below 0.05·Δn of the lowest level (0.08·Δn both together), inside the small-trap-density SRH model
 * (Macdonald &amp; Cuevas, PRB 67, 075203 (2003)). The p-type doping of 1e15 cm^-3 lets the levels span
 * Δn/p0 = 0.01 … 1, where Fe_i's τ_SRH rises about thirty-fold and Cr_i's falls (its level near E_c,
 * k = σ_n/σ_p = 5), so the shapes differ plainly.
 *
 * <p>Per pixel and level, 1/τ_eff = Σ_j N_j/K_j(Δn) + 1/τ_intr(Δn) + 1/τ_surf (the forward model the conversion
 * inverts, {@link TrapDensityConverter#lifetimeAtInjectionUs}), times an independent 3 % Gaussian measurement noise
 * (cut at ±3σ, seeded per level). The three maps lie on one pixel grid (no shift between levels).
 *
 * <p>Besides the maps and {@code truth.json}, the folder holds example rules ({@value #RULES}) that judge the wafer
 * by its stack. All names are invented. Nothing here is measured data.
 */
public final class InjectionStackDemo {
    /** The subfolder of the demonstration set that holds the stack. */
    public static final String FOLDER = "injection-stack";
    /** The wafer id of every level. */
    public static final String WAFER_ID = "LOT-S01-W01";
    /** The injection levels, cm^-3, in file order. */
    public static final double[] LEVELS_CM3 = {1e13, 1e14, 1e15};
    /** Relative standard deviation of the simulated measurement noise of every pixel and level. */
    public static final double NOISE = 0.03;
    /** Net boron doping, cm^-3. */
    public static final double DOPING_CM3 = 1e15;
    /** Thickness, µm. */
    public static final double THICKNESS_UM = 180;
    /** Surface recombination velocity of both surfaces, cm/s. */
    public static final double SRV_CM_S = 2;
    /** Pixel pitch, mm. */
    public static final double PITCH_MM = 1.0;
    /** Name of the example rules file of the stack. */
    public static final String RULES = "rules-identify.json";
    /** Expected outcome of a region that no single defect explains. */
    public static final String NO_SINGLE_DEFECT = "no-single-defect";

    private static final long SEED = DemoScenario.SEED * 67;
    /** Margin inside a disc's edge that the tests take as its core, mm (one pixel pitch). */
    private static final double CORE_MARGIN_MM = PITCH_MM;
    private static final ObjectMapper JSON = new ObjectMapper();

    /** One defect planted in a region. */
    public record Planted(String defect, double densityPerCm3) {
    }

    /**
     * One planted region: a flat-topped disc with a sharp edge (full density at the pixel centres within
     * {@code radiusMm}, none outside). The edge is sharp so that a region's mean τ_SRH is that of its density: a
     * soft edge would add pixels of a small fraction of the density, whose long τ_SRH weighs heavily in a level-wise
     * mean of lifetimes.
     *
     * @param name       short name ({@code fe-i}, {@code cr-i}, {@code overlap})
     * @param expected   the library id that must come out best, or {@value #NO_SINGLE_DEFECT}
     * @param lifetimeUs noiseless effective lifetime at the centre per level, µs
     */
    public record Region(String name, double centreXMm, double centreYMm, double radiusMm, List<Planted> defects,
                         String expected, double[] lifetimeUs) {
        public Region {
            defects = List.copyOf(defects);
        }

        double weight(double x, double y) {
            return StrictMath.hypot(x - centreXMm, y - centreYMm) <= radiusMm ? 1 : 0;
        }

        /** True when (x, y) mm lies at least one pixel pitch inside the disc's edge. */
        public boolean core(double x, double y) {
            return StrictMath.hypot(x - centreXMm, y - centreYMm) <= radiusMm - CORE_MARGIN_MM;
        }
    }

    /**
     * What the stack's {@code truth.json} holds.
     *
     * @param files               the level files in order of {@code injectionPerCm3}
     * @param backgroundLifetimeUs noiseless background lifetime per level, µs
     */
    public record Truth(String waferId, List<String> files, double[] injectionPerCm3, double noise,
                        double[] backgroundLifetimeUs, String backgroundLimitedBy, List<Region> regions) {
        public Truth {
            files = List.copyOf(files);
            regions = List.copyOf(regions);
        }
    }

    private InjectionStackDemo() {
    }

    /** The planted regions (lifetimes filled in). */
    static List<Region> regions() {
        List<Region> r = new ArrayList<>();
        // no two discs alike and no symmetry of the wafer maps the layout onto itself, so that registering a level
        // onto the first has one answer (an x-mirror of a symmetric layout would fit as well as the identity)
        r.add(region("fe-i", -35, 35, 18, List.of(new Planted("fe-i", 5e11)), "fe-i"));
        r.add(region("cr-i", 40, 10, 14, List.of(new Planted("cr-i", 3e11)), "cr-i"));
        r.add(region("overlap", -5, -40, 16, List.of(new Planted("fe-i", 5e11), new Planted("cr-i", 3e11)),
                NO_SINGLE_DEFECT));
        return r;
    }

    private static Region region(String name, double x, double y, double radius, List<Planted> defects,
                                 String expected) {
        double[] tau = new double[LEVELS_CM3.length];
        for (int l = 0; l < tau.length; l++) {
            tau[l] = lifetimeUs(l, defects, 1.0);
        }
        return new Region(name, x, y, radius, defects, expected, tau);
    }

    /** The file name of level {@code l}: {@code LOT-S01-W01-dn1e13.tif}. */
    public static String fileName(int l) {
        return String.format(Locale.ROOT, "%s-dn%de%d.tif", WAFER_ID, 1, (int) StrictMath.round(
                StrictMath.log10(LEVELS_CM3[l])));
    }

    static MeasurementConditions conditions(int l) {
        return DemoScenario.conditions(new Doping(ConductivityType.P, DOPING_CM3), THICKNESS_UM, SRV_CM_S,
                LEVELS_CM3[l], null, Map.of("material", "Czochralski monocrystalline, p-type (boron)", "lot",
                        "LOT-S01", "stack", "injection stack, level " + (l + 1) + " of " + LEVELS_CM3.length,
                        "passivation", "both surfaces, SRV 2 cm/s"));
    }

    /** Effective lifetime (µs) at level {@code l} with the defects {@code planted} scaled by {@code weight}. */
    private static double lifetimeUs(int l, List<Planted> planted, double weight) {
        double dn = LEVELS_CM3[l];
        MeasurementConditions c = conditions(l);
        TrapDensityConverter clean = LifetimeDrawing.forward(c, "midgap");
        double otherRate = 1.0 / clean.lifetimeAtInjectionUs(0, dn);
        double rate = otherRate;
        for (Planted p : planted) {
            if (weight > 0) {
                TrapDensityConverter f = LifetimeDrawing.forward(c, p.defect());
                rate += 1.0 / f.lifetimeAtInjectionUs(p.densityPerCm3() * weight, dn) - otherRate;
            }
        }
        return 1.0 / rate;
    }

    /** The maps of the stack, one per level, in level order. The same on every call. */
    public static List<DemoFile> build() {
        List<Region> regions = regions();
        WaferFormat format = WaferFormat.M2;
        PixelGrid grid = DemoScenario.grid(format.sizeMm(), PITCH_MM);
        WaferShape shape = format.shape();
        List<DemoFile> out = new ArrayList<>();
        for (int l = 0; l < LEVELS_CM3.length; l++) {
            MeasurementConditions c = conditions(l);
            double dn = LEVELS_CM3[l];
            TrapDensityConverter clean = LifetimeDrawing.forward(c, "midgap");
            double otherRate = 1.0 / clean.lifetimeAtInjectionUs(0, dn);
            // SRH rate per unit density of each defect at this level, s^-1 per cm^-3
            Map<String, Double> perTrap = new java.util.TreeMap<>();
            for (Region r : regions) {
                for (Planted p : r.defects()) {
                    perTrap.computeIfAbsent(p.defect(), id -> (1.0 / LifetimeDrawing.forward(c, id)
                            .lifetimeAtInjectionUs(1e12, dn) - otherRate) / 1e12);
                }
            }
            Random rnd = new Random(SEED + l);
            float[] tau = LifetimeDrawing.overWafer(grid, shape, (xm, ym) -> {
                double rate = otherRate;
                for (Region r : regions) {
                    double w = r.weight(xm, ym);
                    if (w > 0) {
                        for (Planted p : r.defects()) {
                            rate += w * p.densityPerCm3() * perTrap.get(p.defect());
                        }
                    }
                }
                double noise = 1 + NOISE * StrictMath.max(-3, StrictMath.min(3, rnd.nextGaussian()));
                return noise / rate;
            });
            Provenance prov = Provenance.of("trapmap demo generator (invented data, seed " + DemoScenario.SEED + ")")
                    .then(ProcessingStep.of("demo-generate", "wafer", WAFER_ID, "defect", "fe-i+cr-i", "noise",
                            Double.toString(NOISE), "injection_cm3", Double.toString(dn)));
            WaferMap map = new WaferMap(FloatRaster.wrap(grid.width(), grid.height(), tau), grid,
                    Quantity.EFFECTIVE_LIFETIME, WAFER_ID, c, prov);
            out.add(new DemoFile(fileName(l), map, String.format(Locale.ROOT, "injection stack level %d: Δn = %.0e"
                    + " cm⁻³", l + 1, dn), List.of()));
        }
        return out;
    }

    /** The truth of the stack as written to its {@code truth.json}. */
    public static Truth truth() {
        double[] bg = new double[LEVELS_CM3.length];
        List<String> files = new ArrayList<>();
        for (int l = 0; l < bg.length; l++) {
            bg[l] = lifetimeUs(l, List.of(), 0);
            files.add(fileName(l));
        }
        return new Truth(WAFER_ID, files, LEVELS_CM3.clone(), NOISE, bg, limitedBy(), regions());
    }

    /** The section of the demonstration set's README that describes the stack (Markdown). */
    static String readme() {
        Truth t = truth();
        StringBuilder sb = new StringBuilder();
        sb.append("\n## Injection stack (`").append(FOLDER).append("/`)\n\n");
        sb.append("One invented wafer, ").append(WAFER_ID).append(", measured at three injection levels, one"
                + " effective-lifetime map per level\n(`").append(String.join("`, `", t.files()))
                .append("`), each with a sidecar naming its `injection_cm3`,\nand `").append(FOLDER)
                .append("/truth.json` with what was planted. It is the input of defect identification from the\n"
                        + "injection dependence of τ_SRH (lifetime spectroscopy). `inspect demo-data` does not read"
                        + " the subfolder, so the\nbatch above is unchanged by it.\n\n");
        sb.append(String.format(Locale.ROOT, "The wafer: Czochralski p-type, N_A = 1e15 cm⁻³ (about 13 Ω·cm),"
                + " %.0f µm, both surfaces passivated to an SRV of\n%.0f cm/s, pixel pitch %.1f mm, the three maps on"
                + " one pixel grid. Per pixel and level\n\n"
                + "    1/τ_eff = Σ N_j/K_j(Δn) + 1/τ_intr(Δn) + 1/τ_surf\n\n"
                + "times an independent %.0f %% Gaussian noise (seeded). The background has no SRH defect: its"
                + " lifetime is limited by\nsurface recombination (τ_surf ≈ 4.5 ms) and intrinsic recombination;"
                + " most of its pixels convert `BELOW_LIMIT`.\n\n", THICKNESS_UM, SRV_CM_S, PITCH_MM,
                NOISE * 100));
        sb.append("| region | centre (mm) | radius (mm) | planted N_t (cm⁻³) | τ_eff at Δn = 1e13 / 1e14 / 1e15"
                + " cm⁻³ (µs) | expected |\n|---|---|---|---|---|---|\n");
        sb.append(String.format(Locale.ROOT, "| background | | | none | %.0f / %.0f / %.0f | below the detection"
                + " limit |\n", t.backgroundLifetimeUs()[0], t.backgroundLifetimeUs()[1],
                t.backgroundLifetimeUs()[2]));
        for (Region r : t.regions()) {
            List<String> d = new ArrayList<>();
            for (Planted p : r.defects()) {
                d.add(p.defect() + " " + String.format(Locale.ROOT, "%.0e", p.densityPerCm3()).replace("e+", "e"));
            }
            sb.append(String.format(Locale.ROOT, "| %s | (%.0f, %.0f) | %.0f | %s | %.1f / %.1f / %.1f | %s |\n",
                    r.name(), r.centreXMm(), r.centreYMm(), r.radiusMm(), String.join(" + ", d), r.lifetimeUs()[0],
                    r.lifetimeUs()[1], r.lifetimeUs()[2], r.expected().equals(NO_SINGLE_DEFECT)
                            ? "no single defect" : r.expected() + " best"));
        }
        sb.append("\nThe regions are flat-topped discs with sharp edges, laid out without symmetry (so that"
                + " registering a\nlevel onto the first has one answer). N_A = 1e15 cm⁻³ lets the levels"
                + " span Δn/p0 = 0.01 … 1, where\nFe_i's τ_SRH rises about thirty-fold and Cr_i's falls (its level"
                + " lies near E_c), so their shapes differ plainly; the\ndensities keep SRH at 70 % or more of"
                + " 1/τ_eff at every level and each N_t ≤ 0.05·Δn. Ranked on the level-wise mean τ_SRH of\neach"
                + " region's"
                + " core (standard error of the mean as its uncertainty), the planted defect comes first with a"
                + " χ² ratio\nto the runner-up above 10 and N_t within 10 %, and the overlap region is"
                + " `NO_SINGLE_DEFECT`"
                + " (p < 0.01; a test\nchecks all three on the files as written).\n\n"
                + "`truth.json` fields: `wafer_id`, `noise_relative`, `levels` (`file`, `injection_cm3`),"
                + " `background` (`density_cm3`,\n`limited_by`, `lifetime_us` per level), `regions` (`name`,"
                + " `centre_x_mm`, `centre_y_mm`, `radius_mm`, `defects` with\n`defect` and"
                + " `density_cm3`, `expected`: the library id that must fit best or `no-single-defect`,"
                + " `lifetime_us`: noiseless\nτ_eff at the centre per level).\n\n");
        sb.append("Identify the defects, and judge the wafer by them with the example rules `" + RULES + "` (a"
                + " profile whose `stack`\nnames the three levels; its limits fail a wafer with more than 1 % of its"
                + " area best explained by Fe_i):\n\n"
                + "    ./trapmap identify " + FOLDER + "/" + WAFER_ID + "-dn1e1{3,4,5}.tif -o hint.tif --json\n"
                + "    ./trapmap inspect " + FOLDER + " --rules " + FOLDER + "/" + RULES + " --out stack-report\n\n"
                + "Both register every level onto the first (the default): the levels lie on one grid, no"
                + " placement beats them as\nthey lie by the stack's margin, so each is kept as measured"
                + " (`\"kept\": \"identity\"` in `hint-summary.json`) and the sharp disc\nedges are not blurred by"
                + " resampling.\n");
        return sb.toString();
    }

    private static String limitedBy() {
        return String.format(Locale.ROOT, "no SRH defect planted: surface recombination (SRV %.0f cm/s on both"
                + " sides of %.0f um, Sproul 1994) and intrinsic recombination (Richter et al. 2012)", SRV_CM_S,
                THICKNESS_UM);
    }

    /**
     * Writes the stack into {@code dir} (created when missing): per level a TIFF and its JSON sidecar, then
     * {@code truth.json} and an example rules file ({@value #RULES}) that judges the wafer by its stack. Every file
     * is written atomically.
     *
     * @return the files written, in order
     */
    static List<Path> write(Path dir) throws IOException {
        Files.createDirectories(dir);
        List<Path> written = new ArrayList<>();
        for (DemoFile f : build()) {
            Path tif = dir.resolve(f.file());
            MapFiles.write(f.map(), tif);
            written.add(tif);
            Path json = dir.resolve(f.stem() + ".json");
            AtomicFiles.write(json, DemoSetFiles.pretty(JSON.readTree(Sidecar.toJson(f.map()))).getBytes(StandardCharsets.UTF_8));
            written.add(json);
        }
        Path truth = dir.resolve(DemoScenario.TRUTH);
        AtomicFiles.write(truth, truthJson(truth()).getBytes(StandardCharsets.UTF_8));
        written.add(truth);
        Path rules = dir.resolve(RULES);
        AtomicFiles.write(rules, rulesJson().getBytes(StandardCharsets.UTF_8));
        written.add(rules);
        return written;
    }

    /**
     * Example rules for {@code inspect} on the stack's folder: the first level is judged by a profile with the
     * stack (its share of area best explained by Fe_i, and the share no single defect explains, as limits); the
     * other levels by the default profile (lifetime flag only). The levels are registered as by default.
     */
    static String rulesJson() {
        return "{\n"
                + "  \"flag\": {\"quantity\": \"lifetime\", \"threshold\": 500, \"min_area_mm2\": 4},\n"
                + "  \"profiles\": [\n"
                + "    {\"name\": \"injection-stack\", \"match\": {\"type\": \"p\", \"file\": \"*-dn1e13.*\"},"
                + " \"defect\": \"fe-i\",\n"
                + "     \"stack\": {\"levels\": [\"*-dn1e13.*\", \"*-dn1e14.*\", \"*-dn1e15.*\"], \"noise\": 0.03},\n"
                + "     \"limits\": {\"best_defect_area_fraction\": {\"max\": 0.01},"
                + " \"no_single_defect_area_fraction\": {\"max\": 0.05}}}\n"
                + "  ]\n"
                + "}\n";
    }

    static String truthJson(Truth t) throws IOException {
        ObjectNode root = JSON.createObjectNode();
        root.put("description", "injection stack of the trapmap demonstration set: defects planted per region"
                + " (invented data)");
        root.put("seed", DemoScenario.SEED);
        root.put("wafer_id", t.waferId());
        root.put("noise_relative", t.noise());
        ArrayNode levels = root.putArray("levels");
        for (int l = 0; l < t.files().size(); l++) {
            ObjectNode o = levels.addObject();
            o.put("file", t.files().get(l));
            o.put("injection_cm3", t.injectionPerCm3()[l]);
        }
        ObjectNode bg = root.putObject("background");
        bg.put("density_cm3", 0.0);
        bg.put("limited_by", t.backgroundLimitedBy());
        ArrayNode bgTau = bg.putArray("lifetime_us");
        for (double v : t.backgroundLifetimeUs()) {
            bgTau.add(DemoSetFiles.digits(v, 6));
        }
        ArrayNode regions = root.putArray("regions");
        for (Region r : t.regions()) {
            ObjectNode o = regions.addObject();
            o.put("name", r.name());
            o.put("centre_x_mm", r.centreXMm());
            o.put("centre_y_mm", r.centreYMm());
            o.put("radius_mm", r.radiusMm());
            ArrayNode ds = o.putArray("defects");
            for (Planted p : r.defects()) {
                ds.addObject().put("defect", p.defect()).put("density_cm3", p.densityPerCm3());
            }
            o.put("expected", r.expected());
            ArrayNode tau = o.putArray("lifetime_us");
            for (double v : r.lifetimeUs()) {
                tau.add(DemoSetFiles.digits(v, 6));
            }
        }
        return DemoSetFiles.pretty(root);
    }

    /** Reads a stack's {@code truth.json} back. */
    public static Truth readTruth(Path file) throws IOException {
        JsonNode root = JSON.readTree(InputFiles.readUtf8(file, InputFiles.JSON_MAX_BYTES));
        List<String> files = new ArrayList<>();
        JsonNode levels = root.get("levels");
        double[] dn = new double[levels.size()];
        for (int l = 0; l < dn.length; l++) {
            files.add(levels.get(l).get("file").asText());
            dn[l] = levels.get(l).get("injection_cm3").asDouble();
        }
        List<Region> regions = new ArrayList<>();
        for (JsonNode r : root.get("regions")) {
            List<Planted> ds = new ArrayList<>();
            for (JsonNode d : r.get("defects")) {
                ds.add(new Planted(d.get("defect").asText(), d.get("density_cm3").asDouble()));
            }
            regions.add(new Region(r.get("name").asText(), r.get("centre_x_mm").asDouble(),
                    r.get("centre_y_mm").asDouble(), r.get("radius_mm").asDouble(), ds, r.get("expected").asText(),
                    doubles(r.get("lifetime_us"))));
        }
        JsonNode bg = root.get("background");
        return new Truth(root.get("wafer_id").asText(), files, dn, root.get("noise_relative").asDouble(),
                doubles(bg.get("lifetime_us")), bg.get("limited_by").asText(), regions);
    }

    private static double[] doubles(JsonNode a) {
        double[] v = new double[a.size()];
        for (int i = 0; i < v.length; i++) {
            v[i] = a.get(i).asDouble();
        }
        return v;
    }
}
