package trapmap.maps.bench;

import java.lang.management.ManagementFactory;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.EnumSet;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.ExceedanceMaps;
import trapmap.maps.process.MapConversion;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.uncertainty.ConditionUncertainty;

/**
 * The probability map of a large lifetime map against the trap-density conversion of the same map, in one JVM:
 * <pre>
 * ExceedanceBench [MAP.tif] [reps] [threads] [samples] [quantile]
 * </pre>
 * MAP defaults to /tmp/b4096/BENCH-0000.tif (else a 4096 x 4096 log-uniform 1–1000 µs map is made in memory); its
 * conditions are set to p 1e16 cm⁻³, Δn 1e15 cm⁻³, 180 µm, S 10 cm/s. After one warm-up of each, every repetition
 * times (a) {@code MapConversion.convert} to the trap density of Fe_i and (b) {@code ExceedanceMaps.prepare} (S samples,
 * default uncertainties, N* 1e11 cm⁻³) plus {@code probabilityMap}, alternately, in wall time and in the process's CPU
 * time (the process's and the calling thread's: with one thread, the latter is the work itself, without the
 * collector's and compiler's threads); it prints the medians and their ratios b/a. With the word {@code quantile} last, one 95 % quantile map is
 * timed too.
 */
public final class ExceedanceBench {
    private ExceedanceBench() {
    }

    public static void main(String[] args) throws Exception {
        Path file = Path.of(args.length > 0 ? args[0] : "/tmp/b4096/BENCH-0000.tif");
        int reps = args.length > 1 ? Integer.parseInt(args[1]) : 5;
        int threads = args.length > 2 ? Integer.parseInt(args[2]) : 1;
        int samples = args.length > 3 ? Integer.parseInt(args[3]) : 10_000;
        boolean quantile = args.length > 4 && args[4].equals("quantile");
        MeasurementConditions c = new MeasurementConditions(Doping.pType(1e16), 180.0, 300.0, 1e15, null, 10.0, null,
                null, Map.of());
        WaferMap map = Files.exists(file) ? MapFiles.readSingle(file).withConditions(c) : generated(4096, c);
        Defect fe = DefectLibrary.byId("fe-i");
        ConversionSettings settings = ConversionSettings.DEFAULTS;
        System.out.printf(Locale.ROOT, "map %s: %d x %d, %d thread(s), %d samples, %d repetitions%n",
                Files.exists(file) ? file : "generated", map.width(), map.height(), threads, samples, reps);
        Runnable convert = () -> sink(MapConversion.convert(map, fe, settings, EnumSet.of(Quantity.TRAP_DENSITY),
                threads).get(Quantity.TRAP_DENSITY).raster().samples()[0]);
        Runnable probability = () -> sink(ExceedanceMaps.prepare(map, fe, settings, ConditionUncertainty.DEFAULTS,
                1e11, samples, 1).probabilityMap(map, threads).raster().samples()[0]);
        convert.run();
        probability.run();
        Runnable prepare = () -> sink(ExceedanceMaps.prepare(map, fe, settings, ConditionUncertainty.DEFAULTS,
                1e11, samples, 1).samples());
        prepare.run();
        double[][] a = new double[3][reps];
        double[][] b = new double[3][reps];
        double[][] p = new double[3][reps];
        for (int r = 0; r < reps; r++) {
            time(convert, a, r);
            time(probability, b, r);
            time(prepare, p, r);
        }
        double aw = median(a[0]);
        double ac = median(a[1]);
        double at = median(a[2]);
        double bw = median(b[0]);
        double bc = median(b[1]);
        double bt = median(b[2]);
        String row = "%s wall %.3f s  process cpu %.3f s  calling thread cpu %.3f s (medians)%n";
        System.out.printf(Locale.ROOT, row, "(a) trap-density conversion     ", aw, ac, at);
        System.out.printf(Locale.ROOT, row, "(b) prepare + probability map   ", bw, bc, bt);
        System.out.printf(Locale.ROOT, row, "    of which prepare alone      ", median(p[0]), median(p[1]), median(p[2]));
        System.out.printf(Locale.ROOT, "ratio b/a: calling-thread cpu %.2f, process cpu %.2f, wall %.2f (target <= 2)%n",
                bt / at, bc / ac, bw / aw);
        if (quantile) {
            double[][] q = new double[3][1];
            ExceedanceMaps m = ExceedanceMaps.prepare(map, fe, settings, ConditionUncertainty.DEFAULTS, 1e11, samples,
                    1);
            time(() -> sink(m.quantileMap(map, 0.95, threads).raster().samples()[0]), q, 0);
            System.out.printf(Locale.ROOT, "(c) 95 %% quantile map (one run)  wall %.3f s  calling thread cpu %.3f s,"
                    + " %.2f x (a)%n", q[0][0], q[2][0], q[2][0] / at);
        }
    }

    private static volatile double sunk;

    private static void sink(double v) {
        sunk += v;
    }

    private static void time(Runnable r, double[][] out, int i) {
        com.sun.management.OperatingSystemMXBean os =
                (com.sun.management.OperatingSystemMXBean) ManagementFactory.getOperatingSystemMXBean();
        java.lang.management.ThreadMXBean th = ManagementFactory.getThreadMXBean();
        long cpu0 = os.getProcessCpuTime();
        long own0 = th.getCurrentThreadCpuTime();
        long t0 = System.nanoTime();
        r.run();
        out[0][i] = (System.nanoTime() - t0) * 1e-9;
        out[1][i] = (os.getProcessCpuTime() - cpu0) * 1e-9;
        out[2][i] = (th.getCurrentThreadCpuTime() - own0) * 1e-9;
    }

    private static double median(double[] v) {
        double[] s = v.clone();
        Arrays.sort(s);
        return s.length % 2 == 1 ? s[s.length / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
    }

    private static WaferMap generated(int n, MeasurementConditions c) {
        Random rnd = new Random(1);
        float[] s = new float[n * n];
        for (int i = 0; i < s.length; i++) {
            s[i] = (float) Math.pow(10, 3 * rnd.nextDouble());
        }
        return new WaferMap(FloatRaster.wrap(n, n, s), PixelGrid.centred(n, n, 0.04), Quantity.EFFECTIVE_LIFETIME,
                "bench", c, Provenance.of("generated"));
    }
}
