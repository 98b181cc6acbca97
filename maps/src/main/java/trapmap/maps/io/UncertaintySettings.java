package trapmap.maps.io;

import static trapmap.maps.io.JsonFields.error;
import static trapmap.maps.io.JsonFields.number;

import com.fasterxml.jackson.databind.JsonNode;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import trapmap.physics.uncertainty.ConditionUncertainty;
import trapmap.physics.uncertainty.ExceedanceModel;
import trapmap.shared.error.InvalidValueException;

/**
 * What an exceedance probability or density quantile is drawn with: the condition and lifetime uncertainties, the
 * number of Monte Carlo samples and the seed. Its JSON form is the {@code uncertainty} block of a physics settings
 * file ({@code --physics FILE}) and of the {@code physics} block of rules files; every key is optional (a missing one
 * keeps its default, {@link ConditionUncertainty#DEFAULTS} and the values below) and no other key is accepted:
 * <pre>
 * "uncertainty": {"doping_relative": 0.05,      relative standard uncertainty of the doping, 0–2
 *                 "thickness_relative": 0.02,   … of the thickness, 0–2
 *                 "srv_relative": 0.5,          … of the surface recombination velocity, 0–2
 *                 "injection_relative": 0.1,    … of Δn (or of G for a fixed generation rate), 0–2
 *                 "temperature_k": 1,           absolute standard uncertainty of the temperature, K, 0–50
 *                 "lifetime_relative": 0.03,    relative noise of a measured lifetime, 0–2
 *                 "samples": 10000,             Monte Carlo samples, 16–4194304
 *                 "seed": 1}                    seed of the draws, an integer
 * </pre>
 * A bad value is refused with one message naming the file, the field and its unit.
 *
 * @param uncertainty the condition and lifetime uncertainties
 * @param samples     Monte Carlo samples
 * @param seed        seed of the draws
 */
public record UncertaintySettings(ConditionUncertainty uncertainty, int samples, long seed) {
    /** Samples when none are given: probability steps of 1e-4. */
    public static final int DEFAULT_SAMPLES = 10_000;
    /** Seed when none is given. */
    public static final long DEFAULT_SEED = 1;
    /** The documented defaults. */
    public static final UncertaintySettings DEFAULTS = new UncertaintySettings(ConditionUncertainty.DEFAULTS,
            DEFAULT_SAMPLES, DEFAULT_SEED);
    /** The keys of the JSON form, in the order they are written. */
    public static final List<String> KEYS = List.of("doping_relative", "thickness_relative", "srv_relative",
            "injection_relative", "temperature_k", "lifetime_relative", "samples", "seed");

    public UncertaintySettings {
        if (uncertainty == null) {
            throw new InvalidValueException("uncertainty", "", "the uncertainties are missing");
        }
        if (samples < ExceedanceModel.MIN_SAMPLES || samples > ExceedanceModel.MAX_SAMPLES) {
            throw new InvalidValueException("samples", "", "samples must be in [" + ExceedanceModel.MIN_SAMPLES
                    + ", " + ExceedanceModel.MAX_SAMPLES + "] but was " + samples);
        }
    }

    public UncertaintySettings withSamples(int n) {
        return new UncertaintySettings(uncertainty, n, seed);
    }

    public UncertaintySettings withSeed(long s) {
        return new UncertaintySettings(uncertainty, samples, s);
    }

    /**
     * The settings of a JSON object.
     *
     * @param name prefix of every message (the file's name)
     * @param path the object's path in its file, e.g. {@code uncertainty} or {@code physics.uncertainty}
     * @throws InvalidValueException naming {@code name}, the field path and its unit
     */
    public static UncertaintySettings parse(JsonNode node, String name, String path) {
        if (node == null || !node.isObject()) {
            throw error(name, path, "must be a JSON object of uncertainties (keys " + String.join(", ", KEYS) + ")",
                    "");
        }
        String prefix = path + ".";
        for (Iterator<String> it = node.fieldNames(); it.hasNext(); ) {
            String k = it.next();
            if (!KEYS.contains(k)) {
                throw error(name, prefix + k, "unknown key; expected one of " + String.join(", ", KEYS), "");
            }
        }
        ConditionUncertainty d = ConditionUncertainty.DEFAULTS;
        double rel = ConditionUncertainty.MAX_RELATIVE;
        String relUnit = "relative, 0.05 = 5 %";
        ConditionUncertainty u = new ConditionUncertainty(
                number(node, "doping_relative", relUnit, 0, rel, d.dopingRelative(), name, prefix),
                number(node, "thickness_relative", relUnit, 0, rel, d.thicknessRelative(), name, prefix),
                number(node, "srv_relative", relUnit, 0, rel, d.srvRelative(), name, prefix),
                number(node, "injection_relative", relUnit, 0, rel, d.injectionRelative(), name, prefix),
                number(node, "temperature_k", "K", 0, ConditionUncertainty.MAX_TEMPERATURE_K, d.temperatureK(), name,
                        prefix),
                number(node, "lifetime_relative", relUnit, 0, rel, d.lifetimeRelative(), name, prefix));
        int samples = DEFAULT_SAMPLES;
        JsonNode s = node.get("samples");
        if (s != null) {
            if (!s.isIntegralNumber() || !s.canConvertToInt() || s.intValue() < ExceedanceModel.MIN_SAMPLES
                    || s.intValue() > ExceedanceModel.MAX_SAMPLES) {
                throw error(name, prefix + "samples", "must be a whole number in [" + ExceedanceModel.MIN_SAMPLES
                        + ", " + ExceedanceModel.MAX_SAMPLES + "] but was " + s, "samples");
            }
            samples = s.intValue();
        }
        long seed = DEFAULT_SEED;
        JsonNode e = node.get("seed");
        if (e != null) {
            if (!e.isIntegralNumber() || !e.canConvertToLong()) {
                throw error(name, prefix + "seed", "must be a whole number but was " + e, "");
            }
            seed = e.longValue();
        }
        return new UncertaintySettings(u, samples, seed);
    }

    /** The JSON form of these settings: every key, numbers as numbers. */
    public Map<String, Object> toJson() {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("doping_relative", uncertainty.dopingRelative());
        m.put("thickness_relative", uncertainty.thicknessRelative());
        m.put("srv_relative", uncertainty.srvRelative());
        m.put("injection_relative", uncertainty.injectionRelative());
        m.put("temperature_k", uncertainty.temperatureK());
        m.put("lifetime_relative", uncertainty.lifetimeRelative());
        m.put("samples", samples);
        m.put("seed", seed);
        return m;
    }
}
