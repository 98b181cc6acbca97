package trapmap.maps.batch;

import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;
import java.nio.file.Path;
import java.util.Locale;
import trapmap.maps.geometry.OutlineFit;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;

/**
 * The steps of {@link WaferInspection#evaluation} for one lifetime map, one after the other, each timed in CPU of the
 * calling thread, for the benchmark of the stages ({@code trapmap.maps.bench.InspectStagesBench}): the same calls
 * with the same working arrays, with the profile that matches the map, which must be a lifetime map judged by trap density. Not used by the program; not thread-safe.
 */
public final class InspectionStages {
    /** Stage names, in the order they run. */
    public static final String[] NAMES = {"read", "outline", "masks", "convert", "judged", "regions", "percentiles",
        "footprint", "thumbnail"};

    private final Rules rules;
    private final InspectionBuffers buffers = new InspectionBuffers();
    private final ThreadMXBean bean = ManagementFactory.getThreadMXBean();

    public InspectionStages(Rules rules) {
        this.rules = rules;
    }

    /** Runs the stages on {@code file} and adds their CPU times, ns, to {@code ns} (indexed as {@link #NAMES}). */
    public void run(Path file, Path thumbnail, long[] ns) throws java.io.IOException {
        long t = bean.getCurrentThreadCpuTime();
        WaferMap read = MapFiles.readSingle(file);
        WaferMap lifetime = read.withConditions(rules.applyTo(read.conditions()));
        t = lap(ns, 0, t);
        PixelGrid grid = lifetime.grid();
        float[] tau = lifetime.raster().samples();
        OutlineFit fit = OutlineFits.fit(tau, grid);
        WaferShape shape = fit.shape();
        String family = fit.closestFormat().batchFamily();
        Rules.Profile profile = rules.profileFor(file.getFileName().toString(),
                lifetime.conditions().doping().type(), family);
        Defect defect = DefectLibrary.byId(profile.defectId());
        t = lap(ns, 1, t);
        float[] life = buffers.life(grid.width() * grid.height());
        Masks masks = Masks.of(tau, grid, shape, rules.edgeExclusionMm(), Double.NaN, buffers, life);
        int count = masks.count();
        t = lap(ns, 2, t);
        ConversionSettings settings = ConversionSettings.of(rules.physics());
        Conditions conditions = MapConversion.physicsConditions(lifetime.conditions(), settings);
        float[] converted = buffers.density(life.length);
        byte[] status = buffers.status(life.length);
        WaferInspection.convertPacked(conditions, defect, life, count, converted, status);
        t = lap(ns, 3, t);
        WaferInspection.Judged j = WaferInspection.judged(life, count, converted, status, false, masks.missing(),
                grid.pixelAreaMm2(), buffers);
        t = lap(ns, 4, t);
        Rules.Flag flag = profile.flag();
        FlaggedRegions regions = FlaggedRegions.findPacked(j.judged(), j.judged(), grid, masks.indices(), count,
                flag.criteria(), shape, rules.edgeExclusionMm(), buffers);
        t = lap(ns, 5, t);
        Sample dens = Sample.ofCounted(j.ranked(), j.rankedCount(), grid, new double[] {95}, 0, 0,
                buffers.densityBuckets());
        Sample life2 = Sample.ofCounted(life, count, grid, new double[] {Thumbnails.LOW_PERCENT,
            Thumbnails.HIGH_PERCENT}, j.lifePositive(), j.lifeReciprocalSum(), buffers.lifeBuckets());
        t = lap(ns, 6, t);
        Footprint.of(family, grid, masks.indices(), count, regions.pixels());
        t = lap(ns, 7, t);
        if (thumbnail != null) {
            Thumbnails.write(lifetime, regions.pixels(), life2.percentile(Thumbnails.LOW_PERCENT),
                    life2.percentile(Thumbnails.HIGH_PERCENT), false, thumbnail);
        }
        lap(ns, 8, t);
        if (dens.count() < 0) {
            throw new AssertionError();
        }
    }

    private long lap(long[] ns, int stage, long t) {
        long now = bean.getCurrentThreadCpuTime();
        ns[stage] += now - t;
        return now;
    }

    /** One line of the mean CPU ms per map of every stage over {@code maps} maps. */
    public static String line(long[] ns, int maps) {
        StringBuilder b = new StringBuilder();
        long sum = 0;
        for (int s = 0; s < NAMES.length; s++) {
            b.append(String.format(Locale.ROOT, "%s %.2f, ", NAMES[s], ns[s] / 1e6 / maps));
            sum += ns[s];
        }
        return b.append(String.format(Locale.ROOT, "sum %.2f", sum / 1e6 / maps)).toString();
    }
}
