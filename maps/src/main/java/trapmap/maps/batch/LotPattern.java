package trapmap.maps.batch;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.util.Optional;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.regex.PatternSyntaxException;
import trapmap.shared.text.TextLimits;

/**
 * The rules' optional {@code "lot_pattern"}: a Java regular expression whose first group, found in a wafer id, is the
 * wafer's lot when its sidecar gives no {@code lot} fact. Example: {@code "lot_pattern": "^(LOT-[A-Z0-9]+)-W"} takes
 * {@code LOT-0042} from the wafer id {@code LOT-0042-W07}. A wafer id it does not match has no lot.
 */
public final class LotPattern {
    /** The rules' top-level key. */
    public static final String KEY = "lot_pattern";
    private static final ObjectMapper JSON = new ObjectMapper();

    private LotPattern() {
    }

    /**
     * The pattern of the rules {@code text} ({@code name} prefixes every message), empty when they give none.
     *
     * @throws RulesException when it is not a text, not a regular expression, or has no group
     */
    public static Optional<Pattern> parse(String text, String name) throws RulesException {
        JsonNode root;
        try {
            root = JSON.readTree(text);
        } catch (JsonProcessingException e) {
            throw new RulesException(name + ": " + trapmap.maps.io.JsonErrors.notJson(e));
        }
        JsonNode node = root == null ? null : root.get(KEY);
        if (node == null || node.isNull()) {
            return Optional.empty();
        }
        if (!node.isTextual()) {
            throw new RulesException(name + ": field '" + KEY + "': must be a text (a regular expression) but is "
                    + node.getNodeType().name().toLowerCase(java.util.Locale.ROOT));
        }
        String tooLong = TextLimits.problem(node.asText(), TextLimits.MAX_TEXT_CHARS);
        if (tooLong != null) {
            throw new RulesException(name + ": field '" + KEY + "': " + tooLong);
        }
        Pattern p;
        try {
            p = Pattern.compile(node.asText());
        } catch (PatternSyntaxException e) {
            throw new RulesException(name + ": field '" + KEY + "': not a regular expression: "
                    + e.getDescription() + " near index " + e.getIndex());
        }
        if (p.matcher("").groupCount() < 1) {
            throw new RulesException(name + ": field '" + KEY + "': must have a group (in parentheses) that is the"
                    + " lot, e.g. ^(LOT-[A-Z0-9]+)-W");
        }
        return Optional.of(p);
    }

    /** The lot in {@code waferId}: the first group of the pattern's first match; null when none or empty. */
    public static String lotOf(Pattern pattern, String waferId) {
        if (pattern == null || waferId == null) {
            return null;
        }
        Matcher m = pattern.matcher(waferId);
        if (!m.find()) {
            return null;
        }
        String lot = m.group(1);
        return lot == null || lot.isEmpty() ? null : lot;
    }
}
