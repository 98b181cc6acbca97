package trapmap.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.MapFormatException;
import trapmap.maps.io.MapStream;
import trapmap.maps.io.TiffRowWriter;
import trapmap.maps.model.MapHeader;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.BandConversion;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.physics.conversion.ConversionWarning;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.defect.Defect;
import trapmap.shared.progress.HeadStart;

/** {@code trapmap convert}: a lifetime or PL map to a trap-density (or related) map of one defect. */
@Command(name = "convert", version = TrapmapCommand.VERSION, mixinStandardHelpOptions = true, sortOptions = false,
        usageHelpAutoWidth = true,
        header = "Converts a lifetime or PL map into a trap-density, occupancy, SRH-lifetime, bound, status or"
                + " lifetime map, or into another file format.",
        description = {
            "Reads MAP (TIFF, CSV; conditions from its sidecar <name>.json, overridden by the flags), converts every"
                    + " pixel through the SRH model for the chosen defect and writes the chosen quantity to -o"
                    + " (.tif, .csv as x_mm,y_mm,value, or .png picture). Status codes in status maps: 0 OK, 1"
                    + " BELOW_LIMIT (SRH share of 1/τ_eff under the 5 %% resolution: the density is the detection"
                    + " limit, an upper bound), 2 INVALID (NaN, <= 0, infinite or below 1 ns), 3 NO_DATA.",
            "",
            "Without --defect and --quantity, writes MAP as it is in the format of -o (TIFF <-> CSV) with its"
                    + " metadata; --quantity effective-lifetime writes the lifetime map (from a PL map: by its"
                    + " calibration).",
            ""},
        footer = {"", "Caution: " + Calculation.CAUTION, "", Help.EXIT_CODES_MAP_OUTPUT})
final class ConvertCommand implements Callable<Integer> {
    /** Output quantities by their command-line names. */
    static final Map<String, trapmap.maps.model.Quantity> QUANTITIES = quantities();

    @Spec
    CommandSpec spec;

    @Parameters(index = "0", paramLabel = "MAP", description = "Effective-lifetime (µs) or PL-counts map file.")
    Path input;

    @Option(names = {"-o", "--output", "--out"}, paramLabel = "<file>", required = true,
            description = "Output file: .tif/.tiff (float, metadata embedded), .csv (x_mm,y_mm,value) or .png.")
    Path output;

    @Option(names = "--defect", paramLabel = "<id>",
            description = "Defect id (list with 'trapmap defects') or one from --defect-file. Needed for every"
                    + " quantity but effective-lifetime. Default: none.")
    String defect;

    @Option(names = "--defect-file", paramLabel = "<file.json>", description = Help.DEFECT_FILE)
    Path defectFile;

    @Option(names = "--quantity", paramLabel = "<name>",
            description = "What to write: trap-density (cm^-3), density-min, density-max (cm^-3, over the defect's"
                    + " published parameter spread), occupancy (f_t), srh-lifetime (µs), injection (cm^-3), status,"
                    + " lifetime-at-reference (µs; needs --reference-injection), effective-lifetime (µs; needs no"
                    + " defect), exceedance-probability (P(N_t > N*), 0-1; needs --threshold), density-quantile"
                    + " (cm^-3, the --quantile of N_t over the uncertainties). Default: trap-density with --defect;"
                    + " without it, MAP as it is.")
    String quantity;

    @Option(names = "--threshold", paramLabel = "<cm^-3>", converter = Quantity.Density.class,
            description = "Threshold N* in cm^-3 of --quantity exceedance-probability. Default: none.")
    Double threshold;

    @Option(names = "--quantile", paramLabel = "<q>",
            description = "Level q, 0 < q < 1, of --quantity density-quantile (0.05 and 0.95 bound a 90 %% interval)."
                    + " Default: 0.95.")
    Double quantileLevel;

    @Option(names = "--samples", paramLabel = "<n>",
            description = "Monte Carlo samples of exceedance-probability and density-quantile, 16-4194304. Default:"
                    + " the --physics file's uncertainty block, else 10000.")
    Integer samples;

    @Option(names = "--seed", paramLabel = "<n>",
            description = "Seed of their draws (same seed, same map). Default: the --physics file's uncertainty"
                    + " block, else 1.")
    Long seed;

    @Option(names = "--page", paramLabel = "<n>", defaultValue = "1",
            description = "Page of a multi-page TIFF to convert, from 1. Default: 1.")
    int page;

    @Option(names = "--json", description = "Print a JSON summary of the conversion instead of text.")
    boolean json;

    @Mixin
    MapConditionOptions conditions;

    /** Convert's own: the other map commands make no lifetime-at-reference map, so they do not offer it. */
    @Option(names = "--reference-injection", paramLabel = "<cm^-3>", converter = Quantity.Density.class,
            description = "Δn in cm^-3 at which the lifetime-at-reference map is computed; only with --quantity"
                    + " lifetime-at-reference. Default: none.")
    Double referenceInjection;

    @Override
    public Integer call() throws MapFormatException {
        MapInput.refuseOverwriting(output, List.of(output), List.of(input));
        String name = quantity != null ? quantity.trim().toLowerCase(Locale.ROOT)
                : defect != null ? trapmap.maps.model.Quantity.TRAP_DENSITY.key() : null;
        if (referenceInjection != null && !trapmap.maps.model.Quantity.LIFETIME_AT_REFERENCE.key().equals(name)) {
            throw new InputException("--reference-injection applies only to --quantity lifetime-at-reference, not to "
                    + (name == null ? "a plain format conversion" : "--quantity " + name));
        }
        if (name == null || name.equals(LIFETIME.key())) {
            return copy(name != null);
        }
        trapmap.maps.model.Quantity wanted = QUANTITIES.get(name);
        if (wanted == null) {
            throw new InputException("--quantity '" + quantity + "' is not one of " + String.join(", ",
                    QUANTITIES.keySet()) + ", " + LIFETIME.key());
        }
        boolean exceedance = wanted == trapmap.maps.model.Quantity.EXCEEDANCE_PROBABILITY
                || wanted == trapmap.maps.model.Quantity.DENSITY_QUANTILE;
        if (!exceedance && (threshold != null || quantileLevel != null || samples != null || seed != null)) {
            throw new InputException("--threshold, --quantile, --samples and --seed belong to --quantity"
                    + " exceedance-probability or density-quantile, not " + wanted.key());
        }
        if (defect == null) {
            throw new InputException("--defect is required for --quantity " + wanted.key() + ": "
                    + Flags.expected("--defect") + "; only " + LIFETIME.key() + " or a plain format conversion"
                    + " (no --quantity) needs none");
        }
        if (wanted == trapmap.maps.model.Quantity.LIFETIME_AT_REFERENCE && referenceInjection == null) {
            throw new InputException("--quantity lifetime-at-reference needs --reference-injection (Δn in cm^-3)");
        }
        Defect d = DefectCatalog.load(defectFile).find(defect);
        if (exceedance) {
            return new ExceedanceOutput(this).write(d, wanted);
        }
        if (MapFiles.formatOf(output) == MapFiles.Format.TIFF) {
            return streamed(d, wanted);
        }
        Converted converted = convertInput(d, wanted);
        WaferMap out = converted.result().get(wanted);
        MapInput.write(out, output);
        MapConversion.Result r = converted.result();
        report(r.statusCounts(), r.warnings(), r.defectId(), MapHeader.of(out), converted.floorNote());
        return Exit.OK;
    }

    /**
     * Converts to a TIFF file band by band ({@link BandConversion}): the output is the one the whole-map conversion
     * writes, byte for byte, while only a few bands of rows are in memory (when the input can be read band by band,
     * see {@link MapStream#open}; else the input alone is whole).
     */
    private int streamed(Defect d, trapmap.maps.model.Quantity wanted) throws MapFormatException {
        ConversionSettings settings = settings();
        // The kernel is compiled on the second core while this thread opens the input (results do not depend on it).
        HeadStart warmUp = BandConversion.warmUp(conditions.applyTo(BandConversion.WARM_UP_CONDITIONS), d,
                settings, wanted);
        try (warmUp; MapStream in = MapInput.stream(input, page)) {
            MapHeader header = in.header().withConditions(conditions.applyTo(in.header().conditions()));
            BandConversion conversion = BandConversion.of(header, d, settings, wanted);
            BandConversion.Summary[] summary = new BandConversion.Summary[1];
            try {
                TiffRowWriter.write(output, conversion.output(), out -> {
                    warmUp.close();
                    summary[0] = conversion.run(in, out::write, Runtime.getRuntime().availableProcessors());
                });
            } catch (MapFormatException e) {
                throw e; // the input's fault, found while its bands were read
            } catch (java.io.IOException e) {
                throw MapInput.cannotWrite(output, e);
            }
            report(summary[0].statusCounts(), summary[0].warnings(), d.id(), conversion.output(),
                    summary[0].floorNote());
        } catch (java.io.IOException e) {
            if (e instanceof MapFormatException m) {
                throw m;
            }
            throw new MapFormatException(input.toString(), null, "cannot be read (" + e.getMessage() + ")", "", e);
        }
        return Exit.OK;
    }

    private static final trapmap.maps.model.Quantity LIFETIME = trapmap.maps.model.Quantity.EFFECTIVE_LIFETIME;

    /**
     * {@link BandConversion#WARM_UP_CONDITIONS} with a fixed injection (1e15 cm⁻³) instead of the generation rate: the
     * warm-up's guess for a map measured at a fixed injection. Made when asked (a constant would load the kernel's
     * class with this one's).
     */
    static trapmap.maps.model.MeasurementConditions warmUpFixedInjection() {
        return BandConversion.WARM_UP_CONDITIONS.withGeneration(null).withInjection(1e15);
    }

    /**
     * Starts {@link BandConversion#warmUp} before the command line is parsed (parsing takes a fresh process tens of
     * milliseconds), so that the kernel's top-tier code is there when the first band is: only for a trap-density
     * conversion whose arguments name a built-in defect ({@code --defect ID}) and exactly one of {@code
     * --generation} and {@code --injection}, which choose the kernel's path; the values are the typical ones of {@link
     * BandConversion#WARM_UP_CONDITIONS}. Nothing else is guessed from the raw arguments: every other conversion is
     * warmed up once parsed ({@link #streamed}), and a wrong guess costs only time, never a result.
     */
    static void warmUpEarly(String... args) {
        boolean generation = false;
        boolean injection = false;
        String defectId = null;
        for (int i = 1; i < args.length; i++) {
            String a = args[i];
            int eq = a.indexOf('=');
            String name = eq > 0 ? a.substring(0, eq) : a;
            switch (name) {
                case "--generation" -> generation = true;
                case "--injection" -> injection = true;
                case "--defect" -> defectId = eq > 0 ? a.substring(eq + 1) : i + 1 < args.length ? args[i + 1] : null;
                case "--quantity", "--defect-file", "--reference-injection", "--physics" -> {
                    return;
                }
                default -> {
                    if (a.startsWith("@")) {
                        return; // an argument file: what it holds is not known here
                    }
                }
            }
        }
        if (generation == injection || defectId == null) {
            return;
        }
        Defect d;
        try {
            d = trapmap.physics.defect.DefectLibrary.byId(defectId);
        } catch (RuntimeException e) {
            return; // not a built-in defect: the command reports it
        }
        if (!d.hasAbsoluteCrossSections()) {
            return;
        }
        trapmap.maps.model.MeasurementConditions guess = injection ? warmUpFixedInjection()
                : BandConversion.WARM_UP_CONDITIONS;
        BandConversion.warmUp(guess, d, ConversionSettings.DEFAULTS, trapmap.maps.model.Quantity.TRAP_DENSITY);
    }

    /**
     * Writes the input map (with the flags' conditions) in the format of {@code -o}: as it is, or, when {@code
     * lifetime}, as an effective-lifetime map (a PL map through its calibration). No defect is involved.
     */
    /** The conversion settings of the condition flags, with the reference injection when one is given. */
    ConversionSettings settings() {
        ConversionSettings s = conditions.settings();
        return referenceInjection == null ? s : s.withReferenceInjection(referenceInjection);
    }

    private int copy(boolean lifetime) throws MapFormatException {
        WaferMap map = MapInput.page(input, page);
        WaferMap out = map.withConditions(conditions.applyTo(map.conditions()));
        if (lifetime && out.quantity() == trapmap.maps.model.Quantity.PL_COUNTS) {
            out = MapConversion.lifetimeFromPl(out);
        } else if (lifetime && out.quantity() != LIFETIME) {
            throw new InputException(input + ": a " + out.quantity().key() + " map has no effective lifetime;"
                    + " --quantity " + LIFETIME.key() + " needs a lifetime or PL-counts map");
        }
        MapInput.write(out, output);
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("input", input.toString());
        m.put("output", output.toString());
        m.put("quantity", out.quantity().key());
        m.put("unit", out.quantity().unit());
        m.put("width", out.width());
        m.put("height", out.height());
        m.put("defect", null);
        PrintWriter stdout = spec.commandLine().getOut();
        if (json) {
            stdout.println(Output.json(m));
        } else {
            stdout.printf(Locale.ROOT, "wrote %s: %s (%s), %d x %d pixels, %s%n", output, out.quantity().key(),
                    out.quantity().unit().isEmpty() ? "no unit" : out.quantity().unit(), out.width(), out.height(),
                    out.quantity() == map.quantity() ? "copied from " + input : "from the PL map " + input);
        }
        stdout.flush();
        return Exit.OK;
    }

    /** A conversion and the input's lifetime-floor note ({@link MapConversion.Result#lifetimeFloorNote()}). */
    private record Converted(MapConversion.Result result, String floorNote) {
    }

    /**
     * Reads the input and converts it to {@code wanted} only (and the status codes); the input map is referenced
     * from this frame alone, so that its samples can be collected once the conversion is done.
     */
    private Converted convertInput(Defect d, trapmap.maps.model.Quantity wanted) throws MapFormatException {
        WaferMap map = MapInput.page(input, page);
        WaferMap withConditions = map.withConditions(conditions.applyTo(map.conditions()));
        // The note is counted in the conversion's pass over the pixels (no scan of its own).
        MapConversion.Result result = MapConversion.convert(withConditions, d, settings(),
                java.util.EnumSet.of(wanted));
        return new Converted(result, result.lifetimeFloorNote());
    }

    private void report(int[] counts, java.util.Set<ConversionWarning> conversionWarnings, String defectId,
                        MapHeader out, String floor) {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("input", input.toString());
        m.put("output", output.toString());
        m.put("quantity", out.quantity().key());
        m.put("unit", out.quantity().unit());
        m.put("width", out.width());
        m.put("height", out.height());
        m.put("defect", defectId);
        Map<String, Integer> byStatus = new LinkedHashMap<>();
        List<String> pixels = new ArrayList<>();
        for (PixelStatus s : PixelStatus.values()) {
            if (s == PixelStatus.INCONSISTENT) {
                continue; // iron pairs only
            }
            byStatus.put(s.name(), counts[s.code()]);
            pixels.add(counts[s.code()] + " " + statusWords(s));
        }
        m.put("pixels_by_status", byStatus);
        List<String> warnings = new ArrayList<>();
        for (ConversionWarning w : conversionWarnings) {
            warnings.add(w.name() + ": " + w.message());
        }
        if (!floor.isEmpty()) {
            warnings.add("LIFETIME_BELOW_FLOOR: " + floor);
        }
        m.put("warnings", warnings);
        m.put("caution", Calculation.CAUTION);
        PrintWriter stdout = spec.commandLine().getOut();
        if (json) {
            stdout.println(Output.json(m));
        } else {
            stdout.printf(Locale.ROOT, "wrote %s: %s (%s) of %s, %d x %d pixels%n", output,
                    out.quantity().key(), out.quantity().unit().isEmpty() ? "no unit" : out.quantity().unit(),
                    defectId, out.width(), out.height());
            stdout.println("pixels: " + String.join(", ", pixels));
            stdout.println("caution: " + Calculation.CAUTION);
        }
        stdout.flush();
        // warnings go to stderr (the JSON object also lists them), so stdout stays the result alone
        PrintWriter stderr = spec.commandLine().getErr();
        warnings.forEach(w -> stderr.println("warning: " + w));
        stderr.flush();
    }

    /** How the text line names the pixels of a status, e.g. "below the detection limit". */
    static String statusWords(PixelStatus s) {
        return switch (s) {
            case OK -> "ok";
            case BELOW_LIMIT -> "below the detection limit";
            case INVALID -> "invalid";
            case NO_DATA -> "no data";
            case INCONSISTENT -> "inconsistent";
        };
    }

    private static Map<String, trapmap.maps.model.Quantity> quantities() {
        Map<String, trapmap.maps.model.Quantity> m = new LinkedHashMap<>();
        for (trapmap.maps.model.Quantity q : List.of(trapmap.maps.model.Quantity.TRAP_DENSITY,
                trapmap.maps.model.Quantity.TRAP_DENSITY_MIN, trapmap.maps.model.Quantity.TRAP_DENSITY_MAX,
                trapmap.maps.model.Quantity.OCCUPANCY, trapmap.maps.model.Quantity.SRH_LIFETIME,
                trapmap.maps.model.Quantity.INJECTION, trapmap.maps.model.Quantity.STATUS,
                trapmap.maps.model.Quantity.LIFETIME_AT_REFERENCE,
                trapmap.maps.model.Quantity.EXCEEDANCE_PROBABILITY, trapmap.maps.model.Quantity.DENSITY_QUANTILE)) {
            m.put(q.key(), q);
        }
        return java.util.Collections.unmodifiableMap(m);
    }
}
