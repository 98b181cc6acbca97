package trapmap.maps.batch;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import trapmap.maps.geometry.OutlineFit;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.MapFormatException;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.ExceedanceMaps;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.maps.region.RegionCriteria;
import trapmap.maps.stats.InvalidArea;
import trapmap.maps.stats.RankBuckets;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.ConversionOutput;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

/**
 * Inspects one wafer map against {@link Rules}: reads it, applies the rules' conditions, fits its outline, picks the
 * rules profile that matches it (conductivity type, wafer family, file name), converts it to trap density of that
 * profile's defect when needed, evaluates every figure over the wafer less the edge exclusion, finds the flagged
 * regions and decides pass/fail and the grade. Thread-safe; one call holds one map.
 *
 * <p>Per-pixel work is kept to single passes over the evaluated pixels; each shortcut gives what the general class
 * gives (masks, regions, figures, trap density) or, for the outline of a large map, stays within a tolerance the
 * tests state.
 *
 * <p>Nothing a file can contain makes {@link #inspect} throw: an unreadable file, a map of the wrong quantity or
 * missing conditions give an {@link WaferResult.Status#ERROR error} result with a one-line reason.
 */
public final class WaferInspection {
    /** Reads one map; {@link MapFiles#readSingle(Path)} unless a test counts the reads. */
    @FunctionalInterface
    public interface MapReader {
        WaferMap read(Path file) throws IOException;
    }

    private final Rules rules;
    private final MapReader reader;
    private final Map<String, Defect> defects = new HashMap<>();
    private final boolean thumbnailCaptions;

    public WaferInspection(Rules rules) {
        this(rules, MapFiles::readSingle);
    }

    public WaferInspection(Rules rules, MapReader reader) {
        this(rules, reader, false);
    }

    private WaferInspection(Rules rules, MapReader reader, boolean thumbnailCaptions) {
        this.rules = rules;
        this.reader = reader;
        this.thumbnailCaptions = thumbnailCaptions;
        for (Rules.Profile p : rules.allProfiles()) {
            if (p.defectId() != null) {
                defects.put(p.defectId(), DefectLibrary.byId(p.defectId()));
            }
        }
    }

    /** Inspects one file; see {@link #inspect(Path, Path)}. */
    /** This inspection, writing its thumbnails with a small caption strip (or without). */
    public WaferInspection withThumbnailCaptions(boolean captions) {
        return captions == thumbnailCaptions ? this : new WaferInspection(rules, reader, captions);
    }

    public WaferResult inspect(Path file) {
        return inspect(file, null);
    }

    /** Inspects one file with fresh working arrays; see {@link #inspect(Path, Path, InspectionBuffers)}. */
    public WaferResult inspect(Path file, Path thumbnail) {
        return inspect(file, thumbnail, new InspectionBuffers());
    }

    /**
     * Inspects one file.
     *
     * @param thumbnail PNG file for a thumbnail with the flagged regions outlined, or null for none
     * @param buffers   working arrays of this worker, reused from wafer to wafer (the result is the same as with
     *                  fresh ones)
     */
    public WaferResult inspect(Path file, Path thumbnail, InspectionBuffers buffers) {
        return inspect(file.toString(), () -> reader.read(file), thumbnail, buffers);
    }

    /** Gives the map of one wafer, e.g. from bytes fetched from another file system. */
    @FunctionalInterface
    public interface MapSupplier {
        WaferMap read() throws IOException;
    }

    /**
     * Inspects the map that {@code read} gives, reported under {@code name} (the path or URI of its file), exactly as
     * {@link #inspect(Path, Path, InspectionBuffers)} inspects a file (the same judgement; a map that cannot be read
     * or judged gives the same error result), without a thumbnail. For maps whose bytes come from elsewhere, e.g.
     * {@link MapFiles#readSingle(String, byte[], String, byte[], trapmap.maps.io.ReadOptions)}; the profile's
     * {@code file} glob is matched against the last part of {@code name}.
     */
    public WaferResult inspect(String name, MapSupplier read, InspectionBuffers buffers) {
        return inspect(name, read, null, buffers);
    }

    private WaferResult inspect(String name, MapSupplier read, Path thumbnail, InspectionBuffers buffers) {
        WaferMap map;
        try {
            map = read.read();
        } catch (MapFormatException e) {
            return WaferResult.error(name, e.getMessage());
        } catch (IOException e) {
            return WaferResult.error(name, name + ": cannot read (" + e + ")");
        } catch (RuntimeException e) {
            return WaferResult.error(name, name + ": " + describe(e));
        }
        try {
            return evaluation(name, map, thumbnail, null, buffers, false).result();
        } catch (BatchOutputException.Unchecked e) {
            throw e; // the thumbnail could not be written: the output folder's failure, not the wafer's
        } catch (RuntimeException e) {
            return WaferResult.error(name, name + ": " + describe(e));
        }
    }

    private static String describe(RuntimeException e) {
        return e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
    }

    /** Evaluates a map already read; {@code name} is reported as its file. */
    public WaferResult evaluate(String name, WaferMap read, Path thumbnail) {
        return evaluation(name, read, thumbnail).result();
    }

    /**
     * Judges a map already read exactly as {@link #inspect} does and keeps what the judgement worked with, for the
     * viewer and the wafer report. Unlike {@link #inspect} it throws when the map cannot be judged.
     *
     * @param name           the file name the profile's {@code file} glob is matched against and the result names
     * @param read           the map as read (the rules' conditions are applied here)
     * @param defectOverride a defect replacing the profile's for trap densities, or null for the profile's own
     * @throws IllegalArgumentException when the map cannot be judged (wrong quantity, missing conditions, no outline
     *                                  where the rules need one), with a one-line reason
     */
    public Evaluation judge(String name, WaferMap read, Defect defectOverride) {
        return evaluation(name, read, null, defectOverride, new InspectionBuffers(), true);
    }

    /** The rules this inspection judges by. */
    public Rules rules() {
        return rules;
    }

    /**
     * What an evaluation worked with, besides its result: the lifetime map with the rules' conditions, the
     * trap-density map at the evaluated pixels (NaN elsewhere; null when the profile needs none), the wafer outline
     * (null when none was fitted), the evaluated pixels (index y·width + x), the flagged regions with their pixels,
     * the rules profile that judged the wafer, the defect of its trap densities (null when none was used) and the
     * unusable share of the evaluated area with its causes (the figure {@code invalid_area_fraction}) and the criteria
     * the regions were found with (the flag's, or for a flag with a confidence the lifetime limit of
     * {@link ConfidenceFlag}).
     */
    public record Evaluation(WaferResult result, WaferMap lifetime, WaferMap density, WaferShape shape,
                             boolean[] evaluated, FlaggedRegions regions, Rules.Profile profile, Defect defect,
                             InvalidArea invalid, RegionCriteria criteria) {
        /** As the canonical constructor, the regions found with the profile flag's own criteria. */
        public Evaluation(WaferResult result, WaferMap lifetime, WaferMap density, WaferShape shape,
                          boolean[] evaluated, FlaggedRegions regions, Rules.Profile profile, Defect defect,
                          InvalidArea invalid) {
            this(result, lifetime, density, shape, evaluated, regions, profile, defect, invalid,
                    profile.flag().criteria());
        }

        /** True when the defect is not the profile's own (a per-wafer or viewer-wide override). */
        public boolean defectOverridden() {
            return defect != null && !defect.id().equals(profile.defectId());
        }
    }

    /** As {@link #evaluate}, keeping the intermediate maps. */
    Evaluation evaluation(String name, WaferMap read, Path thumbnail) {
        return evaluation(name, read, thumbnail, null, new InspectionBuffers(), true);
    }

    /**
     * The evaluation of a map with the working arrays of {@code buffers}. Every per-pixel step reads the evaluated
     * pixels packed in index order (lifetimes gathered while the masks are made, trap densities converted packed,
     * then one pass for the judged densities, the invalid-area tally and the densities to rank), and nothing
     * map-sized is allocated unless {@code keep}: then the evaluation also holds the trap-density map and the
     * evaluated pixels in arrays of their own (else both are null: only the result is used).
     */
    Evaluation evaluation(String name, WaferMap read, Path thumbnail, Defect defectOverride,
                          InspectionBuffers buffers, boolean keep) {
        WaferMap map = read.withConditions(rules.applyTo(read.conditions()));
        WaferMap lifetime = switch (map.quantity()) {
            case EFFECTIVE_LIFETIME -> map;
            case PL_COUNTS -> MapConversion.lifetimeFromPl(map);
            default -> throw new IllegalArgumentException("a " + map.quantity().key()
                    + " map cannot be inspected; expected an effective-lifetime or PL-counts map");
        };
        PixelGrid grid = lifetime.grid();
        float[] tau = lifetime.raster().samples();

        String family;
        WaferShape shape;
        if (rules.waferFormat() != null) {
            shape = rules.waferFormat().shape();
            family = rules.waferFormat().id();
        } else {
            OutlineFit fit;
            try {
                fit = OutlineFits.fit(tau, grid);
            } catch (RuntimeException e) {
                fit = null;
                if (rules.edgeExclusionMm() > 0 || usesEdgeRatio()) {
                    throw new IllegalArgumentException("the wafer outline could not be fitted ("
                            + WaferResult.oneLine(describe(e)) + "); give \"wafer\": <format id> in the rules");
                }
            }
            shape = fit == null ? null : fit.shape();
            family = fit == null ? "unfitted" : fit.closestFormat().batchFamily();
        }
        Doping doping = map.conditions().doping();
        Rules.Profile profile = rules.profileFor(Path.of(name).getFileName().toString(),
                doping == null ? null : doping.type(), family);
        List<Figure> figures = profile.figures();
        boolean edgeRatio = figures.stream().anyMatch(f -> f.kind() == Figure.Kind.EDGE_TO_CENTRE_RATIO);
        // the evaluated lifetimes, packed in index order while the masks are made: converted, tallied and flagged,
        // then summed and ranked (which reorders them)
        float[] lifeValues = buffers.life(grid.width() * grid.height());
        Masks masks = Masks.of(tau, grid, shape, rules.edgeExclusionMm(),
                edgeRatio ? rules.edgeExclusionMm() + rules.edgeBandMm() : Double.NaN, buffers, lifeValues);
        int count = masks.count();
        Defect defect = defectOverride != null ? defectOverride : defects.get(profile.defectId());
        ConversionSettings settings = ConversionSettings.of(rules.physics());
        Conditions conditions = null;
        float[] converted = null;
        byte[] status = null;
        int belowLimit = 0;
        if (profile.needsTrapDensity()) {
            conditions = MapConversion.physicsConditions(lifetime.conditions(), settings);
            converted = buffers.density(lifeValues.length);
            status = buffers.status(lifeValues.length);
            belowLimit = convertPacked(conditions, defect, lifeValues, count, converted, status);
        }
        WaferMap density = converted == null || !keep ? null
                : densityMap(lifetime, conditions, defect, settings, converted, masks);
        // What the flag, the regions and the trap-density figures read: the OK pixels, or with the rules' opt-in
        // also the below-limit ones at their bound (the detection limit). One pass gives them, the invalid-area
        // tally, the judged densities that are not NaN, in index order, for their percentiles, and what the
        // lifetime figures need besides their ranks (the reciprocal sum; both samples' radix buckets).
        Judged j = judged(lifeValues, count, converted, status,
                profile.flag().belowLimit() == Rules.BelowLimit.AT_BOUND, masks.missing(), grid.pixelAreaMm2(),
                buffers);
        float[] judged = j.judged();
        InvalidArea invalid = j.invalid();
        double belowLimitFraction = converted == null || count == 0 ? Double.NaN : (double) belowLimit / count;

        Rules.Flag flag = profile.flag();
        float[] flagValues = flag.quantity() == Rules.FlagQuantity.LIFETIME ? lifeValues : judged;
        RegionCriteria criteria = flag.criteria();
        ExceedanceMaps exceedance = flag.confident() || figures.stream().anyMatch(
                f -> f.kind() == Figure.Kind.EXCEEDANCE_AREA_FRACTION)
                ? ConfidenceFlag.prepare(flag, lifetime.conditions(), defect, settings) : null;
        if (flag.confident()) {
            // P(N_t > N*) >= c exactly below one lifetime per wafer: the flag reads the lifetimes
            double limit = exceedance.confidentLifetimeUs(flag.confidence());
            flagValues = ConfidenceFlag.flaggable(lifeValues, count);
            criteria = ConfidenceFlag.criteria(flag, limit);
        }
        FlaggedRegions regions = FlaggedRegions.findPacked(flagValues, judged, grid, masks.indices(), count, criteria,
                shape, rules.edgeExclusionMm(), buffers);

        Sample dens = judged == null ? null : Sample.ofCounted(j.ranked(), j.rankedCount(), grid,
                percents(figures, Figure.Kind.TRAP_DENSITY_PERCENTILE), 0, 0, buffers.densityBuckets());
        double[] lifePercents = percents(figures, Figure.Kind.LIFETIME_PERCENTILE);
        double[] withRange = Arrays.copyOf(lifePercents, lifePercents.length + 2);
        withRange[lifePercents.length] = Thumbnails.LOW_PERCENT;
        withRange[lifePercents.length + 1] = Thumbnails.HIGH_PERCENT;
        Sample life = Sample.ofCounted(lifeValues, count, grid, thumbnail == null ? lifePercents : withRange,
                j.lifePositive(), j.lifeReciprocalSum(), buffers.lifeBuckets());
        FlaggedRegions.FlaggedRegion worst = regions.largest();
        FlaggedRegions.FlaggedRegion interior = largestInterior(regions, shape, grid);
        double flaggedFraction = life.areaMm2() > 0 ? regions.totalAreaMm2() / life.areaMm2() : Double.NaN;

        // a profile's injection stack: its other levels beside this map, identified with the engine of `identify`
        StackFigures.Shares stack = profile.stack() == null ? null
                : StackFigures.of(name, map, profile.stack(), rules, defect, reader, masks.indices(), count);
        Map<String, Double> values = new LinkedHashMap<>();
        for (Figure f : figures) {
            double v = switch (f.kind()) {
                case HARMONIC_MEAN_LIFETIME -> life.harmonicMean();
                case MEDIAN_LIFETIME -> life.median();
                case LIFETIME_PERCENTILE -> life.percentile(f.percent());
                case TRAP_DENSITY_PERCENTILE -> dens.percentile(f.percent());
                case FLAGGED_AREA_FRACTION -> flaggedFraction;
                case LARGEST_REGION -> worst == null ? 0 : worst.region().areaMm2();
                case LARGEST_INTERIOR_REGION -> shape == null ? Double.NaN
                        : interior == null ? 0 : interior.region().areaMm2();
                case EDGE_TO_CENTRE_RATIO -> Masks.edgeToCentre(tau, masks);
                case BELOW_LIMIT_AREA_FRACTION -> belowLimitFraction;
                case INVALID_AREA_FRACTION -> invalid.fraction();
                case EXCEEDANCE_AREA_FRACTION -> count == 0 ? Double.NaN : (double) ConfidenceFlag.countFlagged(
                        lifeValues, count, exceedance.confidentLifetimeUs(f.percent() / 100)) / count;
                case BEST_DEFECT_AREA_FRACTION -> stack == null ? Double.NaN : stack.bestDefect();
                case NO_SINGLE_DEFECT_AREA_FRACTION -> stack == null ? Double.NaN : stack.noSingleDefect();
            };
            values.put(f.name(), v);
        }
        List<String> failed = new ArrayList<>();
        List<Figure> failedFigures = new ArrayList<>();
        for (Rules.Limit l : profile.limits()) {
            if (!l.holds(values.get(l.figure().name()))) {
                failed.add(l.figure().name());
                failedFigures.add(l.figure());
            }
        }
        if (!profile.limitsInvalidArea() && !profile.invalidAreaLimit().holds(invalid.fraction())) {
            // the program's default limit, for profiles that set none; its text says it is the default
            failed.add(InvalidArea.exceeds(invalid.fraction(), profile.invalidAreaLimit().max()));
            failedFigures.add(profile.invalidAreaLimit().figure());
        }
        String grade = profile.grade(!failed.isEmpty(), f -> values.get(f.name()));
        List<String> missed = failed.isEmpty() ? profile.missedBy(grade, f -> values.get(f.name())) : List.of();
        Footprint footprint = Footprint.of(family, grid, masks.indices(), count, regions.pixels());
        if (thumbnail != null) {
            Thumbnails.write(lifetime, regions.pixels(), life.percentile(Thumbnails.LOW_PERCENT),
                    life.percentile(Thumbnails.HIGH_PERCENT), thumbnailCaptions, thumbnail);
        }
        WaferResult result = new WaferResult(name, map.waferId(), failed.isEmpty() ? WaferResult.Status.PASS
                : WaferResult.Status.FAIL, grade, profile.name(), defect == null ? null : defect.id(), values, failed,
                missed, regions.regions(), "", footprint, WaferResult.Worst.behind(failedFigures, worst, interior));
        boolean[] evaluated = keep ? masks.evaluated() : null;
        return new Evaluation(result, lifetime, density, shape, evaluated, regions, profile, defect, invalid,
                criteria);
    }

    /**
     * The trap-density map of {@link MapConversion#convert} with the default settings (same conditions, same
     * converter, same values), without the other quantities that conversion also stores: the batch needs only this
     * one, and the other five maps would be allocated and filled for every wafer.
     */
    static WaferMap trapDensity(WaferMap lifetime, Defect defect) {
        return trapDensity(lifetime, defect, ConversionSettings.DEFAULTS);
    }

    /** As {@link #trapDensity(WaferMap, Defect)} with the given settings. */
    static WaferMap trapDensity(WaferMap lifetime, Defect defect, ConversionSettings settings) {
        Conditions conditions = MapConversion.physicsConditions(lifetime.conditions(), settings);
        float[] nt = new float[lifetime.raster().size()];
        new TrapDensityConverter(conditions, defect).convert(lifetime.raster().samples(), lifetime.width(),
                new ConversionOutput(nt, null, null, null, null, null, null, null, null), 1);
        return lifetime.derive(FloatRaster.wrap(lifetime.width(), lifetime.height(), nt), Quantity.TRAP_DENSITY,
                MapConversion.convertStep(conditions, defect, settings));
    }

    /**
     * As {@link #trapDensity(WaferMap, Defect)} at the pixels {@code indices[0..count)}, NaN elsewhere: every figure,
     * region and flag of the batch reads the trap density of evaluated pixels only, and the conversion of a pixel
     * depends on its lifetime alone, so the evaluated pixels are converted packed into one row.
     */
    static WaferMap trapDensity(WaferMap lifetime, Defect defect, int[] indices, int count) {
        Masks masks = new Masks(indices, count, null, 0, lifetime.raster().size());
        return trapDensity(lifetime, defect, Sample.gather(lifetime.raster().samples(), masks), masks,
                ConversionSettings.DEFAULTS).map();
    }

    /**
     * A trap-density map and its values at the evaluated pixels, packed in index order, with their conversion
     * statuses (packed likewise) and the number of them below the detection limit.
     */
    record Density(WaferMap map, float[] packed, byte[] status, int belowLimit) {
    }

    /** As {@link #trapDensity(WaferMap, Defect, float[], Masks, ConversionSettings)} with the default settings. */
    static Density trapDensity(WaferMap lifetime, Defect defect, float[] packedTau, Masks masks) {
        return trapDensity(lifetime, defect, packedTau, masks, ConversionSettings.DEFAULTS);
    }

    /** As {@link #trapDensity(WaferMap, Defect, int[], int)} from the evaluated lifetimes, packed in index order. */
    static Density trapDensity(WaferMap lifetime, Defect defect, float[] packedTau, Masks masks,
                               ConversionSettings settings) {
        Conditions conditions = MapConversion.physicsConditions(lifetime.conditions(), settings);
        int count = masks.count();
        float[] out = new float[count];
        byte[] status = new byte[count];
        int below = convertPacked(conditions, defect, packedTau, count, out, status);
        return new Density(densityMap(lifetime, conditions, defect, settings, out, masks), out, status, below);
    }

    /**
     * Converts the lifetimes {@code packedTau[0..count)} to trap density into {@code out[0..count)} with their
     * statuses into {@code status[0..count)} (the arrays may be longer; the rest is left as it is), and returns how
     * many are below the detection limit.
     */
    static int convertPacked(Conditions conditions, Defect defect, float[] packedTau, int count, float[] out,
                             byte[] status) {
        if (count == 0) {
            return 0;
        }
        // the packed pixels as a raster one pixel wide, converted a strip of rows per call (STRIP): the kernel
        // converts only those and counts their statuses
        TrapDensityConverter.Tally tally = new TrapDensityConverter.Tally();
        TrapDensityConverter converter = new TrapDensityConverter(conditions, defect);
        ConversionOutput output = new ConversionOutput(out, null, null, null, null, null, null, status, null);
        for (int k = 0; k < count; k += STRIP) {
            converter.convertRows(packedTau, 1, k, Math.min(count, k + STRIP), output, tally);
        }
        return tally.count(PixelStatus.BELOW_LIMIT);
    }

    /**
     * What the judgement reads of the evaluated pixels: the judged trap densities packed in index order (null without
     * a conversion), those of them that are not NaN in the same order, {@code ranked[0..rankedCount)}, for their
     * percentiles, the invalid area, and of the lifetimes the positive ones' count and reciprocal sum (in index order,
     * as {@link Sample#ofPacked} adds them).
     */
    record Judged(float[] judged, float[] ranked, int rankedCount, InvalidArea invalid, int lifePositive,
                  double lifeReciprocalSum) {
    }

    /**
     * One pass over the evaluated pixels, packed in index order: the judged trap densities (the converted ones where
     * the status is OK, NaN elsewhere; all of them as converted when below-limit pixels count {@code atBound}), those
     * not NaN, and the {@link InvalidArea} tally of the lifetimes {@code life[0..count)} (no NaN) with their statuses
     * (null {@code converted}: not converted) and {@code missing} NaN pixels left out of the evaluated ones; on the
     * way it counts the radix buckets of the lifetimes into {@link InspectionBuffers#lifeBuckets()} (those of the
     * ranked densities, into {@link InspectionBuffers#densityBuckets()}, right after it) and adds up the
     * reciprocals of the positive lifetimes, so that their percentiles and harmonic mean need no pass of their own.
     * A method of its own, small enough for the JIT compiler to compile on its own.
     *
     * <p>A finite lifetime of at least the conversion's floor that is OK or below the limit (as the conversion gives
     * every such lifetime), or is not converted, is one {@link InvalidArea#cause} counts as usable: those are only
     * counted, and only the others (rare) go through {@link InvalidArea.Tally#add}.
     */
    static Judged judged(float[] life, int count, float[] converted, byte[] status, boolean atBound, int missing,
                         double pixelAreaMm2, InspectionBuffers buffers) {
        JudgedPass pass = new JudgedPass(life, converted, status, atBound, buffers);
        for (int k = 0; k < count; k += STRIP) {
            int to = Math.min(count, k + STRIP);
            if (converted == null) {
                pass.lifetimes(k, to);
            } else {
                pass.converted(k, to);
            }
        }
        if (converted != null) {
            // the buckets of the ranked densities in a pass of their own: in the pass above, the increments of two
            // bucket arrays and the stores of the judged and ranked values held each other up
            int[] densityCounts = buffers.densityBuckets().cleared();
            for (int k = 0; k < pass.ranks; k += STRIP) {
                countBuckets(pass.ranked, k, Math.min(pass.ranks, k + STRIP), densityCounts);
            }
        }
        pass.tally.addUsable(pass.usable);
        pass.tally.addMissing(missing);
        return new Judged(pass.judged, pass.ranked, pass.ranks, pass.tally.result(pixelAreaMm2), pass.positive,
                pass.reciprocalSum);
    }

    /**
     * Pixels per call of the loops over a map's evaluated pixels ({@link #judged}, {@link #convertPacked}). A loop
     * over all of them in a method called once per map would be compiled on the stack during the first map, before
     * the loop had ever ended: the compiled code then stops at the loop's end (a deoptimisation) and is compiled
     * again, and its method with every other loop in it. A strip per call of a small method (a few dozen calls a
     * map) has its loop ended many times before it is compiled, and compiled alone, once for all maps.
     */
    static final int STRIP = 1 << 14;

    /**
     * The state of {@link #judged}'s pass over the pixels in index order: the counts and the reciprocal sum (added
     * in index order).
     */
    private static final class JudgedPass {
        private static final byte OK = PixelStatus.OK.code();
        private static final byte BELOW = PixelStatus.BELOW_LIMIT.code();
        private final float[] life;
        private final float[] converted;
        private final byte[] status;
        private final boolean atBound;
        private final int[] lifeCounts;
        final InvalidArea.Tally tally = new InvalidArea.Tally(true);
        final float[] judged;
        final float[] ranked;
        int ranks;
        int positive;
        double reciprocalSum;
        int usable;

        JudgedPass(float[] life, float[] converted, byte[] status, boolean atBound, InspectionBuffers buffers) {
            this.life = life;
            this.converted = converted;
            this.status = status;
            this.atBound = atBound;
            this.lifeCounts = buffers.lifeBuckets().cleared();
            this.judged = converted == null ? null : atBound ? converted : buffers.judged(converted.length);
            this.ranked = converted == null ? null : buffers.densitySample(converted.length);
        }

        /** The lifetimes {@code life[from..to)} of a judgement without conversion. */
        void lifetimes(int from, int to) {
            float[] life = this.life;
            int[] lifeCounts = this.lifeCounts;
            int positive = this.positive;
            double reciprocalSum = this.reciprocalSum;
            int usable = this.usable;
            for (int k = from; k < to; k++) {
                float v = life[k];
                lifeCounts[RankBuckets.bucket(v)]++;
                if (v > 0) {
                    reciprocalSum += 1 / (double) v;
                    positive++;
                }
                if (v >= TrapDensityConverter.LIFETIME_FLOOR_US && v != Float.POSITIVE_INFINITY) {
                    usable++;
                } else {
                    tally.add(v, -1);
                }
            }
            this.positive = positive;
            this.reciprocalSum = reciprocalSum;
            this.usable = usable;
        }

        /** The pixels {@code [from, to)} of a judgement of converted trap densities. */
        void converted(int from, int to) {
            float[] life = this.life;
            float[] converted = this.converted;
            byte[] status = this.status;
            float[] judged = this.judged;
            float[] ranked = this.ranked;
            int[] lifeCounts = this.lifeCounts;
            boolean atBound = this.atBound;
            int ranks = this.ranks;
            int positive = this.positive;
            double reciprocalSum = this.reciprocalSum;
            int usable = this.usable;
            for (int k = from; k < to; k++) {
                float v = life[k];
                lifeCounts[RankBuckets.bucket(v)]++;
                if (v > 0) {
                    reciprocalSum += 1 / (double) v;
                    positive++;
                }
                byte st = status[k];
                if ((st == OK || st == BELOW) && v >= TrapDensityConverter.LIFETIME_FLOOR_US
                        && v != Float.POSITIVE_INFINITY) {
                    usable++;
                } else {
                    tally.add(v, st);
                }
                float d = converted[k];
                if (!atBound) {
                    d = st == OK ? d : Float.NaN;
                    judged[k] = d;
                }
                // without a branch (OK and other pixels alternate at random): a NaN is written past the end
                int number = d == d ? 1 : 0;
                ranked[ranks] = d;
                ranks += number;
            }
            this.ranks = ranks;
            this.positive = positive;
            this.reciprocalSum = reciprocalSum;
            this.usable = usable;
        }
    }

    /** Adds the radix buckets ({@link RankBuckets#bucket}) of {@code values[from..to)} (no NaN) to {@code counts}. */
    private static void countBuckets(float[] values, int from, int to, int[] counts) {
        for (int k = from; k < to; k++) {
            counts[RankBuckets.bucket(values[k])]++;
        }
    }

    /** The trap-density map with the packed densities at the evaluated pixels and NaN elsewhere. */
    private static WaferMap densityMap(WaferMap lifetime, Conditions conditions, Defect defect,
                                       ConversionSettings settings, float[] packed, Masks masks) {
        float[] nt = new float[lifetime.raster().size()];
        Arrays.fill(nt, Float.NaN);
        int[] indices = masks.indices();
        for (int k = 0, n = masks.count(); k < n; k++) {
            nt[indices[k]] = packed[k];
        }
        return lifetime.derive(FloatRaster.wrap(lifetime.width(), lifetime.height(), nt), Quantity.TRAP_DENSITY,
                MapConversion.convertStep(conditions, defect, settings));
    }

    /**
     * The largest interior region of {@link Figure.Kind#LARGEST_INTERIOR_REGION} (the first in scan order among
     * equals); null when there is none or no outline.
     */
    private FlaggedRegions.FlaggedRegion largestInterior(FlaggedRegions regions, WaferShape shape, PixelGrid grid) {
        if (shape == null) {
            return null;
        }
        double border = rules.edgeExclusionMm() + Math.max(Figure.INTERIOR_MARGIN_MM, grid.pitchMm());
        FlaggedRegions.FlaggedRegion largest = null;
        for (FlaggedRegions.FlaggedRegion r : regions.regions()) {
            if (r.region().edgeDistanceMm() > border
                    && (largest == null || r.region().areaMm2() > largest.region().areaMm2())) {
                largest = r;
            }
        }
        return largest;
    }

    private boolean usesEdgeRatio() {
        return rules.figures().stream().anyMatch(f -> f.kind() == Figure.Kind.EDGE_TO_CENTRE_RATIO);
    }

    private static double[] percents(List<Figure> figures, Figure.Kind kind) {
        return figures.stream().filter(f -> f.kind() == kind).mapToDouble(Figure::percent).toArray();
    }

}
