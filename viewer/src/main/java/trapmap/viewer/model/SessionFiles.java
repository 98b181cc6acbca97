package trapmap.viewer.model;

import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import trapmap.maps.io.AtomicFiles;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import trapmap.maps.io.ColourMap;
import trapmap.maps.io.DefectFiles;
import trapmap.maps.io.JsonTexts;
import trapmap.maps.region.RegionCriteria;
import trapmap.physics.defect.Defect;
import trapmap.shared.text.TextLimits;

/**
 * Reads and writes sessions as readable JSON:
 * <pre>
 * {"format": "trapmap-session", "version": 1,
 *  "files": ["wafers/w07.tif", …],          (relative to the session file's folder when inside it)
 *  "selected": 0,
 *  "conditions": {"doping": "p:1.5ohmcm", "thickness_um": 180, "temperature_k": 300, "injection_cm3": 1e14,
 *                 "generation_cm3_s": null, "srv_cm_s": 10},   (null or missing: the sidecar's value)
 *  "defect": "fe-i",
 *  "user_defects": [ {defect objects as in a defect file} ],
 *  "quantity": "trap-density",
 *  "display": {"colour_map": "blue-yellow", "log_scale": true, "auto_range": true, "low_percentile": 1,
 *              "high_percentile": 99, "low": 1e10, "high": 1e12},
 *  "threshold": {"value": 3e11, "side": "above", "min_area_mm2": 4, "max_flagged_fraction": 0.02},
 *  "line": {"x0_mm": -50, "y0_mm": 0, "x1_mm": 50, "y1_mm": 0, "band_width_mm": 2},   (or null)
 *  "edge_exclusion_mm": 2,
 *  "views": {"wafers/w07.tif": {"zoom": 2, "centre_x_px": 128, "centre_y_px": 128}},
 *  "rules": "rules-example.json",          (or null: the quick threshold check)
 *  "defect_for_all": null,                  (a defect replacing every rules profile's)
 *  "physics": {"thermal_velocity": "green", …}  (or null: the rules file's physics block, else the defaults)
 *  "exceedance": {"threshold_cm3": 3e11,
 *                 "uncertainty": {"doping_relative": 0.05, …, "samples": 10000, "seed": 1}},
 *                 (the uncertainty block of physics settings files, read by the same parser,
 *                  {@link trapmap.maps.io.UncertaintySettings}; missing: the defaults of
 *                  {@link ExceedanceSettings#DEFAULT})
 *  "defect_overrides": {"wafers/w07.tif": "cr-i"}}   (per file)
 * </pre>
 * Unknown keys are errors; every error names the file and the field (with its unit). Writing is atomic.
 */
public final class SessionFiles {
    /** The {@code format} value. */
    public static final String FORMAT = "trapmap-session";

    private static final ObjectMapper JSON = new ObjectMapper()
            .enable(JsonParser.Feature.STRICT_DUPLICATE_DETECTION)
            .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS)
            .enable(SerializationFeature.INDENT_OUTPUT);

    private static final Set<String> KEYS = Set.of("format", "version", "files", "selected", "conditions", "defect",
            "user_defects", "quantity", "display", "threshold", "line", "edge_exclusion_mm", "views", "rules",
            "defect_for_all", "defect_overrides", "physics", "exceedance");
    private static final Set<String> EXCEEDANCE_KEYS = Set.of("threshold_cm3", "uncertainty");

    /**
     * A session file that cannot be used; the message names the file and the field, on one line (line breaks that
     * a key or value of the file brings in are shown as {@code \n} and {@code \r}).
     */
    public static final class SessionException extends IOException {
        private static final long serialVersionUID = 1L;

        public SessionException(String message) {
            super(message.replace("\r", "\\r").replace("\n", "\\n"));
        }
    }

    private SessionFiles() {
    }

    // ---- writing -----------------------------------------------------------------------------------------

    /** Writes {@code s} to {@code file} atomically (temporary file in the same folder, then a rename). */
    public static void write(Session s, Path file) throws IOException {
        Path dir = file.toAbsolutePath().getParent();
        byte[] bytes = toJson(s, dir).getBytes(StandardCharsets.UTF_8);
        AtomicFiles.write(file, bytes);
    }

    /** The JSON text of a session whose file lies in {@code dir} (paths inside it are written relative). */
    public static String toJson(Session s, Path dir) {
        ObjectNode root = JSON.createObjectNode();
        root.put("format", FORMAT);
        root.put("version", Session.VERSION);
        ArrayNode files = root.putArray("files");
        s.files().forEach(p -> files.add(rel(p, dir)));
        root.put("selected", s.selected());
        Analysis a = s.analysis();
        ConditionOverrides c = a.conditions();
        ObjectNode cn = root.putObject("conditions");
        cn.put("doping", c.doping());
        cn.put("thickness_um", c.thicknessUm());
        cn.put("temperature_k", c.temperatureK());
        cn.put("injection_cm3", c.injectionPerCm3());
        cn.put("generation_cm3_s", c.generationPerCm3PerS());
        cn.put("srv_cm_s", c.srvCmPerS());
        root.put("defect", a.defectId());
        ArrayNode ud = root.putArray("user_defects");
        s.userDefects().forEach(d -> ud.add(defectNode(d)));
        root.put("quantity", a.quantity().key());
        DisplaySettings d = a.display();
        ObjectNode dn = root.putObject("display");
        dn.put("colour_map", colourKey(d.colours()));
        dn.put("log_scale", d.logarithmic());
        dn.put("auto_range", d.autoRange());
        dn.put("low_percentile", d.lowPercent());
        dn.put("high_percentile", d.highPercent());
        dn.put("low", d.low());
        dn.put("high", d.high());
        ThresholdRule t = a.threshold();
        ObjectNode tn = root.putObject("threshold");
        tn.put("value", t.value());
        tn.put("side", t.side().name().toLowerCase(Locale.ROOT));
        tn.put("min_area_mm2", t.minAreaMm2());
        tn.put("max_flagged_fraction", t.maxFlaggedFraction());
        if (a.line() == null) {
            root.putNull("line");
        } else {
            ProfileLine l = a.line();
            ObjectNode ln = root.putObject("line");
            ln.put("x0_mm", l.x0Mm());
            ln.put("y0_mm", l.y0Mm());
            ln.put("x1_mm", l.x1Mm());
            ln.put("y1_mm", l.y1Mm());
            ln.put("band_width_mm", l.bandWidthMm());
        }
        root.put("edge_exclusion_mm", a.edgeExclusionMm());
        ExceedanceSettings ex = a.exceedance();
        ObjectNode en = root.putObject("exceedance");
        en.put("threshold_cm3", ex.thresholdPerCm3());
        en.set("uncertainty", JSON.valueToTree(ex.drawn().toJson()));
        ObjectNode vn = root.putObject("views");
        s.views().entrySet().stream().sorted(Map.Entry.comparingByKey()).forEach(e -> {
            ObjectNode v = vn.putObject(rel(e.getKey(), dir));
            v.put("zoom", e.getValue().zoom());
            v.put("centre_x_px", e.getValue().centreXPx());
            v.put("centre_y_px", e.getValue().centreYPx());
        });
        if (s.rules() == null) {
            root.putNull("rules");
        } else {
            root.put("rules", rel(s.rules(), dir));
        }
        root.put("defect_for_all", s.defectForAll());
        if (s.physics() == null) {
            root.putNull("physics");
        } else {
            root.set("physics", JSON.valueToTree(trapmap.maps.io.PhysicsSettingsFile.toJson(s.physics())));
        }
        ObjectNode on = root.putObject("defect_overrides");
        s.defects().entrySet().stream().sorted(Map.Entry.comparingByKey()).forEach(e -> on.put(rel(e.getKey(), dir),
                e.getValue()));
        try {
            return JSON.writeValueAsString(root) + "\n";
        } catch (JsonProcessingException e) {
            throw new IllegalStateException(e);
        }
    }

    private static String rel(Path p, Path dir) {
        Path abs = p.toAbsolutePath().normalize();
        if (dir != null && abs.startsWith(dir.toAbsolutePath().normalize())) {
            return dir.toAbsolutePath().normalize().relativize(abs).toString().replace('\\', '/');
        }
        return abs.toString();
    }

    static String colourKey(ColourMap c) {
        return c.name().toLowerCase(Locale.ROOT).replace('_', '-');
    }

    /** A defect as a defect-file object ({@link DefectFiles} reads it back). */
    static ObjectNode defectNode(Defect d) {
        ObjectNode n = JSON.createObjectNode();
        n.put("id", d.id());
        n.put("name", d.name());
        n.put("source", d.source().isEmpty() ? "user-defined" : d.source());
        ObjectNode level = n.putObject("level");
        level.put("reference", switch (d.level().reference()) {
            case CONDUCTION_BAND -> "Ec";
            case VALENCE_BAND -> "Ev";
            case INTRINSIC -> "Ei";
        });
        level.put("energy_ev", d.level().energyEv());
        level.put("degeneracy", d.level().degeneracy());
        n.put("sigma_n_cm2", d.electronCrossSectionCm2());
        n.put("sigma_p_cm2", d.holeCrossSectionCm2());
        n.put("vth_convention", d.velocityConvention() == trapmap.physics.material.ThermalVelocityModel.FIXED
                ? "fixed" : "green");
        if (d.spread() != null) {
            ObjectNode sp = n.putObject("spread");
            sp.putArray("energy_ev").add(d.spread().energyEv().min()).add(d.spread().energyEv().max());
            sp.putArray("sigma_n_cm2").add(d.spread().electronCrossSectionCm2().min())
                    .add(d.spread().electronCrossSectionCm2().max());
            sp.putArray("sigma_p_cm2").add(d.spread().holeCrossSectionCm2().min())
                    .add(d.spread().holeCrossSectionCm2().max());
            sp.put("note", d.spread().note());
        }
        return n;
    }

    // ---- reading -----------------------------------------------------------------------------------------

    /** Reads a session file; relative paths are resolved against its folder. */
    public static Session read(Path file) throws IOException {
        String text;
        try {
            text = trapmap.maps.io.InputFiles.readUtf8(file, trapmap.maps.io.InputFiles.JSON_MAX_BYTES);
        } catch (trapmap.maps.io.InputFiles.Refused e) {
            throw new SessionException(file + ": session file " + e.reason());
        } catch (java.nio.file.NoSuchFileException e) {
            throw new SessionException(file + ": no such session file");
        } catch (java.nio.charset.CharacterCodingException e) {
            throw new SessionException(file + ": is not UTF-8 text");
        } catch (IOException e) {
            throw new SessionException(file + ": cannot read the session file (" + oneLine(e.toString()) + ")");
        }
        return parse(text, file.toString(), file.toAbsolutePath().getParent());
    }

    /**
     * Reads a session file and restores it into {@code model} ({@link Session#applyTo}); every failure, also one
     * while restoring, is a {@link SessionException} whose one line names the file.
     *
     * @return the outcome of opening the session's map files (and its rules file)
     */
    public static ViewerModel.OpenOutcome open(Path file, ViewerModel model) throws IOException {
        Session s = read(file);
        try {
            return s.applyTo(model);
        } catch (RuntimeException e) {
            throw new SessionException(file + ": cannot be restored (" + oneLine(e.getMessage() == null
                    ? e.toString() : e.getMessage()) + ")");
        }
    }

    private static String oneLine(String text) {
        return text.replaceAll("\\s*[\\r\\n]+\\s*", " ");
    }

    /** Parses session text; {@code name} names it in errors, {@code dir} resolves relative paths. */
    public static Session parse(String text, String name, Path dir) throws SessionException {
        JsonNode root;
        try {
            root = JSON.readTree(text);
        } catch (JsonProcessingException e) {
            throw new SessionException(name + ": " + oneLine(trapmap.maps.io.JsonErrors.notJson(e)));
        }
        if (root == null || !root.isObject()) {
            throw new SessionException(name + ": a session file holds one JSON object");
        }
        JsonTexts.Overlong overlong = JsonTexts.firstOverlong(root, TextLimits.MAX_TEXT_CHARS, Map.of(
                "id", TextLimits.MAX_ID_CHARS, "name", TextLimits.MAX_ID_CHARS, "defect", TextLimits.MAX_ID_CHARS,
                "defect_for_all", TextLimits.MAX_ID_CHARS));
        if (overlong != null) {
            throw new SessionException(name + ": " + overlong.field() + " " + overlong.problem());
        }
        Reader r = new Reader(name);
        r.keys(root, KEYS, "");
        String format = r.text(root, "format", true);
        if (!FORMAT.equals(format)) {
            throw r.error("format", "", "must be \"" + FORMAT + "\" but was \"" + format + "\"");
        }
        double version = r.number(root, "version", "", true);
        if (version != Session.VERSION) {
            throw r.error("version", "", fmt(version) + " is not supported (this program reads version "
                    + Session.VERSION + ")");
        }
        List<Path> files = new ArrayList<>();
        JsonNode fn = root.get("files");
        if (fn == null || !fn.isArray()) {
            throw r.error("files", "", "is required: a list of map file paths");
        }
        for (int i = 0; i < fn.size(); i++) {
            if (!fn.get(i).isTextual() || fn.get(i).asText().isBlank()) {
                throw r.error("files[" + i + "]", "", "must be a file path");
            }
            files.add(resolve(r, fn.get(i).asText(), "files[" + i + "]", dir));
        }
        int selected = root.has("selected") ? (int) r.number(root, "selected", "", false) : (files.isEmpty() ? -1 : 0);
        if (selected < -1 || selected >= Math.max(1, files.size())) {
            throw r.error("selected", "", "must be an index into files (0 to " + (files.size() - 1) + ") but was "
                    + selected);
        }

        ConditionOverrides cond = ConditionOverrides.NONE;
        JsonNode cn = root.get("conditions");
        if (cn != null && !cn.isNull()) {
            r.object(cn, "conditions");
            r.keys(cn, Set.of("doping", "thickness_um", "temperature_k", "injection_cm3", "generation_cm3_s",
                    "srv_cm_s"), "conditions.");
            try {
                cond = new ConditionOverrides(r.optText(cn, "conditions.doping"),
                        r.optNumber(cn, "conditions.thickness_um", "um"),
                        r.optNumber(cn, "conditions.temperature_k", "K"),
                        r.optNumber(cn, "conditions.injection_cm3", "cm^-3"),
                        r.optNumber(cn, "conditions.generation_cm3_s", "cm^-3 s^-1"),
                        r.optNumber(cn, "conditions.srv_cm_s", "cm/s"));
            } catch (IllegalArgumentException e) {
                throw new SessionException(name + ": conditions: " + e.getMessage());
            }
        }
        String defect = root.has("defect") && !root.get("defect").isNull() ? r.text(root, "defect", true) : null;

        List<Defect> userDefects = new ArrayList<>();
        JsonNode ud = root.get("user_defects");
        if (ud != null && !ud.isNull()) {
            if (!ud.isArray()) {
                throw r.error("user_defects", "", "must be a list of defect objects");
            }
            if (ud.size() > 0) {
                try {
                    userDefects.addAll(DefectFiles.parse(ud.toString(), name + ": user_defects"));
                } catch (IOException e) {
                    throw new SessionException(e.getMessage());
                }
            }
        }
        if (defect != null && userDefects.stream().noneMatch(d -> d.id().equals(defect))
                && DefectChoices.library().stream().noneMatch(d -> d.id().equals(defect))) {
            throw r.error("defect", "", "'" + defect + "' is neither a library defect with absolute cross-sections"
                    + " nor one of user_defects");
        }

        DisplayedQuantity q = DisplayedQuantity.LIFETIME;
        if (root.has("quantity")) {
            try {
                q = DisplayedQuantity.ofKey(r.text(root, "quantity", true));
            } catch (IllegalArgumentException e) {
                // the message names the field already ("unknown quantity 'x'; …")
                throw new SessionException(name + ": " + e.getMessage());
            }
        }

        DisplaySettings display = DisplaySettings.DEFAULT.withLogarithmic(q.logarithmic());
        JsonNode dn = root.get("display");
        if (dn != null && !dn.isNull()) {
            r.object(dn, "display");
            r.keys(dn, Set.of("colour_map", "log_scale", "auto_range", "low_percentile", "high_percentile", "low",
                    "high"), "display.");
            ColourMap cm = display.colours();
            if (dn.has("colour_map")) {
                String key = r.text(dn, "display.colour_map", true);
                cm = null;
                for (ColourMap c : ColourMap.values()) {
                    if (colourKey(c).equalsIgnoreCase(key)) {
                        cm = c;
                    }
                }
                if (cm == null) {
                    List<String> known = new ArrayList<>();
                    for (ColourMap c : ColourMap.values()) {
                        known.add(colourKey(c));
                    }
                    throw r.error("display.colour_map", "", "unknown colour map '" + key + "'; known: " + known);
                }
            }
            try {
                display = new DisplaySettings(cm, r.bool(dn, "display.log_scale", display.logarithmic()),
                        r.bool(dn, "display.auto_range", true),
                        r.num(dn, "display.low_percentile", "%", 1), r.num(dn, "display.high_percentile", "%", 99),
                        r.num(dn, "display.low", "", 1), r.num(dn, "display.high", "", 100));
            } catch (IllegalArgumentException e) {
                throw new SessionException(name + ": display: " + e.getMessage());
            }
        }

        ThresholdRule threshold = ThresholdRule.defaultFor(q);
        JsonNode tn = root.get("threshold");
        if (tn != null && !tn.isNull()) {
            r.object(tn, "threshold");
            r.keys(tn, Set.of("value", "side", "min_area_mm2", "max_flagged_fraction"), "threshold.");
            String side = tn.has("side") ? r.text(tn, "threshold.side", true) : q.defaultSide().name();
            RegionCriteria.Side s;
            if (side.equalsIgnoreCase("above")) {
                s = RegionCriteria.Side.ABOVE;
            } else if (side.equalsIgnoreCase("below")) {
                s = RegionCriteria.Side.BELOW;
            } else {
                throw r.error("threshold.side", "", "must be \"above\" or \"below\" but was \"" + side + "\"");
            }
            try {
                threshold = new ThresholdRule(r.num(tn, "threshold.value", q.unit(), q.defaultThreshold()), s,
                        r.num(tn, "threshold.min_area_mm2", "mm^2", 4),
                        r.num(tn, "threshold.max_flagged_fraction", "", ThresholdRule.DEFAULT_MAX_FRACTION));
            } catch (IllegalArgumentException e) {
                throw new SessionException(name + ": threshold: " + e.getMessage());
            }
        }

        ProfileLine line = null;
        JsonNode ln = root.get("line");
        if (ln != null && !ln.isNull()) {
            r.object(ln, "line");
            r.keys(ln, Set.of("x0_mm", "y0_mm", "x1_mm", "y1_mm", "band_width_mm"), "line.");
            try {
                line = new ProfileLine(r.number(ln, "line.x0_mm", "mm", true), r.number(ln, "line.y0_mm", "mm", true),
                        r.number(ln, "line.x1_mm", "mm", true), r.number(ln, "line.y1_mm", "mm", true),
                        r.num(ln, "line.band_width_mm", "mm", 0));
            } catch (IllegalArgumentException e) {
                throw new SessionException(name + ": line: " + e.getMessage());
            }
        }
        double edge = r.num(root, "edge_exclusion_mm", "mm", Analysis.DEFAULT.edgeExclusionMm());
        ExceedanceSettings exceedance = exceedance(r, root.get("exceedance"), name);

        Analysis analysis;
        try {
            analysis = new Analysis(cond, defect, q, display, threshold, line, edge, exceedance);
        } catch (IllegalArgumentException e) {
            throw new SessionException(name + ": " + e.getMessage());
        }

        Map<Path, ViewState> views = new LinkedHashMap<>();
        JsonNode vn = root.get("views");
        if (vn != null && !vn.isNull()) {
            r.object(vn, "views");
            for (Iterator<Map.Entry<String, JsonNode>> it = vn.fields(); it.hasNext(); ) {
                Map.Entry<String, JsonNode> e = it.next();
                String f = "views." + e.getKey();
                r.object(e.getValue(), f);
                r.keys(e.getValue(), Set.of("zoom", "centre_x_px", "centre_y_px"), f + ".");
                try {
                    views.put(resolve(r, e.getKey(), f, dir), new ViewState(
                            r.number(e.getValue(), f + ".zoom", "", true),
                            r.number(e.getValue(), f + ".centre_x_px", "px", true),
                            r.number(e.getValue(), f + ".centre_y_px", "px", true)));
                } catch (IllegalArgumentException ex) {
                    throw new SessionException(name + ": " + f + ": " + ex.getMessage());
                }
            }
        }
        Path rules = root.has("rules") && !root.get("rules").isNull()
                ? resolve(r, r.text(root, "rules", true), "rules", dir) : null;
        String forAll = root.has("defect_for_all") && !root.get("defect_for_all").isNull()
                ? knownDefect(r, r.text(root, "defect_for_all", true), "defect_for_all", userDefects) : null;
        Map<Path, String> overrides = new LinkedHashMap<>();
        JsonNode on = root.get("defect_overrides");
        if (on != null && !on.isNull()) {
            r.object(on, "defect_overrides");
            for (var it = on.fields(); it.hasNext(); ) {
                var e = it.next();
                String f = "defect_overrides." + e.getKey();
                if (!e.getValue().isTextual()) {
                    throw r.error(f, "", "must be a defect id");
                }
                overrides.put(resolve(r, e.getKey(), f, dir),
                        knownDefect(r, e.getValue().asText(), f, userDefects));
            }
        }
        trapmap.physics.conversion.PhysicsSettings physics = null;
        JsonNode pn = root.get("physics");
        if (pn != null && !pn.isNull()) {
            try {
                physics = trapmap.maps.io.PhysicsSettingsFile.parse(pn, name, "physics");
            } catch (trapmap.shared.error.InvalidValueException e) {
                throw new SessionException(e.getMessage());
            }
        }
        return new Session(files, files.isEmpty() ? -1 : selected, analysis, userDefects, views, rules, forAll,
                overrides, physics);
    }

    /** The {@code exceedance} block; missing fields take {@link ExceedanceSettings#DEFAULT}'s values. */
    private static ExceedanceSettings exceedance(Reader r, JsonNode en, String name) throws SessionException {
        ExceedanceSettings d = ExceedanceSettings.DEFAULT;
        if (en == null || en.isNull()) {
            return d;
        }
        r.object(en, "exceedance");
        r.keys(en, EXCEEDANCE_KEYS, "exceedance.");
        try {
            if (en.has("uncertainty")) {
                d = d.withDrawn(trapmap.maps.io.UncertaintySettings.parse(en.get("uncertainty"), name,
                        "exceedance.uncertainty"));
            }
        } catch (trapmap.shared.error.InvalidValueException e) {
            throw new SessionException(e.getMessage());
        }
        try {
            return d.withThreshold(r.num(en, "exceedance.threshold_cm3", "cm^-3", d.thresholdPerCm3()));
        } catch (IllegalArgumentException e) {
            throw new SessionException(name + ": exceedance: " + e.getMessage());
        }
    }

    private static String knownDefect(Reader r, String id, String field, List<Defect> userDefects)
            throws SessionException {
        if (userDefects.stream().noneMatch(d -> d.id().equals(id))
                && DefectChoices.library().stream().noneMatch(d -> d.id().equals(id))) {
            throw r.error(field, "", "'" + id + "' is neither a library defect with absolute cross-sections nor one"
                    + " of user_defects");
        }
        return id;
    }

    private static Path resolve(Reader r, String p, String field, Path dir) throws SessionException {
        try {
            Path path = Path.of(p);
            return (path.isAbsolute() || dir == null ? path : dir.resolve(path)).toAbsolutePath().normalize();
        } catch (java.nio.file.InvalidPathException e) {
            throw r.error(field, "", "is not a valid file path (" + oneLine(e.getReason()) + ")");
        }
    }

    private static String fmt(double v) {
        return v == Math.rint(v) ? Long.toString((long) v) : Double.toString(v);
    }

    /** Field access with errors that name the file, the field and its unit. */
    private static final class Reader {
        private final String name;

        Reader(String name) {
            this.name = name;
        }

        SessionException error(String field, String unit, String message) {
            return new SessionException(name + ": " + field + (unit.isEmpty() ? "" : " (" + unit + ")") + " "
                    + message);
        }

        private static String leaf(String field) {
            int dot = field.lastIndexOf('.');
            return dot < 0 ? field : field.substring(dot + 1);
        }

        void keys(JsonNode n, Set<String> allowed, String prefix) throws SessionException {
            for (Iterator<String> it = n.fieldNames(); it.hasNext(); ) {
                String k = it.next();
                if (!allowed.contains(k)) {
                    throw error(prefix + k, "", "is not a known key (known: " + new java.util.TreeSet<>(allowed)
                            + ")");
                }
            }
        }

        void object(JsonNode n, String field) throws SessionException {
            if (!n.isObject()) {
                throw error(field, "", "must be an object");
            }
        }

        String text(JsonNode n, String field, boolean required) throws SessionException {
            JsonNode v = n.get(leaf(field));
            if (v == null || v.isNull()) {
                if (required) {
                    throw error(field, "", "is required");
                }
                return null;
            }
            if (!v.isTextual()) {
                throw error(field, "", "must be a string but was " + v);
            }
            return v.asText();
        }

        String optText(JsonNode n, String field) throws SessionException {
            return text(n, field, false);
        }

        double number(JsonNode n, String field, String unit, boolean required) throws SessionException {
            JsonNode v = n.get(leaf(field));
            if (v == null || v.isNull()) {
                if (required) {
                    throw error(field, unit, "is required");
                }
                return Double.NaN;
            }
            if (!v.isNumber()) {
                throw error(field, unit, "must be a number" + (unit.isEmpty() ? "" : " in " + unit) + " but was "
                        + v);
            }
            double d = v.asDouble();
            if (!Double.isFinite(d)) {
                throw error(field, unit, "must be finite");
            }
            return d;
        }

        double num(JsonNode n, String field, String unit, double fallback) throws SessionException {
            double d = number(n, field, unit, false);
            return Double.isNaN(d) ? fallback : d;
        }

        Double optNumber(JsonNode n, String field, String unit) throws SessionException {
            double d = number(n, field, unit, false);
            return Double.isNaN(d) ? null : d;
        }

        boolean bool(JsonNode n, String field, boolean fallback) throws SessionException {
            JsonNode v = n.get(leaf(field));
            if (v == null || v.isNull()) {
                return fallback;
            }
            if (!v.isBoolean()) {
                throw error(field, "", "must be true or false but was " + v);
            }
            return v.asBoolean();
        }
    }
}
