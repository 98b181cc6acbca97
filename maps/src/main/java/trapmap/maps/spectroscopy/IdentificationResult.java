package trapmap.maps.spectroscopy;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.physics.defect.Defect;
import trapmap.physics.spectroscopy.DpssFit;
import trapmap.physics.spectroscopy.DpssResult;
import trapmap.physics.spectroscopy.LifetimeCurve;
import trapmap.physics.spectroscopy.Ranking;
import trapmap.physics.spectroscopy.RankingStatus;
import trapmap.shared.error.InvalidValueException;

/**
 * What {@link DefectIdentification#identify} found: per pixel (every pixel of a block carries its block's result)
 * the best and runner-up defect as 1-based indices into {@link #legend()}, the χ² of the best, the χ² ratio
 * runner-up/best, the {@link RankingStatus} (by ordinal) and N_t of the best (cm^-3); NaN where a pixel has no
 * data (and for the defect, χ² and N_t where too few levels are usable). Besides, the regions with their ranking
 * and DPSS, and the curves behind every pixel for a viewer.
 */
public final class IdentificationResult {
    /**
     * One legend row of the best-defect map.
     *
     * @param index      value of the defect in the index maps (1-based)
     * @param defectId   library id, e.g. {@code fe-i}
     * @param name       readable name
     * @param pixelCount pixels whose best defect this is with status OK or BELOW_LIMIT (a single defect explains
     *                   their curve)
     */
    public record LegendEntry(int index, String defectId, String name, int pixelCount) {
    }

    private final StackLifetimes lifetimes;
    private final List<Defect> candidates;
    private final List<Defect> ranked;
    private final DefectIdentification.Options options;
    private final List<LegendEntry> legend;
    private final float[] best;
    private final float[] runnerUp;
    private final float[] chiSquared;
    private final float[] chiSquaredRatio;
    private final float[] status;
    private final float[] bestDensity;
    private final int[] statusCounts;
    private final int[] regionLabels;
    private final double regionThresholdUs;
    private final List<RegionIdentification> regions;
    private final DefectIdentification.Engine engine;

    IdentificationResult(StackLifetimes lifetimes, List<Defect> candidates, List<Defect> ranked,
                         DefectIdentification.Options options, List<LegendEntry> legend, float[] best,
                         float[] runnerUp, float[] chiSquared, float[] chiSquaredRatio, float[] status,
                         float[] bestDensity, int[] statusCounts, int[] regionLabels, double regionThresholdUs,
                         List<RegionIdentification> regions, DefectIdentification.Engine engine) {
        this.lifetimes = lifetimes;
        this.candidates = List.copyOf(candidates);
        this.ranked = List.copyOf(ranked);
        this.options = options;
        this.legend = List.copyOf(legend);
        this.best = best;
        this.runnerUp = runnerUp;
        this.chiSquared = chiSquared;
        this.chiSquaredRatio = chiSquaredRatio;
        this.status = status;
        this.bestDensity = bestDensity;
        this.statusCounts = statusCounts;
        this.regionLabels = regionLabels;
        this.regionThresholdUs = regionThresholdUs;
        this.regions = List.copyOf(regions);
        this.engine = engine;
    }

    /** The stack's τ_SRH and Δn the identification ran on. */
    public StackLifetimes lifetimes() {
        return lifetimes;
    }

    /** The stack. */
    public InjectionStack stack() {
        return lifetimes.stack();
    }

    /** Every candidate as given (the DPSS compares all of them). */
    public List<Defect> candidates() {
        return candidates;
    }

    /** The candidates ranked (those with absolute cross-sections), in legend order. */
    public List<Defect> rankedCandidates() {
        return ranked;
    }

    public DefectIdentification.Options options() {
        return options;
    }

    /** The legend of the index maps, one row per ranked candidate. */
    public List<LegendEntry> legend() {
        return legend;
    }

    /** The legend row of a 1-based index. */
    public LegendEntry legendOf(int index) {
        return legend.get(index - 1);
    }

    public int width() {
        return lifetimes.width();
    }

    public int height() {
        return lifetimes.height();
    }

    /** Best defect index per pixel (1-based into {@link #legend()}, NaN none), row-major (a copy). */
    public float[] bestIndex() {
        return best.clone();
    }

    /** Runner-up defect index per pixel (NaN none), a copy. */
    public float[] runnerUpIndex() {
        return runnerUp.clone();
    }

    /** χ² of the best candidate per pixel, a copy. */
    public float[] chiSquared() {
        return chiSquared.clone();
    }

    /** χ²(runner-up)/χ²(best) per pixel, a copy. */
    public float[] chiSquaredRatio() {
        return chiSquaredRatio.clone();
    }

    /** {@link RankingStatus#ordinal()} per pixel (NaN without data), a copy. */
    public float[] status() {
        return status.clone();
    }

    /** N_t of the best candidate per pixel, cm^-3, a copy. */
    public float[] bestDensityCm3() {
        return bestDensity.clone();
    }

    /** Pixels with each status, by {@link RankingStatus#ordinal()}. */
    public int[] statusCounts() {
        return statusCounts.clone();
    }

    /** Pixels with a status (with data). */
    public int rankedPixels() {
        int n = 0;
        for (int c : statusCounts) {
            n += c;
        }
        return n;
    }

    /** Region number per pixel (1-based, 0 in no region), row-major (a copy). */
    public int[] regionLabels() {
        return regionLabels.clone();
    }

    /**
     * The region threshold used: regions are where the first level's τ_SRH is below it, µs; +∞ when the default rule
     * found no finite median (an SRH-free background), so that SRH dominance alone decides.
     */
    public double regionThresholdUs() {
        return regionThresholdUs;
    }

    /** The region rule in words, with its threshold and unit, for every face (command line, viewer). */
    public String regionRule() {
        String dominance = "SRH at least " + Math.round(DefectIdentification.SRH_DOMINANT_SHARE * 100)
                + " % of the recombination at the first level";
        return Double.isFinite(regionThresholdUs)
                ? "τ_SRH below " + trapmap.maps.io.NumberText.of((float) regionThresholdUs) + " µs and " + dominance
                : dominance + " (no τ_SRH threshold: most pixels show no resolvable SRH)";
    }

    /** The regions with their curves, rankings and DPSS, by id. */
    public List<RegionIdentification> regions() {
        return regions;
    }

    /** Region {@code id} (1-based). */
    public RegionIdentification region(int id) {
        if (id < 1 || id > regions.size()) {
            throw new InvalidValueException("region", "", "there is no region " + id + "; the regions are 1.."
                    + regions.size());
        }
        return regions.get(id - 1);
    }

    /** The curve of region {@code id} (1-based), null when it has no pixel with data. */
    public LifetimeCurve regionCurve(int id) {
        return region(id).curve();
    }

    /** The region of pixel (col, row): its id, 0 when in none. */
    public int regionAt(int col, int row) {
        check(col, row);
        return regionLabels[row * width() + col];
    }

    /**
     * The curve ranked for pixel (col, row): the pixel's own, or its block's (see {@link DefectIdentification});
     * null when the pixel has no data.
     */
    public LifetimeCurve curveAt(int col, int row) {
        check(col, row);
        return engine.curveAt(col, row);
    }

    /** The full ranking of pixel (col, row) (recomputed from its curve), null when the pixel has no data. */
    public Ranking rankingAt(int col, int row) {
        LifetimeCurve c = curveAt(col, row);
        return c == null ? null : engine.rank(c);
    }

    /**
     * The DPSS of pixel (col, row)'s curve (its block's) compared with every candidate; null when the pixel has no
     * data.
     */
    public DpssResult dpssAt(int col, int row) {
        LifetimeCurve c = curveAt(col, row);
        return c == null ? null : new DpssFit(lifetimes.doping(), lifetimes.silicon(), c.injectionPerCm3())
                .fit(c, candidates);
    }

    private void check(int col, int row) {
        if (col < 0 || row < 0 || col >= width() || row >= height()) {
            throw new InvalidValueException("pixel", "px", "pixel (" + col + ", " + row + ") lies outside the "
                    + width() + "x" + height() + " px stack");
        }
    }

    /** The history step of the result maps: candidates, levels, block, noise, region rule. */
    public ProcessingStep step() {
        List<String> ids = new ArrayList<>();
        ranked.forEach(d -> ids.add(d.id()));
        List<String> labels = new ArrayList<>();
        stack().levels().forEach(l -> labels.add(l.label()));
        return ProcessingStep.of("identify", "candidates", String.join(",", ids), "levels",
                String.join(" | ", labels), "block_px", Integer.toString(options.blockPx()), "noise",
                Double.toString(options.relativeNoise()), "region_threshold_us",
                String.format(Locale.ROOT, "%.6g", regionThresholdUs), "min_region_px",
                Integer.toString(options.minRegionPixels()));
    }

    private WaferMap map(float[] samples, Quantity q) {
        WaferMap first = stack().level(0).map();
        return first.derive(FloatRaster.wrap(width(), height(), samples.clone()), q, step());
    }

    /** The best-defect index map ({@link Quantity#DEFECT_INDEX}). */
    public WaferMap bestIndexMap() {
        return map(best, Quantity.DEFECT_INDEX);
    }

    /** The runner-up index map ({@link Quantity#DEFECT_INDEX}). */
    public WaferMap runnerUpIndexMap() {
        return map(runnerUp, Quantity.DEFECT_INDEX);
    }

    /** The χ² map of the best candidate ({@link Quantity#CHI_SQUARED}). */
    public WaferMap chiSquaredMap() {
        return map(chiSquared, Quantity.CHI_SQUARED);
    }

    /** The χ² ratio map runner-up/best ({@link Quantity#RATIO}). */
    public WaferMap chiSquaredRatioMap() {
        return map(chiSquaredRatio, Quantity.RATIO);
    }

    /** The status map ({@link Quantity#IDENTIFICATION_STATUS}, RankingStatus ordinals). */
    public WaferMap statusMap() {
        return map(status, Quantity.IDENTIFICATION_STATUS);
    }

    /** N_t of the best candidate ({@link Quantity#TRAP_DENSITY}, cm^-3). */
    public WaferMap bestDensityMap() {
        return map(bestDensity, Quantity.TRAP_DENSITY);
    }

    /** The region map ({@link Quantity#REGION_LABEL}: 1-based ids, 0 outside regions, NaN without data). */
    public WaferMap regionMap() {
        float[] f = new float[regionLabels.length];
        for (int i = 0; i < f.length; i++) {
            f[i] = Float.isNaN(status[i]) && regionLabels[i] == 0 ? Float.NaN : regionLabels[i];
        }
        return map(f, Quantity.REGION_LABEL);
    }

    /**
     * Share of the pixels with data whose best defect is {@code defectId} and whose status is OK or BELOW_LIMIT
     * (0 when the defect was not ranked or no pixel has data).
     */
    public double shareIdentifiedAs(String defectId) {
        int n = rankedPixels();
        if (n == 0) {
            return 0;
        }
        for (LegendEntry e : legend) {
            if (e.defectId().equals(defectId)) {
                return (double) e.pixelCount() / n;
            }
        }
        return 0;
    }

    /** Share of the pixels with data whose status is {@link RankingStatus#NO_SINGLE_DEFECT}. */
    public double shareNoSingleDefect() {
        int n = rankedPixels();
        return n == 0 ? 0 : (double) statusCounts[RankingStatus.NO_SINGLE_DEFECT.ordinal()] / n;
    }
}
