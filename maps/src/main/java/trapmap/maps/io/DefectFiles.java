package trapmap.maps.io;

import com.fasterxml.jackson.core.JsonLocation;
import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.core.type.TypeReference;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.charset.CharacterCodingException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.defect.DefectSpecs;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.text.TextLimits;

/**
 * Reads user-defined defects from a JSON file. The file holds one defect object, an array of them, or an object
 * {@code {"defects": [...]}}; each object has the fields of {@link DefectSpecs}, for example
 * <pre>
 * {"id": "fe-i-alt", "name": "interstitial iron, alternative set", "source": "where the numbers come from",
 *  "level": {"reference": "Ev", "energy_ev": 0.38}, "sigma_n_cm2": 5e-14, "sigma_p_cm2": 7e-17,
 *  "vth_convention": "fixed", "spread": {"sigma_n_cm2": [1.3e-14, 5e-14], "note": "two published values"}}
 * </pre>
 * Ids must be unique within the file and must not repeat a built-in id, so that an id always means one parameter
 * set. Every failure is a {@link DefectFileException} whose one-line message names the file and, where there is
 * one, the field and its unit.
 */
public final class DefectFiles {
    private static final ObjectMapper JSON = new ObjectMapper()
            .enable(JsonParser.Feature.STRICT_DUPLICATE_DETECTION)
            .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS);
    private static final TypeReference<LinkedHashMap<String, Object>> MAP = new TypeReference<>() { };
    private static final String SHAPE = "expected a defect object, an array of defect objects, or {\"defects\": [...]}";

    /** Physics-side field names that {@link Defect} and its parts report, with the JSON key they come from. */
    private static final Map<String, String> JSON_KEYS = Map.of(
            "energy", "level.energy_ev",
            "degeneracy", "level.degeneracy",
            "sigma_n", "sigma_n_cm2",
            "sigma_p", "sigma_p_cm2",
            "sigma", "sigma_n_cm2",
            "captureRatio", "sigma_n_cm2");

    private DefectFiles() {
    }

    /**
     * The defects in {@code file}, in file order.
     *
     * @throws DefectFileException when the file is missing, unreadable, not valid JSON, or describes an invalid defect
     */
    public static List<Defect> read(Path file) throws DefectFileException {
        String name = file.toString();
        if (Files.isDirectory(file)) {
            throw new DefectFileException(name, null, "", name + ": is a directory, not a defect file", null);
        }
        byte[] bytes;
        try {
            bytes = InputFiles.readBytes(file, InputFiles.JSON_MAX_BYTES);
        } catch (NoSuchFileException e) {
            throw new DefectFileException(name, null, "", name + ": no such defect file", e);
        } catch (InputFiles.Refused e) {
            throw new DefectFileException(name, null, "", name + ": defect file " + e.reason(), e);
        } catch (IOException e) {
            throw new DefectFileException(name, null, "", name + ": cannot read the defect file ("
                    + oneLine(String.valueOf(e.getMessage())) + ")", e);
        }
        String text;
        try {
            text = StandardCharsets.UTF_8.newDecoder().decode(java.nio.ByteBuffer.wrap(bytes)).toString();
        } catch (CharacterCodingException e) {
            throw new DefectFileException(name, null, "", name + ": is not UTF-8 text", e);
        }
        return parse(text, name);
    }

    /**
     * The defects described by {@code json}.
     *
     * @param origin the file name (or other origin) used in messages
     * @throws DefectFileException when the text is not valid JSON or describes an invalid defect
     */
    public static List<Defect> parse(String json, String origin) throws DefectFileException {
        JsonNode root = tree(json, origin);
        JsonTexts.Overlong overlong = JsonTexts.firstOverlong(root, TextLimits.MAX_ID_CHARS,
                Map.of("id", TextLimits.MAX_ID_CHARS, "name", TextLimits.MAX_ID_CHARS));
        if (overlong != null) {
            throw new DefectFileException(origin, overlong.field(), "", origin + ": field '" + overlong.field()
                    + "': " + overlong.problem(), null);
        }
        List<JsonNode> entries = entries(root, origin);
        List<Defect> defects = new ArrayList<>(entries.size());
        Map<String, Integer> seen = new HashMap<>();
        for (int i = 0; i < entries.size(); i++) {
            String where = entries.size() == 1 && !root.isArray() && !root.has("defects") ? origin
                    : origin + " (defect " + (i + 1) + ")";
            JsonNode node = entries.get(i);
            if (!node.isObject()) {
                throw new DefectFileException(origin, null, "", where + ": must be a JSON object but is "
                        + Sidecar.kind(node), null);
            }
            Defect d = build(JSON.convertValue(node, MAP), where, origin);
            if (isBuiltIn(d.id())) {
                throw new DefectFileException(origin, "id", "", where + ": field 'id' '" + d.id()
                        + "' is a built-in defect id; choose another id for a user-defined parameter set", null);
            }
            Integer first = seen.putIfAbsent(d.id(), i + 1);
            if (first != null) {
                throw new DefectFileException(origin, "id", "", origin + ": defect id '" + d.id()
                        + "' appears twice (defects " + first + " and " + (i + 1) + ")", null);
            }
            defects.add(d);
        }
        return List.copyOf(defects);
    }

    /**
     * One user-defined defect from the fields of a defect-file object given as a map (what the viewer's New defect
     * form collects: numbers as {@link Number}s, anything else as typed), checked exactly as an object of a defect
     * file is, built-in ids refused.
     *
     * @param origin what the fields came from, used in messages
     * @throws DefectFileException naming the field (its defect-file key) and unit of the first invalid value
     */
    public static Defect fromFields(Map<String, ?> fields, String origin) throws DefectFileException {
        Defect d = build(new LinkedHashMap<>(fields), origin, origin);
        if (isBuiltIn(d.id())) {
            throw new DefectFileException(origin, "id", "", origin + ": field 'id' '" + d.id()
                    + "' is a built-in defect id; choose another id for a user-defined parameter set", null);
        }
        return d;
    }

    private static JsonNode tree(String json, String origin) throws DefectFileException {
        JsonNode root;
        try {
            root = JSON.readTree(json);
        } catch (JsonProcessingException e) {
            JsonLocation at = e.getLocation();
            String place = at == null ? "" : " at line " + at.getLineNr() + ", column " + at.getColumnNr();
            throw new DefectFileException(origin, null, "", origin + ": not valid JSON" + place + ": "
                    + oneLine(JsonErrors.reason(e)), e);
        }
        if (root == null || root.isMissingNode()) {
            throw new DefectFileException(origin, null, "", origin + ": is empty; " + SHAPE, null);
        }
        return root;
    }

    private static List<JsonNode> entries(JsonNode root, String origin) throws DefectFileException {
        List<JsonNode> list = new ArrayList<>();
        if (root.isObject() && root.has("defects")) {
            if (root.size() != 1) {
                throw new DefectFileException(origin, null, "", origin + ": an object with \"defects\" must have"
                        + " no other fields; " + SHAPE, null);
            }
            JsonNode arr = root.get("defects");
            if (!arr.isArray()) {
                throw new DefectFileException(origin, "defects", "", origin + ": field 'defects' must be an array"
                        + " of defect objects but is " + Sidecar.kind(arr), null);
            }
            arr.forEach(list::add);
        } else if (root.isArray()) {
            root.forEach(list::add);
        } else if (root.isObject()) {
            list.add(root);
        } else {
            throw new DefectFileException(origin, null, "", origin + ": holds " + Sidecar.kind(root) + "; " + SHAPE,
                    null);
        }
        if (list.isEmpty()) {
            throw new DefectFileException(origin, null, "", origin + ": contains no defects; " + SHAPE, null);
        }
        return list;
    }

    private static Defect build(Map<String, ?> spec, String where, String file) throws DefectFileException {
        try {
            return DefectSpecs.fromMap(spec, where);
        } catch (InvalidValueException e) {
            String field = e.field();
            String key = JSON_KEYS.getOrDefault(field, field);
            String message = oneLine(e.getMessage());
            String prefix = where + ": ";
            String rest = message.startsWith(prefix) ? message.substring(prefix.length()) : message;
            if (!rest.startsWith("field '")) {
                rest = rest.startsWith(field + " ") ? "field '" + key + "' " + rest.substring(field.length() + 1)
                        : "field '" + key + "': " + rest;
            }
            throw new DefectFileException(file, key, e.unit(), prefix + rest, e);
        } catch (IllegalArgumentException e) {
            throw new DefectFileException(file, null, "", where + ": " + oneLine(String.valueOf(e.getMessage())), e);
        }
    }

    private static boolean isBuiltIn(String id) {
        return DefectLibrary.all().stream().anyMatch(d -> d.id().equals(id));
    }

    private static String oneLine(String s) {
        return s == null ? "" : s.replaceAll("\\s*\\R\\s*", " ").trim();
    }
}
