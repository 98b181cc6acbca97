package trapmap.maps.batch;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.BitSet;
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
import trapmap.maps.region.Region;
import trapmap.maps.region.RegionCriteria;
import trapmap.maps.region.RegionTable;
import trapmap.maps.region.ThresholdRegions;
import trapmap.maps.stats.MapStatistics;
import trapmap.maps.stats.StatisticsRequest;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;

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

    /** Reads one map; {@link MapFiles#readSingle(Path)} unless a test counts the reads. */
    @FunctionalInterface
    public interface MapReader {
        WaferMap read(Path file) throws IOException;
    }

    private final Rules rules;
    private final MapReader reader;
    private final Defect defect;

    public WaferInspection(Rules rules) {
        this(rules, MapFiles::readSingle);
    }

    public WaferInspection(Rules rules, MapReader reader) {
        this.rules = rules;
        this.reader = reader;
        this.defect = rules.defectId() == null ? null : DefectLibrary.byId(rules.defectId());
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
        WaferMap map = read.withConditions(rules.applyTo(read.conditions()));
        WaferMap lifetime = switch (map.quantity()) {
            case EFFECTIVE_LIFETIME -> map;
            case PL_COUNTS -> MapConversion.lifetimeFromPl(map);
            default -> throw new IllegalArgumentException("a " + map.quantity().key()
                    + " map cannot be inspected; expected an effective-lifetime or PL-counts map");
        };
        WaferMap density = rules.needsTrapDensity()
                ? MapConversion.convert(lifetime, defect, ConversionSettings.DEFAULTS, 1).get(Quantity.TRAP_DENSITY)
                : null;
        PixelGrid grid = lifetime.grid();

        String family;
        WaferShape shape;
        if (rules.waferFormat() != null) {
            shape = rules.waferFormat().shape();
            family = rules.waferFormat().id();
        } else {
            OutlineFit fit;
            try {
                fit = OutlineDetection.fit(lifetime.raster(), grid);
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
        Mask mask = Mask.valid(lifetime.raster());
        if (shape != null) {
            mask = mask.and(shape.mask(grid, rules.edgeExclusionMm()));
        }

        List<Figure> figures = rules.figures();
        MapStatistics life = MapStatistics.of(lifetime, mask, StatisticsRequest.of(percents(figures,
                Figure.Kind.LIFETIME_PERCENTILE)));
        MapStatistics dens = density == null ? null : MapStatistics.of(density, mask.and(Mask.valid(
                density.raster())), StatisticsRequest.of(percents(figures, Figure.Kind.TRAP_DENSITY_PERCENTILE)));

        Rules.Flag flag = rules.flag();
        WaferMap flagMap = flag.quantity() == Rules.FlagQuantity.LIFETIME ? lifetime : density;
        RegionCriteria criteria = flag.quantity() == Rules.FlagQuantity.LIFETIME
                ? RegionCriteria.below(flag.threshold(), flag.minAreaMm2())
                : RegionCriteria.above(flag.threshold(), flag.minAreaMm2());
        RegionTable regions = ThresholdRegions.find(flagMap, mask, criteria, shape);
        Region worst = regions.size() == 0 ? null : regions.byArea().get(0);
        double flaggedFraction = life.areaMm2() > 0 ? regions.totalAreaMm2() / life.areaMm2() : Double.NaN;

        Map<String, Double> values = new LinkedHashMap<>();
        for (Figure f : figures) {
            double v = switch (f.kind()) {
                case HARMONIC_MEAN_LIFETIME -> life.harmonicMean();
                case MEDIAN_LIFETIME -> life.median();
                case LIFETIME_PERCENTILE -> life.percentile(f.percent());
                case TRAP_DENSITY_PERCENTILE -> dens.percentile(f.percent());
                case FLAGGED_AREA_FRACTION -> flaggedFraction;
                case LARGEST_REGION -> worst == null ? 0 : worst.areaMm2();
                case EDGE_TO_CENTRE_RATIO -> edgeToCentre(lifetime, mask, shape);
            };
            values.put(f.name(), v);
        }
        List<String> failed = new ArrayList<>();
        for (Rules.Limit l : rules.limits()) {
            if (!l.holds(values.get(l.figure().name()))) {
                failed.add(l.figure().name());
            }
        }
        String grade = "";
        for (Rules.Grade g : rules.grades()) {
            if (g.when().stream().allMatch(l -> l.holds(values.get(l.figure().name())))) {
                grade = g.grade();
                break;
            }
        }
        BitSet flaggedPixels = flaggedPixels(flagMap.raster(), grid, mask, criteria);
        Footprint footprint = footprint(family, grid, mask, flaggedPixels);
        if (thumbnail != null) {
            writeThumbnail(lifetime, flaggedPixels, thumbnail);
        }
        return new WaferResult(name, map.waferId(), failed.isEmpty() ? WaferResult.Status.PASS
                : WaferResult.Status.FAIL, grade, values, failed, worst, "", footprint);
    }

    private boolean usesEdgeRatio() {
        return rules.figures().stream().anyMatch(f -> f.kind() == Figure.Kind.EDGE_TO_CENTRE_RATIO);
    }

    private double edgeToCentre(WaferMap lifetime, Mask mask, WaferShape shape) {
        Mask centre = mask.and(shape.mask(lifetime.grid(), rules.edgeExclusionMm() + rules.edgeBandMm()));
        Mask edge = mask.and(centre.not());
        StatisticsRequest none = StatisticsRequest.of(new double[0]);
        double e = MapStatistics.of(lifetime, edge, none).harmonicMean();
        double c = MapStatistics.of(lifetime, centre, none).harmonicMean();
        return e / c;
    }

    private static double[] percents(List<Figure> figures, Figure.Kind kind) {
        return figures.stream().filter(f -> f.kind() == kind).mapToDouble(Figure::percent).toArray();
    }

    /** Pixels of the 8-connected groups of selected pixels whose area reaches the criteria's minimum. */
    public static BitSet flaggedPixels(FloatRaster raster, PixelGrid grid, Mask mask, RegionCriteria criteria) {
        int w = raster.width();
        int h = raster.height();
        float[] s = raster.samples();
        BitSet open = new BitSet(s.length);
        for (int i = 0; i < s.length; i++) {
            if (mask.containsIndex(i) && criteria.selects(s[i])) {
                open.set(i);
            }
        }
        BitSet kept = new BitSet(s.length);
        int[] queue = new int[Math.max(16, open.cardinality())];
        for (int seed = open.nextSetBit(0); seed >= 0; seed = open.nextSetBit(seed + 1)) {
            open.clear(seed);
            int head = 0;
            int tail = 0;
            queue[tail++] = seed;
            while (head < tail) {
                int i = queue[head++];
                int x = i % w;
                int y = i / w;
                for (int dy = -1; dy <= 1; dy++) {
                    for (int dx = -1; dx <= 1; dx++) {
                        int nx = x + dx;
                        int ny = y + dy;
                        if (nx >= 0 && ny >= 0 && nx < w && ny < h && open.get(ny * w + nx)) {
                            open.clear(ny * w + nx);
                            queue[tail++] = ny * w + nx;
                        }
                    }
                }
            }
            if (tail * grid.pixelAreaMm2() >= criteria.minAreaMm2()) {
                for (int k = 0; k < tail; k++) {
                    kept.set(queue[k]);
                }
            }
        }
        return kept;
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
        BitSet covered = new BitSet(cw * ch);
        BitSet hit = new BitSet(cw * ch);
        for (int y = 0; y < h; y++) {
            int j = cell(grid.yMm(y), p) - j0;
            for (int x = 0; x < w; x++) {
                int idx = y * w + x;
                if (mask.containsIndex(idx)) {
                    int c = j * cw + cell(grid.xMm(x), p) - i0;
                    covered.set(c);
                    if (flagged.get(idx)) {
                        hit.set(c);
                    }
                }
            }
        }
        return new Footprint(family, p, i0, j0, cw, ch, covered, hit);
    }

    static int cell(double mm, double pitchMm) {
        return (int) Math.floor(mm / pitchMm + 0.5);
    }

    /**
     * A thumbnail of at most {@link #THUMBNAIL_PX} px a side: the map's picture sampled at the centre of each block
     * of pixels, with the border of the flagged regions drawn in {@link #OUTLINE_ARGB}.
     */
    static BufferedImage thumbnail(WaferMap map, BitSet flagged) {
        BufferedImage full = MapFiles.picture(map, PngStyle.DEFAULT);
        int w = map.width();
        int h = map.height();
        int k = Math.max(1, (Math.max(w, h) + THUMBNAIL_PX - 1) / THUMBNAIL_PX);
        int tw = (w + k - 1) / k;
        int th = (h + k - 1) / k;
        boolean[] block = new boolean[tw * th];
        for (int i = flagged.nextSetBit(0); i >= 0; i = flagged.nextSetBit(i + 1)) {
            block[(i / w / k) * tw + (i % w) / k] = true;
        }
        BufferedImage out = new BufferedImage(tw, th, BufferedImage.TYPE_INT_ARGB);
        for (int ty = 0; ty < th; ty++) {
            for (int tx = 0; tx < tw; tx++) {
                int sx = Math.min(w - 1, tx * k + k / 2);
                int sy = Math.min(h - 1, ty * k + k / 2);
                int argb = full.getRGB(sx, sy);
                if (block[ty * tw + tx] && border(block, tw, th, tx, ty)) {
                    argb = OUTLINE_ARGB;
                }
                out.setRGB(tx, ty, argb);
            }
        }
        return out;
    }

    private static boolean border(boolean[] b, int w, int h, int x, int y) {
        return x == 0 || y == 0 || x == w - 1 || y == h - 1 || !b[y * w + x - 1] || !b[y * w + x + 1]
                || !b[(y - 1) * w + x] || !b[(y + 1) * w + x];
    }

    private static void writeThumbnail(WaferMap map, BitSet flagged, Path file) {
        BufferedImage img = thumbnail(map, flagged);
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
