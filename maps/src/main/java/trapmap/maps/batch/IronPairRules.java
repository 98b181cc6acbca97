package trapmap.maps.batch;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import trapmap.shared.text.TextLimits;

/**
 * The {@code iron} section of a rules file: how the two states of a wafer's FeB-dissociation pair are found among a
 * batch's files, and the limits of the iron figures.
 * <pre>
 * "iron": {"feb_state": "*-feb-state.*", "fei_state": "*-fe-i-state.*",
 *          "limits": {"iron_median_cm3": {"max": 1e11}, "iron_p95_cm3": {"max": 5e11}}}
 * </pre>
 * The globs match file names without their folder; the text each {@code *} or {@code ?} of {@code feb_state}
 * matches fills the same wildcard of {@code fei_state}, in order, so both globs need the same wildcards.
 *
 * @param febState glob of the maps with the iron paired to boron
 * @param feiState glob of the maps after dissociation
 * @param limits   limits of the iron figures ({@code iron_median_cm3}, {@code iron_pNN_cm3}), in cm⁻³
 */
public record IronPairRules(String febState, String feiState, List<IronLimit> limits) {

    /** Iron figures: the median or a percentile of [Fe_i] over the pixels with a value, cm⁻³. */
    private static final Pattern FIGURE = Pattern.compile("iron_(median|p(\\d{1,2}(?:\\.\\d+)?))_cm3");

    /**
     * A limit of an iron figure.
     *
     * @param figure  {@code iron_median_cm3} or {@code iron_pNN_cm3}
     * @param percent the percentile the figure is (50 for the median)
     * @param min     lower limit, cm⁻³ (−∞ when none)
     * @param max     upper limit, cm⁻³ (+∞ when none)
     */
    public record IronLimit(String figure, double percent, double min, double max) {
        /** True when {@code value} lies within the limits (NaN never does). */
        public boolean holds(double value) {
            return value >= min && value <= max;
        }
    }

    public IronPairRules {
        limits = List.copyOf(limits);
    }

    /**
     * The {@code iron} section of a rules file, empty when there is none.
     *
     * @throws RulesException naming the field (and unit) at fault, or when the file cannot be read
     */
    public static Optional<IronPairRules> read(Path rulesFile) throws RulesException {
        return parse(Rules.readText(rulesFile), rulesFile.toString());
    }

    /** As {@link #read}, from text; {@code name} names the file in messages. */
    public static Optional<IronPairRules> parse(String text, String name) throws RulesException {
        Optional<IronPairRules> ahead = Rules.ironAhead(text, name); // the same text read ahead: the same result
        if (ahead != null) {
            return ahead;
        }
        JsonNode root;
        try {
            root = new ObjectMapper().readTree(text);
        } catch (JsonProcessingException e) {
            throw new RulesException(name + ": not valid JSON: " + trapmap.maps.io.JsonErrors.reason(e));
        }
        if (root == null || !root.has("iron")) {
            return Optional.empty();
        }
        JsonNode n = root.get("iron");
        if (!n.isObject()) {
            throw error(name, "iron", "must be an object {\"feb_state\": glob, \"fei_state\": glob, \"limits\": {…}}",
                    "");
        }
        for (Iterator<String> it = n.fieldNames(); it.hasNext(); ) {
            String k = it.next();
            if (!List.of("feb_state", "fei_state", "limits").contains(k)) {
                throw error(name, "iron." + k, "unknown key; expected one of feb_state, fei_state, limits", "");
            }
        }
        String feb = glob(name, n, "feb_state");
        String fei = glob(name, n, "fei_state");
        if (!wildcards(feb).equals(wildcards(fei))) {
            throw error(name, "iron.fei_state", "must have the same * and ? wildcards, in the same order, as"
                    + " iron.feb_state ('" + feb + "'), since they carry the wafer's name", "");
        }
        if (feb.equals(fei)) {
            throw error(name, "iron.fei_state", "must differ from iron.feb_state", "");
        }
        List<IronLimit> limits = new ArrayList<>();
        if (n.has("limits")) {
            JsonNode l = n.get("limits");
            if (!l.isObject()) {
                throw error(name, "iron.limits", "must be an object of figure -> {\"min\": …, \"max\": …}", "");
            }
            for (Iterator<String> it = l.fieldNames(); it.hasNext(); ) {
                String figure = it.next();
                limits.add(limit(name, figure, l.get(figure)));
            }
        }
        return Optional.of(new IronPairRules(feb, fei, limits));
    }

    /** The name the Fe_i-state partner of an FeB-state file must have, or empty when the name does not match. */
    public Optional<String> feiNameFor(String febFileName) {
        return translate(febState, feiState, febFileName);
    }

    /** The name the FeB-state partner of an Fe_i-state file must have, or empty when the name does not match. */
    public Optional<String> febNameFor(String feiFileName) {
        return translate(feiState, febState, feiFileName);
    }

    private static Optional<String> translate(String from, String to, String fileName) {
        List<String> parts = FileGlob.wildcardParts(from, fileName);
        if (parts == null) {
            return Optional.empty();
        }
        StringBuilder out = new StringBuilder();
        int part = 0;
        for (char c : to.toCharArray()) {
            if (c == '*' || c == '?') {
                out.append(parts.get(part++));
            } else {
                out.append(c);
            }
        }
        return Optional.of(out.toString());
    }

    private static String wildcards(String glob) {
        return glob.replaceAll("[^*?]", "");
    }

    private static String glob(String name, JsonNode n, String key) throws RulesException {
        JsonNode g = n.get(key);
        if (g == null || !g.isTextual() || g.asText().isBlank()) {
            throw error(name, "iron." + key, "is required: a glob on the file name such as \"*-feb-state.*\"", "");
        }
        String s = g.asText().trim();
        String tooLong = TextLimits.problem(s, TextLimits.MAX_GLOB_CHARS);
        if (tooLong != null) {
            throw error(name, "iron." + key, tooLong, "");
        }
        if (s.contains("/") || s.contains("\\") || s.contains("[") || s.contains("{")) {
            throw error(name, "iron." + key, "must be a file-name glob with only * and ? wildcards but was '" + s
                    + "'", "");
        }
        if (wildcards(s).isEmpty()) {
            throw error(name, "iron." + key, "needs a * or ? for the wafer's part of the name but was '" + s + "'",
                    "");
        }
        return s;
    }

    /**
     * The percentile an iron figure's column gives: 50 for {@code iron_median_cm3}, NN for {@code iron_pNN_cm3}; NaN
     * for a column that is no iron figure.
     */
    public static double percentOf(String figure) {
        Matcher m = FIGURE.matcher(figure);
        if (!m.matches()) {
            return Double.NaN;
        }
        return m.group(2) == null ? 50 : Double.parseDouble(m.group(2));
    }

    private static IronLimit limit(String name, String figure, JsonNode spec) throws RulesException {
        String path = "iron.limits." + figure;
        double percent = percentOf(figure);
        if (Double.isNaN(percent)) {
            throw error(name, path, "unknown iron figure; expected iron_median_cm3 or iron_pNN_cm3 (e.g."
                    + " iron_p95_cm3)", "cm^-3");
        }
        if (!(percent >= 0 && percent <= 100)) {
            throw error(name, path, "percentile must be in [0, 100]", "");
        }
        if (spec == null || !spec.isObject() || spec.size() == 0) {
            throw error(name, path, "must be {\"min\": …, \"max\": …} with either or both", "cm^-3");
        }
        double min = Double.NEGATIVE_INFINITY;
        double max = Double.POSITIVE_INFINITY;
        for (Iterator<String> it = spec.fieldNames(); it.hasNext(); ) {
            String k = it.next();
            JsonNode v = spec.get(k);
            if (!k.equals("min") && !k.equals("max")) {
                throw error(name, path + "." + k, "unknown key; expected min, max", "");
            }
            if (!v.isNumber() || !(v.doubleValue() >= 0) || Double.isInfinite(v.doubleValue())) {
                throw error(name, path + "." + k, "must be a number >= 0 but was " + v, "cm^-3");
            }
            if (k.equals("min")) {
                min = v.doubleValue();
            } else {
                max = v.doubleValue();
            }
        }
        if (min > max) {
            throw error(name, path, String.format(Locale.ROOT, "min %.4g is above max %.4g", min, max), "cm^-3");
        }
        return new IronLimit(figure, percent, min, max);
    }

    private static RulesException error(String name, String field, String problem, String unit) {
        return RulesException.field(name, field, problem, unit);
    }
}
