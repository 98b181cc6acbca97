package trapmap.maps.process;

import java.io.IOException;
import java.util.ArrayList;
import java.util.EnumSet;
import java.util.List;
import java.util.Set;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicReference;
import trapmap.maps.io.MapStream;
import trapmap.maps.model.MapHeader;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Quantity;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.ConversionOutput;
import trapmap.physics.conversion.ConversionWarning;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.Defect;
import trapmap.physics.material.Doping;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.progress.HeadStart;

/**
 * {@link MapConversion#convert} to one quantity, band by band: rows are read from a {@link MapStream}, converted and
 * handed to a sink (a {@link trapmap.maps.io.TiffRowWriter}) without the whole map ever being in memory, and the
 * whole-map figures a conversion reports (pixels by status, warnings, pixels per warning, the lifetime-floor note)
 * are summed band by band. Every pixel gets the value the whole-map conversion gives it, bit for bit: the kernel is
 * the same and works pixel by pixel, and the figures are integer sums, so neither the band size nor the number of
 * threads changes any result.
 */
public final class BandConversion {
    private final TrapDensityConverter converter;
    private final Quantity wanted;
    private final boolean reference;
    private final PlToLifetime pl;
    private final boolean countFloor;
    private final MapHeader output;
    private final int width;

    private BandConversion(TrapDensityConverter converter, Quantity wanted, boolean reference, PlToLifetime pl,
                           boolean floor, MapHeader output) {
        this.converter = converter;
        this.wanted = wanted;
        this.reference = reference;
        this.pl = pl;
        this.countFloor = floor;
        this.output = output;
        this.width = output.width();
    }

    /**
     * The conversion of the map of {@code input} (effective lifetime in µs or PL counts, its conditions complete) to
     * {@code wanted}, checked as {@link MapConversion#convert} checks it.
     *
     * @throws InvalidValueException    for missing conditions, an unsuitable defect or a map of another quantity
     * @throws IllegalArgumentException when a conversion does not produce {@code wanted} (lifetime at reference
     *                                  without a reference injection)
     */
    public static BandConversion of(MapHeader input, Defect defect, ConversionSettings settings, Quantity wanted) {
        PlToLifetime pl = null;
        MapHeader lifetime = switch (input.quantity()) {
            case EFFECTIVE_LIFETIME -> input;
            case PL_COUNTS -> {
                pl = PlToLifetime.of(input.conditions());
                yield input.derive(Quantity.EFFECTIVE_LIFETIME, pl.step());
            }
            default -> throw new InvalidValueException("quantity", "", "a " + input.quantity().key()
                    + " map cannot be converted; expected an effective-lifetime or PL-counts map");
        };
        Conditions conditions = MapConversion.physicsConditions(lifetime.conditions(), settings);
        TrapDensityConverter converter = new TrapDensityConverter(conditions, defect);
        boolean reference = !Double.isNaN(settings.referenceInjectionPerCm3());
        if (!MapConversion.ALL.contains(wanted) || (!reference && wanted == Quantity.LIFETIME_AT_REFERENCE)) {
            throw new IllegalArgumentException("no quantity a conversion produces among " + Set.of(wanted));
        }
        MapHeader out = lifetime.derive(wanted, MapConversion.convertStep(conditions, defect, settings));
        return new BandConversion(converter, wanted, reference, pl,
                input.quantity() == Quantity.EFFECTIVE_LIFETIME, out);
    }

    /**
     * Typical conditions of a warm-up ({@link #warmUp}): p-type 1e16 cm^-3, 180 µm, 300 K, generation 1e19 cm^-3 s^-1,
     * surface recombination velocity 10 cm/s. A command lays the conditions of its flags over them.
     */
    public static final MeasurementConditions WARM_UP_CONDITIONS = new MeasurementConditions(Doping.pType(1e16),
            180.0, 300.0, null, 1e19, 10.0, null, null, java.util.Map.of());

    /** The warm-up raster: 64 rows of 16 pixels, converted one row at a time. */
    private static final int WARM_UP_WIDTH = 16;
    private static final int WARM_UP_ROWS = 64;
    /**
     * Conversions of one short row in a warm-up: enough calls for HotSpot's tiered policy to queue the kernel for its
     * top-tier compiler as a whole method (not only its loop, which long rows would compile first, and whose
     * compiler time the real bands would then wait for), and few enough to leave the core to that compiler.
     */
    private static final int WARM_UP_ROUNDS = 1500;

    /**
     * Starts converting a small made-up raster over and over on a background (daemon) thread, so that the
     * just-in-time compiler has the kernel compiled before the first band of the real map arrives, while the calling
     * thread still opens the input: in a fresh process, the first bands otherwise run several times slower in the
     * interpreter and the lower compiler tiers. {@code guess} are the conditions known so far (e.g. the flags over
     * {@link #WARM_UP_CONDITIONS}); they only steer which kernel paths are exercised most (fixed injection or
     * generation, the planes of {@code wanted}; the other way of giving the injection and a status plane
     * now and then, see {@link #OTHER_EVERY}). The warm-up changes no result, keeps no state the conversion reads, and stops
     * when the returned handle is closed, after {@value #WARM_UP_ROUNDS} rounds, or at its first failure (which it
     * ignores: the real conversion checks and reports).
     */
    public static HeadStart warmUp(MeasurementConditions guess, Defect defect, ConversionSettings settings,
                                   Quantity wanted) {
        return HeadStart.start(WARM_UP_THREAD, stopped -> {
            try {
                TrapDensityConverter k = new TrapDensityConverter(MapConversion.physicsConditions(guess, settings),
                        defect);
                boolean reference = !Double.isNaN(settings.referenceInjectionPerCm3());
                TrapDensityConverter other = otherInjection(guess, settings, defect);
                ConversionOutput out = planes(wanted, reference, WARM_UP_PIXELS);
                ConversionOutput withStatus = new ConversionOutput(out.trapDensity, out.trapDensityMin,
                        out.trapDensityMax, out.occupancy, out.srhLifetimeUs, out.injection, out.lifetimeAtReferenceUs,
                        new byte[WARM_UP_PIXELS], null);
                // of every OTHER_EVERY rounds: the other injection first, then the wanted planes, then a status plane
                warmUpRounds(other != null ? List.of(other, k, k, k) : List.of(k),
                        List.of(out, out, withStatus, out), stopped);
            } catch (RuntimeException e) {
                // a head start only: the conversion itself checks the conditions and reports
            }
        });
    }

    /**
     * Every this many rounds a warm-up converts its row with the other way of giving the injection (a fixed Δn
     * instead of a generation rate, or the reverse), and as many rounds (half-way between) with a status plane
     * besides the wanted one, as {@link MapConversion#convert} (used by {@code stats}) asks for. The kernel's code has
     * a path for each, and a path its profile never saw is compiled as a trap: a map whose conditions choose the
     * other way than {@code guess} (conditions from the map's metadata, not from the flags), or a conversion with a
     * status plane, would throw the compiled kernel away at its first pixels and have it compiled again while the
     * map waits. Run now and then, those paths are compiled too, at no cost to the others.
     */
    private static final int OTHER_EVERY = 4;

    /**
     * A converter like {@code guess}'s with the other way of giving the injection: Δn = 1e15 cm^-3 for a guess with a
     * generation rate, else the generation rate of {@link #WARM_UP_CONDITIONS}; null when those conditions are
     * refused.
     */
    private static TrapDensityConverter otherInjection(MeasurementConditions guess, ConversionSettings settings,
                                                       Defect defect) {
        MeasurementConditions other = guess.generationPerCm3PerS() != null
                ? guess.withGeneration(null).withInjection(1e15)
                : guess.withInjection(null).withGeneration(WARM_UP_CONDITIONS.generationPerCm3PerS());
        try {
            return new TrapDensityConverter(MapConversion.physicsConditions(other, settings), defect);
        } catch (RuntimeException e) {
            return null;
        }
    }

    /**
     * The rounds of a warm-up: converts the rows of the warm-up raster one at a time, row after row, round r by
     * kernel {@code r % kernels.size()} into planes {@code r % outs.size()}, {@value #WARM_UP_ROUNDS} rows in all or
     * until {@code stopped}.
     */
    static void warmUpRounds(List<TrapDensityConverter> kernels, List<ConversionOutput> outs,
                             java.util.function.BooleanSupplier stopped) {
        float[] tau = new float[WARM_UP_ROWS * WARM_UP_WIDTH];
        for (int i = 0; i < tau.length; i++) { // 0.5 µs to 5 ms, some without data, a few below the floor
            tau[i] = i % 13 == 0 ? Float.NaN : i % 101 == 0 ? 5e-4f : (float) (0.5 * Math.pow(1e4,
                    (i * 0.618034) % 1.0));
        }
        TrapDensityConverter.Tally tally = new TrapDensityConverter.Tally();
        for (int r = 0; r < WARM_UP_ROUNDS && !stopped.getAsBoolean(); r++) {
            int row = r % WARM_UP_ROWS;
            kernels.get(r % kernels.size()).convertRows(tau, WARM_UP_WIDTH, row, row + 1, outs.get(r % outs.size()),
                    tally);
        }
    }

    /** The name of a warm-up's thread (of this class's and of {@link MapConversion#warmUp}'s). */
    public static final String WARM_UP_THREAD = "convert-warm-up";

    /** Pixels of the warm-up raster. */
    static final int WARM_UP_PIXELS = WARM_UP_ROWS * WARM_UP_WIDTH;

    /**
     * The one plane a band of {@code n} pixels needs for {@code wanted} (the status plane for {@link Quantity#STATUS});
     * the kernel counts the statuses without a plane.
     */
    private static ConversionOutput planes(Quantity wanted, boolean reference, int n) {
        return new ConversionOutput(wanted == Quantity.TRAP_DENSITY ? new float[n] : null,
                wanted == Quantity.TRAP_DENSITY_MIN ? new float[n] : null,
                wanted == Quantity.TRAP_DENSITY_MAX ? new float[n] : null,
                wanted == Quantity.OCCUPANCY ? new float[n] : null,
                wanted == Quantity.SRH_LIFETIME ? new float[n] : null,
                wanted == Quantity.INJECTION ? new float[n] : null,
                reference && wanted == Quantity.LIFETIME_AT_REFERENCE ? new float[n] : null,
                wanted == Quantity.STATUS ? new byte[n] : null, null);
    }

    /** The header of the converted map. */
    public MapHeader output() {
        return output;
    }

    /** Where converted rows go. */
    @FunctionalInterface
    public interface Sink {
        /** Takes rows {@code [row0, row0 + rows)}, {@code samples} from index 0; called from several threads. */
        void write(int row0, int rows, float[] samples) throws IOException;
    }

    /**
     * The whole-map figures of a conversion.
     *
     * @param statusCounts pixels of each status, indexed by {@link PixelStatus#code()}
     * @param warnings     the warnings of all pixels and the wafer-level ones
     * @param floorNote    {@link MapConversion#lifetimeFloorNote} of the input (empty when none)
     */
    public record Summary(int[] statusCounts, Set<ConversionWarning> warnings, String floorNote) {
        public Summary {
            statusCounts = statusCounts.clone();
            Set<ConversionWarning> w = EnumSet.noneOf(ConversionWarning.class);
            w.addAll(warnings);
            warnings = java.util.Collections.unmodifiableSet(w); // in declaration order
        }

        @Override
        public int[] statusCounts() {
            return statusCounts.clone();
        }
    }

    /**
     * Converts every row of {@code in} in bands of about a million pixels on {@code threads} threads (the calling
     * one among them) and gives each band to {@code sink}.
     *
     * @throws IOException from reading or from the sink (the first failure; the other threads stop at their next
     *                     band)
     */
    public Summary run(MapStream in, Sink sink, int threads) throws IOException {
        return run(in, sink, threads, MapStream.bandRows(width));
    }

    /** {@link #run(MapStream, Sink, int)} in bands of {@code rows} rows (the last may be shorter). */
    public Summary run(MapStream in, Sink sink, int threads, int rows) throws IOException {
        if (rows < 1) {
            throw new IllegalArgumentException("bands of " + rows + " rows");
        }
        if (in.width() != width || in.height() != output.height()) {
            throw new IllegalArgumentException("the stream is " + in.width() + "x" + in.height() + ", the conversion "
                    + width + "x" + output.height());
        }
        int bands = (in.height() + rows - 1) / rows;
        int n = Math.max(1, Math.min(threads, bands));
        AtomicInteger next = new AtomicInteger();
        AtomicReference<Throwable> failure = new AtomicReference<>();
        List<Worker> workers = new ArrayList<>();
        for (int t = 0; t < n; t++) {
            workers.add(new Worker(in.reader(rows), sink, rows, bands, in.height(), next, failure));
        }
        Throwable f = Workers.runAll(workers, "convert-band-", failure);
        if (f instanceof IOException e) {
            throw e;
        } else if (f instanceof RuntimeException e) {
            throw e;
        } else if (f instanceof Error e) {
            throw e;
        } else if (f != null) {
            throw new IOException("the conversion was interrupted", f);
        }
        TrapDensityConverter.Tally all = new TrapDensityConverter.Tally();
        for (Worker w : workers) {
            all.add(w.tally);
        }
        Set<ConversionWarning> warnings = EnumSet.noneOf(ConversionWarning.class);
        warnings.addAll(ConversionWarning.fromMask(all.warningBits()));
        warnings.addAll(converter.conditionWarnings());
        return new Summary(all.statusCounts(), warnings,
                countFloor ? MapConversion.lifetimeFloorNote(all.belowFloor(), all.belowFloorLikeSeconds()) : "");
    }

    /** One thread's bands: its buffers and its share of the figures. */
    private final class Worker implements Runnable {
        private final MapStream.Reader reader;
        private final Sink sink;
        private final int rows;
        private final int bands;
        private final int height;
        private final AtomicInteger next;
        private final AtomicReference<Throwable> failure;
        final TrapDensityConverter.Tally tally = new TrapDensityConverter.Tally();
        private float[] samples;
        private float[] values;
        private ConversionOutput out;

        Worker(MapStream.Reader reader, Sink sink, int rows, int bands, int height, AtomicInteger next,
               AtomicReference<Throwable> failure) {
            this.reader = reader;
            this.sink = sink;
            this.rows = rows;
            this.bands = bands;
            this.height = height;
            this.next = next;
            this.failure = failure;
        }

        @Override
        public void run() {
            try {
                for (int b = next.getAndIncrement(); b < bands && failure.get() == null; b = next.getAndIncrement()) {
                    int row0 = b * rows;
                    band(row0, Math.min(rows, height - row0));
                }
            } catch (Throwable e) {
                failure.compareAndSet(null, e);
            }
        }

        private void band(int row0, int r) throws IOException {
            int n = r * width;
            if (samples == null || samples.length != n) { // the kernel takes arrays of exactly the band's pixels
                samples = new float[n];
                values = wanted == Quantity.STATUS ? new float[n] : null;
                out = planes(wanted, reference, n);
            }
            reader.read(row0, r, samples);
            if (pl != null) {
                pl.apply(samples, 0, n);
            }
            // Row by row: a call of the kernel that starts in the interpreter or the lower compiler tier stays there
            // to its end, so a band's million pixels in one call would run there, and have the kernel compiled again
            // on-stack for its loop, until the top tier's code (compiled during the warm-up) comes; rows switch to
            // it at the next row. The pixels and counts are the same for any split (see the class comment).
            for (int row = 0; row < r; row++) {
                converter.convertRows(samples, width, row, row + 1, out, tally);
            }
            byte[] status = out.status;
            float[] plane;
            if (wanted == Quantity.STATUS) {
                for (int i = 0; i < n; i++) {
                    values[i] = status[i];
                }
                plane = values;
            } else {
                plane = plane(out);
            }
            sink.write(row0, r, plane);
        }

        private float[] plane(ConversionOutput o) {
            return switch (wanted) {
                case TRAP_DENSITY -> o.trapDensity;
                case TRAP_DENSITY_MIN -> o.trapDensityMin;
                case TRAP_DENSITY_MAX -> o.trapDensityMax;
                case OCCUPANCY -> o.occupancy;
                case SRH_LIFETIME -> o.srhLifetimeUs;
                case INJECTION -> o.injection;
                case LIFETIME_AT_REFERENCE -> o.lifetimeAtReferenceUs;
                default -> throw new IllegalStateException(wanted.key());
            };
        }
    }
}
