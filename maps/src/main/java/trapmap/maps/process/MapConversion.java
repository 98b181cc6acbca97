package trapmap.maps.process;

import java.util.ArrayList;
import java.util.EnumMap;
import java.util.EnumSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.ConversionOutput;
import trapmap.physics.conversion.ConversionWarning;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.conversion.Surface;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.physics.defect.Defect;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.progress.HeadStart;

/**
 * Converts a lifetime or PL map into trap-density, bound, occupancy, SRH-lifetime, injection, harmonised-lifetime
 * and status maps of one defect, through the physics array API. The map's conditions must already hold everything
 * (sidecar values overridden by the user's); missing ones are refused with the field and unit named.
 */
public final class MapConversion {
    private MapConversion() {
    }

    /**
     * The converted maps, one per requested {@link Quantity}, the union of the warnings of all pixels and the
     * wafer-level ones, the defect and the physics settings converted with, the {@link PixelStatus#code()} of
     * every pixel (kept as bytes whether or not a {@link Quantity#STATUS} map was requested), the number of pixels with
     * each per-pixel warning (by {@link ConversionWarning#ordinal()}) and of each status (by code), and the
     * {@link #lifetimeFloorNote(WaferMap)} of the converted map, counted in the conversion's own pass.
     */
    public record Result(Map<Quantity, WaferMap> maps, Set<ConversionWarning> warnings, String defectId,
                         trapmap.physics.conversion.PhysicsSettings physics, byte[] statusCodes,
                         int[] warningPixels, int[] statusCounts, String lifetimeFloorNote) {
        public Result {
            maps = Map.copyOf(maps);
            warnings = Set.copyOf(warnings);
            warningPixels = warningPixels.clone();
            statusCounts = statusCounts.clone();
        }

        /** As the canonical constructor, with the status counts counted from {@code statusCodes} and no note. */
        public Result(Map<Quantity, WaferMap> maps, Set<ConversionWarning> warnings, String defectId,
                      trapmap.physics.conversion.PhysicsSettings physics, byte[] statusCodes, int[] warningPixels) {
            this(maps, warnings, defectId, physics, statusCodes, warningPixels, count(statusCodes), "");
        }

        private static int[] count(byte[] statusCodes) {
            int[] counts = new int[PixelStatus.values().length];
            for (byte c : statusCodes) {
                counts[c]++;
            }
            return counts;
        }

        /** The number of pixels that carry the per-pixel warning {@code w} (0 for a wafer-level warning). */
        public int pixelsWith(ConversionWarning w) {
            return w.isWaferLevel() || w.ordinal() >= warningPixels.length ? 0 : warningPixels[w.ordinal()];
        }

        /** The pixels converted ({@link PixelStatus#OK} or {@link PixelStatus#BELOW_LIMIT}). */
        public int convertedPixels() {
            return statusCounts[PixelStatus.OK.code()] + statusCounts[PixelStatus.BELOW_LIMIT.code()];
        }

        /** The share of the converted pixels that carry {@code w}, 0…1 (NaN when none was converted). */
        public double shareWith(ConversionWarning w) {
            int converted = convertedPixels();
            return converted == 0 ? Double.NaN : (double) pixelsWith(w) / converted;
        }

        /**
         * The warnings as sentences, sorted: a per-pixel warning with the number of pixels it concerns and their share
         * of the converted pixels ({@code … (1 234 px, 5.6 % of the converted pixels)}), a wafer-level one as it is.
         */
        public java.util.List<String> warningNotes() {
            int converted = convertedPixels();
            return warnings.stream().map(w -> w.isWaferLevel() ? w.message() : String.format(java.util.Locale.ROOT,
                    "%s (%d px, %s %% of the %d converted pixels)", w.message(), pixelsWith(w),
                    percent(100.0 * pixelsWith(w) / Math.max(1, converted)), converted)).sorted().toList();
        }

        /** A percentage with one decimal from 1 % up, two significant digits below (0.032), so that few is not 0.0. */
        static String percent(double p) {
            if (p == 0 || p >= 1) {
                return String.format(java.util.Locale.ROOT, "%.1f", p);
            }
            return new java.math.BigDecimal(p).round(new java.math.MathContext(2)).stripTrailingZeros()
                    .toPlainString();
        }

        /**
         * The map of {@code q}.
         *
         * @throws IllegalArgumentException when the conversion made none (not requested, or no reference injection)
         */
        public WaferMap get(Quantity q) {
            WaferMap m = maps.get(q);
            if (m == null) {
                throw new IllegalArgumentException("the conversion produced no " + q.key() + " map"
                        + (q == Quantity.LIFETIME_AT_REFERENCE ? " (give a reference injection)" : ""));
            }
            return m;
        }

        /** The number of pixels of each status, indexed by {@link PixelStatus#code()} (a copy). */
        @Override
        public int[] statusCounts() {
            return statusCounts.clone();
        }

        /** The pixels whose conversion status is {@code status}. */
        public Mask statusMask(PixelStatus status) {
            WaferMap any = maps.values().iterator().next();
            byte code = status.code();
            return Mask.of(any.width(), any.height(), i -> statusCodes[i] == code);
        }

        /**
         * The trap-density map at {@link PixelStatus#OK} pixels only, NaN elsewhere: what statistics, thresholds and
         * regions use. A {@link PixelStatus#BELOW_LIMIT} pixel holds the detection limit (an upper bound, not a
         * measured density) in {@link Quantity#TRAP_DENSITY} and is left out here.
         */
        public WaferMap okTrapDensity() {
            WaferMap nt = get(Quantity.TRAP_DENSITY);
            float[] v = nt.raster().samples();
            float[] kept = new float[v.length];
            byte ok = PixelStatus.OK.code();
            for (int i = 0; i < v.length; i++) {
                kept[i] = statusCodes[i] == ok ? v[i] : Float.NaN;
            }
            return nt.derive(FloatRaster.wrap(nt.width(), nt.height(), kept), Quantity.TRAP_DENSITY,
                    ProcessingStep.of("status-filter", "kept", "OK pixels (below-limit, invalid and no-data pixels are"
                            + " NaN)"));
        }
    }

    /**
     * Physics conditions from map conditions.
     *
     * @throws InvalidValueException naming the missing or contradictory field
     */
    public static Conditions physicsConditions(MeasurementConditions c, ConversionSettings s) {
        if (c.doping() == null) {
            throw new InvalidValueException("doping", "cm^-3", "doping is unknown: give it as p:<cm^-3>, n:<cm^-3> or"
                    + " p:<ohm*cm> in the sidecar or on the command line");
        }
        if ((c.injectionPerCm3() == null) == (c.generationPerCm3PerS() == null)) {
            throw new InvalidValueException("injection", "cm^-3", c.injectionPerCm3() == null
                    ? "neither an injection level (cm^-3) nor a generation rate (cm^-3 s^-1) is known"
                    : "both an injection level and a generation rate are given; keep one");
        }
        Injection injection = c.injectionPerCm3() != null ? Injection.fixed(c.injectionPerCm3())
                : Injection.generation(c.generationPerCm3PerS());
        Surface surface = Surface.IDEAL;
        if (c.srvCmPerS() != null) {
            if (c.thicknessUm() == null) {
                throw new InvalidValueException("thickness", "um", "a surface recombination velocity needs the"
                        + " wafer thickness (µm)");
            }
            surface = new Surface(c.thicknessUm(), c.srvCmPerS(), s.surfaceModel());
        }
        double t = c.temperatureK() == null ? 300 : c.temperatureK();
        return new Conditions(c.doping(), s.physics().silicon(t), injection, surface, s.physics().radiativeCm3PerS(),
                s.detectionResolution(), s.referenceInjectionPerCm3());
    }

    /**
     * An effective-lifetime map (µs) from a PL-counts map: Δn = (−N_dop + sqrt(N_dop² + 4I/A))/2, τ = Δn/G.
     * Needs the calibration constant A, the doping and the generation rate in the map's conditions.
     */
    public static WaferMap lifetimeFromPl(WaferMap pl) {
        PlToLifetime f = PlToLifetime.of(pl.conditions());
        return pl.derive(pl.raster().map(f::lifetimeUs), Quantity.EFFECTIVE_LIFETIME, f.step());
    }

    /**
     * The history entry of a conversion: defect, conditions, the reference injection and every physics setting
     * (under the settings file's keys, see {@link trapmap.physics.conversion.PhysicsSettings#describe()}).
     */
    public static ProcessingStep convertStep(Conditions conditions, Defect defect, ConversionSettings settings) {
        Map<String, String> p = new java.util.LinkedHashMap<>();
        p.put("defect", defect.id());
        p.put("doping", conditions.doping().toString());
        p.put("injection", conditions.injection().toString());
        p.put("surface", conditions.surface().ideal() ? "ideal" : conditions.surface().toString());
        p.put("temperature_k", Double.toString(conditions.silicon().temperatureK()));
        p.put("vth", settings.velocities().name());
        p.put("reference_injection_cm3", Double.toString(settings.referenceInjectionPerCm3()));
        settings.physics().describe().forEach((k, v) -> p.put("physics." + k, v));
        return new ProcessingStep("convert", p);
    }

    /**
     * A one-line warning when pixels of an effective-lifetime map (µs) lie below the physical floor of
     * {@link TrapDensityConverter#LIFETIME_FLOOR_US} (1 ns; the conversion makes them INVALID), naming the likely unit
     * mistake when most of them, read as seconds, are ordinary lifetimes; empty when there are none.
     */
    public static String lifetimeFloorNote(WaferMap lifetime) {
        if (lifetime.quantity() != Quantity.EFFECTIVE_LIFETIME) {
            return "";
        }
        LifetimeFloor floor = new LifetimeFloor();
        float[] s = lifetime.raster().samples();
        floor.add(s, 0, s.length);
        return floor.note();
    }

    /**
     * The note of {@link #lifetimeFloorNote(WaferMap)} from its counts: {@code below} pixels with 0 &lt; τ &lt; 1 ns,
     * {@code likeSeconds} of them between 1 ns and 0.1 s when read as seconds (what a conversion's
     * {@link TrapDensityConverter.Tally} counts).
     */
    public static String lifetimeFloorNote(long below, long likeSeconds) {
        return LifetimeFloor.note(below, likeSeconds);
    }

    /** Every quantity a conversion can produce (lifetime at reference only with a reference injection). */
    public static final Set<Quantity> ALL = Set.copyOf(EnumSet.of(Quantity.TRAP_DENSITY, Quantity.TRAP_DENSITY_MIN,
            Quantity.TRAP_DENSITY_MAX, Quantity.OCCUPANCY, Quantity.SRH_LIFETIME, Quantity.INJECTION,
            Quantity.LIFETIME_AT_REFERENCE, Quantity.STATUS));

    /** Converts to every quantity with all available processors. */
    public static Result convert(WaferMap map, Defect defect, ConversionSettings settings) {
        return convert(map, defect, settings, ALL, Runtime.getRuntime().availableProcessors());
    }

    /** Converts to every quantity. */
    public static Result convert(WaferMap map, Defect defect, ConversionSettings settings, int threads) {
        return convert(map, defect, settings, ALL, threads);
    }

    /** Converts to the {@code wanted} quantities only, with all available processors. */
    public static Result convert(WaferMap map, Defect defect, ConversionSettings settings, Set<Quantity> wanted) {
        return convert(map, defect, settings, wanted, Runtime.getRuntime().availableProcessors());
    }

    /**
     * Converts an effective-lifetime (µs) or PL-counts map to the {@code wanted} quantities: only their rasters are
     * allocated (4 bytes per pixel each), besides one byte per pixel for the status codes and one for the warning
     * bits, so that an 8192² map converted to one quantity needs about 1.5 times its own size on top of itself.
     * {@link Quantity#LIFETIME_AT_REFERENCE} is made only when the settings give a reference injection; quantities
     * a conversion cannot produce are ignored.
     *
     * @throws InvalidValueException for missing conditions, an unsuitable defect or a map of another quantity
     */
    public static Result convert(WaferMap map, Defect defect, ConversionSettings settings, Set<Quantity> wanted,
                                 int threads) {
        WaferMap lifetime = switch (map.quantity()) {
            case EFFECTIVE_LIFETIME -> map;
            case PL_COUNTS -> lifetimeFromPl(map);
            default -> throw new InvalidValueException("quantity", "", "a " + map.quantity().key()
                    + " map cannot be converted; expected an effective-lifetime or PL-counts map");
        };
        Conditions conditions = physicsConditions(lifetime.conditions(), settings);
        TrapDensityConverter converter = new TrapDensityConverter(conditions, defect);
        int n = lifetime.raster().size();
        boolean reference = !Double.isNaN(settings.referenceInjectionPerCm3());
        if (wanted.stream().noneMatch(q -> ALL.contains(q) && (reference || q != Quantity.LIFETIME_AT_REFERENCE))) {
            throw new IllegalArgumentException("no quantity a conversion produces among " + wanted);
        }
        byte[] statusCodes = new byte[n];
        ConversionOutput out = planes(wanted, reference, n, statusCodes);
        TrapDensityConverter.Tally tally = byRows(converter, lifetime.raster().samples(), lifetime.width(), out,
                threads);

        ProcessingStep step = convertStep(conditions, defect, settings);
        Map<Quantity, WaferMap> maps = new EnumMap<>(Quantity.class);
        int w = lifetime.width();
        int h = lifetime.height();
        put(maps, lifetime, Quantity.TRAP_DENSITY, out.trapDensity, step);
        put(maps, lifetime, Quantity.TRAP_DENSITY_MIN, out.trapDensityMin, step);
        put(maps, lifetime, Quantity.TRAP_DENSITY_MAX, out.trapDensityMax, step);
        put(maps, lifetime, Quantity.OCCUPANCY, out.occupancy, step);
        put(maps, lifetime, Quantity.SRH_LIFETIME, out.srhLifetimeUs, step);
        put(maps, lifetime, Quantity.INJECTION, out.injection, step);
        put(maps, lifetime, Quantity.LIFETIME_AT_REFERENCE, out.lifetimeAtReferenceUs, step);
        if (wanted.contains(Quantity.STATUS)) {
            float[] status = new float[n];
            for (int i = 0; i < n; i++) {
                status[i] = statusCodes[i];
            }
            maps.put(Quantity.STATUS, lifetime.derive(FloatRaster.wrap(w, h, status), Quantity.STATUS, step));
        }
        Set<ConversionWarning> warnings = EnumSet.noneOf(ConversionWarning.class);
        warnings.addAll(ConversionWarning.fromMask(tally.warningBits()));
        warnings.addAll(converter.conditionWarnings());
        // The floor note concerns an effective-lifetime map as given, not one computed from PL counts.
        String floorNote = map.quantity() == Quantity.EFFECTIVE_LIFETIME
                ? lifetimeFloorNote(tally.belowFloor(), tally.belowFloorLikeSeconds()) : "";
        return new Result(maps, warnings, defect.id(), settings.physics(), statusCodes, tally.warningPixels(),
                tally.statusCounts(), floorNote);
    }

    /**
     * The kernel over every row of a raster, one row per call, rows handed out in order to {@code threads} threads
     * (the calling one among them): a call that starts in the interpreter or a lower compiler tier stays there to its
     * end, so rows switch to the top tier's code as soon as it is compiled, and the kernel's loop is not compiled
     * again on the stack for long calls. Every pixel and the summed counts are those of one call over the whole
     * raster ({@link TrapDensityConverter#convertRows}); the counts are integers and flags, added in any order.
     */
    static TrapDensityConverter.Tally byRows(TrapDensityConverter converter, float[] tau, int width,
                                             ConversionOutput out, int threads) {
        if (width <= 0 || tau.length % width != 0) {
            throw new IllegalArgumentException("raster of " + tau.length + " pixels is not a whole number of rows of "
                    + width);
        }
        int rows = tau.length / width;
        int n = Math.max(1, Math.min(threads, rows / ROWS_PER_TASK));
        java.util.concurrent.atomic.AtomicInteger next = new java.util.concurrent.atomic.AtomicInteger();
        java.util.concurrent.atomic.AtomicReference<Throwable> failure =
                new java.util.concurrent.atomic.AtomicReference<>();
        TrapDensityConverter.Tally[] tallies = new TrapDensityConverter.Tally[n];
        Runnable[] workers = new Runnable[n];
        for (int t = 0; t < n; t++) {
            TrapDensityConverter.Tally tally = new TrapDensityConverter.Tally();
            tallies[t] = tally;
            workers[t] = () -> {
                try {
                    for (int row0 = next.getAndAdd(ROWS_PER_TASK); row0 < rows && failure.get() == null;
                            row0 = next.getAndAdd(ROWS_PER_TASK)) {
                        for (int row = row0, end = Math.min(rows, row0 + ROWS_PER_TASK); row < end; row++) {
                            converter.convertRows(tau, width, row, row + 1, out, tally);
                        }
                    }
                } catch (RuntimeException | Error e) {
                    failure.compareAndSet(null, e);
                }
            };
        }
        Workers.rethrow(Workers.runAll(java.util.List.of(workers), "convert-rows-", failure),
                "the conversion was interrupted");
        TrapDensityConverter.Tally total = new TrapDensityConverter.Tally();
        for (TrapDensityConverter.Tally t : tallies) {
            total.add(t);
        }
        return total;
    }

    /** Rows a thread takes at a time in {@link #byRows}. */
    private static final int ROWS_PER_TASK = 8;

    /**
     * The planes {@link #convert(WaferMap, Defect, ConversionSettings, Set, int)} fills for {@code n} pixels: those
     * of the wanted quantities and the status codes. No warning plane: the kernel counts the pixels of each warning
     * and status in its own pass.
     */
    private static ConversionOutput planes(Set<Quantity> wanted, boolean reference, int n, byte[] statusCodes) {
        return new ConversionOutput(plane(wanted, Quantity.TRAP_DENSITY, n),
                plane(wanted, Quantity.TRAP_DENSITY_MIN, n), plane(wanted, Quantity.TRAP_DENSITY_MAX, n),
                plane(wanted, Quantity.OCCUPANCY, n), plane(wanted, Quantity.SRH_LIFETIME, n),
                plane(wanted, Quantity.INJECTION, n), reference ? plane(wanted, Quantity.LIFETIME_AT_REFERENCE, n) : null,
                statusCodes, null);
    }

    /**
     * A head start for {@link #convert(WaferMap, Defect, ConversionSettings, Set, int)} while the map is still being
     * read: as {@link BandConversion#warmUp}, a small made-up raster converted over and over on a background (daemon)
     * thread, here into the planes that conversion fills ({@code wanted}'s and the status codes), with its rows taken
     * in turn by a kernel of each of {@code guesses}. The compiled kernel keeps only the paths its warm-up took (a
     * fixed injection or a generation rate, a surface term or none): when the map's own conditions, not known yet,
     * take another, the compiled code is thrown away at the map's first row, which is then converted in the lower
     * tiers while the kernel is compiled again, on the stack and as a method. A guess for each case the command line
     * leaves open avoids that. Guesses the conversion refuses are left out; the warm-up changes no result, keeps no
     * state the conversion reads, and stops when the returned handle is closed or after its rounds.
     */
    public static HeadStart warmUp(List<MeasurementConditions> guesses, Defect defect, ConversionSettings settings,
                                   Set<Quantity> wanted) {
        return HeadStart.start(BandConversion.WARM_UP_THREAD, stopped -> {
            List<TrapDensityConverter> kernels = new ArrayList<>();
            for (MeasurementConditions guess : guesses) {
                try {
                    kernels.add(new TrapDensityConverter(physicsConditions(guess, settings), defect));
                } catch (RuntimeException e) {
                    // a head start only: the conversion itself checks the conditions and reports
                }
            }
            if (!kernels.isEmpty()) {
                boolean reference = !Double.isNaN(settings.referenceInjectionPerCm3());
                int n = BandConversion.WARM_UP_PIXELS;
                BandConversion.warmUpRounds(kernels, List.of(planes(wanted, reference, n, new byte[n])), stopped);
            }
        });
    }

    private static float[] plane(Set<Quantity> wanted, Quantity q, int n) {
        return wanted.contains(q) ? new float[n] : null;
    }

    private static void put(Map<Quantity, WaferMap> maps, WaferMap lifetime, Quantity q, float[] samples,
                            ProcessingStep step) {
        if (samples != null) {
            maps.put(q, lifetime.derive(FloatRaster.wrap(lifetime.width(), lifetime.height(), samples), q, step));
        }
    }
}
