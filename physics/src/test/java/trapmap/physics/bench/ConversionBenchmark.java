package trapmap.physics.bench;

import java.util.SplittableRandom;
import java.util.concurrent.TimeUnit;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Level;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OperationsPerInvocation;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;
import org.openjdk.jmh.infra.Blackhole;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.ConversionOutput;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.Surface;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

/**
 * Throughput of the array conversion {@link TrapDensityConverter#convert(float[], int, ConversionOutput, int)} on a
 * 4096×4096 lifetime map: interstitial iron in 1e16 cm^-3 p-type silicon, 180 µm thick with S = 10 cm/s, every
 * output raster requested or the trap density and status only. Lifetimes are log-uniform in 1–1000 µs (fixed seed) with about 1 % NaN pixels.
 * <p>
 * One operation is one pixel ({@link OperationsPerInvocation}), so the score is nanoseconds per pixel and the GC
 * profiler's {@code gc.alloc.rate.norm} is bytes allocated per pixel. Run with {@code scripts/bench-physics}.
 */
@State(Scope.Benchmark)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.NANOSECONDS)
@OperationsPerInvocation(ConversionBenchmark.PIXELS)
@Fork(value = 1, jvmArgsAppend = {"-Xms2g", "-Xmx2g"})
@Warmup(iterations = 2, time = 2)
@Measurement(iterations = 3, time = 2)
public class ConversionBenchmark {
    /** Raster side, pixels. */
    public static final int SIDE = 4096;
    /** Pixels per conversion. */
    public static final int PIXELS = SIDE * SIDE;
    /** Fraction of NaN (no-data) pixels. */
    public static final double NAN_FRACTION = 0.01;

    /** {@code fixed}: Δn = 1e14 cm^-3 everywhere; {@code generation}: G = 1e19 cm^-3 s^-1, Δn = G·τ_eff. */
    @Param({"fixed", "generation"})
    public String injection;

    /**
     * {@code all}: every output plane; {@code density}: the trap density with the status plane only (what
     * {@code convert} of one quantity and {@code MapConversion} with one wanted quantity ask for).
     */
    @Param({"all", "density"})
    public String outputs;

    /** Worker threads of the conversion. */
    @Param({"1", "2"})
    public int threads;

    private float[] lifetimesUs;
    private ConversionOutput out;
    private TrapDensityConverter converter;

    @Setup(Level.Trial)
    public void setUp() {
        lifetimesUs = lifetimes(PIXELS, 20240601L);
        ConversionOutput all = ConversionOutput.allocateAll(PIXELS);
        out = switch (outputs) {
            case "all" -> all;
            case "density" -> new ConversionOutput(all.trapDensity, null, null, null, null, null, null, all.status,
                    null);
            default -> throw new IllegalArgumentException("outputs must be all or density: " + outputs);
        };
        Injection inj = switch (injection) {
            case "fixed" -> Injection.fixed(1e14);
            case "generation" -> Injection.generation(1e19);
            default -> throw new IllegalArgumentException("injection must be fixed or generation: " + injection);
        };
        Conditions conditions = Conditions.of(Doping.pType(1e16), inj).withSurface(Surface.sproul(180, 10));
        converter = new TrapDensityConverter(conditions, DefectLibrary.byId("fe-i"));
    }

    /** Seeded log-uniform lifetimes in [1, 1000) µs with about {@link #NAN_FRACTION} NaN pixels. */
    static float[] lifetimes(int pixels, long seed) {
        SplittableRandom rnd = new SplittableRandom(seed);
        float[] tau = new float[pixels];
        for (int i = 0; i < pixels; i++) {
            tau[i] = rnd.nextDouble() < NAN_FRACTION ? Float.NaN : (float) Math.pow(10, 3 * rnd.nextDouble());
        }
        return tau;
    }

    @Benchmark
    public void convert(Blackhole bh) {
        converter.convert(lifetimesUs, SIDE, out, threads);
        bh.consume(out);
    }
}
