package trapmap.maps.io;

import static trapmap.maps.io.CsvLayout.unquote;

import java.util.Locale;
import trapmap.shared.units.LifetimeUnit;
import trapmap.shared.units.Units;

/**
 * Numbers in CSV maps: decimal text (a decimal comma when the delimiter is a semicolon), NaN for no data,
 * coordinates in mm, values with their unit for messages and the factor that takes lifetimes to µs, and the
 * shortest decimal forms used in messages and pitches.
 */
final class CsvNumbers {
    private CsvNumbers() {
    }

    /**
     * A coordinate of a point list, mm.
     *
     * @throws MapFormatException naming the line and column when the text is not a number within ±10⁶ mm
     */
    static double coordinate(String text, String name, int line, String column, char delimiter)
            throws MapFormatException {
        String t = number(text, delimiter);
        if (!isNumber(t)) {
            throw new MapFormatException(name, "line " + line, column + " '" + abbreviate(text) + "' is not a"
                    + " number", "mm");
        }
        double v = Double.parseDouble(t);
        if (!(Math.abs(v) <= 1e6)) {
            throw new MapFormatException(name, "line " + line, column + " '" + abbreviate(text) + "' is outside"
                    + " [-1e6, 1e6]", "mm");
        }
        return v;
    }

    /**
     * The factor that takes the values to µs when they are lifetimes in another unit (applied while parsing, to the
     * decimal text, so that 0.001 s gives exactly 1000 µs), else 1. Undecidable units are left to {@link MapBuilder}.
     */
    static double lifetimeFactor(Sidecar meta, String columnUnit) {
        String unit = meta.unit() != null ? meta.unit() : columnUnit;
        if (unit == null || (meta.quantity() != null && !MapBuilder.isLifetime(meta.quantity()))) {
            return 1;
        }
        try {
            return LifetimeUnit.parse(unit).toMicroseconds(1);
        } catch (IllegalArgumentException e) {
            return 1;
        }
    }

    /**
     * A value: NaN for an empty cell or NaN, else the number times {@code factor}.
     *
     * @throws MapFormatException naming the line and the unit when the text is not a number or beyond the float
     *                            range
     */
    static float value(String text, String name, int line, String unit, char delimiter, double factor)
            throws MapFormatException {
        String t = number(text, delimiter);
        if (t.isEmpty() || isNaN(t)) {
            return Float.NaN;
        }
        if (!isNumber(t)) {
            throw new MapFormatException(name, "line " + line, "value '" + abbreviate(text) + "' is not a number",
                    unitLabel(unit));
        }
        float v = factor == 1 ? Float.parseFloat(t) : (float) (Double.parseDouble(t) * factor);
        if (Float.isInfinite(v)) {
            throw new MapFormatException(name, "line " + line, "value '" + abbreviate(text) + "' is beyond the"
                    + " 32-bit float range", unitLabel(unit));
        }
        return v;
    }

    private static String unitLabel(String unit) {
        String u = unit == null ? "" : unit.trim();
        return Sidecar.normaliseUnit(u).equals("us") ? "µs" : Units.label(u);
    }

    private static String number(String text, char delimiter) {
        String t = unquote(text.trim());
        return delimiter == ';' && t.indexOf(',') >= 0 && t.indexOf('.') < 0 ? t.replace(',', '.') : t;
    }

    private static boolean isNaN(String t) {
        return t.equalsIgnoreCase("nan") || t.equalsIgnoreCase("-nan") || t.equalsIgnoreCase("+nan");
    }

    static boolean isNumberOrNaN(String t) {
        return isNumber(t) || isNaN(t);
    }

    /** A decimal number: optional sign, digits with an optional point, optional exponent; nothing else. */
    static boolean isNumber(String t) {
        int n = t.length();
        int i = 0;
        if (i < n && (t.charAt(i) == '+' || t.charAt(i) == '-')) {
            i++;
        }
        int digits = 0;
        while (i < n && t.charAt(i) >= '0' && t.charAt(i) <= '9') {
            i++;
            digits++;
        }
        if (i < n && t.charAt(i) == '.') {
            i++;
            while (i < n && t.charAt(i) >= '0' && t.charAt(i) <= '9') {
                i++;
                digits++;
            }
        }
        if (digits == 0) {
            return false;
        }
        if (i < n && (t.charAt(i) == 'e' || t.charAt(i) == 'E')) {
            i++;
            if (i < n && (t.charAt(i) == '+' || t.charAt(i) == '-')) {
                i++;
            }
            int exp = 0;
            while (i < n && t.charAt(i) >= '0' && t.charAt(i) <= '9') {
                i++;
                exp++;
            }
            if (exp == 0) {
                return false;
            }
        }
        return i == n;
    }

    /** {@code v} for messages: its shortest decimal form. */
    static String num(double v) {
        return Sidecar.fmt(nice(v));
    }

    /** {@code s} cut to 40 characters for messages. */
    static String abbreviate(String s) {
        return s.length() <= 40 ? s : s.substring(0, 37) + "...";
    }

    /** The shortest decimal within 10⁻⁹ (relative) of {@code v}. */
    static double nice(double v) {
        for (int digits = 1; digits <= 17; digits++) {
            double r = Double.parseDouble(String.format(Locale.ROOT, "%." + (digits - 1) + "e", v));
            if (Math.abs(r - v) <= 1e-9 * Math.abs(v)) {
                return r;
            }
        }
        return v;
    }

    /** The unit values are taken in: as given, else the quantity's, else µs (what the reader will assume). */
    static String unitForMessages(Sidecar meta, String columnUnit) {
        return meta.unit() != null ? meta.unit() : columnUnit != null ? columnUnit
                : meta.quantity() != null ? meta.quantity().unit() : "µs";
    }
}
