package trapmap.maps.bench;

import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.stream.Stream;
import trapmap.maps.batch.InspectionBuffers;
import trapmap.maps.batch.InspectionStages;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.WaferInspection;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.physics.defect.DefectLibrary;

/**
 * CPU time of the stages of one wafer's inspection, in one thread, so that the figures hold on a busy machine:
 * reading a map, reading + converting it to trap density, and the whole inspection (with a thumbnail). Medians over
 * the maps after a warm-up over the first quarter; the inspection keeps one worker's arrays from map to map as the batch
 * does. Arguments: {@code MAPS_DIR RULES [maps [passes]]}; with
 * {@code passes} &gt; 0 it first times the steady state: every stage of the inspection over that many more passes over
 * the maps, in one process, after the just-in-time compiler has settled. Not a unit test: run it
 * from {@code scripts/bench-inspect} ({@code BENCH_STAGES=1}).
 */
public final class InspectStagesBench {
    private InspectStagesBench() {
    }

    public static void main(String[] args) throws Exception {
        Path dir = Path.of(args[0]);
        Rules rules = Rules.read(Path.of(args[1]));
        int n = args.length > 2 ? Integer.parseInt(args[2]) : 40;
        int passes = args.length > 3 ? Integer.parseInt(args[3]) : 0;
        List<Path> files;
        try (Stream<Path> s = Files.list(dir)) {
            files = s.filter(p -> p.toString().endsWith(".tif")).sorted().limit(n).toList();
        }
        Path thumbs = Files.createTempDirectory("trapmap-bench-thumbs");
        ThreadMXBean bean = ManagementFactory.getThreadMXBean();
        if (passes > 0) {
            // first, so that the just-in-time compiler's profile is that of the inspection alone, as in the batch
            steady(files, rules, thumbs, passes, bean);
        }
        WaferInspection inspection = new WaferInspection(rules);
        InspectionBuffers buffers = new InspectionBuffers(); // one worker's arrays, as in the batch
        int warm = files.size() / 4;
        double[] read = new double[files.size() - warm];
        double[] convert = new double[read.length];
        double[] inspect = new double[read.length];
        for (int i = 0; i < files.size(); i++) {
            Path f = files.get(i);
            long t0 = bean.getCurrentThreadCpuTime();
            WaferMap m = MapFiles.readSingle(f);
            long t1 = bean.getCurrentThreadCpuTime();
            MapConversion.convert(m, DefectLibrary.byId("fe-i"), ConversionSettings.DEFAULTS, 1);
            long t2 = bean.getCurrentThreadCpuTime();
            inspection.inspect(f, thumbs.resolve(f.getFileName() + ".png"), buffers);
            long t3 = bean.getCurrentThreadCpuTime();
            if (i >= warm) {
                read[i - warm] = (t1 - t0) / 1e6;
                convert[i - warm] = (t2 - t1) / 1e6;
                inspect[i - warm] = (t3 - t2) / 1e6;
            }
        }
        System.out.printf(Locale.ROOT, "CPU ms per map (median of %d after %d warm-up): read %.1f, convert %.1f,"
                + " whole inspection %.1f%n", read.length, warm, median(read), median(convert), median(inspect));
        // the lower quartile shifts less when other processes share the cores
        System.out.printf(Locale.ROOT, "CPU ms per map (lower quartile): read %.1f, convert %.1f,"
                + " whole inspection %.1f%n", quartile(read), quartile(convert), quartile(inspect));
        try (Stream<Path> s = Files.list(thumbs)) {
            for (Path p : (Iterable<Path>) s::iterator) {
                Files.delete(p);
            }
        }
        Files.delete(thumbs);
    }

    /**
     * The steady state: {@code passes} passes over the maps in one thread after one warm-up pass, the stages of
     * {@link InspectionStages} timed one by one, then the whole inspection with and without a thumbnail; means per map.
     */
    private static void steady(List<Path> files, Rules rules, Path thumbs, int passes, ThreadMXBean bean)
            throws Exception {
        InspectionStages stages = new InspectionStages(rules);
        WaferInspection inspection = new WaferInspection(rules);
        InspectionBuffers buffers = new InspectionBuffers();
        long[] ns = new long[InspectionStages.NAMES.length];
        for (int pass = 0; pass <= passes; pass++) {
            if (pass == 1) {
                Arrays.fill(ns, 0);
            }
            for (Path f : files) {
                stages.run(f, thumbs.resolve(f.getFileName() + ".png"), ns);
            }
        }
        int maps = passes * files.size();
        System.out.println("steady-state CPU ms per map by stage (" + passes + " passes over " + files.size()
                + " maps after one): " + InspectionStages.line(ns, maps));
        long with = 0;
        long without = 0;
        for (int pass = 0; pass <= passes; pass++) {
            for (Path f : files) {
                long t0 = bean.getCurrentThreadCpuTime();
                inspection.inspect(f, thumbs.resolve(f.getFileName() + ".png"), buffers);
                long t1 = bean.getCurrentThreadCpuTime();
                inspection.inspect(f, null, buffers);
                long t2 = bean.getCurrentThreadCpuTime();
                if (pass > 0) {
                    with += t1 - t0;
                    without += t2 - t1;
                }
            }
        }
        System.out.printf(Locale.ROOT, "steady-state CPU ms per map, whole inspection: %.2f with thumbnail,"
                + " %.2f without%n", with / 1e6 / maps, without / 1e6 / maps);
    }

    private static double quartile(double[] v) {
        double[] c = v.clone();
        java.util.Arrays.sort(c);
        return c.length == 0 ? Double.NaN : c[c.length / 4];
    }

    private static double median(double[] v) {
        double[] c = v.clone();
        java.util.Arrays.sort(c);
        return c.length == 0 ? Double.NaN : c[c.length / 2];
    }
}
