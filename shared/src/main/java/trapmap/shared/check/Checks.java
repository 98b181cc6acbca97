package trapmap.shared.check;

import trapmap.shared.error.InvalidValueException;
import trapmap.shared.units.Units;

/**
 * Argument checks with uniform messages that name the field, the expected range and the unit:
 * {@code "thicknessUm must be > 0 µm but was -3"}.
 */
public final class Checks {
    private Checks() {
    }

    /** Requires a finite value. */
    public static double finite(double value, String field, String unit) {
        if (!Double.isFinite(value)) {
            throw fail(field, unit, "must be a finite number", value);
        }
        return value;
    }

    /** Requires a finite value strictly greater than zero. */
    public static double positive(double value, String field, String unit) {
        if (!(value > 0) || Double.isInfinite(value)) {
            throw fail(field, unit, "must be > 0" + suffix(unit), value);
        }
        return value;
    }

    /** Requires a finite value greater than or equal to zero. */
    public static double nonNegative(double value, String field, String unit) {
        if (!(value >= 0) || Double.isInfinite(value)) {
            throw fail(field, unit, "must be >= 0" + suffix(unit), value);
        }
        return value;
    }

    /** Requires {@code min <= value <= max}. */
    public static double inRange(double value, double min, double max, String field, String unit) {
        if (!(value >= min && value <= max)) {
            throw fail(field, unit, "must be in [" + min + ", " + max + "]" + suffix(unit), value);
        }
        return value;
    }

    /** Requires a non-null reference. */
    public static <T> T notNull(T value, String field) {
        if (value == null) {
            throw new InvalidValueException(field, "", field + " is required");
        }
        return value;
    }

    private static String suffix(String unit) {
        return unit == null || unit.isEmpty() ? "" : " " + Units.label(unit);
    }

    private static InvalidValueException fail(String field, String unit, String rule, double value) {
        return new InvalidValueException(field, unit, field + " " + rule + " but was " + value);
    }
}
