package trapmap.maps.batch;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.BitSet;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import javax.imageio.ImageIO;
import trapmap.maps.geometry.OutlineDetection;
import trapmap.maps.geometry.OutlineFit;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.MapFormatException;
import trapmap.maps.io.PngStyle;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.maps.region.RegionCriteria;
import trapmap.maps.stats.MapStatistics;
import trapmap.maps.stats.StatisticsRequest;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

/**
 * Inspects one wafer map against {@link Rules}: reads it, applies the rules' conditions, converts it to trap density
 * when the rules need that, evaluates every figure over the wafer less the edge exclusion, finds the flagged regions
 * and decides pass/fail and the grade. Thread-safe; one call holds one map.
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
    record Evaluation(WaferResult result, WaferMap lifetime, WaferMap density, WaferShape shape, Mask evaluated,
                      FlaggedRegions regions) {
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
        WaferMap density = profile.needsTrapDensity()
                ? MapConversion.convert(lifetime, defects.get(profile.defectId()), ConversionSettings.DEFAULTS, 1)
                        .get(Quantity.TRAP_DENSITY)
                : null;

        List<Figure> figures = profile.figures();
        boolean edgeRatio = figures.stream().anyMatch(f -> f.kind() == Figure.Kind.EDGE_TO_CENTRE_RATIO);
        Masks masks = masks(tau, grid, shape, rules.edgeExclusionMm(),
                edgeRatio ? rules.edgeExclusionMm() + rules.edgeBandMm() : Double.NaN);
        Mask mask = masks.evaluated();
        double[] lifePercents = percents(figures, Figure.Kind.LIFETIME_PERCENTILE);
        double[] withRange = java.util.Arrays.copyOf(lifePercents, lifePercents.length + 2);
        withRange[lifePercents.length] = THUMBNAIL_LOW_PERCENT;
        withRange[lifePercents.length + 1] = THUMBNAIL_HIGH_PERCENT;
        MapStatistics life = MapStatistics.of(lifetime, mask, StatisticsRequest.of(thumbnail == null ? lifePercents
                : withRange));
        MapStatistics dens = density == null ? null : MapStatistics.of(density, mask, StatisticsRequest.of(
                percents(figures, Figure.Kind.TRAP_DENSITY_PERCENTILE)));

        Rules.Flag flag = profile.flag();
        WaferMap flagMap = flag.quantity() == Rules.FlagQuantity.LIFETIME ? lifetime : density;
        RegionCriteria criteria = flag.quantity() == Rules.FlagQuantity.LIFETIME
                ? RegionCriteria.below(flag.threshold(), flag.minAreaMm2())
                : RegionCriteria.above(flag.threshold(), flag.minAreaMm2());
        FlaggedRegions regions = FlaggedRegions.find(flagMap.raster(), grid, mask, criteria, shape,
                density == null ? null : density.raster().samples());
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
                case EDGE_TO_CENTRE_RATIO -> edgeToCentre(tau, mask, masks.centre());
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
        Footprint footprint = footprint(family, grid, mask, regions.pixels());
        if (thumbnail != null) {
            writeThumbnail(lifetime, regions.pixels(), life.percentile(THUMBNAIL_LOW_PERCENT),
                    life.percentile(THUMBNAIL_HIGH_PERCENT), thumbnail);
        }
        WaferResult result = new WaferResult(name, map.waferId(), failed.isEmpty() ? WaferResult.Status.PASS
                : WaferResult.Status.FAIL, grade, profile.name(), profile.defectId(), values, failed,
                missed, regions.regions(), "", footprint);
        return new Evaluation(result, lifetime, density, shape, mask, regions);
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

    /** Maps wider or taller than this are fitted on a block-reduced validity mask (see {@link #fitOutline}). */
    static final int FIT_MAX_PX = 320;

    /**
     * The outline of the valid pixels. A map of at most {@link #FIT_MAX_PX} pixels a side is fitted as it is; a
     * larger one on a validity mask reduced by k×k blocks (k the smallest that brings it within the limit; a block is
     * valid when at least half of its pixels are), whose grid has k times the pitch and the same wafer coordinates.
     * The outline then rests on edge points spaced k pixels apart: at 1024² (k = 4) it stays within a fraction of a
     * coarse pixel of the full-resolution fit (checked by the tests), at a sixteenth of the cost.
     */
    static OutlineFit fitOutline(float[] tau, PixelGrid grid) {
        int w = grid.width();
        int h = grid.height();
        int k = (Math.max(w, h) + FIT_MAX_PX - 1) / FIT_MAX_PX;
        if (k <= 1) {
            return OutlineDetection.fit(Mask.of(w, h, i -> tau[i] == tau[i]), grid);
        }
        int cw = w / k;
        int ch = h / k;
        int[] counts = new int[cw * ch];
        for (int y = 0; y < ch * k; y++) {
            int row = (y / k) * cw;
            int base = y * w;
            for (int x = 0; x < cw * k; x++) {
                float v = tau[base + x];
                if (v == v) {
                    counts[row + x / k]++;
                }
            }
        }
        int half = (k * k + 1) / 2;
        PixelGrid coarse = new PixelGrid(cw, ch, grid.pitchMm() * k, (grid.centreXPx() - (k - 1) / 2.0) / k,
                (grid.centreYPx() - (k - 1) / 2.0) / k);
        return OutlineDetection.fit(Mask.of(cw, ch, i -> counts[i] >= half), coarse);
    }

    /**
     * The evaluated pixels (valid and at least {@code exclusionMm} inside the outline) and, when {@code centreMm} is
     * a number, the centre pixels (at least {@code centreMm} inside).
     */
    record Masks(Mask evaluated, Mask centre) {
    }

    /**
     * The masks of {@link Masks}, identical to {@code Mask.valid(raster).and(shape.mask(grid, e))}. The distance to the
     * outline changes by at most the distance moved (it is 1-Lipschitz), so after one exact distance d the next
     * pixels of the row up to |d − e| away are on the same side of every threshold e and are filled without being
     * computed; only pixels near a threshold are computed one by one.
     */
    static Masks masks(float[] tau, PixelGrid grid, WaferShape shape, double exclusionMm, double centreMm) {
        int w = grid.width();
        int h = grid.height();
        boolean[] in = new boolean[w * h];
        boolean[] centre = Double.isNaN(centreMm) ? null : new boolean[w * h];
        if (shape == null) {
            for (int i = 0; i < in.length; i++) {
                in[i] = tau[i] == tau[i];
            }
            return new Masks(Mask.of(w, h, i -> in[i]), centre == null ? null : Mask.of(w, h, i -> false));
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
                for (; x < end; x++) {
                    int i = row + x;
                    in[i] = inside && tau[i] == tau[i];
                    if (centre != null) {
                        centre[i] = central && in[i];
                    }
                }
            }
        }
        return new Masks(Mask.of(w, h, i -> in[i]), centre == null ? null : Mask.of(w, h, i -> centre[i]));
    }

    /**
     * Harmonic-mean lifetime of the evaluated pixels outside {@code centre} over that of those inside, each over the
     * positive lifetimes in index order (as {@link MapStatistics#harmonicMean()} sums them).
     */
    static double edgeToCentre(float[] tau, Mask evaluated, Mask centre) {
        double edgeSum = 0;
        double centreSum = 0;
        int edgeCount = 0;
        int centreCount = 0;
        for (int i = evaluated.nextIndex(0); i >= 0; i = evaluated.nextIndex(i + 1)) {
            double v = tau[i];
            if (v > 0) {
                if (centre.containsIndex(i)) {
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

    private static double[] percents(List<Figure> figures, Figure.Kind kind) {
        return figures.stream().filter(f -> f.kind() == kind).mapToDouble(Figure::percent).toArray();
    }

    static Footprint footprint(String family, PixelGrid grid, Mask mask, BitSet flagged) {
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
        BitSet covered = new BitSet(cw * ch);
        BitSet hit = new BitSet(cw * ch);
        for (int idx = mask.nextIndex(0); idx >= 0; idx = mask.nextIndex(idx + 1)) {
            int y = idx / w;
            int c = (cell(grid.yMm(y), p) - j0) * cw + column[idx - y * w];
            covered.set(c);
            if (flagged.get(idx)) {
                hit.set(c);
            }
        }
        return new Footprint(family, p, i0, j0, cw, ch, covered, hit);
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
        for (int ty = 0; ty < th; ty++) {
            for (int tx = 0; tx < tw; tx++) {
                if (!hit[ty * tw + tx] && near(hit, tw, th, tx, ty, OUTLINE_PX)) {
                    out.setRGB(tx, ty, OUTLINE_ARGB);
                }
            }
        }
        return out;
    }

    /** True when a flagged pixel lies within {@code r} pixels (Chebyshev distance) of (x, y). */
    private static boolean near(boolean[] b, int w, int h, int x, int y, int r) {
        for (int yy = Math.max(0, y - r); yy <= Math.min(h - 1, y + r); yy++) {
            for (int xx = Math.max(0, x - r); xx <= Math.min(w - 1, x + r); xx++) {
                if (b[yy * w + xx]) {
                    return true;
                }
            }
        }
        return false;
    }

    private static void writeThumbnail(WaferMap map, BitSet flagged, double lowUs, double highUs, Path file) {
        BufferedImage img = thumbnail(map, flagged, lowUs, highUs);
        Path tmp = file.resolveSibling(file.getFileName() + ".tmp");
        try {
            if (!ImageIO.write(img, "png", tmp.toFile())) {
                throw new IOException("no PNG writer");
            }
            java.nio.file.Files.move(tmp, file, java.nio.file.StandardCopyOption.REPLACE_EXISTING,
                    java.nio.file.StandardCopyOption.ATOMIC_MOVE);
        } catch (IOException e) {
            throw new java.io.UncheckedIOException("thumbnail " + file + ": " + e.getMessage(), e);
        }
    }
}
