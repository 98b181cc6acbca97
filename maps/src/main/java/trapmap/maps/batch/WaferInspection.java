package trapmap.maps.batch;

import java.awt.image.BufferedImage;
import java.awt.image.DataBufferInt;
import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.BitSet;
import java.util.Collections;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import trapmap.maps.geometry.OutlineDetection;
import trapmap.maps.geometry.OutlineFit;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.io.PngFiles;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.MapFormatException;
import trapmap.maps.io.PngStyle;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.maps.region.RegionCriteria;
import trapmap.maps.stats.MapStatistics;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.ConversionOutput;
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
    /** Cell size of the recurrence footprint, mm. */
    public static final double FOOTPRINT_PITCH_MM = 1.0;
    /** Longest side of a thumbnail, px. */
    public static final int THUMBNAIL_PX = 256;
    /** Colour of flagged-region outlines in thumbnails (opaque magenta, ARGB). */
    public static final int OUTLINE_ARGB = 0xFFFF00FF;
    /** Width of the outline around flagged regions in thumbnails, px. */
    public static final int OUTLINE_PX = 2;

    /** Reads one map; {@link MapFiles#readSingle(Path)} unless a test counts the reads. */
    @FunctionalInterface
    public interface MapReader {
        WaferMap read(Path file) throws IOException;
    }

    /** Percentiles of the evaluated lifetimes that span a thumbnail's colours. */
    static final double THUMBNAIL_LOW_PERCENT = 1;
    static final double THUMBNAIL_HIGH_PERCENT = 99;

    private final Rules rules;
    private final MapReader reader;
    private final Map<String, Defect> defects = new HashMap<>();

    public WaferInspection(Rules rules) {
        this(rules, MapFiles::readSingle);
    }

    public WaferInspection(Rules rules, MapReader reader) {
        this.rules = rules;
        this.reader = reader;
        for (Rules.Profile p : rules.allProfiles()) {
            if (p.defectId() != null) {
                defects.put(p.defectId(), DefectLibrary.byId(p.defectId()));
            }
        }
    }

    /** Inspects one file; see {@link #inspect(Path, Path)}. */
    public WaferResult inspect(Path file) {
        return inspect(file, null);
    }

    /**
     * Inspects one file.
     *
     * @param thumbnail PNG file for a thumbnail with the flagged regions outlined, or null for none
     */
    public WaferResult inspect(Path file, Path thumbnail) {
        String name = file.toString();
        WaferMap map;
        try {
            map = reader.read(file);
        } catch (MapFormatException e) {
            return WaferResult.error(name, e.getMessage());
        } catch (IOException e) {
            return WaferResult.error(name, name + ": cannot read (" + e + ")");
        } catch (RuntimeException e) {
            return WaferResult.error(name, name + ": " + describe(e));
        }
        try {
            return evaluate(name, map, thumbnail);
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
     * What an evaluation worked with, besides its result: the lifetime map, the trap-density map (null when the
     * profile needs none), the wafer outline (null when none was fitted), the evaluated pixels and the flagged
     * regions with their pixels.
     */
    record Evaluation(WaferResult result, WaferMap lifetime, WaferMap density, WaferShape shape,
                      boolean[] evaluated, FlaggedRegions regions) {
    }

    /** As {@link #evaluate}, keeping the intermediate maps. */
    Evaluation evaluation(String name, WaferMap read, Path thumbnail) {
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
                fit = fitOutline(tau, grid);
            } catch (RuntimeException e) {
                fit = null;
                if (rules.edgeExclusionMm() > 0 || usesEdgeRatio()) {
                    throw new IllegalArgumentException("the wafer outline could not be fitted ("
                            + WaferResult.oneLine(describe(e)) + "); give \"wafer\": <format id> in the rules");
                }
            }
            shape = fit == null ? null : fit.shape();
            family = fit == null ? "unfitted"
                    : fit.closestFormat() != null && fit.closestFormat().withinTolerance()
                    ? fit.closestFormat().format().id() : "fitted";
        }
        Doping doping = map.conditions().doping();
        Rules.Profile profile = rules.profileFor(Path.of(name).getFileName().toString(),
                doping == null ? null : doping.type(), family);
        List<Figure> figures = profile.figures();
        boolean edgeRatio = figures.stream().anyMatch(f -> f.kind() == Figure.Kind.EDGE_TO_CENTRE_RATIO);
        Masks masks = masks(tau, grid, shape, rules.edgeExclusionMm(),
                edgeRatio ? rules.edgeExclusionMm() + rules.edgeBandMm() : Double.NaN);
        // the evaluated lifetimes, packed in index order: converted, then summed and ranked (which reorders them)
        float[] lifeValues = Sample.gather(tau, masks);
        Density converted = profile.needsTrapDensity()
                ? trapDensity(lifetime, defects.get(profile.defectId()), lifeValues, masks) : null;
        WaferMap density = converted == null ? null : converted.map();
        Sample dens = converted == null ? null : Sample.ofPacked(converted.packed(), masks.count(), grid,
                percents(figures, Figure.Kind.TRAP_DENSITY_PERCENTILE), false);
        double[] lifePercents = percents(figures, Figure.Kind.LIFETIME_PERCENTILE);
        double[] withRange = Arrays.copyOf(lifePercents, lifePercents.length + 2);
        withRange[lifePercents.length] = THUMBNAIL_LOW_PERCENT;
        withRange[lifePercents.length + 1] = THUMBNAIL_HIGH_PERCENT;
        Sample life = Sample.ofPacked(lifeValues, masks.count(), grid,
                thumbnail == null ? lifePercents : withRange, true);

        Rules.Flag flag = profile.flag();
        WaferMap flagMap = flag.quantity() == Rules.FlagQuantity.LIFETIME ? lifetime : density;
        RegionCriteria criteria = flag.quantity() == Rules.FlagQuantity.LIFETIME
                ? RegionCriteria.below(flag.threshold(), flag.minAreaMm2())
                : RegionCriteria.above(flag.threshold(), flag.minAreaMm2());
        FlaggedRegions regions = FlaggedRegions.find(flagMap.raster(), grid, masks.indices(), masks.count(), criteria,
                shape, density == null ? null : density.raster().samples(), rules.edgeExclusionMm());
        FlaggedRegions.FlaggedRegion worst = regions.largest();
        double flaggedFraction = life.areaMm2() > 0 ? regions.totalAreaMm2() / life.areaMm2() : Double.NaN;

        Map<String, Double> values = new LinkedHashMap<>();
        for (Figure f : figures) {
            double v = switch (f.kind()) {
                case HARMONIC_MEAN_LIFETIME -> life.harmonicMean();
                case MEDIAN_LIFETIME -> life.median();
                case LIFETIME_PERCENTILE -> life.percentile(f.percent());
                case TRAP_DENSITY_PERCENTILE -> dens.percentile(f.percent());
                case FLAGGED_AREA_FRACTION -> flaggedFraction;
                case LARGEST_REGION -> worst == null ? 0 : worst.region().areaMm2();
                case LARGEST_INTERIOR_REGION -> largestInterior(regions, shape, grid);
                case EDGE_TO_CENTRE_RATIO -> edgeToCentre(tau, masks);
            };
            values.put(f.name(), v);
        }
        List<String> failed = new ArrayList<>();
        for (Rules.Limit l : profile.limits()) {
            if (!l.holds(values.get(l.figure().name()))) {
                failed.add(l.figure().name());
            }
        }
        String grade = profile.grade(!failed.isEmpty(), f -> values.get(f.name()));
        List<String> missed = failed.isEmpty() ? profile.missedBy(grade, f -> values.get(f.name())) : List.of();
        Footprint footprint = footprint(family, grid, masks.evaluated(), regions.pixels());
        if (thumbnail != null) {
            writeThumbnail(lifetime, regions.pixels(), life.percentile(THUMBNAIL_LOW_PERCENT),
                    life.percentile(THUMBNAIL_HIGH_PERCENT), thumbnail);
        }
        WaferResult result = new WaferResult(name, map.waferId(), failed.isEmpty() ? WaferResult.Status.PASS
                : WaferResult.Status.FAIL, grade, profile.name(), profile.defectId(), values, failed,
                missed, regions.regions(), "", footprint);
        return new Evaluation(result, lifetime, density, shape, masks.evaluated(), regions);
    }

    /**
     * The trap-density map of {@link MapConversion#convert} with the default settings (same conditions, same
     * converter, same values), without the other quantities that conversion also stores: the batch needs only this
     * one, and the other five maps would be allocated and filled for every wafer.
     */
    static WaferMap trapDensity(WaferMap lifetime, Defect defect) {
        Conditions conditions = MapConversion.physicsConditions(lifetime.conditions(), ConversionSettings.DEFAULTS);
        float[] nt = new float[lifetime.raster().size()];
        new TrapDensityConverter(conditions, defect).convert(lifetime.raster().samples(), lifetime.width(),
                new ConversionOutput(nt, null, null, null, null, null, null, null, null), 1);
        return lifetime.derive(FloatRaster.wrap(lifetime.width(), lifetime.height(), nt), Quantity.TRAP_DENSITY,
                ProcessingStep.of("convert", "defect", defect.id(), "doping", conditions.doping().toString(),
                        "injection", conditions.injection().toString()));
    }

    /**
     * As {@link #trapDensity(WaferMap, Defect)} at the pixels {@code indices[0..count)}, NaN elsewhere: every figure,
     * region and flag of the batch reads the trap density of evaluated pixels only, and the conversion of a pixel
     * depends on its lifetime alone, so the evaluated pixels are converted packed into one row.
     */
    static WaferMap trapDensity(WaferMap lifetime, Defect defect, int[] indices, int count) {
        Masks masks = new Masks(null, indices, count, null);
        return trapDensity(lifetime, defect, Sample.gather(lifetime.raster().samples(), masks), masks).map();
    }

    /** A trap-density map and its values at the evaluated pixels, packed in index order. */
    record Density(WaferMap map, float[] packed) {
    }

    /** As {@link #trapDensity(WaferMap, Defect, int[], int)} from the evaluated lifetimes, packed in index order. */
    static Density trapDensity(WaferMap lifetime, Defect defect, float[] packedTau, Masks masks) {
        Conditions conditions = MapConversion.physicsConditions(lifetime.conditions(), ConversionSettings.DEFAULTS);
        int[] indices = masks.indices();
        int count = masks.count();
        float[] nt = new float[lifetime.raster().size()];
        Arrays.fill(nt, Float.NaN);
        float[] out = new float[count];
        if (count > 0) {
            new TrapDensityConverter(conditions, defect).convert(packedTau, count,
                    new ConversionOutput(out, null, null, null, null, null, null, null, null), 1);
            for (int k = 0; k < count; k++) {
                nt[indices[k]] = out[k];
            }
        }
        WaferMap map = lifetime.derive(FloatRaster.wrap(lifetime.width(), lifetime.height(), nt),
                Quantity.TRAP_DENSITY, ProcessingStep.of("convert", "defect", defect.id(), "doping",
                        conditions.doping().toString(), "injection", conditions.injection().toString()));
        return new Density(map, out);
    }

    /** See {@link Figure.Kind#LARGEST_INTERIOR_REGION}; NaN without an outline. */
    private double largestInterior(FlaggedRegions regions, WaferShape shape, PixelGrid grid) {
        if (shape == null) {
            return Double.NaN;
        }
        double border = rules.edgeExclusionMm() + Math.max(Figure.INTERIOR_MARGIN_MM, grid.pitchMm());
        double largest = 0;
        for (FlaggedRegions.FlaggedRegion r : regions.regions()) {
            if (r.region().edgeDistanceMm() > border) {
                largest = Math.max(largest, r.region().areaMm2());
            }
        }
        return largest;
    }

    private boolean usesEdgeRatio() {
        return rules.figures().stream().anyMatch(f -> f.kind() == Figure.Kind.EDGE_TO_CENTRE_RATIO);
    }

    /** Size, px, that block reduction brings a large map's validity mask down to for the outline fit. */
    static final int FIT_PX = 160;

    /**
     * The outline of the valid pixels. A map of fewer than 2·{@link #FIT_PX} pixels along its longer side is fitted as
     * it is; a larger one on its validity mask reduced by k×k blocks, k = ⌊side / FIT_PX⌋ (a block is valid when at
     * least half of its pixels are), on a grid of k times the pitch with the same wafer coordinates. The outline then
     * rests on edge points k pixels apart, hundreds of them: at 1024² (k = 6) the fitted centre and size stay within
     * a small fraction of a pixel of the full-resolution fit (checked by the tests) at a thirtieth of the cost.
     */
    public static OutlineFit fitOutline(float[] tau, PixelGrid grid) {
        int w = grid.width();
        int h = grid.height();
        int k = Math.max(w, h) / FIT_PX;
        if (k <= 1) {
            return OutlineDetection.fit(Mask.of(w, h, i -> tau[i] == tau[i]), grid);
        }
        int cw = w / k;
        int ch = h / k;
        PixelGrid coarse = new PixelGrid(cw, ch, grid.pitchMm() * k, (grid.centreXPx() - (k - 1) / 2.0) / k,
                (grid.centreYPx() - (k - 1) / 2.0) / k);
        return FIT_CACHE.fit(reducedValidity(tau, w, h, k), coarse);
    }

    /**
     * The validity of the k×k blocks of a w×h map, ⌊w/k⌋ × ⌊h/k⌋ of them in row-major order: a block is valid when
     * at least half of its pixels are not NaN.
     */
    static boolean[] reducedValidity(float[] tau, int w, int h, int k) {
        int cw = w / k;
        int ch = h / k;
        int[] counts = new int[cw * ch];
        for (int y = 0; y < ch * k; y++) {
            int row = (y / k) * cw;
            int x = y * w;
            for (int bx = 0; bx < cw; bx++) {
                int c = 0;
                for (int end = x + k; x < end; x++) {
                    float v = tau[x];
                    c += v == v ? 1 : 0;
                }
                counts[row + bx] += c;
            }
        }
        int half = (k * k + 1) / 2;
        boolean[] valid = new boolean[cw * ch];
        for (int i = 0; i < valid.length; i++) {
            valid[i] = counts[i] >= half;
        }
        return valid;
    }

    /** Fitted outlines of the last few validity masks seen (see {@link FitCache}). */
    private static final FitCache FIT_CACHE = new FitCache(16);

    /**
     * The outline fit is a pure function of the validity mask and its grid, and the maps of one tool often share
     * their reduced mask exactly (same stage, same crop): the last {@code capacity} fits are kept, keyed by the mask's
     * bits and the grid, and a mask equal to one of them reuses its fit. Thread-safe.
     */
    static final class FitCache {
        private record Key(int hash, boolean[] valid, PixelGrid grid) {
            @Override
            public boolean equals(Object o) {
                return o instanceof Key k && k.hash == hash && k.grid.equals(grid)
                        && Arrays.equals(k.valid, valid);
            }

            @Override
            public int hashCode() {
                return hash;
            }
        }

        private final Map<Key, OutlineFit> fits;

        FitCache(int capacity) {
            fits = Collections.synchronizedMap(new LinkedHashMap<>(capacity, 0.75f, true) {
                @Override
                protected boolean removeEldestEntry(Map.Entry<Key, OutlineFit> eldest) {
                    return size() > capacity;
                }
            });
        }

        OutlineFit fit(boolean[] valid, PixelGrid grid) {
            Key key = new Key(31 * Arrays.hashCode(valid) + grid.hashCode(), valid, grid);
            OutlineFit fit = fits.get(key);
            if (fit == null) {
                fit = OutlineDetection.fit(Mask.of(grid.width(), grid.height(), i -> valid[i]), grid);
                fits.put(key, fit);
            }
            return fit;
        }
    }

    /**
     * The evaluated pixels (valid and at least the edge exclusion inside the outline), also as ascending indices
     * ({@code indices[0..count)}), and, when asked for, the centre pixels of {@code edge_to_centre_ratio} (null
     * otherwise).
     */
    record Masks(boolean[] evaluated, int[] indices, int count, boolean[] centre) {
    }

    /**
     * The masks of {@link Masks}: {@code evaluated} holds exactly the pixels of
     * {@code Mask.valid(raster).and(shape.mask(grid, exclusionMm))}, {@code centre} those at least {@code centreMm}
     * inside (NaN: none asked for). The distance to the outline changes by at most the distance moved (it is
     * 1-Lipschitz), so after one exact distance d the next pixels of the row up to |d − e| away lie on the same side
     * of every threshold e and are filled without being computed; only pixels near a threshold are computed one by
     * one.
     */
    static Masks masks(float[] tau, PixelGrid grid, WaferShape shape, double exclusionMm, double centreMm) {
        int w = grid.width();
        int h = grid.height();
        boolean[] in = new boolean[w * h];
        boolean[] centre = Double.isNaN(centreMm) ? null : new boolean[w * h];
        int[] indices = new int[w * h];
        int count = 0;
        if (shape == null) {
            for (int i = 0; i < in.length; i++) {
                if (tau[i] == tau[i]) {
                    in[i] = true;
                    indices[count++] = i;
                }
            }
            return new Masks(in, indices, count, centre);
        }
        WaferShape.Prepared p = shape.prepared();
        double pitch = grid.pitchMm();
        double slack = 1e-7; // mm, far above the rounding of the distance and coordinates
        for (int y = 0; y < h; y++) {
            double ym = grid.yMm(y);
            int row = y * w;
            int x = 0;
            while (x < w) {
                double d = p.distanceToEdgeMm(grid.xMm(x), ym);
                boolean inside = d >= exclusionMm;
                boolean central = centre != null && d >= centreMm;
                double margin = Math.abs(d - exclusionMm);
                if (centre != null) {
                    margin = Math.min(margin, Math.abs(d - centreMm));
                }
                int run = margin > slack ? 1 + (int) Math.min(w, Math.floor((margin - slack) / pitch)) : 1;
                int end = Math.min(w, x + run);
                if (!inside) {
                    x = end;
                    continue;
                }
                for (; x < end; x++) {
                    int i = row + x;
                    if (tau[i] == tau[i]) {
                        in[i] = true;
                        indices[count++] = i;
                        if (central) {
                            centre[i] = true;
                        }
                    }
                }
            }
        }
        return new Masks(in, indices, count, centre);
    }

    /** A Mask of the same pixels as a boolean array. */
    static Mask mask(boolean[] in, PixelGrid grid) {
        return Mask.of(grid.width(), grid.height(), i -> in[i]);
    }

    /**
     * Harmonic-mean lifetime of the evaluated pixels outside the centre over that of those inside, each over the
     * positive lifetimes in index order (as {@link MapStatistics#harmonicMean()} sums them).
     */
    static double edgeToCentre(float[] tau, Masks masks) {
        double edgeSum = 0;
        double centreSum = 0;
        int edgeCount = 0;
        int centreCount = 0;
        int[] idx = masks.indices();
        boolean[] centre = masks.centre();
        for (int k = 0, n = masks.count(); k < n; k++) {
            int i = idx[k];
            double v = tau[i];
            if (v > 0) {
                if (centre[i]) {
                    centreSum += 1 / v;
                    centreCount++;
                } else {
                    edgeSum += 1 / v;
                    edgeCount++;
                }
            }
        }
        double e = edgeCount == 0 ? Double.NaN : edgeCount / edgeSum;
        double c = centreCount == 0 ? Double.NaN : centreCount / centreSum;
        return e / c;
    }

    /**
     * The figures of one map over the evaluated pixels, equal to those of {@link MapStatistics#of} over the same
     * pixels: the count of valid (not NaN) values, their area, the harmonic mean of the positive values (reciprocals
     * summed in index order) and type-7 percentiles from the same exact order statistics
     * ({@link MapStatistics#percentiles}), in one pass without the figures the batch does not use.
     */
    record Sample(int count, double areaMm2, double harmonicMean, double median, double[] percents,
                  double[] values) {
        static Sample of(float[] s, Masks masks, PixelGrid grid, double[] percents) {
            return of(s, masks, grid, percents, true);
        }

        /** As {@link #of(float[], Masks, PixelGrid, double[])}; without the harmonic mean (NaN) unless asked for. */
        static Sample of(float[] s, Masks masks, PixelGrid grid, double[] percents, boolean harmonic) {
            return ofPacked(gather(s, masks), masks.count(), grid, percents, harmonic);
        }

        /** The samples of the evaluated pixels, in index order. */
        static float[] gather(float[] s, Masks masks) {
            int[] idx = masks.indices();
            float[] v = new float[masks.count()];
            for (int k = 0; k < v.length; k++) {
                v[k] = s[idx[k]];
            }
            return v;
        }

        /**
         * As {@link #of(float[], Masks, PixelGrid, double[], boolean)} from the evaluated pixels' samples packed in
         * index order, {@code v[0..n)}, which it reorders.
         */
        static Sample ofPacked(float[] v, int n, PixelGrid grid, double[] percents, boolean harmonic) {
            int m = 0;
            int positive = 0;
            double reciprocalSum = 0;
            for (int k = 0; k < n; k++) {
                float f = v[k];
                if (f == f) {
                    v[m++] = f;
                    if (harmonic && f > 0) {
                        reciprocalSum += 1 / (double) f;
                        positive++;
                    }
                }
            }
            double[] wanted = Arrays.copyOf(percents, percents.length + 1);
            wanted[percents.length] = 50;
            double[] est = MapStatistics.percentiles(v, m, wanted);
            return new Sample(m, m * grid.pixelAreaMm2(), positive == 0 ? Double.NaN : positive / reciprocalSum,
                    est[percents.length], percents.clone(), Arrays.copyOf(est, percents.length));
        }

        /** The estimate of a requested percentile (or 50). */
        double percentile(double percent) {
            if (percent == 50) {
                return median;
            }
            for (int k = 0; k < percents.length; k++) {
                if (percents[k] == percent) {
                    return values[k];
                }
            }
            throw new IllegalArgumentException("percentile " + percent + " was not requested");
        }
    }

    private static double[] percents(List<Figure> figures, Figure.Kind kind) {
        return figures.stream().filter(f -> f.kind() == kind).mapToDouble(Figure::percent).toArray();
    }

    static Footprint footprint(String family, PixelGrid grid, boolean[] evaluated, BitSet flagged) {
        double p = FOOTPRINT_PITCH_MM;
        int w = grid.width();
        int h = grid.height();
        int i0 = cell(Math.min(grid.xMm(0), grid.xMm(w - 1)), p);
        int i1 = cell(Math.max(grid.xMm(0), grid.xMm(w - 1)), p);
        int j0 = cell(Math.min(grid.yMm(0), grid.yMm(h - 1)), p);
        int j1 = cell(Math.max(grid.yMm(0), grid.yMm(h - 1)), p);
        int cw = i1 - i0 + 1;
        int ch = j1 - j0 + 1;
        int[] column = new int[w];
        for (int x = 0; x < w; x++) {
            column[x] = cell(grid.xMm(x), p) - i0;
        }
        // runs of columns in the same cell: a cell of a row is covered once any of its pixels is evaluated
        int[] runStart = new int[w + 1];
        int runs = 0;
        for (int x = 0; x < w; x++) {
            if (x == 0 || column[x] != column[x - 1]) {
                runStart[runs++] = x;
            }
        }
        runStart[runs] = w;
        long[] words = new long[(cw * ch + 63) >>> 6]; // the covered cells, as the words of a BitSet
        for (int y = 0; y < h; y++) {
            int rowCell = (cell(grid.yMm(y), p) - j0) * cw;
            int row = y * w;
            for (int r = 0; r < runs; r++) {
                for (int x = runStart[r], end = runStart[r + 1]; x < end; x++) {
                    if (evaluated[row + x]) {
                        int c = rowCell + column[x];
                        words[c >>> 6] |= 1L << c;
                        break;
                    }
                }
            }
        }
        BitSet hit = new BitSet(cw * ch);
        for (int i = flagged.nextSetBit(0); i >= 0; i = flagged.nextSetBit(i + 1)) {
            int y = i / w;
            hit.set((cell(grid.yMm(y), p) - j0) * cw + column[i - y * w]); // flagged pixels are evaluated ones
        }
        return new Footprint(family, p, i0, j0, cw, ch, BitSet.valueOf(words), hit);
    }

    static int cell(double mm, double pitchMm) {
        return (int) Math.floor(mm / pitchMm + 0.5);
    }

    /**
     * A thumbnail of {@link #THUMBNAIL_PX} px along its longer side (smaller maps are enlarged): the map sampled at
     * the centre of each thumbnail pixel (nearest neighbour), drawn in the default colours over
     * {@code [lowUs, highUs]} (NaN: the picture's own range), with a line {@link #OUTLINE_PX} px wide in
     * {@link #OUTLINE_ARGB} drawn just outside each flagged region, so that the region itself keeps its colours. A
     * thumbnail pixel counts as flagged when any map pixel in it is flagged, so no region is too small to be seen.
     */
    static BufferedImage thumbnail(WaferMap map, BitSet flagged, double lowUs, double highUs) {
        int w = map.width();
        int h = map.height();
        double scale = (double) Math.max(w, h) / THUMBNAIL_PX; // map pixels per thumbnail pixel
        int tw = Math.max(1, (int) Math.round(w / scale));
        int th = Math.max(1, (int) Math.round(h / scale));
        int[] sx = new int[tw];
        int[] sy = new int[th];
        for (int tx = 0; tx < tw; tx++) {
            sx[tx] = Math.min(w - 1, (int) ((tx + 0.5) * scale));
        }
        for (int ty = 0; ty < th; ty++) {
            sy[ty] = Math.min(h - 1, (int) ((ty + 0.5) * scale));
        }
        float[] s = map.raster().samples();
        float[] small = new float[tw * th];
        boolean[] hit = new boolean[tw * th];
        for (int ty = 0; ty < th; ty++) {
            for (int tx = 0; tx < tw; tx++) {
                int i = sy[ty] * w + sx[tx];
                small[ty * tw + tx] = s[i];
                hit[ty * tw + tx] = flagged.get(i);
            }
        }
        for (int i = flagged.nextSetBit(0); i >= 0; i = flagged.nextSetBit(i + 1)) {
            int tx = Math.min(tw - 1, (int) ((i % w) / scale));
            int ty = Math.min(th - 1, (int) ((i / w) / scale));
            hit[ty * tw + tx] = true;
        }
        PixelGrid g = map.grid();
        PixelGrid sg = new PixelGrid(tw, th, g.pitchMm() * scale, (g.centreXPx() + 0.5) / scale - 0.5,
                (g.centreYPx() + 0.5) / scale - 0.5);
        PngStyle style = PngStyle.DEFAULT;
        if (lowUs > 0 && highUs > lowUs) {
            style = style.withRange(lowUs, highUs);
        }
        BufferedImage out = MapFiles.picture(new WaferMap(FloatRaster.wrap(tw, th, small), sg, map.quantity(),
                map.waferId(), map.conditions(), map.provenance()), style);
        boolean[] near = dilate(hit, tw, th, OUTLINE_PX);
        int[] argb = ((DataBufferInt) out.getRaster().getDataBuffer()).getData(); // TYPE_INT_ARGB, no offset
        for (int i = 0; i < near.length; i++) {
            if (near[i] && !hit[i]) {
                argb[i] = OUTLINE_ARGB;
            }
        }
        return out;
    }

    /** The pixels within {@code r} pixels (Chebyshev distance) of a set pixel: a square dilation, rows then columns. */
    static boolean[] dilate(boolean[] b, int w, int h, int r) {
        boolean[] rows = new boolean[b.length];
        for (int y = 0; y < h; y++) {
            int row = y * w;
            int last = Integer.MIN_VALUE / 2; // x of the last set pixel seen, scanning right
            for (int x = 0; x < w + r; x++) {
                if (x < w && b[row + x]) {
                    last = x;
                }
                int at = x - r; // pixel whose window [at - r, at + r] ends at x
                if (at >= 0 && at < w) {
                    rows[row + at] = x - last <= 2 * r;
                }
            }
        }
        boolean[] out = new boolean[b.length];
        for (int x = 0; x < w; x++) {
            int last = Integer.MIN_VALUE / 2;
            for (int y = 0; y < h + r; y++) {
                if (y < h && rows[y * w + x]) {
                    last = y;
                }
                int at = y - r;
                if (at >= 0 && at < h) {
                    out[at * w + x] = y - last <= 2 * r;
                }
            }
        }
        return out;
    }

    private static void writeThumbnail(WaferMap map, BitSet flagged, double lowUs, double highUs, Path file) {
        BufferedImage img = thumbnail(map, flagged, lowUs, highUs);
        Path tmp = file.resolveSibling(file.getFileName() + ".tmp");
        try {
            PngFiles.write(img, tmp);
            java.nio.file.Files.move(tmp, file, java.nio.file.StandardCopyOption.REPLACE_EXISTING,
                    java.nio.file.StandardCopyOption.ATOMIC_MOVE);
        } catch (IOException e) {
            throw new java.io.UncheckedIOException("thumbnail " + file + ": " + e.getMessage(), e);
        }
    }
}
