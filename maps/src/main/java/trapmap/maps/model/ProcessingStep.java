package trapmap.maps.model;

import java.util.LinkedHashMap;
import java.util.Map;

/**
 * One step in the history of a map, with the parameters it ran with.
 *
 * @param operation  what was done, e.g. {@code read}, {@code convert}, {@code register}
 * @param parameters parameters as text, in a stable order
 */
public record ProcessingStep(String operation, Map<String, String> parameters) {
    public ProcessingStep {
        parameters = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(parameters));
    }

    /** A step with parameters given as alternating keys and values. */
    public static ProcessingStep of(String operation, String... keysAndValues) {
        if (keysAndValues.length % 2 != 0) {
            throw new IllegalArgumentException("parameters need key/value pairs");
        }
        Map<String, String> p = new LinkedHashMap<>();
        for (int i = 0; i < keysAndValues.length; i += 2) {
            p.put(keysAndValues[i], keysAndValues[i + 1]);
        }
        return new ProcessingStep(operation, p);
    }
}
