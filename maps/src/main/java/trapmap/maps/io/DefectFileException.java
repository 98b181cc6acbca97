package trapmap.maps.io;

import java.io.IOException;

/**
 * A defect file that cannot be used: missing or unreadable, not valid JSON, not shaped like a defect list, or with a
 * field out of its range. The message is one line that names the file, and where known the field and its unit, e.g.
 * {@code my.json: field 'sigma_n_cm2' must be in [1e-25, 1e-10] cm^2 but was 5.0}.
 */
public class DefectFileException extends IOException {
    private static final long serialVersionUID = 1L;

    /** The file as the user named it. */
    private final String file;
    /** The offending field (dotted path inside a defect, e.g. {@code level.energy_ev}), or null. */
    private final String field;
    /** The unit the field is expected in; empty when dimensionless or unknown. */
    private final String unit;

    public DefectFileException(String file, String field, String unit, String message, Throwable cause) {
        super(message.replace("\r", "\\r").replace("\n", "\\n"), cause); // one line, whatever a key brings in
        this.file = file;
        this.field = field;
        this.unit = unit == null ? "" : unit;
    }

    public String file() {
        return file;
    }

    /** The offending field, or null when the problem is not tied to one field. */
    public String field() {
        return field;
    }

    public String unit() {
        return unit;
    }
}
