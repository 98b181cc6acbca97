package trapmap.maps.io;

import static trapmap.maps.io.JsonFields.error;
import static trapmap.maps.io.JsonFields.number;

import com.fasterxml.jackson.core.JsonParser;
import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.DeserializationFeature;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.physics.material.DensityOfStatesModel;
import trapmap.physics.material.IntrinsicDensityModel;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.recombination.SurfaceModel;
import trapmap.shared.error.InvalidValueException;

/**
 * The JSON form of {@link PhysicsSettings}: a physics settings file ({@code --physics FILE}) and the
 * {@code physics} block of rules files and viewer sessions. Every key is optional (a missing key keeps the
 * default) and no other key is accepted:
 * <pre>
 * {"thermal_velocity": "fixed" | "green",
 *  "surface_model": "sproul" | "exact",
 *  "intrinsic_density": "altermatt-2003" | "sproul-green-1991" | "misiakos-1993" | "couderc-2014",
 *  "density_of_states": "green-1990" | "couderc-2014",
 *  "radiative_coefficient_cm3_s": 4.73e-15,
 *  "detection_resolution": 0.05,
 *  "uncertainty": {...}}
 * </pre>
 * The {@code uncertainty} block (what exceedance probabilities and density quantiles are drawn with) is read by
 * {@link #uncertainty(JsonNode, String, String)} and {@link #readUncertainty(Path)}; its keys are those of
 * {@link UncertaintySettings}. A bad value is refused with one message naming the file, the field and its unit.
 */
public final class PhysicsSettingsFile {
    /** The keys of the JSON form, in the order they are written. */
    public static final List<String> KEYS = List.of("thermal_velocity", "surface_model", "intrinsic_density",
            "density_of_states", "radiative_coefficient_cm3_s", "detection_resolution");

    private static final ObjectMapper JSON = new ObjectMapper()
            .enable(JsonParser.Feature.STRICT_DUPLICATE_DETECTION)
            .enable(DeserializationFeature.FAIL_ON_TRAILING_TOKENS);

    private PhysicsSettingsFile() {
    }

    /**
     * Reads a physics settings file.
     *
     * @throws InvalidValueException with a message that starts with the file name and names the field and unit
     */
    public static PhysicsSettings read(Path file) {
        return parse(tree(file), file.toString(), "");
    }

    /**
     * The {@code uncertainty} block of a physics settings file ({@link UncertaintySettings#DEFAULTS} without one);
     * the rest of the file is checked as by {@link #read}.
     *
     * @throws InvalidValueException with a message that starts with the file name and names the field and unit
     */
    public static UncertaintySettings readUncertainty(Path file) {
        JsonNode root = tree(file);
        parse(root, file.toString(), "");
        return uncertainty(root, file.toString(), "");
    }

    /**
     * The {@code uncertainty} block of a physics settings object ({@link UncertaintySettings#DEFAULTS} without one).
     *
     * @param name prefix of every message (the file's name)
     * @param path the physics object's path in its file ("" for a settings file, "physics" for a block)
     */
    public static UncertaintySettings uncertainty(JsonNode node, String name, String path) {
        JsonNode u = node == null ? null : node.get(UNCERTAINTY);
        return u == null ? UncertaintySettings.DEFAULTS
                : UncertaintySettings.parse(u, name, path.isEmpty() ? UNCERTAINTY : path + "." + UNCERTAINTY);
    }

    /** The key of the uncertainty block. */
    public static final String UNCERTAINTY = "uncertainty";

    private static JsonNode tree(Path file) {
        String name = file.toString();
        String text;
        try {
            text = InputFiles.readUtf8(file, InputFiles.JSON_MAX_BYTES);
        } catch (NoSuchFileException e) {
            throw new InvalidValueException("physics", "", name + ": no such physics settings file");
        } catch (InputFiles.Refused e) {
            throw new InvalidValueException("physics", "", name + ": physics settings file " + e.reason());
        } catch (java.nio.charset.CharacterCodingException e) {
            throw new InvalidValueException("physics", "", name + ": physics settings file is not UTF-8 text");
        } catch (IOException e) {
            throw new InvalidValueException("physics", "", name + ": cannot read the physics settings file (" + e
                    + ")");
        }
        JsonNode root;
        try {
            root = JSON.readTree(text);
        } catch (JsonProcessingException e) {
            throw new InvalidValueException("physics", "", name + ": " + JsonErrors.notJson(e));
        }
        return root;
    }

    /**
     * The settings of a JSON object.
     *
     * @param name prefix of every message (the file's name)
     * @param path the object's path in its file ("" for a settings file, "physics" for a block)
     * @throws InvalidValueException naming {@code name}, the field path and its unit
     */
    public static PhysicsSettings parse(JsonNode node, String name, String path) {
        String prefix = path.isEmpty() ? "" : path + ".";
        if (node == null || !node.isObject()) {
            throw error(name, path.isEmpty() ? "(top level)" : path, "must be a JSON object of physics settings",
                    "");
        }
        for (Iterator<String> it = node.fieldNames(); it.hasNext(); ) {
            String k = it.next();
            if (!KEYS.contains(k) && !k.equals(UNCERTAINTY)) {
                throw error(name, prefix + k, "unknown key; expected one of " + String.join(", ", KEYS) + ", "
                        + UNCERTAINTY, "");
            }
        }
        PhysicsSettings d = PhysicsSettings.DEFAULTS;
        ThermalVelocityModel v = choice(node, "thermal_velocity", ThermalVelocityModel.class, d.velocities(), name,
                prefix);
        SurfaceModel s = choice(node, "surface_model", SurfaceModel.class, d.surfaceModel(), name, prefix);
        IntrinsicDensityModel ni = choice(node, "intrinsic_density", IntrinsicDensityModel.class,
                d.intrinsicDensity(), name, prefix);
        DensityOfStatesModel dos = choice(node, "density_of_states", DensityOfStatesModel.class, d.densityOfStates(),
                name, prefix);
        double b = number(node, "radiative_coefficient_cm3_s", "cm^3/s", PhysicsSettings.MIN_RADIATIVE_CM3_PER_S,
                PhysicsSettings.MAX_RADIATIVE_CM3_PER_S, d.radiativeCm3PerS(), name, prefix);
        double res = number(node, "detection_resolution", "relative, 0.05 = 5 %", 1e-6, 1, d.detectionResolution(),
                name, prefix);
        if (node.has(UNCERTAINTY)) {
            uncertainty(node, name, path); // checked here too, so that every reader of the block refuses it alike
        }
        return new PhysicsSettings(v, s, ni, dos, b, res);
    }

    /** The JSON form of {@code s}: every key, numbers as numbers. */
    public static Map<String, Object> toJson(PhysicsSettings s) {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("thermal_velocity", PhysicsSettings.name(s.velocities()));
        m.put("surface_model", PhysicsSettings.name(s.surfaceModel()));
        m.put("intrinsic_density", PhysicsSettings.name(s.intrinsicDensity()));
        m.put("density_of_states", PhysicsSettings.name(s.densityOfStates()));
        m.put("radiative_coefficient_cm3_s", s.radiativeCm3PerS());
        m.put("detection_resolution", s.detectionResolution());
        return m;
    }

    private static <E extends Enum<E>> E choice(JsonNode node, String key, Class<E> type, E fallback, String name,
                                                String prefix) {
        JsonNode n = node.get(key);
        if (n == null) {
            return fallback;
        }
        if (!n.isTextual()) {
            throw error(name, prefix + key, "must be a text (a model name) but is " + n, "");
        }
        try {
            return PhysicsSettings.choice(type, n.asText(), key);
        } catch (InvalidValueException e) {
            throw error(name, prefix + key, e.getMessage(), "");
        }
    }
}
