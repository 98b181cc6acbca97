package trapmap.cli;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import java.io.UncheckedIOException;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import trapmap.maps.io.NumberText;
import trapmap.physics.conversion.ConversionWarning;

/** JSON and aligned-text output. JSON never holds NaN or infinities: such values are written as {@code null}. */
final class Output {
    /**
     * The JSON writer, made when first used: a class of its own, so that {@link #prepareJson} makes it on its thread
     * (Jackson's classes, some tens of milliseconds) instead of the caller's.
     */
    private static final class Json {
        static final ObjectMapper MAPPER = NumberText.jsonMapper().enable(SerializationFeature.INDENT_OUTPUT);
    }

    private Output() {
    }

    /** The messages of {@code warnings}, in declaration order. */
    static List<String> warningMessages(java.util.Set<ConversionWarning> warnings) {
        List<String> out = new ArrayList<>();
        for (ConversionWarning w : ConversionWarning.values()) {
            if (warnings.contains(w)) {
                out.add(w.message());
            }
        }
        return out;
    }

    /** The codes (enum names) of {@code warnings}, in declaration order. */
    static List<String> warningCodes(java.util.Set<ConversionWarning> warnings) {
        List<String> out = new ArrayList<>();
        for (ConversionWarning w : ConversionWarning.values()) {
            if (warnings.contains(w)) {
                out.add(w.name());
            }
        }
        return out;
    }

    /** A finite number, or null for NaN and infinities (JSON has no representation for them). */
    static Double num(double v) {
        return Double.isFinite(v) ? v : null;
    }

    /** A value of a map's float samples (sample, quantile, peak) at float precision, or null when not finite. */
    static Float sample(double v) {
        return Double.isFinite(v) ? (float) v : null;
    }

    /** A position or length rounded to {@link NumberText#POSITION_RESOLUTION_MM}, or null when not finite. */
    static Double mm(double v) {
        return Double.isFinite(v) ? NumberText.roundMm(v) : null;
    }

    /** An area rounded to {@link NumberText#AREA_RESOLUTION_MM2}, or null when not finite. */
    static Double mm2(double v) {
        return Double.isFinite(v) ? NumberText.roundMm2(v) : null;
    }

    /**
     * Builds the JSON writer and its serializers for the value types of the commands' results (maps, lists, strings,
     * numbers, booleans, null) on a daemon thread, so that a command that prints JSON at its end finds them ready
     * instead of building them then (a few hundred milliseconds of class loading in a fresh process); the text
     * {@link #json} writes does not change.
     */
    static void prepareJson() {
        Thread t = new Thread(() -> {
            Map<String, Object> sample = new java.util.LinkedHashMap<>();
            sample.put("text", "x");
            sample.put("double", 0.5);
            sample.put("float", 0.5f);
            sample.put("int", 1);
            sample.put("bool", true);
            sample.put("none", null);
            sample.put("list", List.of("x"));
            sample.put("rows", new ArrayList<>(List.of(new java.util.LinkedHashMap<>(Map.of("k", 1.5)))));
            json(sample);
        }, "trapmap-json-prepare");
        t.setDaemon(true);
        t.start();
    }

    /** {@code value} as indented JSON. */
    static String json(Object value) {
        try {
            return Json.MAPPER.writeValueAsString(value);
        } catch (JsonProcessingException e) {
            throw new UncheckedIOException(e);
        }
    }

    /**
     * A result value as one CSV cell: doubles and floats as the shortest text that reads back to them
     * ({@link NumberText}), lists joined by "; ", null as empty.
     */
    static String cell(Object value) {
        if (value == null) {
            return "";
        }
        if (value instanceof List<?> list) {
            List<String> parts = new ArrayList<>();
            list.forEach(o -> parts.add(cell(o)));
            return String.join("; ", parts);
        }
        if (value instanceof Double d) {
            return NumberText.of(d);
        }
        if (value instanceof Float f) {
            return NumberText.of(f);
        }
        return String.valueOf(value);
    }

    /** Two aligned columns: labels, then value and unit. */
    static final class Table {
        private final List<String[]> rows = new ArrayList<>();
        private final List<String> notes = new ArrayList<>();

        /** A row; {@code value} null is skipped. */
        Table row(String label, String value, String unit) {
            if (value != null) {
                rows.add(new String[] {label, unit == null || unit.isEmpty() ? value : value + " " + unit});
            }
            return this;
        }

        /**
         * A numeric row from a result map (skipped when the key is absent); null shown as {@code nullText}; a whole
         * number (a count) in full, any other number with {@link Format#number}.
         */
        Table number(Map<String, Object> result, String key, String label, String unit, String nullText) {
            if (!result.containsKey(key)) {
                return this;
            }
            Object v = result.get(key);
            if (v == null) {
                return nullText == null ? this : row(label, nullText, "");
            }
            if (v instanceof Integer || v instanceof Long) {
                return row(label, v.toString(), unit); // a count is exact: 68644 px, not 68640
            }
            return row(label, Format.number(((Number) v).doubleValue()), unit);
        }

        /** A free text line printed after the rows. */
        Table note(String line) {
            notes.add(line);
            return this;
        }

        String render() {
            int width = 0;
            for (String[] r : rows) {
                width = Math.max(width, r[0].length());
            }
            StringBuilder sb = new StringBuilder();
            for (String[] r : rows) {
                sb.append(String.format("%-" + width + "s  %s%n", r[0], r[1]));
            }
            for (String n : notes) {
                sb.append(n).append(System.lineSeparator());
            }
            return sb.toString();
        }
    }
}
