package trapmap.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import trapmap.maps.compare.Improvement;
import trapmap.maps.geometry.FormatMatch;
import trapmap.maps.geometry.OutlineFit;
import trapmap.maps.geometry.ReducedOutline;
import trapmap.maps.geometry.WaferFormat;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.io.MapFormatException;
import trapmap.maps.model.Quantity;
import trapmap.maps.process.BandConversion;
import trapmap.maps.process.MapConversion;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.Mask;
import trapmap.maps.region.Region;
import trapmap.maps.region.RegionCriteria;
import trapmap.maps.region.RegionTable;
import trapmap.maps.region.ThresholdRegions;
import trapmap.maps.stats.EvaluatedArea;
import trapmap.maps.stats.EvaluatedStatistics;
import trapmap.maps.stats.InvalidArea;
import trapmap.maps.stats.MapStatistics;
import trapmap.maps.stats.StatisticsRequest;
import trapmap.physics.defect.Defect;
import trapmap.shared.progress.HeadStart;

/** {@code trapmap stats}: statistics, area fractions and flagged regions of one map. */
@Command(name = "stats", version = TrapmapCommand.VERSION, mixinStandardHelpOptions = true, sortOptions = false,
        usageHelpAutoWidth = true,
        header = "Statistics, threshold area fractions and the table of flagged regions of a map.",
        description = {
            "Summarises MAP over the wafer (less an edge exclusion): count, mean, harmonic mean (the device-relevant"
                    + " average of a lifetime map), geometric mean, median, percentiles, min, max, standard"
                    + " deviation. With --threshold it adds the area fractions on each side and the flagged regions"
                    + " (8-connected), largest first. With --defect the map is first converted to that defect's trap"
                    + " density; then the statistics, area fractions and regions are over the OK pixels, and the"
                    + " pixels below the detection limit are counted on their own (below_limit: count, area_mm2,"
                    + " area_fraction of the evaluated area).",
            "",
            "Always: invalid_area, the share of the evaluated area whose measured value cannot be used (non-finite,"
                    + " <= 0, or invalid for the conversion), with the count of each cause, and left_out, which"
                    + " pixels each statistic leaves out and why (the harmonic and geometric means skip values <="
                    + " 0). Above the program's default limit of 0.05 a warning is printed (as inspect fails a wafer"
                    + " whose rules set no limit).",
            ""},
        footer = {"", Help.EXIT_CODES})
final class StatsCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Parameters(index = "0", paramLabel = "MAP", description = "Map file (TIFF or CSV, with optional sidecar).")
    Path input;

    @Option(names = "--page", paramLabel = "<n>", defaultValue = "1",
            description = "Page of a multi-page TIFF to summarise, from 1. Default: 1.")
    int page;

    @Option(names = "--threshold", paramLabel = "<value>",
            description = "Threshold in the map's unit for area fractions and flagged regions. Default: none.")
    Double threshold;

    @Option(names = "--flag", paramLabel = "above|below",
            description = "Which side of the threshold is flagged; needs --threshold. Default: below for lifetimes,"
                    + " above for densities.")
    String flag;

    @Option(names = "--min-area-mm2", paramLabel = "<mm²>", defaultValue = "0",
            description = "Smallest flagged region reported, mm²; needs --threshold. Default: 0.")
    double minAreaMm2;

    @Option(names = "--edge-exclusion-mm", paramLabel = "<mm>", defaultValue = "0",
            description = "Band along the wafer edge left out, mm. Default: 0.")
    double edgeExclusionMm;

    @Option(names = "--wafer", paramLabel = "<format>",
            description = "Wafer outline: a standard format id (round-150-flat, round-300-notch, m2, m10, g12,"
                    + " square-156.75, ...). Default: fitted to the map's data.")
    String wafer;

    @Mixin
    DensityOption density;

    @Option(names = "--json", description = "Print one JSON object.")
    boolean json;

    @Mixin
    MapConditionOptions conditions;

    @Override
    public Integer call() throws MapFormatException {
        conditions.settings(); // a bad --physics file is refused even when nothing is converted
        if (!(edgeExclusionMm >= 0 && edgeExclusionMm <= 50)) {
            throw new InputException("--edge-exclusion-mm must be in [0, 50] mm (got " + Format.exact(edgeExclusionMm) + ")");
        }
        if (!(minAreaMm2 >= 0) || Double.isInfinite(minAreaMm2)) {
            throw new InputException("--min-area-mm2 must be >= 0 mm² (got " + Format.exact(minAreaMm2) + ")");
        }
        if (threshold != null && !Double.isFinite(threshold)) {
            throw new InputException("--threshold must be a finite number in the map's unit");
        }
        if (threshold == null) { // without a threshold there are no flagged regions for them to shape
            for (String option : new String[] {"--flag", "--min-area-mm2"}) {
                if (spec.commandLine().getParseResult().hasMatchedOption(option)) {
                    throw new InputException(option + " belongs to --threshold (the flagged regions): give"
                            + " --threshold in the map's unit (µs for lifetimes, cm^-3 for densities)");
                }
            }
        }
        if (json) {
            Output.prepareJson(); // ready by the end, built while the map is read and converted
        }
        // The kernel is compiled on the second core while this thread reads the map (results do not depend on it).
        HeadStart warmUp = warmUp();
        // and so are the loops of the statistics' pass
        HeadStart statisticsWarmUp = EvaluatedStatistics.warmUp(density.defect != null, true,
                threshold == null ? 0 : 1);
        WaferMap read;
        try {
            read = MapInput.page(input, page);
        } catch (MapFormatException | RuntimeException e) {
            warmUp.close();
            throw e;
        }
        WaferMap map = read;
        Defect defect = density.defectOrNull();
        MapConversion.Result converted = null;
        String floor = "";
        Map<String, Object> outline = new LinkedHashMap<>();
        // The outline is fitted to the map as read, so it and the evaluated area it gives are found while the
        // conversion runs; its failure is given after the conversion's warnings, as when the two ran one after the
        // other.
        java.util.concurrent.ForkJoinTask<WaferArea> fitting = defect == null ? null
                : java.util.concurrent.ForkJoinPool.commonPool().submit(() -> waferArea(read, outline));
        if (defect != null) {
            try (warmUp) {
                converted = DensityOption.convert(map, defect, conditions, spec.commandLine().getErr());
            }
            floor = converted.lifetimeFloorNote();
            map = converted.get(Quantity.TRAP_DENSITY);
        } else {
            warmUp.close();
        }
        WaferArea waferArea = fitting == null ? waferArea(read, outline) : joined(fitting);
        WaferShape shape = waferArea.shape();
        // One pass gives the pixels the statistics use, the below-limit count and the invalid area.
        StatisticsRequest request = threshold == null
                ? StatisticsRequest.of(new double[] {5, 95})
                : StatisticsRequest.of(new double[] {5, 95}, threshold);
        statisticsWarmUp.close();
        EvaluatedStatistics summary = EvaluatedStatistics.of(map.raster(), read.raster(), waferArea.area(),
                converted == null ? null : converted.statusCodes(), read.quantity() == Quantity.EFFECTIVE_LIFETIME,
                read.grid(), request);
        EvaluatedArea evaluatedArea = summary.area();
        Mask mask = evaluatedArea.mask();
        InvalidArea invalid = evaluatedArea.invalid();
        Map<String, Object> belowLimit = null;
        List<String> warnings = new ArrayList<>();
        if (invalid.aboveDefaultLimit()) {
            warnings.add(invalid.defaultLimitWarning() + ": " + invalid.invalidCount() + " of "
                    + invalid.evaluatedCount() + " px of the evaluated area cannot be used");
        }
        if (converted != null) {
            // Statistics, thresholds and regions of a converted map use the OK pixels only (the mask above); the
            // below-limit ones (whose value is the detection limit, an upper bound) are counted on their own.
            int below = evaluatedArea.belowLimitCount();
            int evaluated = evaluatedArea.evaluatedCount();
            belowLimit = new LinkedHashMap<>();
            belowLimit.put("count", below);
            belowLimit.put("area_mm2", Output.mm2(below * map.grid().pixelAreaMm2()));
            belowLimit.put("area_fraction", Output.num(evaluated == 0 ? Double.NaN : (double) below / evaluated));
            belowLimit.put("note", "below detection limit: the SRH share of 1/τ_eff is under the detection"
                    + " resolution; these pixels are left out of the statistics, the threshold and the regions");
            if (!floor.isEmpty()) {
                warnings.add(floor);
            }
        }
        // The flagged regions need the mask and the threshold only: they are found, and their rows made, while the
        // statistics are computed (whose serial parts then share the machine with them).
        RegionCriteria.Side side = threshold == null ? null : side(map.quantity());
        java.util.concurrent.ForkJoinTask<List<Map<String, Object>>> regionSearch = null;
        if (threshold != null) {
            WaferMap searched = map;
            Mask flaggable = mask;
            RegionCriteria criteria = new RegionCriteria(threshold, side, minAreaMm2);
            regionSearch = java.util.concurrent.ForkJoinPool.commonPool().submit(
                    () -> regionRows(ThresholdRegions.find(searched, flaggable, criteria, shape)));
        }
        MapStatistics s;
        try {
            s = summary.statistics();
        } catch (RuntimeException | Error e) {
            if (regionSearch != null) {
                regionSearch.cancel(false);
            }
            throw e;
        }

        Map<String, Object> m = new LinkedHashMap<>();
        m.put("file", input.toString());
        m.put("quantity", map.quantity().key());
        m.put("unit", map.quantity().unit());
        m.put("edge_exclusion_mm", edgeExclusionMm);
        m.put("outline", outline);
        m.put("count", s.count());
        m.put("area_mm2", Output.mm2(s.areaMm2()));
        m.put("mean", Output.num(s.mean()));
        m.put("harmonic_mean", Output.num(s.harmonicMean()));
        m.put("geometric_mean", Output.num(s.geometricMean()));
        m.put("median", Output.sample(s.median()));
        m.put("p5", Output.sample(s.percentiles().get(0).value()));
        m.put("p95", Output.sample(s.percentiles().get(1).value()));
        m.put("min", Output.sample(s.min()));
        m.put("max", Output.sample(s.max()));
        m.put("std", Output.num(s.standardDeviation()));
        m.put("non_positive_count", s.nonPositiveCount());
        m.put("invalid_area", invalidArea(invalid));
        if (belowLimit != null) {
            m.put("below_limit", belowLimit);
        }
        m.put("left_out", leftOut(invalid, s, belowLimit == null ? 0 : (Integer) belowLimit.get("count"),
                converted != null));
        if (s.nonPositiveCount() > 0) {
            Map<String, Object> in = new LinkedHashMap<>();
            in.put("count", s.nonPositiveCount());
            in.put("statistics", NON_POSITIVE_INCLUDED);
            in.put("reason", "value <= 0: counted as measured by the statistics that are defined for it");
            m.put("non_positive_included", in);
        }
        if (!warnings.isEmpty()) {
            m.put("warnings", warnings);
        }
        if (threshold != null) {
            MapStatistics.AreaFraction f = s.areaFraction(threshold);
            Map<String, Object> t = new LinkedHashMap<>();
            t.put("value", threshold);
            t.put("flagged_side", side.name().toLowerCase(Locale.ROOT));
            t.put("fraction_below", Output.num(f.fractionBelow()));
            t.put("fraction_above", Output.num(f.fractionAbove()));
            t.put("area_below_mm2", Output.mm2(f.areaBelowMm2()));
            t.put("area_above_mm2", Output.mm2(f.areaAboveMm2()));
            t.put("flagged_fraction", Output.num(side == RegionCriteria.Side.ABOVE ? f.fractionAbove()
                    : f.fractionBelow()));
            m.put("threshold", t);
            if (!regionSearch.isDone()) {
                // this thread takes part in the search's parallel steps (the band scan, the rows) instead of idling
                java.util.concurrent.ForkJoinPool.commonPool().awaitQuiescence(1, java.util.concurrent.TimeUnit.SECONDS);
            }
            m.put("regions", joined(regionSearch));
        }
        print(m);
        return Exit.OK;
    }

    /**
     * A head start for the conversion's kernel when a defect is asked for ({@link MapConversion#warmUp}, into the
     * planes {@link DensityOption#convert} fills); nothing otherwise, or when the defect or the conditions are refused
     * (the conversion reports that in its turn). The map's own conditions are not known before it is read: where the
     * flags leave them open, the kernel is warmed up for a fixed injection and for a generation rate, with and without
     * a surface term, so that its compiled code serves the map whichever it has.
     */
    private HeadStart warmUp() {
        try {
            Defect d = density.defectOrNull();
            if (d != null) {
                return MapConversion.warmUp(warmUpGuesses(), d, conditions.settings(),
                        java.util.EnumSet.of(Quantity.TRAP_DENSITY));
            }
        } catch (RuntimeException e) {
            // reported where the defect is used
        }
        return HeadStart.NONE;
    }

    /** The conditions of the kernel's warm-up: the flags over each case of {@link #warmUpCases} they leave open. */
    List<trapmap.maps.model.MeasurementConditions> warmUpGuesses() {
        List<trapmap.maps.model.MeasurementConditions> guesses = new ArrayList<>();
        for (trapmap.maps.model.MeasurementConditions c : warmUpCases(conditions.injection == null
                && conditions.generation == null, conditions.srv == null)) {
            guesses.add(conditions.applyTo(c));
        }
        return guesses;
    }

    /**
     * {@link BandConversion#WARM_UP_CONDITIONS} (a generation rate and a surface recombination velocity), and when
     * {@code injectionOpen} the same with a fixed injection instead ({@link ConvertCommand#warmUpFixedInjection}),
     * and when {@code surfaceOpen} each of those with ideal surfaces as well.
     */
    static List<trapmap.maps.model.MeasurementConditions> warmUpCases(boolean injectionOpen, boolean surfaceOpen) {
        trapmap.maps.model.MeasurementConditions typical = BandConversion.WARM_UP_CONDITIONS;
        List<trapmap.maps.model.MeasurementConditions> cases = new ArrayList<>(List.of(typical));
        if (injectionOpen) {
            cases.add(ConvertCommand.warmUpFixedInjection());
        }
        if (surfaceOpen) {
            for (int k = 0, n = cases.size(); k < n; k++) {
                cases.add(cases.get(k).withSrv(null));
            }
        }
        return cases;
    }

    /** The result of {@code task} (the outline fit, the region search), or the failure it ended with, as it was. */
    private static <T> T joined(java.util.concurrent.ForkJoinTask<T> task) {
        try {
            return task.get();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("interrupted while waiting for " + task, e);
        } catch (java.util.concurrent.ExecutionException e) {
            if (e.getCause() instanceof RuntimeException r) {
                throw r;
            }
            if (e.getCause() instanceof Error r) {
                throw r;
            }
            throw new IllegalStateException(e.getCause());
        }
    }

    /** The statistics that count values <= 0 as measured (the harmonic and geometric means leave them out). */
    static final String NON_POSITIVE_INCLUDED = "mean, median, p5, p95, min, max, std";

    private static Map<String, Object> invalidArea(InvalidArea a) {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("fraction", Output.num(a.fraction()));
        m.put("count", a.invalidCount());
        m.put("area_mm2", Output.mm2(a.areaMm2()));
        m.put("evaluated_count", a.evaluatedCount());
        m.put("non_finite_count", a.nonFiniteCount());
        m.put("non_positive_count", a.nonPositiveCount());
        m.put("invalid_conversion_count", a.invalidConversionCount());
        m.put("default_limit", InvalidArea.DEFAULT_LIMIT);
        m.put("above_default_limit", a.aboveDefaultLimit());
        return m;
    }

    /**
     * Which pixels of the evaluated area each statistic leaves out, and why: those left out of every statistic
     * (no data, and with a conversion every pixel not converted OK), and those only the harmonic and geometric means
     * leave out (values <= 0, for which they are not defined).
     */
    private static List<Map<String, Object>> leftOut(InvalidArea a, MapStatistics s, int belowLimit,
                                                     boolean converted) {
        List<Map<String, Object>> out = new ArrayList<>();
        int all = a.evaluatedCount() - s.count();
        if (all > 0) {
            String why = converted
                    ? "not converted OK: " + belowLimit + " below the detection limit, the others unusable"
                            + " (non-finite, <= 0 or invalid for the conversion; see invalid_area)"
                    : "no data (NaN)";
            out.add(leftOutRow(all, why, "all"));
        }
        if (s.nonPositiveCount() > 0) {
            out.add(leftOutRow(s.nonPositiveCount(), "value <= 0: the harmonic and geometric means are defined for"
                    + " positive values only (a map with many such pixels gets a higher harmonic mean)",
                    "harmonic_mean, geometric_mean"));
        }
        return out;
    }

    private static Map<String, Object> leftOutRow(int count, String reason, String statistics) {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("count", count);
        m.put("statistics", statistics);
        m.put("reason", reason);
        return m;
    }

    /** A wafer outline (null when none could be fitted) and the evaluated area it gives (null without one). */
    private record WaferArea(WaferShape shape, Mask area) {
    }

    /** The outline of {@link #shape} and the evaluated area inside it, less the edge exclusion. */
    private WaferArea waferArea(WaferMap map, Map<String, Object> outline) {
        WaferShape shape = shape(map, outline);
        return new WaferArea(shape, shape == null ? null : shape.mask(map.grid(), edgeExclusionMm));
    }

    private WaferShape shape(WaferMap map, Map<String, Object> outline) {
        if (wafer != null) {
            WaferFormat f;
            try {
                f = WaferFormat.byId(wafer);
            } catch (IllegalArgumentException e) {
                throw new InputException("--wafer '" + wafer + "' is not a known format (" + String.join(", ",
                        WaferFormat.ids()) + ")");
            }
            outline.put("source", "format");
            outline.put("format", f.id());
            return f.shape();
        }
        try {
            OutlineFit fit = ReducedOutline.fit(map.raster(), map.grid());
            outline.put("source", "fitted");
            outline.put("model", fit.model().name().toLowerCase(Locale.ROOT));
            outline.put("description", fit.shape().describe());
            outline.put("rms_residual_mm", Output.mm(fit.quality().rmsResidualMm()));
            FormatMatch match = fit.closestFormat();
            outline.put("format", match.format() == null ? null : match.format().id());
            outline.put("family", match.family());
            outline.put("within_tolerance", match.withinTolerance());
            outline.put("deviation_mm", Output.mm(match.deviationMm()));
            outline.put("tolerance_mm", Output.num(match.toleranceMm()));
            outline.put("pitch_mm", Output.num(match.pitchMm()));
            outline.put("fiducial", match.mark().key());
            outline.put("fiducial_resolved", match.markResolved());
            outline.put("format_summary", match.describe());
            outline.put("format_sources", match.candidates().stream().map(f -> f.id() + ": " + f.source()).toList());
            return fit.shape();
        } catch (RuntimeException e) {
            if (edgeExclusionMm > 0) {
                throw new InputException("--edge-exclusion-mm needs the wafer outline, which could not be fitted to "
                        + input + " (" + Flags.oneLine(e.getMessage()) + "); give --wafer <format>");
            }
            outline.put("source", "none");
            outline.put("note", "outline not fitted: " + Flags.oneLine(e.getMessage()));
            return null;
        }
    }

    private RegionCriteria.Side side(Quantity q) {
        if (flag != null) {
            switch (flag.trim().toLowerCase(Locale.ROOT)) {
                case "above": return RegionCriteria.Side.ABOVE;
                case "below": return RegionCriteria.Side.BELOW;
                default: throw new InputException("--flag must be above or below (got '" + flag + "')");
            }
        }
        return Improvement.forQuantity(q).map(i -> i == Improvement.HIGHER_IS_BETTER ? RegionCriteria.Side.BELOW
                : RegionCriteria.Side.ABOVE).orElseThrow(() -> new InputException("--flag above|below is needed:"
                        + " a " + q.key() + " map has no preferred direction"));
    }

    private static List<Map<String, Object>> regionRows(RegionTable table) {
        List<Region> sorted = new ArrayList<>(table.regions());
        sorted.sort((a, b) -> Double.compare(b.areaMm2(), a.areaMm2()));
        // one row per region, built on all cores (each row is rounded text work of its own region), in table order
        return java.util.stream.IntStream.range(0, sorted.size()).parallel().mapToObj(i -> regionRow(sorted.get(i)))
                .toList();
    }

    private static Map<String, Object> regionRow(Region r) {
        Map<String, Object> row = new LinkedHashMap<>();
        row.put("id", r.id());
        row.put("area_mm2", Output.mm2(r.areaMm2()));
        row.put("pixels", r.pixelCount());
        row.put("centroid_x_mm", Output.mm(r.centroidXMm()));
        row.put("centroid_y_mm", Output.mm(r.centroidYMm()));
        row.put("centroid_inside", r.centroidInside());
        row.put("position_x_mm", Output.mm(r.positionXMm()));
        row.put("position_y_mm", Output.mm(r.positionYMm()));
        row.put("min_x_mm", Output.mm(r.bounds().minXMm()));
        row.put("min_y_mm", Output.mm(r.bounds().minYMm()));
        row.put("max_x_mm", Output.mm(r.bounds().maxXMm()));
        row.put("max_y_mm", Output.mm(r.bounds().maxYMm()));
        row.put("peak", Output.sample(r.peakValue()));
        row.put("peak_x_mm", Output.mm(r.peakXMm()));
        row.put("peak_y_mm", Output.mm(r.peakYMm()));
        row.put("mean", Output.num(r.meanValue()));
        row.put("edge_distance_mm", Output.mm(r.edgeDistanceMm()));
        return row;
    }

    @SuppressWarnings("unchecked")
    private void print(Map<String, Object> m) {
        PrintWriter out = spec.commandLine().getOut();
        if (json) {
            out.println(Output.json(m));
            out.flush();
            return;
        }
        String unit = (String) m.get("unit");
        Output.Table t = new Output.Table();
        t.row("map", m.get("file") + " (" + m.get("quantity") + ")", "");
        Map<String, Object> outline = (Map<String, Object>) m.get("outline");
        t.row("wafer outline", String.valueOf(outline.getOrDefault("description", outline.getOrDefault("format",
                outline.get("source")))), "");
        if (outline.containsKey("format_summary")) {
            t.row("wafer format", String.valueOf(outline.get("format_summary")), "");
        }
        t.number(m, "count", "pixels", "", null);
        t.number(m, "area_mm2", "area", "mm²", null);
        int nonPositive = (Integer) m.get("non_positive_count");
        String positiveOnly = nonPositive == 0 ? "" : " (" + nonPositive + " px <= 0 left out)";
        String withNonPositive = nonPositive == 0 ? "" : " (" + nonPositive + " px <= 0 included)";
        t.number(m, "mean", "mean" + withNonPositive, unit, "n/a");
        t.number(m, "harmonic_mean", "harmonic mean" + positiveOnly, unit, "n/a");
        t.number(m, "geometric_mean", "geometric mean" + positiveOnly, unit, "n/a");
        t.number(m, "median", "median" + withNonPositive, unit, "n/a");
        t.number(m, "p5", "5th percentile" + withNonPositive, unit, "n/a");
        t.number(m, "p95", "95th percentile" + withNonPositive, unit, "n/a");
        t.number(m, "min", "min", unit, "n/a");
        t.number(m, "max", "max", unit, "n/a");
        t.number(m, "std", "standard deviation" + withNonPositive, unit, "n/a");
        Map<String, Object> inv = (Map<String, Object>) m.get("invalid_area");
        t.row("invalid area", (inv.get("fraction") == null ? "n/a" : Format.number((Double) inv.get("fraction")))
                + " of the evaluated area (" + inv.get("count") + " of " + inv.get("evaluated_count")
                + " px: non-finite " + inv.get("non_finite_count") + ", non-positive " + inv.get("non_positive_count")
                + ", invalid conversion " + inv.get("invalid_conversion_count") + ")", "");
        if (m.containsKey("below_limit")) {
            Map<String, Object> b = (Map<String, Object>) m.get("below_limit");
            t.row("below detection limit", b.get("count") + " px, " + Format.number((Double) b.get("area_mm2"))
                    + " mm², fraction " + (b.get("area_fraction") == null ? "n/a"
                    : Format.number((Double) b.get("area_fraction"))) + " (not in the statistics)", "");
        }
        for (Map<String, Object> l : (List<Map<String, Object>>) m.get("left_out")) {
            t.note("left out of " + l.get("statistics") + ": " + l.get("count") + " px, " + l.get("reason"));
        }
        if (m.containsKey("threshold")) {
            Map<String, Object> th = (Map<String, Object>) m.get("threshold");
            t.number(th, "flagged_fraction", "flagged fraction (" + th.get("flagged_side") + " "
                    + Format.number((Double) th.get("value")) + " " + unit + ")", "", "n/a");
            List<Map<String, Object>> regions = (List<Map<String, Object>>) m.get("regions");
            t.row("flagged regions", Integer.toString(regions.size()), "");
            int shown = 0;
            for (Map<String, Object> r : regions) {
                if (shown++ == 10) {
                    t.note("  … " + (regions.size() - 10) + " more (use --json for all)");
                    break;
                }
                t.note(String.format(Locale.ROOT, "  #%-3s %9s mm² at (%s, %s) mm%s, peak %s %s, %s mm from edge",
                        r.get("id"), Format.number((Double) r.get("area_mm2")),
                        Format.number((Double) r.get("position_x_mm")), Format.number((Double) r.get("position_y_mm")),
                        Boolean.TRUE.equals(r.get("centroid_inside")) ? "" : " (a point of the region; its centroid ("
                                + Format.number((Double) r.get("centroid_x_mm")) + ", "
                                + Format.number((Double) r.get("centroid_y_mm")) + ") lies outside it)",
                        r.get("peak") == null ? "n/a" : Format.number(((Number) r.get("peak")).doubleValue()), unit,
                        r.get("edge_distance_mm") == null ? "n/a" : Format.number((Double) r.get("edge_distance_mm"))));
            }
        }
        if (m.containsKey("warnings")) {
            ((List<String>) m.get("warnings")).forEach(w -> t.note("warning: " + w));
        }
        out.print(t.render());
        out.flush();
    }
}
