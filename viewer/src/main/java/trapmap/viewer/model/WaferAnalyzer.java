package trapmap.viewer.model;

import java.util.BitSet;
import java.util.Set;
import java.util.concurrent.CancellationException;
import java.util.function.BooleanSupplier;
import trapmap.maps.batch.FlaggedRegions;
import trapmap.maps.batch.OutlineFits;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.WaferInspection;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.Mask;
import trapmap.maps.region.RegionCriteria;
import trapmap.maps.region.RegionTable;
import trapmap.maps.region.ThresholdRegions;
import trapmap.maps.stats.InvalidArea;
import trapmap.maps.stats.MapStatistics;
import trapmap.maps.stats.StatisticsRequest;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.defect.Defect;

/**
 * Computes a {@link WaferAnalysis}. With a rules file, {@link #judge} takes the verdict, grade, evaluated pixels,
 * outline and flagged regions from the batch's own engine ({@link WaferInspection#judge}). Without one,
 * {@link #analyse} runs the viewer's quick threshold check with the same maps-module calls, in the same order, as the batch engine
 * ({@link WaferInspection#evaluate}): conditions applied, PL converted to lifetime, conversion with
 * the model's physics settings, outline fitted to the lifetime's valid pixels, mask = valid lifetime ∩
 * outline less the edge exclusion (outline by {@link OutlineFits#fit}), regions and their pixels over
 * that mask in one pass by {@link FlaggedRegions#find} (the regions of {@link ThresholdRegions}), flagged
 * fraction = region area / evaluated lifetime area, invalid area by {@link InvalidArea} over the outline less the
 * edge exclusion. A viewer figure therefore equals the batch's for the same settings.
 */
public final class WaferAnalyzer {
    /** Percentiles of the lifetime statistics, %. */
    static final double[] LIFETIME_PERCENTS = {1, 5, 10, 25, 75, 90, 95, 99};

    private WaferAnalyzer() {
    }

    /**
     * The effective-lifetime map with the user's conditions applied (PL counts converted).
     *
     * @throws IllegalArgumentException when the map is neither a lifetime nor a PL map, or a PL map lacks its calibration
     */
    public static WaferMap lifetime(WaferMap read, ConditionOverrides conditions) {
        WaferMap map = read.withConditions(conditions.applyTo(read.conditions()));
        return switch (map.quantity()) {
            case EFFECTIVE_LIFETIME -> map;
            case PL_COUNTS -> MapConversion.lifetimeFromPl(map);
            default -> throw new IllegalArgumentException("a " + map.quantity().key() + " map cannot be analysed;"
                    + " expected an effective-lifetime or PL-counts map");
        };
    }

    /** The conversion of {@code lifetime} for {@code defect} with the default physics (all processors). */
    public static MapConversion.Result convert(WaferMap lifetime, Defect defect) {
        return convert(lifetime, defect, PhysicsSettings.DEFAULTS);
    }

    /** The conversion of {@code lifetime} for {@code defect} with {@code physics} (all processors). */
    public static MapConversion.Result convert(WaferMap lifetime, Defect defect, PhysicsSettings physics) {
        return MapConversion.convert(lifetime, defect, ConversionSettings.of(physics));
    }

    /** As {@link #analyse(WaferMap, Analysis, Defect, WaferAnalysis, BooleanSupplier, PhysicsSettings)} with the defaults. */
    public static WaferAnalysis analyse(WaferMap read, Analysis analysis, Defect defect, WaferAnalysis previous,
                                        BooleanSupplier cancelled) {
        return analyse(read, analysis, defect, previous, cancelled, PhysicsSettings.DEFAULTS);
    }

    /**
     * Analyses one wafer.
     *
     * @param read       the map as read
     * @param analysis   settings
     * @param defect     the defect of {@code analysis.defectId()}, or null
     * @param previous   earlier results of the same map, or null: its conversion is reused for the same conditions
     *                   and defect, its outline for the same conditions
     * @param cancelled  polled between the steps; when it turns true a {@link CancellationException} is thrown
     * @param physics    the physics settings of the conversion
     */
    public static WaferAnalysis analyse(WaferMap read, Analysis analysis, Defect defect, WaferAnalysis previous,
                                        BooleanSupplier cancelled, PhysicsSettings physics) {
        boolean sameLifetime = previous != null && previous.analysis().conditions().equals(analysis.conditions());
        WaferMap lifetime = sameLifetime ? previous.lifetime() : lifetime(read, analysis.conditions());
        check(cancelled);
        MapConversion.Result conv = previous != null && previous.analysis().sameConversion(analysis)
                && previous.conversion() != null && previous.conversion().physics().equals(physics)
                ? previous.conversion() : null;
        if (conv == null && defect != null && defect.hasAbsoluteCrossSections()) {
            conv = convert(lifetime, defect, physics);
        }
        check(cancelled);
        ExceedanceLayer exceedance = exceedance(lifetime, conv, defect, physics, analysis, previous);
        check(cancelled);
        DisplayedQuantity q = analysis.quantity();
        WaferMap displayed = displayed(q, lifetime, conv, exceedance);

        WaferShape shape;
        if (sameLifetime) {
            shape = previous.shape();
        } else {
            try {
                shape = OutlineFits.fit(lifetime.raster().samples(), lifetime.grid()).shape();
            } catch (RuntimeException e) {
                shape = null;
            }
        }
        check(cancelled);
        Mask mask = Mask.valid(lifetime.raster());
        // the evaluated area, unusable pixels included: the outline less the edge exclusion (no outline: the data)
        Mask area = shape == null ? mask : shape.mask(lifetime.grid(), analysis.edgeExclusionMm());
        if (shape != null) {
            mask = mask.and(area);
        }
        InvalidArea invalid = InvalidArea.of(lifetime.raster(), area, conv == null ? null
                : conv.statusCodes(), true, lifetime.grid());
        double belowLimit = conv == null || mask.count() == 0 ? Double.NaN
                : (double) mask.and(conv.statusMask(PixelStatus.BELOW_LIMIT)).count() / mask.count();
        MapStatistics life = MapStatistics.of(lifetime, mask, StatisticsRequest.of(LIFETIME_PERCENTS));
        // trap densities: statistics and the threshold use the OK pixels, never the detection limit of the others
        Mask judgedMask = okPixels(q, mask, conv);
        MapStatistics shown = displayed == lifetime ? life : MapStatistics.of(displayed, judgedMask.and(
                Mask.valid(displayed.raster())), StatisticsRequest.of(LIFETIME_PERCENTS));
        check(cancelled);
        RegionCriteria criteria = analysis.threshold().criteria();
        // one labelling pass gives the regions and their pixels; without a fitted outline the edge distances are
        // measured to the data outline, which only ThresholdRegions does
        FlaggedRegions found = FlaggedRegions.find(displayed.raster(), displayed.grid(), judgedMask, criteria, shape);
        RegionTable regions = shape != null
                ? new RegionTable(found.regions().stream().map(FlaggedRegions.FlaggedRegion::region).toList(),
                        criteria, RegionTable.EdgeReference.WAFER_SHAPE)
                : ThresholdRegions.find(displayed, judgedMask, criteria, null);
        BitSet flagged = found.pixels();
        double fraction = life.areaMm2() > 0 ? regions.totalAreaMm2() / life.areaMm2() : Double.NaN;
        Verdict verdict = Verdict.quick(fraction, analysis.threshold(), q.unit(), defect == null ? null
                : defect.id(), invalid, belowLimit);
        return new WaferAnalysis(analysis, lifetime, conv, displayed, shape, mask, life, shown, regions, flagged,
                fraction, keyFigure(q, shown, fraction), verdict, analysis.threshold().value(), q.unit(),
                analysis.edgeExclusionMm(), conv == null ? Set.of() : conv.warnings(), exceedance);
    }

    /**
     * Judges one wafer by a rules file with the batch's own engine ({@link WaferInspection#judge(String, WaferMap,
     * Defect)}): the verdict, grade, figures, evaluated pixels, outline and flagged regions are the batch's. The map
     * is converted for display with the defect that judged it (the profile's, or {@code override}); figures on the
     * screen are computed over the pixels the rules evaluated.
     *
     * @param fileName  the map's file (the profiles' {@code file} globs match its name; a profile's injection stack
     *                  reads its other levels from beside it)
     * @param read      the map as read
     * @param analysis  the viewer's settings: its condition overrides apply before the rules' conditions; its
     *                  threshold and edge exclusion are not used (the rules give them)
     * @param rules     the loaded rules
     * @param override  a defect replacing the profile's, or null
     * @param fallback  the defect for showing trap densities of a wafer whose profile uses none, or null
     * @param previous  earlier results of the same map, or null: its conversion is reused for the same conditions
     *                  and defect
     * @param cancelled polled between the steps
     */
    public static WaferAnalysis judge(String fileName, WaferMap read, Analysis analysis, LoadedRules rules,
                                      Defect override, Defect fallback, WaferAnalysis previous,
                                      BooleanSupplier cancelled) {
        WaferMap input = read.withConditions(analysis.conditions().applyTo(read.conditions()));
        WaferInspection.Evaluation ev = rules.inspection().judge(fileName, input, override);
        check(cancelled);
        WaferMap lifetime = ev.lifetime();
        Defect defect = ev.defect() != null ? ev.defect() : fallback;
        MapConversion.Result conv = null;
        PhysicsSettings physics = rules.rules().physics();
        if (previous != null && previous.conversion() != null && defect != null
                && previous.conversion().defectId().equals(defect.id())
                && previous.conversion().physics().equals(physics)
                && previous.lifetime().conditions().equals(lifetime.conditions())) {
            conv = previous.conversion();
        }
        if (conv == null && defect != null && defect.hasAbsoluteCrossSections()) {
            conv = convert(lifetime, defect, physics);
        }
        check(cancelled);
        Rules.Flag flag = ev.profile().flag();
        // a flag with a confidence shows the probability it judged (its N*, the rules' uncertainties)
        ExceedanceLayer exceedance = flag.confident() && conv != null
                ? ExceedanceLayer.ofFlag(flag, lifetime, defect, physics)
                : exceedance(lifetime, conv, defect, physics, analysis, previous);
        check(cancelled);
        DisplayedQuantity q = analysis.quantity();
        WaferMap displayed = displayed(q, lifetime, conv, exceedance);
        boolean[] evaluated = ev.evaluated();
        Mask mask = Mask.of(lifetime.width(), lifetime.height(), i -> evaluated[i]);
        MapStatistics life = MapStatistics.of(lifetime, mask, StatisticsRequest.of(LIFETIME_PERCENTS));
        MapStatistics shown = displayed == lifetime ? life : MapStatistics.of(displayed, okPixels(q, mask, conv).and(
                Mask.valid(displayed.raster())), StatisticsRequest.of(LIFETIME_PERCENTS));
        check(cancelled);
        boolean lifetimeFlag = flag.quantity() == Rules.FlagQuantity.LIFETIME;
        RegionCriteria criteria = ev.criteria();
        RegionTable regions = new RegionTable(ev.regions().regions().stream().map(FlaggedRegions.FlaggedRegion::region)
                .toList(), criteria, ev.shape() != null ? RegionTable.EdgeReference.WAFER_SHAPE
                : RegionTable.EdgeReference.DATA_OUTLINE);
        Double judged = ev.result().figures().get("flagged_area_fraction");
        double fraction = judged != null ? judged : life.areaMm2() > 0 ? regions.totalAreaMm2() / life.areaMm2()
                : Double.NaN;
        double shownThreshold = shownThreshold(flag, q, exceedance);
        Verdict verdict = Verdict.of(ev, rules.rules(), rules.name(),
                !analysis.conditions().equals(ConditionOverrides.NONE));
        return new WaferAnalysis(analysis, lifetime, conv, displayed, ev.shape(), mask, life, shown, regions,
                ev.regions().pixels(), fraction, keyFigure(q, shown, fraction), verdict, shownThreshold,
                lifetimeFlag || flag.confident() ? "µs" : "cm⁻³", rules.rules().edgeExclusionMm(),
                conv == null ? Set.of() : conv.warnings(), exceedance);
    }

    /**
     * The rules flag's threshold in the shown quantity's unit, NaN where the flag is on another quantity. A flag with
     * a confidence c (pixels with P(N_t &gt; N*) ≥ c) is its confidence on the probability and its lifetime limit
     * τ_c on the lifetime (both bound exactly the flagged pixels); on the trap density it has none (the nominal
     * density above N* is not what it flags).
     */
    static double shownThreshold(Rules.Flag flag, DisplayedQuantity q, ExceedanceLayer exceedance) {
        if (flag.confident()) {
            return switch (q) {
                case EXCEEDANCE_PROBABILITY -> flag.confidence();
                case LIFETIME -> exceedance == null ? Double.NaN : exceedance.confidentLifetimeUs(flag.confidence());
                default -> Double.NaN;
            };
        }
        boolean lifetimeFlag = flag.quantity() == Rules.FlagQuantity.LIFETIME;
        return (lifetimeFlag && q == DisplayedQuantity.LIFETIME)
                || (!lifetimeFlag && q == DisplayedQuantity.TRAP_DENSITY) ? flag.threshold() : Double.NaN;
    }

    /**
     * {@code mask} less the pixels that were not converted OK when trap densities are shown (a below-limit pixel
     * holds the detection limit, an upper bound, not a measured density); {@code mask} itself otherwise.
     */
    private static Mask okPixels(DisplayedQuantity q, Mask mask, MapConversion.Result conv) {
        return q == DisplayedQuantity.TRAP_DENSITY && conv != null ? mask.and(conv.statusMask(PixelStatus.OK)) : mask;
    }

    /**
     * The probability of exceeding N* of a converted wafer: the previous results' when the lifetime's conditions,
     * defect, physics and exceedance settings are the same, else prepared anew; null without a conversion.
     */
    private static ExceedanceLayer exceedance(WaferMap lifetime, MapConversion.Result conv, Defect defect,
                                              PhysicsSettings physics, Analysis analysis, WaferAnalysis previous) {
        if (conv == null || defect == null) {
            return null;
        }
        ExceedanceLayer old = previous == null ? null : previous.exceedance();
        if (old != null && old.settings().equals(analysis.exceedance()) && previous.conversion() != null
                && previous.conversion().defectId().equals(defect.id())
                && previous.conversion().physics().equals(physics)
                && previous.lifetime().conditions().equals(lifetime.conditions())) {
            return old;
        }
        return ExceedanceLayer.prepare(lifetime, defect, physics, analysis.exceedance());
    }

    /** The map of the shown quantity: the lifetime itself, one output of the conversion, or the probability map. */
    private static WaferMap displayed(DisplayedQuantity q, WaferMap lifetime, MapConversion.Result conv,
                                      ExceedanceLayer exceedance) {
        if (q == DisplayedQuantity.LIFETIME) {
            return lifetime;
        }
        if (q == DisplayedQuantity.EXCEEDANCE_PROBABILITY && exceedance != null) {
            return exceedance.probabilityMap(lifetime);
        }
        if (conv == null) {
            throw new IllegalArgumentException("showing the " + q.label() + " needs a defect with absolute capture"
                    + " cross-sections");
        }
        return conv.get(q.quantity());
    }

    private static WaferAnalysis.KeyFigure keyFigure(DisplayedQuantity q, MapStatistics shown, double fraction) {
        return switch (q) {
            case LIFETIME, SRH_LIFETIME -> new WaferAnalysis.KeyFigure(q == DisplayedQuantity.LIFETIME ? "τ_hm"
                    : "τ_SRH,hm", shown.harmonicMean(), "µs");
            case TRAP_DENSITY -> new WaferAnalysis.KeyFigure("N_t P95", shown.percentile(95), "cm⁻³");
            case OCCUPANCY -> new WaferAnalysis.KeyFigure("f_t median", shown.median(), "");
            case STATUS -> new WaferAnalysis.KeyFigure("flagged", fraction * 100, "%");
            case EXCEEDANCE_PROBABILITY -> new WaferAnalysis.KeyFigure("P(N_t > N*) P95", shown.percentile(95), "");
        };
    }

    private static void check(BooleanSupplier cancelled) {
        if (cancelled != null && cancelled.getAsBoolean()) {
            throw new CancellationException("analysis cancelled");
        }
    }
}
