package trapmap.physics.bench;

import java.lang.management.ManagementFactory;
import java.lang.management.ThreadMXBean;
import java.util.Arrays;
import java.util.Locale;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.ConversionOutput;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.Surface;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

/**
 * CPU time per pixel of the array conversion on one thread, measured with the thread's CPU clock
 * ({@link ThreadMXBean#getCurrentThreadCpuTime()}), so that the figures hold on a loaded machine where JMH's wall
 * clock does not. The map and conditions are those of {@link ConversionBenchmark} (4096² log-uniform 1-1000 µs, 1 %
 * NaN, fe-i, p 1e16 cm^-3, 180 µm, S = 10 cm/s); the cases are fixed injection (1e14 cm^-3) and fixed generation
 * (1e19 cm^-3 s^-1), each writing the trap density and the status bytes only ({@code density}, what
 * {@code convert} of one quantity asks for), and every output ({@code all}). Output arrays are allocated once and
 * reused. Prints the median and the minimum of {@code reps} runs after {@code reps} warm-up runs, in ns per pixel of CPU
 * time (the minimum is the figure least disturbed by other work on the machine).
 * Arguments: {@code [reps] [side] [fixed|generation] [density|all]}; give one case per JVM, as
 * {@code scripts/bench-physics --cpu} does, since a JVM that ran another case first has compiled the kernel for
 * it (the command line converts one case per process).
 */
public final class KernelCpuBench {
    private KernelCpuBench() {
    }

    public static void main(String[] args) {
        int reps = args.length > 0 ? Integer.parseInt(args[0]) : 5;
        int side = args.length > 1 ? Integer.parseInt(args[1]) : ConversionBenchmark.SIDE;
        int n = side * side;
        float[] tau = ConversionBenchmark.lifetimes(n, 20240601L);
        ConversionOutput all = ConversionOutput.allocateAll(n);
        ConversionOutput density = new ConversionOutput(all.trapDensity, null, null, null, null, null, null,
                all.status, null);
        ThreadMXBean mx = ManagementFactory.getThreadMXBean();
        String[] injections = args.length > 2 ? new String[] {args[2]} : new String[] {"fixed", "generation"};
        String[] planes = args.length > 3 ? new String[] {args[3]} : new String[] {"density", "all"};
        System.out.printf(Locale.ROOT, "%-12s %-8s %14s %14s%n", "injection", "outputs", "median ns/px", "min ns/px");
        for (String injection : injections) {
            Injection inj = injection.equals("fixed") ? Injection.fixed(1e14) : Injection.generation(1e19);
            Conditions c = Conditions.of(Doping.pType(1e16), inj).withSurface(Surface.sproul(180, 10));
            TrapDensityConverter conv = new TrapDensityConverter(c, DefectLibrary.byId("fe-i"));
            for (String outputs : planes) {
                ConversionOutput out = outputs.equals("all") ? all : density;
                double[] t = new double[reps];
                for (int r = -reps; r < reps; r++) {
                    long start = mx.getCurrentThreadCpuTime();
                    conv.convert(tau, side, out, 1);
                    long used = mx.getCurrentThreadCpuTime() - start;
                    if (r >= 0) {
                        t[r] = (double) used / n;
                    }
                }
                Arrays.sort(t);
                System.out.printf(Locale.ROOT, "%-12s %-8s %14.2f %14.2f%n", injection, outputs, t[reps / 2], t[0]);
            }
        }
    }
}
