package trapmap.viewer.model;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.CancellationException;
import java.util.function.Function;
import trapmap.maps.io.ReadOptions;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.spectroscopy.DefectIdentification;
import trapmap.maps.spectroscopy.IdentificationResult;
import trapmap.maps.spectroscopy.InjectionStack;
import trapmap.maps.spectroscopy.RegionIdentification;
import trapmap.maps.spectroscopy.StackLifetimes;
import trapmap.physics.defect.Defect;
import trapmap.physics.spectroscopy.CandidateFit;
import trapmap.physics.spectroscopy.DpssResult;
import trapmap.physics.spectroscopy.LifetimeCurve;
import trapmap.physics.spectroscopy.Ranking;
import trapmap.physics.spectroscopy.RankingStatus;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.progress.ProgressListener;
import trapmap.viewer.graphics.Categories;
import trapmap.viewer.graphics.FitCurves;
import trapmap.viewer.graphics.Labels;

/**
 * The viewer's defect identification from maps of one wafer at several injection levels: it gathers the maps (open
 * wafers and files, with the main window's doping, thickness, temperature and surface overrides but each map's own
 * injection level or generation rate), runs the maps module's {@link InjectionStack}, {@link StackLifetimes} and
 * {@link DefectIdentification} (with {@link StackLifetimes}), and answers the dialog's questions about the result: the layers, the legend, the
 * region table, and the curve, ranking, fitted curves and DPSS of a probed pixel or a region. No Swing; the dialog
 * calls {@link #run} off the Event Dispatch Thread.
 */
public final class StackIdentification {
    /** One map of the stack and the name it is known by in messages. */
    public record Input(String name, WaferMap map) {
    }

    /**
     * What the dialog asks for.
     *
     * @param register true to register every level onto the first (the maps module's registration); false when the
     *                 maps are known to lie on one grid
     */
    public record Request(List<Input> inputs, ConversionSettings settings, List<Defect> candidates,
                          DefectIdentification.Options options, boolean register) {
        public Request {
            inputs = List.copyOf(inputs);
            candidates = List.copyOf(candidates);
        }
    }

    /** A displayable map of the result. */
    public enum Layer {
        BEST("best defect (legend index)", Quantity.DEFECT_INDEX, IdentificationResult::bestIndexMap),
        RUNNER_UP("runner-up defect (legend index)", Quantity.DEFECT_INDEX, IdentificationResult::runnerUpIndexMap),
        CHI_SQUARED("χ² of the best defect", Quantity.CHI_SQUARED, IdentificationResult::chiSquaredMap),
        CHI_SQUARED_RATIO("χ² ratio runner-up/best", Quantity.RATIO, IdentificationResult::chiSquaredRatioMap),
        STATUS("identification status", Quantity.IDENTIFICATION_STATUS, IdentificationResult::statusMap),
        DENSITY("N_t of the best defect (cm⁻³)", Quantity.TRAP_DENSITY, IdentificationResult::bestDensityMap),
        REGIONS("regions", Quantity.REGION_LABEL, IdentificationResult::regionMap);

        private final String label;
        private final Quantity quantity;
        private final Function<IdentificationResult, WaferMap> map;

        Layer(String label, Quantity quantity, Function<IdentificationResult, WaferMap> map) {
            this.label = label;
            this.quantity = quantity;
            this.map = map;
        }

        /** The name shown in the layer choice, with its unit where it has one. */
        public String label() {
            return label;
        }

        /** The layer's map of {@code r}. */
        public WaferMap of(IdentificationResult r) {
            return map.apply(r);
        }

        /** The quantity of the layer's map. */
        public Quantity quantity() {
            return quantity;
        }

        /**
         * True for the maps whose values are categories (legend indices, statuses, region numbers): as their
         * quantity says ({@link Quantity#categorical}), which also makes the canvas show a zoomed-out block's most
         * common value rather than its mean.
         */
        public boolean categorical() {
            return quantity.categorical();
        }

        @Override
        public String toString() {
            return label;
        }
    }

    /**
     * What the charts and the candidate table show for a probed pixel or a region.
     *
     * @param title   what was probed, e.g. "pixel (12, 40) px" or "region 2 (315 px)"
     * @param curve   its τ_SRH(Δn) curve
     * @param ranking its library ranking
     * @param fits    the measured points and fitted curves of the best three candidates
     * @param dpss    its DPSS
     * @param summary one line: status and the ranking's reason, as it reads on screen ({@link Labels#prose})
     */
    public record Probe(String title, LifetimeCurve curve, Ranking ranking, FitCurves fits, DpssResult dpss,
                        String summary) {
    }

    /** One row of the region table. */
    public record RegionRow(int id, int pixels, int pixelsUsed, double areaMm2, String best, double ntPerCm3,
                            double lowerPerCm3, double upperPerCm3, double chiSquared, double pValue, String status,
                            String dpss) {
    }

    private StackIdentification() {
    }

    /**
     * The excitation-free part of the window's overrides: doping, thickness, temperature and surface apply to every
     * level; the injection level or generation rate stays each map's own.
     */
    public static ConditionOverrides stackOverrides(ConditionOverrides window) {
        return new ConditionOverrides(window.doping(), window.thicknessUm(), window.temperatureK(), null, null,
                window.srvCmPerS());
    }

    /** An open map with the window's excitation-free overrides applied. */
    public static Input open(String name, WaferMap map, ConditionOverrides window) {
        return new Input(name, map.withConditions(stackOverrides(window).applyTo(map.conditions())));
    }

    /**
     * Maps read from files (one per level, or the pages of a multi-page file whose sidecar gives each page's level),
     * with the window's excitation-free overrides applied.
     *
     * @throws IOException naming the file that cannot be read
     */
    public static List<Input> read(List<Path> files, ConditionOverrides window) throws IOException {
        InjectionStack.Loaded l = InjectionStack.read(files, ReadOptions.DEFAULTS, MeasurementConditions.UNKNOWN);
        List<Input> out = new ArrayList<>();
        for (int i = 0; i < l.maps().size(); i++) {
            out.add(open(l.names().get(i), l.maps().get(i), window));
        }
        return out;
    }

    /**
     * Builds the stack (checks and registration), converts every level to τ_SRH and identifies, telling
     * {@code progress} what is being done (the engine's rows of blocks ranked, from its working threads). Stops with
     * a {@link CancellationException} when the calling thread is interrupted (the dialog's Cancel).
     *
     * @throws InvalidValueException naming the map, the field and its unit when the maps do not form a stack
     */
    public static IdentificationResult run(Request request, ProgressListener progress) {
        List<WaferMap> maps = new ArrayList<>();
        List<String> names = new ArrayList<>();
        for (Input in : request.inputs()) {
            maps.add(in.map());
            names.add(in.name());
        }
        progress.progress(0, 0, "checking " + (request.register() ? "and registering " : "") + maps.size()
                + " levels");
        InjectionStack.Options placing = request.register() ? InjectionStack.Options.DEFAULTS
                : new InjectionStack.Options(false, InjectionStack.Options.DEFAULTS.registration());
        InjectionStack stack = InjectionStack.of(maps, names, placing);
        if (Thread.currentThread().isInterrupted()) {
            throw new CancellationException("identification cancelled");
        }
        return DefectIdentification.identify(stack, request.settings(), request.candidates(), request.options(),
                progress);
    }

    /** How each level was placed onto the first: one line per level (shift in mm, rotation). */
    public static List<String> registrationLines(IdentificationResult r) {
        List<String> out = new ArrayList<>();
        for (int i = 0; i < r.stack().size(); i++) {
            var l = r.stack().level(i);
            if (l.registration() == null) {
                out.add(l.label() + ": reference (" + l.source() + ")");
            } else {
                double[] s = l.shiftMm();
                var g = l.registration().registration();
                out.add(String.format(Locale.ROOT, "%s: shifted %.3f, %.3f mm, turned %.1f°%s, %s (%s)", l.label(),
                        s[0], s[1], l.rotationDeg(), g.mirrored() ? ", mirrored" : "",
                        l.registration().kept().name().toLowerCase(Locale.ROOT) + " kept", l.source()));
                l.registration().warnings().forEach(w -> out.add("  " + w));
            }
        }
        return out;
    }

    /** The probe of pixel (col, row): its own curve or its block's; null when the pixel has no data. */
    public static Probe pixel(IdentificationResult r, int col, int row) {
        LifetimeCurve c = r.curveAt(col, row);
        if (c == null) {
            return null;
        }
        int block = r.options().blockPx();
        String title = block > 1 ? String.format(Locale.ROOT, "block of %d×%d px at pixel (%d, %d)", block, block,
                col, row) : String.format(Locale.ROOT, "pixel (%d, %d)", col, row);
        return probe(r, title, c, r.rankingAt(col, row), r.dpssAt(col, row));
    }

    /**
     * The probe of region {@code id} (1-based) with the engine's DPSS of the region's mean curve (null, and no DPSS
     * chart, when the engine could not make one: the region table gives its reason); null when it has no pixel with
     * data.
     */
    public static Probe region(IdentificationResult r, int id) {
        RegionIdentification ri = r.region(id);
        if (ri.curve() == null || ri.ranking() == null) {
            return null;
        }
        String title = "region " + id + " (" + ri.region().pixelCount() + " px, " + ri.pixelsUsed() + " usable)";
        return probe(r, title, ri.curve(), ri.ranking(), ri.dpss());
    }

    private static Probe probe(IdentificationResult r, String title, LifetimeCurve c, Ranking ranking,
                               DpssResult dpss) {
        StackLifetimes lt = r.lifetimes();
        FitCurves fits = FitCurves.of(c, ranking, lt.doping(), lt.silicon());
        return new Probe(title, c, ranking, fits, dpss,
                statusText(ranking.status()) + ": " + Labels.prose(ranking.reason()));
    }

    /**
     * The categories a categorical layer is drawn in (null for the continuous layers), shared by the map, its colour
     * bar and the legend table: for the defect index layers one qualitative colour per legend index
     * ({@link Categories#qualitative}), then "no single defect" and "too few levels" in their own greys; for the
     * status layer one colour per status (the same greys for those two); for the region layer one colour per region
     * and "in no region".
     */
    public static Categories categories(Layer layer, IdentificationResult r) {
        List<Categories.Category> out = new ArrayList<>();
        switch (layer) {
            case BEST, RUNNER_UP -> {
                for (IdentificationResult.LegendEntry e : r.legend()) {
                    out.add(new Categories.Category(e.index(), e.index() + " " + e.defectId(),
                            Categories.qualitative(e.index() - 1)));
                }
                out.add(new Categories.Category(NO_SINGLE_DEFECT_VALUE, statusText(RankingStatus.NO_SINGLE_DEFECT),
                        Categories.UNDECIDED_RGB));
                out.add(new Categories.Category(TOO_FEW_LEVELS_VALUE, statusText(RankingStatus.TOO_FEW_LEVELS),
                        Categories.TOO_FEW_RGB));
            }
            case STATUS -> {
                for (RankingStatus s : RankingStatus.values()) {
                    out.add(new Categories.Category(s.ordinal(), s.ordinal() + " " + statusText(s), statusRgb(s)));
                }
            }
            case REGIONS -> {
                out.add(new Categories.Category(0, "0 in no region", NO_REGION_RGB));
                for (RegionIdentification ri : r.regions()) {
                    out.add(new Categories.Category(ri.id(), "region " + ri.id(), Categories.qualitative(ri.id() - 1)));
                }
            }
            default -> {
                return null;
            }
        }
        return new Categories(out);
    }

    /** Value of the defect index layers' display for pixels ranked without a single defect. */
    public static final int NO_SINGLE_DEFECT_VALUE = -1;
    /** Value of the defect index layers' display for pixels with too few usable levels. */
    public static final int TOO_FEW_LEVELS_VALUE = -2;
    /** Colour of the pixels in no region (near white). */
    static final int NO_REGION_RGB = 0xF7F7F7;

    /** The colour of a status on the status layer: OK green, below limit sky blue, the other two greys. */
    static int statusRgb(RankingStatus s) {
        return switch (s) {
            case OK -> Categories.QUALITATIVE[2];
            case BELOW_LIMIT -> Categories.QUALITATIVE[1];
            case NO_SINGLE_DEFECT -> Categories.UNDECIDED_RGB;
            case TOO_FEW_LEVELS -> Categories.TOO_FEW_RGB;
        };
    }

    /**
     * The map drawn for a layer: the layer's own map, except that the defect index layers show
     * {@link #NO_SINGLE_DEFECT_VALUE} and {@link #TOO_FEW_LEVELS_VALUE} where the status says so (the legend index
     * only where a defect was identified, OK or below limit), so that such pixels are visibly not a defect's colour.
     * The readout keeps using the result's own maps.
     */
    public static WaferMap displayMap(Layer layer, IdentificationResult r) {
        WaferMap m = layer.of(r);
        if (layer != Layer.BEST && layer != Layer.RUNNER_UP) {
            return m;
        }
        float[] v = m.raster().samples().clone();
        float[] status = r.status();
        for (int i = 0; i < v.length; i++) {
            if (Float.isNaN(status[i])) {
                continue;
            }
            int s = (int) status[i];
            if (s == RankingStatus.NO_SINGLE_DEFECT.ordinal()) {
                v[i] = NO_SINGLE_DEFECT_VALUE;
            } else if (s == RankingStatus.TOO_FEW_LEVELS.ordinal()) {
                v[i] = TOO_FEW_LEVELS_VALUE;
            }
        }
        return new WaferMap(FloatRaster.wrap(m.width(), m.height(), v), m.grid(), m.quantity(), m.waferId(),
                m.conditions(), m.provenance());
    }

    /**
     * What the values of a layer mean, in one line beside the layer choice (so that no layer is read by colour
     * alone).
     */
    public static String layerKey(Layer layer, IdentificationResult r) {
        return switch (layer) {
            case BEST, RUNNER_UP -> "value = legend index: " + legendKey(r);
            case STATUS -> {
                StringBuilder b = new StringBuilder("value = status: ");
                for (RankingStatus s : RankingStatus.values()) {
                    b.append(s.ordinal() == 0 ? "" : ", ").append(s.ordinal()).append(' ').append(statusText(s));
                }
                yield b.toString();
            }
            case CHI_SQUARED -> "χ² of the best candidate's fit (ν = usable levels − 1); grey: no fit";
            case CHI_SQUARED_RATIO -> "χ²(runner-up)/χ²(best): the larger, the clearer the best defect";
            case DENSITY -> "N_t of the best candidate, cm⁻³";
            case REGIONS -> "value = region number (0: in none); regions: " + r.regionRule();
        };
    }

    private static String legendKey(IdentificationResult r) {
        List<String> parts = new ArrayList<>();
        for (IdentificationResult.LegendEntry e : r.legend()) {
            parts.add(e.index() + " " + e.defectId());
        }
        return String.join(", ", parts);
    }

    /** The status as shown in tables and readouts. */
    public static String statusText(RankingStatus s) {
        return trapmap.viewer.graphics.IdentificationCharts.status(s);
    }

    /** The status of an identification-status map value (RankingStatus ordinal; NaN: no data). */
    public static String statusText(double ordinal) {
        if (!Double.isFinite(ordinal) || ordinal < 0 || ordinal >= RankingStatus.values().length) {
            return "no data";
        }
        return statusText(RankingStatus.values()[(int) Math.round(ordinal)]);
    }

    /** The defect named by a legend index map value (NaN: none). */
    public static String defectText(IdentificationResult r, double index) {
        if (!Double.isFinite(index)) {
            return "none";
        }
        var e = r.legendOf((int) Math.round(index));
        return e.defectId() + " (" + e.name() + ")";
    }

    /** The region table: one row per region, its ranking's best candidate and the DPSS summary. */
    public static List<RegionRow> regionRows(IdentificationResult r) {
        List<RegionRow> out = new ArrayList<>();
        for (RegionIdentification ri : r.regions()) {
            Ranking k = ri.ranking();
            CandidateFit b = k == null || k.hint() == null ? null : k.hint().best();
            String status = k == null ? "no data" : statusText(k.status());
            String dpss = Labels.prose(ri.dpss() != null ? ri.dpss().reason() : ri.note());
            out.add(new RegionRow(ri.id(), ri.region().pixelCount(), ri.pixelsUsed(), ri.region().areaMm2(),
                    b == null ? "none" : b.id(), b == null ? Double.NaN : b.ntPerCm3(),
                    b == null ? Double.NaN : b.lowerPerCm3(), b == null ? Double.NaN : b.upperPerCm3(),
                    b == null ? Double.NaN : b.chiSquared(), b == null ? Double.NaN : b.pValue(), status, dpss));
        }
        return out;
    }
}
