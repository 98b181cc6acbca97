package trapmap.maps.io;

import com.fasterxml.jackson.databind.JsonNode;
import java.util.Map;
import trapmap.shared.text.TextLimits;

/**
 * The text limits of {@link TextLimits} applied to a whole JSON tree read from a file (defect files, sessions): every
 * key and every text value is checked in one pass, and the first one over its limit is reported with its field path.
 */
public final class JsonTexts {
    private JsonTexts() {
    }

    /**
     * A text over its limit.
     *
     * @param field   the field path, e.g. {@code user_defects[0].name}
     * @param problem what is wrong, e.g. {@code is 300 characters long; at most 256 are allowed}
     */
    public record Overlong(String field, String problem) {
    }

    /**
     * The first key or text value of {@code root} over its limit, or null when every one fits.
     *
     * @param maxKeyChars longest key (a key that holds a path may need {@link TextLimits#MAX_TEXT_CHARS})
     * @param byName      limits of the values of particular keys (e.g. {@code id} → {@link TextLimits#MAX_ID_CHARS});
     *                    other texts may have {@link TextLimits#MAX_TEXT_CHARS}
     */
    public static Overlong firstOverlong(JsonNode root, int maxKeyChars, Map<String, Integer> byName) {
        return walk(root, null, maxKeyChars, byName, TextLimits.MAX_TEXT_CHARS);
    }

    /** Where a node sits: its parent's place and its key or index; the path text is made only for a report. */
    private record Place(Place parent, String key, int index) {
        String path() {
            String own = key != null ? key : "[" + index + "]";
            if (parent == null) {
                return own;
            }
            return parent.path() + (key != null ? "." : "") + own;
        }
    }

    private static Overlong walk(JsonNode n, Place at, int maxKey, Map<String, Integer> byName, int limit) {
        if (n.isTextual()) {
            String p = TextLimits.problem(n.asText(), limit);
            return p == null ? null : new Overlong(at == null ? "(top level)" : at.path(), p);
        }
        if (n.isObject()) {
            for (Map.Entry<String, JsonNode> e : n.properties()) {
                String k = e.getKey();
                String p = TextLimits.problem(k, maxKey);
                if (p != null) {
                    String shown = k.substring(0, 40) + "...";
                    return new Overlong((at == null ? "" : at.path() + ".") + shown, "the key " + p);
                }
                Overlong o = walk(e.getValue(), new Place(at, k, -1), maxKey, byName,
                        byName.getOrDefault(k, TextLimits.MAX_TEXT_CHARS));
                if (o != null) {
                    return o;
                }
            }
        } else if (n.isArray()) {
            for (int i = 0; i < n.size(); i++) {
                Overlong o = walk(n.get(i), new Place(at, null, i), maxKey, byName, limit);
                if (o != null) {
                    return o;
                }
            }
        }
        return null;
    }
}
