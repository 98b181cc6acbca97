package trapmap.maps.io;

import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.json.JsonWriteFeature;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.json.JsonMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.StandardCharsets;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import trapmap.shared.check.Checks;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.physics.material.ConductivityType;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.text.TextLimits;

/**
 * The facts about a map that its samples do not carry: a JSON object in a file {@code <name>.json} beside the map
 * ({@code w07.tif} + {@code w07.json}), read automatically by {@link MapFiles}. trapmap writes the same object into
 * the ImageDescription tag of the TIFF files it writes; a sidecar beside a file takes precedence over what the file
 * itself says. Every field is optional.
 *
 * <pre>
 * {
 *   "wafer_id": "w07",                      text; default: the file name without extension
 *   "quantity": "effective-lifetime",       a Quantity key: effective-lifetime, pl-counts, trap-density, ...
 *   "unit": "us",                           unit of the stored samples: s, ms, us (µs), ns for lifetimes (converted
 *                                           to µs on reading; µs is assumed when missing), counts, cm^-3, ...
 *   "pixel_pitch_mm": 0.5,                  pixel pitch, mm, in (0, 1000]
 *   "centre_x_px": 255.5,                   column of the wafer centre, px; default: the raster centre
 *   "centre_y_px": 255.5,                   row of the wafer centre, px (row 0 at the top); default: raster centre
 *   "scale": 0.01, "offset": 0,             integer samples (8/16-bit) hold raw values: value = offset + scale·raw
 *   "no_data": 0,                           raw sample value that means "no data" (becomes NaN)
 *   "pages": ["before", "after"],           labels of the pages of a multi-page file, in page order; an entry may
 *                                           also be an object {"label": "1e13", "injection_cm3": 1e13} whose
 *                                           condition fields (doping and the numeric fields of "conditions", same
 *                                           units and ranges) hold for that page only, over the top-level ones
 *   "conditions": {
 *     "doping": "p:1e16",                   p:/n: and a net density in cm^-3, or a resistivity at 23 °C in Ω·cm
 *                                           ("p:1.5ohmcm", "n:2ohmcm"; ASTM F723)
 *     "thickness_um": 180,                  µm, [1, 5000]
 *     "temperature_k": 300,                 K, [77, 500]
 *     "injection_cm3": 1e14,                excess carrier density of a lifetime map, cm^-3, [1e6, 1e19]
 *     "generation_cm3_s": 1e19,             steady-state generation rate, cm^-3 s^-1, [1e10, 1e24]
 *     "srv_cm_s": 10,                       surface recombination velocity, cm/s, [0, 1e7]
 *     "photon_flux_cm2_s": 2.5e17,          excitation photon flux, cm^-2 s^-1, > 0
 *     "pl_calibration_counts_cm6": 1e-30,   PL calibration constant A of I = A·Δn·(Δn + N_dop), > 0
 *     "passivation": "AlOx",                any other field with a text, number or true/false value is kept as a
 *     "extra": {"history": "gettered"}      labelled fact (MeasurementConditions.extra); so are the fields of "extra"
 *   },
 *   "format": "trapmap-map/1",              written by trapmap
 *   "history": {"source": "w07.tif",        written by trapmap: the map's provenance, restored on reading
 *               "steps": [{"operation": "convert", "parameters": {"defect": "fe-i"}}]}
 * }
 * </pre>
 *
 * Unknown top-level fields are ignored with a warning in the map's provenance (the first
 * {@value TextLimits#MAX_LISTED_WARNINGS} by name, the rest counted in one line). Texts are bounded
 * ({@link TextLimits}): {@code wafer_id}, page labels and every key at most {@value TextLimits#MAX_ID_CHARS}
 * characters, other texts at most {@value TextLimits#MAX_TEXT_CHARS}, and at most {@value TextLimits#MAX_KEYS} keys
 * in all. A field of the wrong type or out of its range, or a text or key count over its limit, makes the file
 * unusable: the {@link MapFormatException} names the field and its unit, e.g.
 * {@code w07.json: field 'conditions.thickness_um': must be in [1, 5000] but was -5 (µm)}. The schema is also
 * described in {@code maps/SIDECAR.md}.
 *
 * @param waferId      wafer identifier, or null
 * @param quantity     meaning of the samples, or null
 * @param unit         unit of the stored samples as written, or null
 * @param pixelPitchMm pixel pitch, mm, or null
 * @param centreXPx    column of the wafer centre, or null
 * @param centreYPx    row of the wafer centre, or null
 * @param scale        scale of integer samples, or null
 * @param offset       offset of integer samples, or null
 * @param noData       raw sample value meaning "no data", or null
 * @param conditions   measurement conditions (never null; unknown fields null)
 * @param pages          page labels, or null
 * @param history        earlier provenance, or null
 * @param warnings       what was ignored, one line each
 * @param pageConditions per page, the condition fields given for that page alone
 *                       ({@link MeasurementConditions#UNKNOWN} for a plain label); null when {@code pages} is null,
 *                       otherwise as long as it
 */
public record Sidecar(String waferId, Quantity quantity, String unit, Double pixelPitchMm, Double centreXPx,
                      Double centreYPx, Double scale, Double offset, Double noData, MeasurementConditions conditions,
                      List<String> pages, Provenance history, List<String> warnings,
                      List<MeasurementConditions> pageConditions) {

    /** The value of {@code format} in files trapmap writes. */
    public static final String FORMAT = "trapmap-map/1";
    /** Largest sidecar accepted, bytes. */
    public static final long MAX_BYTES = InputFiles.JSON_MAX_BYTES;

    /** Nothing known. */
    public static final Sidecar EMPTY = new Sidecar(null, null, null, null, null, null, null, null, null,
            MeasurementConditions.UNKNOWN, null, null, List.of());

    static final ObjectMapper JSON = JsonMapper.builder()
            .enable(JsonParser.Feature.STRICT_DUPLICATE_DETECTION)
            .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS)
            .enable(JsonWriteFeature.ESCAPE_NON_ASCII)
            .build();

    /**
     * Builds the JSON mapper and its parser and writer by reading and writing a small document shaped like the
     * metadata trapmap embeds in its TIFF files (about 0.1-0.2 s of CPU in a fresh process), so that a command about
     * to open or write a map can have it done on a background thread while it parses its arguments. Changes nothing
     * else; any failure is ignored (the real reading reports its own).
     */
    public static void prepare() {
        String sample = "{\"format\":\"" + FORMAT + "\",\"wafer_id\":\"W\",\"quantity\":\"effective-lifetime\","
                + "\"unit\":\"us\",\"pixel_pitch_mm\":0.05,\"centre_x_px\":1.5,\"centre_y_px\":1.5,\"conditions\":"
                + "{\"doping\":\"p:1.0E16\",\"thickness_um\":180.0,\"temperature_k\":300.0,\"injection_cm3\":1.0E14,"
                + "\"srv_cm_s\":10.0,\"extra\":{\"note\":\"x\"}},\"history\":{\"source\":\"s\",\"steps\":"
                + "[{\"operation\":\"o\",\"parameters\":{\"a\":\"1\"}}]}}";
        try {
            parse(sample, "sample");
            JSON.writeValueAsString(JSON.readTree(sample));
        } catch (IOException | RuntimeException e) {
            // only a head start: the real reading and writing report their own failures
        }
    }

    /** Condition keys with their unit and accepted range. */
    private static final Map<String, Range> CONDITION_RANGES = new LinkedHashMap<>();

    static {
        CONDITION_RANGES.put("thickness_um", new Range("µm", 1, 5000, false));
        CONDITION_RANGES.put("temperature_k", new Range("K", Silicon.MIN_TEMPERATURE_K, Silicon.MAX_TEMPERATURE_K,
                false));
        CONDITION_RANGES.put("injection_cm3", new Range("cm^-3", 1e6, 1e19, false));
        CONDITION_RANGES.put("generation_cm3_s", new Range("cm^-3 s^-1", 1e10, 1e24, false));
        CONDITION_RANGES.put("srv_cm_s", new Range("cm/s", 0, 1e7, false));
        CONDITION_RANGES.put("photon_flux_cm2_s", new Range("cm^-2 s^-1", 0, Double.MAX_VALUE, true));
        CONDITION_RANGES.put("pl_calibration_counts_cm6", new Range("counts·cm^6", 0, Double.MAX_VALUE, true));
    }

    private static final List<String> TOP_KEYS = List.of("format", "wafer_id", "quantity", "unit", "pixel_pitch_mm",
            "centre_x_px", "centre_y_px", "scale", "offset", "no_data", "pages", "conditions", "history");

    public Sidecar {
        conditions = conditions == null ? MeasurementConditions.UNKNOWN : conditions;
        pages = pages == null ? null : List.copyOf(pages);
        warnings = List.copyOf(warnings == null ? List.of() : warnings);
        if (pages == null) {
            pageConditions = null;
        } else if (pageConditions == null) {
            pageConditions = java.util.Collections.nCopies(pages.size(), MeasurementConditions.UNKNOWN);
        } else if (pageConditions.size() != pages.size()) {
            throw new IllegalArgumentException(pageConditions.size() + " page conditions for " + pages.size()
                    + " pages");
        } else {
            pageConditions = List.copyOf(pageConditions);
        }
    }

    /** A sidecar whose pages (if any) are plain labels without conditions of their own. */
    public Sidecar(String waferId, Quantity quantity, String unit, Double pixelPitchMm, Double centreXPx,
                   Double centreYPx, Double scale, Double offset, Double noData, MeasurementConditions conditions,
                   List<String> pages, Provenance history, List<String> warnings) {
        this(waferId, quantity, unit, pixelPitchMm, centreXPx, centreYPx, scale, offset, noData, conditions, pages,
                history, warnings, null);
    }

    /**
     * The conditions of page {@code page} (0-based): the top-level ones with the page's own fields over them. A page
     * that gives an injection level or a generation rate replaces both of the top level's (one sets the other aside).
     */
    public MeasurementConditions conditionsOfPage(int page) {
        if (pageConditions == null) {
            return conditions;
        }
        return withPage(conditions, pageConditions.get(page));
    }

    /** {@code base} with the fields of {@code page} over it (see {@link #conditionsOfPage}). */
    static MeasurementConditions withPage(MeasurementConditions base, MeasurementConditions page) {
        if (page.injectionPerCm3() != null || page.generationPerCm3PerS() != null) {
            base = base.withInjection(null).withGeneration(null);
        }
        return base.overriddenBy(page);
    }

    /** The keys the schema knows at the top level. */
    public static List<String> topLevelKeys() {
        return TOP_KEYS;
    }

    /** The condition keys with a unit and range (doping, the free-text fields and {@code extra} aside). */
    static Map<String, Range> conditionRanges() {
        return CONDITION_RANGES;
    }

    /** True when {@code key} is a known field of {@code conditions}. */
    static boolean isConditionKey(String key) {
        return key.equals("doping") || CONDITION_RANGES.containsKey(key);
    }

    /**
     * Reads a sidecar file.
     *
     * @throws MapFormatException when the file is missing, unreadable, not UTF-8 JSON, or has a field of the wrong
     *                            type or out of range
     */
    public static Sidecar read(Path file) throws MapFormatException {
        String name = file.toString();
        byte[] bytes;
        try {
            bytes = InputFiles.readBytes(file, MAX_BYTES);
        } catch (NoSuchFileException e) {
            throw new MapFormatException(name, null, "no such sidecar file", "", e);
        } catch (InputFiles.Refused e) {
            throw new MapFormatException(name, null, "sidecar " + e.reason(), "", e);
        } catch (IOException e) {
            if (e instanceof MapFormatException m) {
                throw m;
            }
            throw new MapFormatException(name, null, "cannot read the sidecar (" + e.getMessage() + ")", "", e);
        }
        return decoded(bytes, name);
    }

    /**
     * Parses the bytes of a sidecar fetched from elsewhere (another file system), as {@link #read} parses a file of
     * those bytes; {@code name} (the sidecar's path or URI) is used in messages.
     *
     * @throws MapFormatException when there are more than {@link #MAX_BYTES}, they are not UTF-8 JSON, or a field
     *                            is of the wrong type or out of range
     */
    public static Sidecar parse(byte[] bytes, String name) throws MapFormatException {
        if (bytes.length > MAX_BYTES) {
            throw new MapFormatException(name, null, "sidecar " + InputFiles.tooLarge(bytes.length, MAX_BYTES));
        }
        return decoded(bytes, name);
    }

    private static Sidecar decoded(byte[] bytes, String name) throws MapFormatException {
        String text;
        try {
            text = StandardCharsets.UTF_8.newDecoder().decode(ByteBuffer.wrap(bytes)).toString();
        } catch (CharacterCodingException e) {
            throw new MapFormatException(name, null, "is not UTF-8 text", "", e);
        }
        return parse(text, name);
    }

    /**
     * Parses sidecar JSON.
     *
     * @param origin the file name (or other origin) used in messages
     * @throws MapFormatException naming the field and unit of the first problem
     */
    public static Sidecar parse(String json, String origin) throws MapFormatException {
        String text = json.startsWith("\uFEFF") ? json.substring(1) : json;
        JsonNode root;
        try {
            root = JSON.readTree(text);
        } catch (JsonProcessingException e) {
            JsonLocation at = e.getLocation();
            String place = at == null || at.getLineNr() < 0 ? null : "line " + at.getLineNr() + ", column "
                    + at.getColumnNr();
            throw new MapFormatException(origin, place, "not valid JSON: " + JsonErrors.reason(e), "", e);
        } catch (RuntimeException e) {
            throw new MapFormatException(origin, null, "not valid JSON: " + e.getMessage(), "", e);
        }
        if (root == null || root.isMissingNode()) {
            throw new MapFormatException(origin, null, "is empty; expected a JSON object");
        }
        if (!root.isObject()) {
            throw new MapFormatException(origin, null, "holds " + kind(root) + "; expected a JSON object");
        }
        return new Parser(origin).object((ObjectNode) root);
    }

    /**
     * The largest wafer-centre offset a map file may state, px ({@code centre_x_px}, {@code centre_y_px} in
     * [−1e9, 1e9]): what the readers accept and the writers refuse to exceed.
     */
    public static final double MAX_CENTRE_PX = 1e9;

    /**
     * Refuses a grid the readers would refuse: a wafer centre beyond {@link #MAX_CENTRE_PX}, so that a written map
     * always reads back.
     *
     * @throws IllegalArgumentException naming the field, its value, the range and the unit
     */
    public static void checkWritable(trapmap.maps.raster.PixelGrid grid) {
        double[] centre = {grid.centreXPx(), grid.centreYPx()};
        String[] field = {"centre_x_px", "centre_y_px"};
        for (int k = 0; k < 2; k++) {
            if (!(Math.abs(centre[k]) <= MAX_CENTRE_PX)) {
                throw new IllegalArgumentException("cannot write the map: " + field[k] + " " + centre[k]
                        + " px is outside [-1e9, 1e9] px, the range a map file can hold (the wafer centre would lie "
                        + Math.abs(centre[k] * grid.pitchMm()) + " mm from the data)");
            }
        }
    }

    /**
     * The JSON trapmap embeds in the TIFF files it writes: every fact of the map (all but the samples), so that the
     * file reads back into an equal map. Plain ASCII (other characters escaped).
     */
    public static String toJson(WaferMap map) {
        return toJson(trapmap.maps.model.MapHeader.of(map));
    }

    /** {@link #toJson(WaferMap)} of a map known by its header alone (its samples streamed). */
    public static String toJson(trapmap.maps.model.MapHeader map) {
        checkWritable(map.grid());
        ObjectNode o = JSON.createObjectNode();
        o.put("format", FORMAT);
        o.put("wafer_id", map.waferId());
        o.put("quantity", map.quantity().key());
        o.put("unit", asciiUnit(map.quantity().unit()));
        o.put("pixel_pitch_mm", map.grid().pitchMm());
        o.put("centre_x_px", map.grid().centreXPx());
        o.put("centre_y_px", map.grid().centreYPx());
        ObjectNode c = conditionsJson(map.conditions());
        if (!c.isEmpty()) {
            o.set("conditions", c);
        }
        ObjectNode h = o.putObject("history");
        h.put("source", map.provenance().source());
        ArrayNode steps = h.putArray("steps");
        for (ProcessingStep s : map.provenance().steps()) {
            ObjectNode step = steps.addObject();
            step.put("operation", s.operation());
            ObjectNode p = step.putObject("parameters");
            s.parameters().forEach(p::put);
        }
        try {
            return JSON.writeValueAsString(o);
        } catch (JsonProcessingException e) {
            throw new IllegalStateException("cannot render map metadata as JSON", e);
        }
    }

    /** The measurement conditions as the {@code conditions} object of the schema. */
    static ObjectNode conditionsJson(MeasurementConditions m) {
        ObjectNode c = JSON.createObjectNode();
        if (m.doping() != null) {
            c.put("doping", dopingText(m.doping()));
        }
        putIfKnown(c, "thickness_um", m.thicknessUm());
        putIfKnown(c, "temperature_k", m.temperatureK());
        putIfKnown(c, "injection_cm3", m.injectionPerCm3());
        putIfKnown(c, "generation_cm3_s", m.generationPerCm3PerS());
        putIfKnown(c, "srv_cm_s", m.srvCmPerS());
        putIfKnown(c, "photon_flux_cm2_s", m.photonFluxPerCm2PerS());
        putIfKnown(c, "pl_calibration_counts_cm6", m.plCalibration());
        if (!m.extra().isEmpty()) {
            ObjectNode e = c.putObject("extra");
            new TreeMap<>(m.extra()).forEach(e::put);
        }
        return c;
    }

    /** A doping as the schema writes it, e.g. {@code p:1.0E16} (exact: the density's shortest decimal form). */
    static String dopingText(Doping d) {
        return (d.type() == ConductivityType.P ? "p:" : "n:") + d.densityPerCm3();
    }

    /** A unit in plain ASCII: {@code µs} becomes {@code us}. */
    static String asciiUnit(String unit) {
        return unit.replace('\u00b5', 'u').replace('\u03bc', 'u');
    }

    private static void putIfKnown(ObjectNode o, String key, Double v) {
        if (v != null) {
            o.put(key, v.doubleValue());
        }
    }

    /**
     * This sidecar with every field that {@code override} gives taking precedence; conditions are merged field by
     * field, warnings are kept from both.
     */
    public Sidecar overriddenBy(Sidecar override) {
        List<String> w = new ArrayList<>(warnings);
        w.addAll(override.warnings);
        return new Sidecar(pick(override.waferId, waferId), pick(override.quantity, quantity),
                pick(override.unit, unit), pick(override.pixelPitchMm, pixelPitchMm),
                pick(override.centreXPx, centreXPx), pick(override.centreYPx, centreYPx),
                pick(override.scale, scale), pick(override.offset, offset), pick(override.noData, noData),
                conditions.overriddenBy(override.conditions), pick(override.pages, pages),
                pick(override.history, history), w,
                override.pages != null ? override.pageConditions : pageConditions);
    }

    private static <T> T pick(T preferred, T fallback) {
        return preferred != null ? preferred : fallback;
    }

    static String kind(JsonNode n) {
        if (n.isArray()) {
            return "an array";
        }
        if (n.isObject()) {
            return "an object";
        }
        if (n.isNumber()) {
            return "a number";
        }
        if (n.isTextual()) {
            return "a text";
        }
        if (n.isBoolean()) {
            return "a boolean";
        }
        return "null";
    }

    /** Unit and accepted range of a numeric field; {@code openLow}: the lower bound itself is excluded. */
    record Range(String unit, double min, double max, boolean openLow) {
        boolean accepts(double v) {
            return Double.isFinite(v) && (openLow ? v > min : v >= min) && v <= max;
        }

        String describe() {
            return openLow && max == Double.MAX_VALUE ? "must be > " + Checks.exact(min)
                    : "must be in " + (openLow ? "(" : "[") + Checks.exact(min) + ", " + Checks.exact(max) + "]";
        }
    }

    static String fmt(double v) {
        return v == Math.rint(v) && Math.abs(v) < 1e7 ? Long.toString((long) v) : Double.toString(v);
    }

    /** Walks the JSON tree, collecting warnings, failing on the first bad field. */
    private static final class Parser {
        private final String origin;
        private final List<String> warnings = new ArrayList<>();
        private int ignoredFacts;

        Parser(String origin) {
            this.origin = origin;
        }

        Sidecar object(ObjectNode o) throws MapFormatException {
            checkKeys(o);
            int unknown = 0;
            for (Map.Entry<String, JsonNode> e : o.properties()) {
                String k = e.getKey();
                if (!TOP_KEYS.contains(k)) {
                    if (++unknown <= TextLimits.MAX_LISTED_WARNINGS) {
                        warnings.add("unknown field '" + k + "' ignored");
                    }
                }
            }
            if (unknown > TextLimits.MAX_LISTED_WARNINGS) {
                warnings.add(TextLimits.andMore(unknown - TextLimits.MAX_LISTED_WARNINGS, "unknown fields ignored"));
            }
            String format = text(o, "format", "format");
            if (format != null && !format.startsWith("trapmap-map/")) {
                warnings.add("field 'format' is '" + format + "', not " + FORMAT + "; read as a sidecar");
            }
            String waferId = text(o, "wafer_id", "wafer_id", TextLimits.MAX_ID_CHARS);
            Quantity quantity = null;
            String q = text(o, "quantity", "quantity");
            if (q != null) {
                try {
                    quantity = Quantity.ofKey(q);
                } catch (IllegalArgumentException e) {
                    throw fail("quantity", e.getMessage(), "");
                }
            }
            String unit = text(o, "unit", "unit");
            Double pitch = number(o, "pixel_pitch_mm", "pixel_pitch_mm", new Range("mm", 0, 1000, true));
            Range centre = new Range("px", -MAX_CENTRE_PX, MAX_CENTRE_PX, false);
            Double cx = number(o, "centre_x_px", "centre_x_px", centre);
            Double cy = number(o, "centre_y_px", "centre_y_px", centre);
            Range any = new Range("", -Double.MAX_VALUE, Double.MAX_VALUE, false);
            Double scale = number(o, "scale", "scale", any);
            if (scale != null && scale == 0) {
                throw fail("scale", "must not be 0", "");
            }
            Double offset = number(o, "offset", "offset", any);
            Double noData = number(o, "no_data", "no_data", any);
            List<MeasurementConditions> pageConditions = new ArrayList<>();
            List<String> pages = pages(o.get("pages"), pageConditions);
            MeasurementConditions c = conditions(o.get("conditions"));
            Provenance history = history(o.get("history"));
            return new Sidecar(waferId, quantity, unit, pitch, cx, cy, scale, offset, noData, c, pages, history,
                    warnings, pages == null ? null : pageConditions);
        }

        private MeasurementConditions conditions(JsonNode n) throws MapFormatException {
            if (n == null || n.isNull()) {
                return MeasurementConditions.UNKNOWN;
            }
            if (!n.isObject()) {
                throw fail("conditions", "must be an object but is " + kind(n), "");
            }
            ObjectNode o = (ObjectNode) n;
            Doping doping = null;
            String d = text(o, "doping", "conditions.doping");
            if (d != null) {
                try {
                    doping = Doping.parse(d);
                } catch (InvalidValueException e) {
                    throw fail("conditions.doping", e.getMessage(), e.unit());
                }
            }
            Map<String, Double> values = new LinkedHashMap<>();
            for (Map.Entry<String, Range> e : CONDITION_RANGES.entrySet()) {
                values.put(e.getKey(), number(o, e.getKey(), "conditions." + e.getKey(), e.getValue()));
            }
            Map<String, String> extra = new TreeMap<>();
            for (Map.Entry<String, JsonNode> e : o.properties()) {
                String k = e.getKey();
                if (isConditionKey(k)) {
                    continue;
                }
                if (k.equals("extra")) {
                    JsonNode x = e.getValue();
                    if (x.isNull()) {
                        continue;
                    }
                    if (!x.isObject()) {
                        throw fail("conditions.extra", "must be an object of texts but is " + kind(x), "");
                    }
                    for (Map.Entry<String, JsonNode> xe : x.properties()) {
                        addExtra(extra, "conditions.extra." + xe.getKey(), xe.getKey(), xe.getValue());
                    }
                    continue;
                }
                addExtra(extra, "conditions." + k, k, e.getValue());
            }
            if (ignoredFacts > TextLimits.MAX_LISTED_WARNINGS) {
                warnings.add(TextLimits.andMore(ignoredFacts - TextLimits.MAX_LISTED_WARNINGS,
                        "condition fields that are not a text, number or boolean ignored"));
            }
            return new MeasurementConditions(doping, values.get("thickness_um"), values.get("temperature_k"),
                    values.get("injection_cm3"), values.get("generation_cm3_s"), values.get("srv_cm_s"),
                    values.get("photon_flux_cm2_s"), values.get("pl_calibration_counts_cm6"), extra);
        }

        private void addExtra(Map<String, String> extra, String path, String key, JsonNode v)
                throws MapFormatException {
            if (v.isNull()) {
                return;
            }
            if (v.isTextual() || v.isNumber() || v.isBoolean()) {
                extra.put(key, bounded(v.asText(), path, TextLimits.MAX_TEXT_CHARS));
            } else if (++ignoredFacts <= TextLimits.MAX_LISTED_WARNINGS) {
                warnings.add("field '" + path + "' is " + kind(v) + ", not a text, number or boolean; ignored");
            }
        }

        /**
         * The page labels; each page's own condition fields are added to {@code pageConditions}
         * ({@link MeasurementConditions#UNKNOWN} for a plain label).
         */
        private List<String> pages(JsonNode n, List<MeasurementConditions> pageConditions)
                throws MapFormatException {
            if (n == null || n.isNull()) {
                return null;
            }
            if (!n.isArray()) {
                throw fail("pages", "must be an array of page labels but is " + kind(n), "");
            }
            List<String> labels = new ArrayList<>();
            for (int i = 0; i < n.size(); i++) {
                JsonNode e = n.get(i);
                String where = "pages[" + i + "]";
                if (e.isTextual()) {
                    labels.add(bounded(e.asText(), where, TextLimits.MAX_ID_CHARS));
                    pageConditions.add(MeasurementConditions.UNKNOWN);
                } else if (e.isObject()) {
                    ObjectNode po = (ObjectNode) e;
                    String label = text(po, "label", where + ".label", TextLimits.MAX_ID_CHARS);
                    if (label == null) {
                        throw fail(where + ".label", "is missing; a page object needs a label, e.g. {\"label\":"
                                + " \"1e13\", \"injection_cm3\": 1e13}", "");
                    }
                    labels.add(label);
                    pageConditions.add(pageConditions(po, where));
                } else {
                    throw fail(where, "must be a text (a label) or an object with a label and condition fields but"
                            + " is " + kind(e), "");
                }
            }
            return labels;
        }

        /** The condition fields of one page object (every other field but {@code label} is refused). */
        private MeasurementConditions pageConditions(ObjectNode po, String where) throws MapFormatException {
            for (Map.Entry<String, JsonNode> f : po.properties()) {
                String k = f.getKey();
                if (!k.equals("label") && !isConditionKey(k)) {
                    throw fail(where + "." + k, "is not a page field; a page object takes label, doping, "
                            + String.join(", ", CONDITION_RANGES.keySet()), "");
                }
            }
            Doping doping = null;
            String d = text(po, "doping", where + ".doping");
            if (d != null) {
                try {
                    doping = Doping.parse(d);
                } catch (InvalidValueException ex) {
                    throw fail(where + ".doping", ex.getMessage(), ex.unit());
                }
            }
            Map<String, Double> v = new LinkedHashMap<>();
            for (Map.Entry<String, Range> r : CONDITION_RANGES.entrySet()) {
                v.put(r.getKey(), number(po, r.getKey(), where + "." + r.getKey(), r.getValue()));
            }
            if (v.get("injection_cm3") != null && v.get("generation_cm3_s") != null) {
                throw fail(where, "gives both injection_cm3 (cm^-3) and generation_cm3_s (cm^-3 s^-1); a page has"
                        + " one of them", "");
            }
            return new MeasurementConditions(doping, v.get("thickness_um"), v.get("temperature_k"),
                    v.get("injection_cm3"), v.get("generation_cm3_s"), v.get("srv_cm_s"), v.get("photon_flux_cm2_s"),
                    v.get("pl_calibration_counts_cm6"), Map.of());
        }

        private Provenance history(JsonNode n) throws MapFormatException {
            if (n == null || n.isNull()) {
                return null;
            }
            if (!n.isObject()) {
                throw fail("history", "must be an object but is " + kind(n), "");
            }
            String source = text((ObjectNode) n, "source", "history.source");
            JsonNode steps = n.get("steps");
            List<ProcessingStep> list = new ArrayList<>();
            if (steps != null && !steps.isNull()) {
                if (!steps.isArray()) {
                    throw fail("history.steps", "must be an array but is " + kind(steps), "");
                }
                for (int i = 0; i < steps.size(); i++) {
                    String where = "history.steps[" + i + "]";
                    JsonNode s = steps.get(i);
                    if (!s.isObject()) {
                        throw fail(where, "must be an object but is " + kind(s), "");
                    }
                    String op = text((ObjectNode) s, "operation", where + ".operation");
                    if (op == null) {
                        throw fail(where + ".operation", "is missing", "");
                    }
                    Map<String, String> params = new LinkedHashMap<>();
                    JsonNode p = s.get("parameters");
                    if (p != null && !p.isNull()) {
                        if (!p.isObject()) {
                            throw fail(where + ".parameters", "must be an object but is " + kind(p), "");
                        }
                        for (Map.Entry<String, JsonNode> e : p.properties()) {
                            if (!e.getValue().isValueNode() || e.getValue().isNull()) {
                                throw fail(where + ".parameters." + e.getKey(), "must be a text but is "
                                        + kind(e.getValue()), "");
                            }
                            params.put(e.getKey(), bounded(e.getValue().asText(), where + ".parameters."
                                    + e.getKey(), TextLimits.MAX_TEXT_CHARS));
                        }
                    }
                    list.add(new ProcessingStep(op, params));
                }
            }
            return new Provenance(source == null ? "" : source, list);
        }

        private String text(ObjectNode o, String key, String path) throws MapFormatException {
            return text(o, key, path, TextLimits.MAX_TEXT_CHARS);
        }

        private String text(ObjectNode o, String key, String path, int maxChars) throws MapFormatException {
            JsonNode n = o.get(key);
            if (n == null || n.isNull()) {
                return null;
            }
            if (!n.isTextual()) {
                throw fail(path, "must be a text but is " + kind(n) + " (" + abbreviate(n.toString()) + ")", "");
            }
            return bounded(n.asText(), path, maxChars);
        }

        private String bounded(String text, String path, int maxChars) throws MapFormatException {
            String problem = TextLimits.problem(text, maxChars);
            if (problem != null) {
                throw fail(path, problem, "characters");
            }
            return text;
        }

        /**
         * Refuses more than {@link TextLimits#MAX_KEYS} keys in the whole tree, or a key longer than
         * {@link TextLimits#MAX_ID_CHARS}, before any field is read (one pass over the tree).
         */
        private void checkKeys(JsonNode root) throws MapFormatException {
            int keys = 0;
            java.util.ArrayDeque<JsonNode> todo = new java.util.ArrayDeque<>();
            todo.push(root);
            while (!todo.isEmpty()) {
                JsonNode n = todo.pop();
                if (n.isObject()) {
                    for (Map.Entry<String, JsonNode> e : n.properties()) {
                        if (++keys > TextLimits.MAX_KEYS) {
                            throw new MapFormatException(origin, null, "has more than " + TextLimits.MAX_KEYS
                                    + " keys; a sidecar may have at most " + TextLimits.MAX_KEYS);
                        }
                        String problem = TextLimits.problem(e.getKey(), TextLimits.MAX_ID_CHARS);
                        if (problem != null) {
                            throw new MapFormatException(origin, "key '" + abbreviate(e.getKey()) + "'", problem,
                                    "characters");
                        }
                        todo.push(e.getValue());
                    }
                } else if (n.isArray()) {
                    n.forEach(todo::push);
                }
            }
        }

        private Double number(ObjectNode o, String key, String path, Range r) throws MapFormatException {
            JsonNode n = o.get(key);
            if (n == null || n.isNull()) {
                return null;
            }
            if (!n.isNumber()) {
                throw fail(path, "must be a number but is " + kind(n) + " (" + abbreviate(n.toString()) + ")",
                        r.unit());
            }
            double v = n.doubleValue();
            if (!r.accepts(v)) {
                if (!Double.isFinite(v)) {
                    throw fail(path, "must be a finite number but is beyond the range of numbers", r.unit());
                }
                throw fail(path, r.describe() + " but was " + Checks.exact(v), r.unit());
            }
            return v;
        }

        private MapFormatException fail(String field, String problem, String unit) {
            return new MapFormatException(origin, "field '" + field + "'", problem, unit);
        }
    }

    private static String abbreviate(String s) {
        return s.length() <= 40 ? s : s.substring(0, 37) + "...";
    }

    /** A lower-case unit text without spaces, micro signs as {@code u}, for comparisons. */
    static String normaliseUnit(String u) {
        String t = asciiUnit(u.trim()).toLowerCase(Locale.ROOT).replace(" ", "").replace("⁻³", "^-3");
        switch (t) {
            case "cm-3": case "/cm3": case "/cm^3": case "cm^-3": return "cm^-3";
            case "count": case "counts": case "cts": return "counts";
            case "1": case "-": case "none": return "";
            default: return t;
        }
    }
}
