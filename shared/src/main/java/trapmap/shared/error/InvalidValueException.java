package trapmap.shared.error;

/**
 * A value that is out of its physical or technical range. Carries the name of the field, the unit the value is
 * expected in and the value itself, so that every layer (command line, viewer, batch) can tell the user exactly
 * what to change.
 */
public class InvalidValueException extends IllegalArgumentException {
    private static final long serialVersionUID = 1L;

    /** Name of the offending field as the caller knows it, e.g. {@code thicknessUm}. */
    private final String field;
    /** Unit the field is expected in, e.g. {@code µm}; empty for dimensionless values. */
    private final String unit;

    public InvalidValueException(String field, String unit, String message) {
        super(message);
        this.field = field;
        this.unit = unit == null ? "" : unit;
    }

    public String field() {
        return field;
    }

    public String unit() {
        return unit;
    }
}
