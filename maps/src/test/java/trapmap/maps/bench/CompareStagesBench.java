package trapmap.maps.bench;

import com.sun.management.OperatingSystemMXBean;
import java.lang.management.ManagementFactory;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Locale;
import trapmap.maps.compare.Improvement;
import trapmap.maps.compare.MapComparison;
import trapmap.maps.compare.MapRegistration;
import trapmap.maps.compare.Registration;
import trapmap.maps.compare.RegistrationOptions;
import trapmap.maps.geometry.OutlineDetection;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.WaferMap;
import trapmap.shared.progress.ProgressListener;

/**
 * Process CPU time (all threads, JIT and GC included) and wall time of the stages of {@code compare}, one after
 * another: reading both maps, the registration search (with scoring and the overlap count), resampling, the paired
 * statistics and the two outline fits of the size check. The first round is what one command sees (cold); medians
 * over the further rounds show the warm cost. Arguments: {@code BEFORE AFTER [rounds]}. Not a unit test.
 */
public final class CompareStagesBench {
    private static final String[] STAGES = {"read", "search", "resample", "statistics", "outline fits"};

    private CompareStagesBench() {
    }

    public static void main(String[] args) throws Exception {
        Path beforeFile = Path.of(args[0]);
        Path afterFile = Path.of(args[1]);
        int rounds = args.length > 2 ? Integer.parseInt(args[2]) : 5;
        OperatingSystemMXBean os = (OperatingSystemMXBean) ManagementFactory.getOperatingSystemMXBean();
        double[][] cpu = new double[STAGES.length][rounds];
        double[][] wall = new double[STAGES.length][rounds];
        for (int round = 0; round < rounds; round++) {
            long[] c = new long[STAGES.length + 1];
            long[] w = new long[STAGES.length + 1];
            c[0] = os.getProcessCpuTime();
            w[0] = System.nanoTime();
            WaferMap before = MapFiles.readSingle(beforeFile);
            WaferMap after = MapFiles.readSingle(afterFile);
            c[1] = os.getProcessCpuTime();
            w[1] = System.nanoTime();
            Registration r = MapRegistration.register(before, after, RegistrationOptions.DEFAULTS,
                    ProgressListener.NONE);
            c[2] = os.getProcessCpuTime();
            w[2] = System.nanoTime();
            WaferMap aligned = MapRegistration.apply(before, after, r);
            c[3] = os.getProcessCpuTime();
            w[3] = System.nanoTime();
            MapComparison.statistics(before, aligned, null, 0.05, Improvement.of(before.quantity()));
            c[4] = os.getProcessCpuTime();
            w[4] = System.nanoTime();
            OutlineDetection.fit(before);
            OutlineDetection.fit(after);
            c[5] = os.getProcessCpuTime();
            w[5] = System.nanoTime();
            for (int s = 0; s < STAGES.length; s++) {
                cpu[s][round] = (c[s + 1] - c[s]) / 1e6;
                wall[s][round] = (w[s + 1] - w[s]) / 1e6;
            }
        }
        System.out.println("stage          cold CPU ms  cold wall ms  warm CPU ms (median)  warm wall ms (median)");
        for (int s = 0; s < STAGES.length; s++) {
            System.out.println(String.format(Locale.ROOT, "%-14s %11.0f %13.0f %21.0f %22.0f", STAGES[s], cpu[s][0],
                    wall[s][0], median(cpu[s]), median(wall[s])));
        }
    }

    private static double median(double[] v) {
        if (v.length < 2) {
            return Double.NaN;
        }
        double[] w = Arrays.copyOfRange(v, 1, v.length);
        Arrays.sort(w);
        return w.length % 2 == 1 ? w[w.length / 2] : 0.5 * (w[w.length / 2 - 1] + w[w.length / 2]);
    }
}
