package trapmap.physics.defect;

import trapmap.shared.check.Checks;

/**
 * A closed interval of published values of one parameter.
 *
 * @param min smallest published value
 * @param max largest published value
 */
public record Range(double min, double max) {
    public Range {
        Checks.finite(min, "min", "");
        Checks.finite(max, "max", "");
        if (min > max) {
            throw new IllegalArgumentException("range needs min <= max but got [" + min + ", " + max + "]");
        }
    }

    /** A range holding one value. */
    public static Range of(double value) {
        return new Range(value, value);
    }

    public boolean contains(double v) {
        return v >= min && v <= max;
    }

    /** {@code v} clamped into the range. */
    public double clamp(double v) {
        return Math.max(min, Math.min(max, v));
    }
}
