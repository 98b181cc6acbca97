package trapmap.physics.bench;

import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;
import java.util.Arrays;
import java.util.Locale;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.conversion.Surface;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.uncertainty.ConditionUncertainty;
import trapmap.physics.uncertainty.ExceedanceModel;
import trapmap.physics.uncertainty.QuantileTable;

/**
 * CPU time (the thread's CPU clock) of the exceedance Monte Carlo on one thread: preparing a model (fe-i with its
 * spread, default uncertainties, p 1e16 cm^-3, Δn 1e14 cm^-3, 180 µm, S = 10 cm/s, N* 1e11 cm^-3), the probability
 * per pixel (a 2^20-pixel row of 20–420 µs), the one-pass 95 % quantile per pixel (2^10 pixels), and building and
 * using a 95 % quantile table for 20–420 µs (2^16 pixels; its values are checked against the one-pass ones).
 * Prints the median of {@code reps} runs. Arguments: {@code [samples] [reps]}.
 */
public final class ExceedanceCpuBench {
    private ExceedanceCpuBench() {
    }

    public static void main(String[] args) {
        int samples = args.length > 0 ? Integer.parseInt(args[0]) : 10_000;
        int reps = args.length > 1 ? Integer.parseInt(args[1]) : 5;
        Conditions c = Conditions.of(Doping.pType(1e16), new Injection.Fixed(1e14))
                .withSurface(Surface.sproul(180, 10));
        float[] row = new float[1 << 20];
        for (int i = 0; i < row.length; i++) {
            row[i] = (float) (20 + 400.0 * i / row.length);
        }
        float[] out = new float[row.length];
        float[] small = new float[1 << 10];
        float[] mid = new float[1 << 16];
        for (int i = 0; i < small.length; i++) {
            small[i] = row[i * (row.length / small.length)];
        }
        for (int i = 0; i < mid.length; i++) {
            mid[i] = row[i * (row.length / mid.length)];
        }
        double[][] t = new double[5][reps];
        ThreadMXBean mx = ManagementFactory.getThreadMXBean();
        for (int r = 0; r < reps; r++) {
            long t0 = mx.getCurrentThreadCpuTime();
            ExceedanceModel m = ExceedanceModel.prepare(c, DefectLibrary.byId("fe-i"), PhysicsSettings.DEFAULTS,
                    ConditionUncertainty.DEFAULTS, 1e11, samples, r);
            long t1 = mx.getCurrentThreadCpuTime();
            m.probabilities(row, out);
            long t2 = mx.getCurrentThreadCpuTime();
            float[] onePass = new float[small.length];
            m.quantiles(small, 0.95, onePass);
            long t3 = mx.getCurrentThreadCpuTime();
            QuantileTable table = m.quantileTable(0.95, 20, 420);
            long t4 = mx.getCurrentThreadCpuTime();
            table.quantiles(mid, new float[mid.length]);
            long t5 = mx.getCurrentThreadCpuTime();
            float[] check = new float[small.length];
            table.quantiles(small, check);
            if (!Arrays.equals(check, onePass)) {
                throw new IllegalStateException("quantile table differs from the one-pass quantile");
            }
            t[0][r] = (t1 - t0) / 1e6;
            t[1][r] = (t2 - t1) / (double) row.length;
            t[2][r] = (t3 - t2) / 1e3 / small.length;
            t[3][r] = (t4 - t3) / 1e6;
            t[4][r] = (t5 - t4) / 1e3 / mid.length;
        }
        for (double[] x : t) {
            Arrays.sort(x);
        }
        System.out.printf(Locale.ROOT, "S=%d, median of %d, CPU: prepare %.1f ms; probability %.1f ns/pixel;"
                + " one-pass quantile %.1f us/pixel; quantile table build %.1f ms, %.2f us/pixel%n", samples, reps,
                t[0][reps / 2], t[1][reps / 2], t[2][reps / 2], t[3][reps / 2], t[4][reps / 2]);
    }
}
