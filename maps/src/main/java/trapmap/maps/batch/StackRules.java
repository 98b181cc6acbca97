package trapmap.maps.batch;

import com.fasterxml.jackson.databind.JsonNode;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import java.util.Set;
import trapmap.maps.io.NumberText;
import trapmap.maps.spectroscopy.DefectIdentification;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.shared.text.TextLimits;

/**
 * The {@code stack} of a rules profile: the wafers it judges are measured at several injection levels, one map per
 * level, and are judged also by which library defect explains each pixel's τ_SRH(Δn) curve.
 * <pre>
 * "stack": {"levels": ["*-dn1e13.*", "*-dn1e14.*", "*-dn1e15.*"], "defects": ["fe-i", "cr-i"],
 *           "noise": 0.03, "block_px": 1, "register": true}
 * </pre>
 * The judged map is the first level; its file name must match {@code levels[0]}. The text each {@code *} or
 * {@code ?} of the first glob matches fills the same wildcard of the others, in order, naming the files of the
 * other levels in the same folder (as the {@code iron} section pairs its states), so every glob needs the same
 * wildcards. Each level's injection comes from its own sidecar ({@code injection_cm3}) or the rules' conditions.
 *
 * @param levels   file-name globs of the levels, the judged map's first (at least 2, all different)
 * @param defects  candidate defect ids, or empty for every library defect with absolute cross-sections that suits
 *                 the wafer's conductivity type
 * @param noise    relative standard uncertainty of each pixel's τ_SRH at every level, [1e-6, 1]
 * @param blockPx  side of the square blocks of pixels ranked together (1: every pixel on its own)
 * @param register true: every level is registered onto the first (as {@code trapmap identify}); false: the levels
 *                 are taken as lying on one grid (as {@code identify --no-registration})
 */
public record StackRules(List<String> levels, List<String> defects, double noise, int blockPx, boolean register) {
    /** Default relative uncertainty of a pixel's τ_SRH: 3 % (the default of the physics' lifetime curves). */
    public static final double DEFAULT_NOISE = trapmap.physics.spectroscopy.LifetimeCurve.DEFAULT_RELATIVE_UNCERTAINTY;
    /** The keys of a {@code stack} object. */
    static final List<String> KEYS = List.of("levels", "defects", "noise", "block_px", "register");

    public StackRules {
        levels = List.copyOf(levels);
        defects = List.copyOf(defects);
    }

    /** True when {@code fileName} (without folder) is a map of the first level. */
    public boolean judges(String fileName) {
        return FileGlob.wildcardParts(levels.get(0), fileName) != null;
    }

    /**
     * The file names of every level of the wafer whose first-level map is {@code fileName}, in level order (the
     * first is {@code fileName} itself); empty when the name does not match the first glob.
     */
    public Optional<List<String>> levelNames(String fileName) {
        List<String> parts = FileGlob.wildcardParts(levels.get(0), fileName);
        if (parts == null) {
            return Optional.empty();
        }
        List<String> out = new ArrayList<>();
        out.add(fileName);
        for (int l = 1; l < levels.size(); l++) {
            StringBuilder sb = new StringBuilder();
            int part = 0;
            for (char c : levels.get(l).toCharArray()) {
                if (c == '*' || c == '?') {
                    sb.append(parts.get(part++));
                } else {
                    sb.append(c);
                }
            }
            out.add(sb.toString());
        }
        return Optional.of(List.copyOf(out));
    }

    /** The candidate defects for a wafer of this conductivity type. */
    public List<Defect> candidates(trapmap.physics.material.ConductivityType type) {
        List<String> ids = defects.isEmpty() ? DefectLibrary.suitedFor(type) : defects;
        return ids.stream().map(DefectLibrary::byId).toList();
    }

    /** Parses a profile's {@code stack} object; {@code path} is its field path, {@code name} the rules file. */
    static StackRules parse(JsonNode n, String path, String name, String profileDefect) throws RulesException {
        if (n == null || !n.isObject()) {
            throw error(name, path, "must be an object {\"levels\": [glob, glob, …], \"defects\": [ids], \"noise\":"
                    + " <relative>, \"block_px\": <px>, \"register\": true|false}", "");
        }
        for (Iterator<String> it = n.fieldNames(); it.hasNext(); ) {
            String k = it.next();
            if (!KEYS.contains(k)) {
                throw error(name, path + "." + k, "unknown key; expected one of " + String.join(", ", KEYS), "");
            }
        }
        JsonNode lv = n.get("levels");
        if (lv == null || !lv.isArray() || lv.size() < 2) {
            throw error(name, path + ".levels", "is required: an array of at least 2 file-name globs, one per"
                    + " injection level, the judged map's first (e.g. [\"*-dn1e13.*\", \"*-dn1e14.*\"])", "");
        }
        List<String> levels = new ArrayList<>();
        Set<String> seen = new LinkedHashSet<>();
        for (int i = 0; i < lv.size(); i++) {
            String p = path + ".levels[" + i + "]";
            String g = glob(name, p, lv.get(i));
            if (i > 0 && !wildcards(g).equals(wildcards(levels.get(0)))) {
                throw error(name, p, "must have the same * and ? wildcards, in the same order, as levels[0] ('"
                        + levels.get(0) + "'), since they carry the wafer's name", "");
            }
            if (!seen.add(g)) {
                throw error(name, p, "'" + g + "' is given twice; every level needs its own file", "");
            }
            levels.add(g);
        }
        List<String> defects = new ArrayList<>();
        if (n.has("defects")) {
            JsonNode d = n.get("defects");
            if (!d.isArray() || d.isEmpty()) {
                throw error(name, path + ".defects", "must be a non-empty array of defect ids (see trapmap defects)",
                        "");
            }
            for (int i = 0; i < d.size(); i++) {
                String p = path + ".defects[" + i + "]";
                if (!d.get(i).isTextual()) {
                    throw error(name, p, "must be a defect id such as fe-i", "");
                }
                Defect def;
                try {
                    def = DefectLibrary.byId(d.get(i).asText());
                } catch (IllegalArgumentException e) {
                    throw error(name, p, e.getMessage(), "");
                }
                if (!def.hasAbsoluteCrossSections()) {
                    throw error(name, p, "'" + def.id() + "' has no absolute capture cross-sections (cm^2), so it"
                            + " cannot be ranked", "");
                }
                if (defects.contains(def.id())) {
                    throw error(name, p, "'" + def.id() + "' is given twice", "");
                }
                defects.add(def.id());
            }
            if (profileDefect != null && !defects.contains(profileDefect)) {
                throw error(name, path + ".defects", "must include the profile's defect '" + profileDefect
                        + "', whose share best_defect_area_fraction gives", "");
            }
        }
        double noise = DEFAULT_NOISE;
        if (n.has("noise")) {
            JsonNode v = n.get("noise");
            if (!v.isNumber() || !(v.doubleValue() >= DefectIdentification.MIN_RELATIVE_NOISE
                    && v.doubleValue() <= 1)) {
                throw error(name, path + ".noise", "must be a relative uncertainty in ["
                        + NumberText.of(DefectIdentification.MIN_RELATIVE_NOISE) + ", 1] (0.03 is 3 %) but was " + v,
                        "relative");
            }
            noise = v.doubleValue();
        }
        int block = 1;
        if (n.has("block_px")) {
            JsonNode v = n.get("block_px");
            if (!v.canConvertToInt() || !v.isIntegralNumber() || v.intValue() < 1 || v.intValue() > 64) {
                throw error(name, path + ".block_px", "must be a whole number of pixels in [1, 64] but was " + v,
                        "px");
            }
            block = v.intValue();
        }
        boolean register = true;
        if (n.has("register")) {
            if (!n.get("register").isBoolean()) {
                throw error(name, path + ".register", "must be true or false but was " + n.get("register"), "");
            }
            register = n.get("register").booleanValue();
        }
        return new StackRules(levels, defects, noise, block, register);
    }

    private static String glob(String name, String path, JsonNode g) throws RulesException {
        if (g == null || !g.isTextual() || g.asText().isBlank()) {
            throw error(name, path, "must be a file-name glob such as \"*-dn1e13.*\"", "");
        }
        String s = g.asText().trim();
        String tooLong = TextLimits.problem(s, TextLimits.MAX_GLOB_CHARS);
        if (tooLong != null) {
            throw error(name, path, tooLong, "");
        }
        if (s.contains("/") || s.contains("\\") || s.contains("[") || s.contains("{")) {
            throw error(name, path, "must be a file-name glob with only * and ? wildcards but was '" + s + "'", "");
        }
        if (wildcards(s).isEmpty()) {
            throw error(name, path, "needs a * or ? for the wafer's part of the name but was '" + s + "'", "");
        }
        return s;
    }

    private static String wildcards(String glob) {
        return glob.replaceAll("[^*?]", "");
    }

    private static RulesException error(String name, String field, String problem, String unit) {
        return RulesException.field(name, field, problem, unit);
    }

    @Override
    public String toString() {
        return String.format(Locale.ROOT, "stack %s, defects %s, noise %.3g, block %d px, %s", levels,
                defects.isEmpty() ? "(suited library)" : defects, noise, blockPx, register ? "registered" : "aligned");
    }
}
