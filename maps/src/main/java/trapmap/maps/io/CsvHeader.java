package trapmap.maps.io;

import static trapmap.maps.io.CsvNumbers.abbreviate;
import static trapmap.maps.io.CsvNumbers.isNumber;

import com.fasterxml.jackson.databind.node.ObjectNode;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import trapmap.shared.text.TextLimits;

/**
 * What the comment lines before the first data line of a CSV map said as {@code # key=value}: the sidecar fields
 * they give, the comment line of each key (1-based, for messages), and the raster size of a point list.
 *
 * @param meta   the sidecar fields, with a warning for each key the schema does not know
 * @param lineOf comment line of each key given
 * @param width  {@code width} in pixels, or null
 * @param height {@code height} in pixels, or null
 */
record CsvHeader(Sidecar meta, Map<String, Integer> lineOf, Long width, Long height) {
    private static final Pattern KEY_VALUE = Pattern.compile("([A-Za-z_][A-Za-z0-9_.]*)\\s*=\\s*(.*)");
    private static final List<String> NUMERIC_KEYS = List.of("pixel_pitch_mm", "centre_x_px", "centre_y_px",
            "scale", "offset", "no_data");

    /**
     * Reads the metadata of the comment lines ({@code #} included; empty lines are empty strings).
     *
     * @throws MapFormatException naming the line when a key is given twice or a value is invalid
     */
    static CsvHeader parse(List<String> comments, String name) throws MapFormatException {
        ObjectNode root = Sidecar.JSON.createObjectNode();
        ObjectNode conditions = Sidecar.JSON.createObjectNode();
        Map<String, Integer> lineOf = new LinkedHashMap<>();
        Long width = null;
        Long height = null;
        List<String> warnings = new ArrayList<>();
        int ignored = 0;
        for (int i = 0; i < comments.size(); i++) {
            String c = comments.get(i);
            if (c.isEmpty()) {
                continue;
            }
            Matcher m = KEY_VALUE.matcher(c.substring(1).trim());
            if (!m.matches()) {
                continue; // free text
            }
            String key = m.group(1).toLowerCase(Locale.ROOT);
            String value = m.group(2).trim();
            int line = i + 1;
            if (lineOf.put(key, line) != null) {
                throw new MapFormatException(name, "line " + line, "metadata '" + key + "' is given twice");
            }
            if (key.equals("width") || key.equals("height")) {
                long v = size(value, name, line, key);
                if (key.equals("width")) {
                    width = v;
                } else {
                    height = v;
                }
            } else if (Sidecar.isConditionKey(key)) {
                putValue(conditions, key, value, !key.equals("doping"));
            } else if (Sidecar.topLevelKeys().contains(key) && !key.equals("conditions") && !key.equals("history")
                    && !key.equals("pages") && !key.equals("format")) {
                putValue(root, key, value, NUMERIC_KEYS.contains(key));
            } else if (++ignored <= TextLimits.MAX_LISTED_WARNINGS) {
                warnings.add("line " + line + ": comment field '" + key + "' ignored");
            }
        }
        if (ignored > TextLimits.MAX_LISTED_WARNINGS) {
            warnings.add(TextLimits.andMore(ignored - TextLimits.MAX_LISTED_WARNINGS, "comment fields ignored"));
        }
        if (!conditions.isEmpty()) {
            root.set("conditions", conditions);
        }
        Sidecar meta;
        try {
            meta = Sidecar.parse(root.toString(), name);
        } catch (MapFormatException e) {
            String field = e.location() == null ? null : e.location().replaceAll("^field '(?:conditions\\.)?(.*)'$",
                    "$1");
            Integer line = field == null ? null : lineOf.get(field);
            throw new MapFormatException(name, line == null ? e.location() : "line " + line + ", " + e.location(),
                    e.problem(), e.unit(), e);
        }
        List<String> all = new ArrayList<>(meta.warnings());
        all.addAll(warnings);
        meta = new Sidecar(meta.waferId(), meta.quantity(), meta.unit(), meta.pixelPitchMm(), meta.centreXPx(),
                meta.centreYPx(), meta.scale(), meta.offset(), meta.noData(), meta.conditions(), null, null, all);
        return new CsvHeader(meta, lineOf, width, height);
    }

    private static void putValue(ObjectNode o, String key, String value, boolean numeric) {
        if (numeric && isNumber(value)) {
            o.put(key, Double.parseDouble(value));
        } else {
            o.put(key, value);
        }
    }

    private static long size(String value, String name, int line, String key) throws MapFormatException {
        if (!value.matches("\\d{1,9}") || Long.parseLong(value) < 1) {
            throw new MapFormatException(name, "line " + line, "metadata '" + key + "' must be a whole number of"
                    + " pixels >= 1 but is '" + abbreviate(value) + "'", "px");
        }
        return Long.parseLong(value);
    }
}
