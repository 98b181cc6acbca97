package trapmap.maps.batch;

import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import trapmap.maps.geometry.WaferFormat;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;

/**
 * The inspection rules of a batch, read from a JSON file and checked completely before any wafer is read. The
 * schema is described in the README ("Batch inspection"); every key is known, every number has its unit in its
 * name, and an error names the field and its unit.
 *
 * @param conditions      measurement conditions for maps whose sidecar lacks them (all fields may be null)
 * @param override        true when {@code conditions} replace the sidecar's values instead of filling gaps
 * @param defectId        defect for trap-density figures and flags, or null when none is needed
 * @param edgeExclusionMm band along the wafer edge left out of every figure, mm
 * @param waferFormat     standard outline, or null to fit the outline to each map
 * @param edgeBandMm      width of the edge band of {@code edge_to_centre_ratio}, mm (inside the edge exclusion)
 * @param flag            what counts as a flagged pixel and region
 * @param limits          pass/fail limits; a wafer passes when every figure is within its limits
 * @param grades          grades, first matching wins
 */
public record Rules(MeasurementConditions conditions, boolean override, String defectId, double edgeExclusionMm,
                    WaferFormat waferFormat, double edgeBandMm, Flag flag, List<Limit> limits, List<Grade> grades) {

    /** Default width of the edge band of {@code edge_to_centre_ratio}, mm. */
    public static final double DEFAULT_EDGE_BAND_MM = 10;

    public Rules {
        limits = List.copyOf(limits);
        grades = List.copyOf(grades);
    }

    /** Which side of the threshold is flagged: below for lifetimes, above for trap densities. */
    public enum FlagQuantity {
        LIFETIME("lifetime", "us"), TRAP_DENSITY("trap-density", "cm^-3");

        private final String key;
        private final String unit;

        FlagQuantity(String key, String unit) {
            this.key = key;
            this.unit = unit;
        }

        public String key() {
            return key;
        }

        public String unit() {
            return unit;
        }
    }

    /**
     * Flagged pixels: lifetime below, or trap density above, {@code threshold}; flagged regions: 8-connected groups
     * of them of at least {@code minAreaMm2}.
     *
     * @param quantity  the map the threshold applies to
     * @param threshold µs for lifetime, cm^-3 for trap density
     * @param minAreaMm2 smallest region counted, mm²
     */
    public record Flag(FlagQuantity quantity, double threshold, double minAreaMm2) {
    }

    /**
     * Limits on one figure; NaN means no limit on that side. A figure that cannot be computed (NaN) fails every
     * limit.
     */
    public record Limit(Figure figure, double min, double max) {
        public boolean holds(double value) {
            if (Double.isNaN(value)) {
                return false;
            }
            return (Double.isNaN(min) || value >= min) && (Double.isNaN(max) || value <= max);
        }
    }

    /** A grade and the limits a wafer must meet to get it (none: always). */
    public record Grade(String grade, List<Limit> when) {
        public Grade {
            when = List.copyOf(when);
        }
    }

    /** Every figure the rules use, in the order they first appear; the CSV columns follow this order. */
    public List<Figure> figures() {
        Set<Figure> s = new LinkedHashSet<>();
        s.add(Figure.parse("harmonic_mean_lifetime_us"));
        s.add(Figure.parse("median_lifetime_us"));
        limits.forEach(l -> s.add(l.figure()));
        grades.forEach(g -> g.when().forEach(l -> s.add(l.figure())));
        s.add(Figure.parse("flagged_area_fraction"));
        s.add(Figure.parse("largest_region_mm2"));
        return List.copyOf(s);
    }

    /** True when a trap-density map is needed: a trap-density flag or figure. */
    public boolean needsTrapDensity() {
        return flag.quantity() == FlagQuantity.TRAP_DENSITY
                || figures().stream().anyMatch(f -> f.kind() == Figure.Kind.TRAP_DENSITY_PERCENTILE);
    }

    /** The conditions a map is converted with: the sidecar's, gaps filled from (or, with override, replaced by) these. */
    public MeasurementConditions applyTo(MeasurementConditions fromFile) {
        boolean rulesHaveExcitation = conditions.injectionPerCm3() != null
                || conditions.generationPerCm3PerS() != null;
        boolean fileHasExcitation = fromFile.injectionPerCm3() != null || fromFile.generationPerCm3PerS() != null;
        if (override) {
            MeasurementConditions base = rulesHaveExcitation
                    ? fromFile.withInjection(null).withGeneration(null) : fromFile;
            return base.overriddenBy(conditions);
        }
        MeasurementConditions gaps = fileHasExcitation
                ? conditions.withInjection(null).withGeneration(null) : conditions;
        return gaps.overriddenBy(fromFile);
    }

    // ---- reading -------------------------------------------------------------------------------------------

    private static final ObjectMapper JSON = new ObjectMapper()
            .enable(JsonParser.Feature.STRICT_DUPLICATE_DETECTION)
            .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS);

    /** Reads and checks a rules file. */
    public static Rules read(Path file) throws RulesException {
        String name = file.toString();
        String text;
        try {
            text = Files.readString(file);
        } catch (java.nio.file.NoSuchFileException e) {
            throw new RulesException(name + ": no such rules file");
        } catch (IOException e) {
            throw new RulesException(name + ": cannot read the rules file (" + e + ")");
        }
        return parse(text, name);
    }

    /** Parses and checks rules given as JSON text; {@code name} prefixes every message. */
    public static Rules parse(String text, String name) throws RulesException {
        JsonNode root;
        try {
            root = JSON.readTree(text);
        } catch (JsonProcessingException e) {
            String where = e.getLocation() == null ? "" : "line " + e.getLocation().getLineNr() + ", column "
                    + e.getLocation().getColumnNr() + ": ";
            throw new RulesException(name + ": " + where + "not valid JSON: " + e.getOriginalMessage());
        }
        return new Reader(name).rules(root);
    }

    /** Walks the JSON tree; each check names the field path and its unit. */
    private static final class Reader {
        private final String name;

        Reader(String name) {
            this.name = name;
        }

        RulesException error(String field, String problem, String unit) {
            return new RulesException(name + ": field '" + field + "': " + problem
                    + (unit.isEmpty() ? "" : " (" + unit + ")"));
        }

        void onlyKeys(JsonNode node, String path, Set<String> allowed) throws RulesException {
            for (Iterator<String> it = node.fieldNames(); it.hasNext(); ) {
                String k = it.next();
                if (!allowed.contains(k)) {
                    throw error(path.isEmpty() ? k : path + "." + k, "unknown key; expected one of "
                            + String.join(", ", allowed), "");
                }
            }
        }

        JsonNode object(JsonNode node, String path) throws RulesException {
            if (node == null || !node.isObject()) {
                throw error(path, "must be an object", "");
            }
            return node;
        }

        double number(JsonNode node, String path, String unit, double lo, double hi) throws RulesException {
            if (!node.isNumber()) {
                throw error(path, "must be a number but is " + describe(node), unit);
            }
            double v = node.doubleValue();
            if (!(v >= lo && v <= hi)) {
                throw error(path, "must be in [" + fmt(lo) + ", " + fmt(hi) + "] but was " + node.asText(), unit);
            }
            return v;
        }

        Double optionalNumber(JsonNode parent, String key, String path, String unit, double lo, double hi)
                throws RulesException {
            JsonNode n = parent.get(key);
            return n == null || n.isNull() ? null : number(n, path + "." + key, unit, lo, hi);
        }

        String text(JsonNode node, String path) throws RulesException {
            if (!node.isTextual() || node.asText().isBlank()) {
                throw error(path, "must be a non-empty text but is " + describe(node), "");
            }
            return node.asText().trim();
        }

        Rules rules(JsonNode root) throws RulesException {
            if (!root.isObject()) {
                throw new RulesException(name + ": the rules must be a JSON object");
            }
            onlyKeys(root, "", new LinkedHashSet<>(List.of("conditions", "defect", "edge_exclusion_mm", "wafer",
                    "edge_band_mm", "flag", "limits", "grades")));
            MeasurementConditions c = MeasurementConditions.UNKNOWN;
            boolean override = false;
            if (root.has("conditions")) {
                JsonNode n = object(root.get("conditions"), "conditions");
                onlyKeys(n, "conditions", new LinkedHashSet<>(List.of("doping", "injection_cm3", "generation_cm3_s",
                        "temperature_k", "thickness_um", "srv_cm_s", "override")));
                Doping doping = null;
                if (n.has("doping")) {
                    String t = text(n.get("doping"), "conditions.doping");
                    try {
                        doping = MapFiles.parseDoping(t);
                    } catch (IllegalArgumentException e) {
                        throw error("conditions.doping", e.getMessage(), "cm^-3 or ohm·cm");
                    }
                }
                Double injection = optionalNumber(n, "injection_cm3", "conditions", "cm^-3", 1e6, 1e19);
                Double generation = optionalNumber(n, "generation_cm3_s", "conditions", "cm^-3 s^-1", 1e10, 1e24);
                if (injection != null && generation != null) {
                    throw error("conditions.generation_cm3_s", "excludes conditions.injection_cm3; give one",
                            "cm^-3 s^-1");
                }
                Double temperature = optionalNumber(n, "temperature_k", "conditions", "K", 77, 500);
                Double thickness = optionalNumber(n, "thickness_um", "conditions", "um", 1, 5000);
                Double srv = optionalNumber(n, "srv_cm_s", "conditions", "cm/s", 0, 1e7);
                if (n.has("override")) {
                    if (!n.get("override").isBoolean()) {
                        throw error("conditions.override", "must be true or false but is " + describe(n.get(
                                "override")), "");
                    }
                    override = n.get("override").booleanValue();
                }
                c = new MeasurementConditions(doping, thickness, temperature, injection, generation, srv, null, null,
                        Map.of());
            }
            String defect = root.has("defect") ? text(root.get("defect"), "defect") : null;
            if (defect != null) {
                try {
                    defect = DefectLibrary.byId(defect).id();
                } catch (IllegalArgumentException e) {
                    throw error("defect", e.getMessage(), "");
                }
            }
            double edgeExclusion = root.has("edge_exclusion_mm")
                    ? number(root.get("edge_exclusion_mm"), "edge_exclusion_mm", "mm", 0, 50) : 0;
            double edgeBand = root.has("edge_band_mm")
                    ? number(root.get("edge_band_mm"), "edge_band_mm", "mm", 0.1, 200) : DEFAULT_EDGE_BAND_MM;
            WaferFormat format = null;
            if (root.has("wafer")) {
                String w = text(root.get("wafer"), "wafer");
                if (!w.equals("auto")) {
                    try {
                        format = WaferFormat.byId(w);
                    } catch (IllegalArgumentException e) {
                        throw error("wafer", "'" + w + "' is neither auto nor a known format ("
                                + String.join(", ", WaferFormat.ids()) + ")", "");
                    }
                }
            }
            if (!root.has("flag")) {
                throw error("flag", "is required: {\"quantity\": \"lifetime\", \"threshold\": <us>,"
                        + " \"min_area_mm2\": <mm²>}", "");
            }
            Flag flag = flag(object(root.get("flag"), "flag"));
            List<Limit> limits = root.has("limits") ? limits(root.get("limits"), "limits") : List.of();
            List<Grade> grades = root.has("grades") ? grades(root.get("grades")) : List.of();
            Rules r = new Rules(c, override, defect, edgeExclusion, format, edgeBand, flag, limits, grades);
            if (defect == null && r.needsTrapDensity()) {
                throw error("defect", "is required for trap-density flags and figures (a defect id such as fe-i)",
                        "");
            }
            return r;
        }

        Flag flag(JsonNode n) throws RulesException {
            onlyKeys(n, "flag", new LinkedHashSet<>(List.of("quantity", "threshold", "min_area_mm2")));
            if (!n.has("quantity")) {
                throw error("flag.quantity", "is required: lifetime or trap-density", "");
            }
            String q = text(n.get("quantity"), "flag.quantity");
            FlagQuantity quantity = switch (q) {
                case "lifetime" -> FlagQuantity.LIFETIME;
                case "trap-density" -> FlagQuantity.TRAP_DENSITY;
                default -> throw error("flag.quantity", "must be lifetime or trap-density but was '" + q + "'", "");
            };
            if (!n.has("threshold")) {
                throw error("flag.threshold", "is required", quantity.unit());
            }
            double t = quantity == FlagQuantity.LIFETIME
                    ? number(n.get("threshold"), "flag.threshold", "us", 1e-6, 1e6)
                    : number(n.get("threshold"), "flag.threshold", "cm^-3", 1, 1e20);
            double minArea = n.has("min_area_mm2")
                    ? number(n.get("min_area_mm2"), "flag.min_area_mm2", "mm²", 0, 1e6) : 0;
            return new Flag(quantity, t, minArea);
        }

        List<Limit> limits(JsonNode node, String path) throws RulesException {
            object(node, path);
            List<Limit> out = new ArrayList<>();
            for (Iterator<Map.Entry<String, JsonNode>> it = node.fields(); it.hasNext(); ) {
                Map.Entry<String, JsonNode> e = it.next();
                String p = path + "." + e.getKey();
                Figure f;
                try {
                    f = Figure.parse(e.getKey());
                } catch (IllegalArgumentException ex) {
                    throw error(p, ex.getMessage(), "");
                }
                JsonNode l = object(e.getValue(), p);
                onlyKeys(l, p, new LinkedHashSet<>(List.of("min", "max")));
                Double min = optionalNumber(l, "min", p, f.unit(), -Double.MAX_VALUE, Double.MAX_VALUE);
                Double max = optionalNumber(l, "max", p, f.unit(), -Double.MAX_VALUE, Double.MAX_VALUE);
                if (min == null && max == null) {
                    throw error(p, "needs min, max or both", f.unit());
                }
                if (min != null && max != null && min > max) {
                    throw error(p + ".min", "must be <= max (" + fmt(max) + ") but was " + fmt(min), f.unit());
                }
                out.add(new Limit(f, min == null ? Double.NaN : min, max == null ? Double.NaN : max));
            }
            return out;
        }

        List<Grade> grades(JsonNode node) throws RulesException {
            if (!node.isArray()) {
                throw error("grades", "must be an array of {\"grade\": text, \"when\": {limits}}", "");
            }
            List<Grade> out = new ArrayList<>();
            Set<String> seen = new LinkedHashSet<>();
            for (int i = 0; i < node.size(); i++) {
                String p = "grades[" + i + "]";
                JsonNode g = object(node.get(i), p);
                onlyKeys(g, p, new LinkedHashSet<>(List.of("grade", "when")));
                if (!g.has("grade")) {
                    throw error(p + ".grade", "is required", "");
                }
                String grade = text(g.get("grade"), p + ".grade");
                if (!seen.add(grade)) {
                    throw error(p + ".grade", "'" + grade + "' is given twice", "");
                }
                out.add(new Grade(grade, g.has("when") ? limits(g.get("when"), p + ".when") : List.of()));
            }
            return out;
        }

        private static String describe(JsonNode n) {
            if (n.isTextual()) {
                return "a text (\"" + n.asText() + "\")";
            }
            if (n.isArray()) {
                return "an array";
            }
            if (n.isObject()) {
                return "an object";
            }
            return n.isNumber() ? "a number (" + n.asText() + ")" : n.toString();
        }

        private static String fmt(double v) {
            return v == Math.rint(v) && Math.abs(v) < 1e15 ? Long.toString((long) v) : Double.toString(v);
        }
    }
}
