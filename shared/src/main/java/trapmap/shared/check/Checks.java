package trapmap.shared.check;

import trapmap.shared.error.InvalidValueException;
import trapmap.shared.units.Units;

import java.math.BigDecimal;

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
            throw fail(field, unit, "must be in [" + exact(min) + ", " + exact(max) + "]" + suffix(unit), value);
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

    /**
     * A number as every range and value of a message shows it, in its shortest exact form: whole numbers below
     * 10⁶ as integers ({@code 0}, {@code -1}, {@code 5000}), 10⁻³ up to 10⁶ as decimals ({@code 0.5}), others in
     * lower-case scientific form without a trailing {@code .0} ({@code 1e6}, {@code 1e19}, {@code 1.5e-4}).
     */
    public static String exact(double v) {
        if (!Double.isFinite(v)) {
            return Double.toString(v);
        }
        if (v == Math.rint(v) && Math.abs(v) < 1e6) {
            return Long.toString((long) v);
        }
        double a = Math.abs(v);
        if (a >= 1e-3 && a < 1e6) {
            return Double.toString(v);
        }
        BigDecimal d = BigDecimal.valueOf(v).stripTrailingZeros();
        int exponent = d.precision() - d.scale() - 1;
        return d.movePointLeft(exponent).toPlainString() + "e" + exponent;
    }

    private static String suffix(String unit) {
        return unit == null || unit.isEmpty() ? "" : " " + Units.label(unit);
    }

    private static InvalidValueException fail(String field, String unit, String rule, double value) {
        return new InvalidValueException(field, unit, field + " " + rule + " but was " + exact(value));
    }
}
