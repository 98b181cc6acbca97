package trapmap.maps.io;

import com.fasterxml.jackson.databind.JsonNode;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;
import trapmap.shared.units.Units;

/**
 * Fields of the JSON settings objects (physics settings and their {@code uncertainty} block): one message form,
 * {@code NAME: field 'PATH': PROBLEM (UNIT)}, and the bounded-number reader they share.
 */
final class JsonFields {
    private JsonFields() {
    }

    /**
     * The number at {@code key} of {@code node}, {@code fallback} when the key is missing.
     *
     * @param unit   the field's unit, shown in the message
     * @param lo     smallest value accepted
     * @param hi     largest value accepted
     * @param name   the file's name (prefix of the message)
     * @param prefix the object's path with its trailing dot ("" at the top level)
     * @throws InvalidValueException naming the file, the field path and its unit when it is not a number in
     *                               [lo, hi]
     */
    static double number(JsonNode node, String key, String unit, double lo, double hi, double fallback,
                         String name, String prefix) {
        JsonNode n = node.get(key);
        if (n == null) {
            return fallback;
        }
        if (!n.isNumber()) {
            throw error(name, prefix + key, "must be a number but is " + n, unit);
        }
        double v = n.doubleValue();
        if (!(v >= lo && v <= hi)) {
            throw error(name, prefix + key, "must be in [" + Checks.exact(lo) + ", " + Checks.exact(hi) + "] but was "
                    + Checks.exact(v), unit);
        }
        return v;
    }

    /**
     * The refusal of a field. The message is one line: a line break that a key or value of the file brings in is
     * shown as {@code \n} or {@code \r}.
     */
    static InvalidValueException error(String name, String field, String problem, String unit) {
        return new InvalidValueException(field, unit, (name + ": field '" + field + "': " + problem
                + (unit.isEmpty() ? "" : " (" + Units.label(unit) + ")")).replace("\r", "\\r").replace("\n", "\\n"));
    }
}
