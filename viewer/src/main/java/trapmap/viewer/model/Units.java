package trapmap.viewer.model;

import java.util.Locale;

/** Formatting of values with units for labels, tables and tooltips. */
public final class Units {
    private Units() {
    }

    /** A unit as shown on screen: {@code cm^-3} → {@code cm⁻³}, {@code cm^-3 s^-1} → {@code cm⁻³ s⁻¹}. */
    public static String pretty(String unit) {
        if (unit == null) {
            return "";
        }
        return unit.replace("^-3", "⁻³").replace("^-1", "⁻¹").replace("^2", "²").replace("^-2", "⁻²")
                .replace("us", "µs").replace("µµs", "µs");
    }

    /**
     * A number with three or four significant digits and no trailing zeros: plain between 0.01 and 99 999
     * ({@code 4}, {@code 16.5}, {@code 183.3}), otherwise in scientific notation ({@code 3e11}, {@code 1.65e11});
     * NaN prints as "–".
     */
    public static String number(double v) {
        if (Double.isNaN(v)) {
            return "–";
        }
        if (Double.isInfinite(v)) {
            return v > 0 ? "∞" : "−∞";
        }
        double a = Math.abs(v);
        if (a == 0) {
            return "0";
        }
        if (a >= 0.01 && a < 1e5) {
            String s = String.format(Locale.ROOT, a >= 100 ? "%.1f" : "%.3g", v);
            if (s.contains("e")) {
                s = String.format(Locale.ROOT, "%.2f", v);
            }
            return trim(s);
        }
        String s = String.format(Locale.ROOT, "%.2e", v);
        int e = s.indexOf('e');
        return trim(s.substring(0, e)) + s.substring(e).replace("e+0", "e").replace("e+", "e").replace("e-0", "e-");
    }

    /** Drops trailing zeros after a decimal point: 4.00 → 4, 2.50 → 2.5. */
    private static String trim(String s) {
        return s.contains(".") ? s.replaceAll("0+$", "").replaceAll("\\.$", "") : s;
    }

    /** A number followed by its unit, e.g. {@code 3.20e11 cm⁻³}. */
    public static String withUnit(double v, String unit) {
        String u = pretty(unit);
        return number(v) + (u.isEmpty() ? "" : " " + u);
    }

    /** A fraction as a percentage, e.g. {@code 1.25 %}. */
    public static String percent(double fraction) {
        if (Double.isNaN(fraction)) {
            return "–";
        }
        return String.format(Locale.ROOT, fraction * 100 >= 10 ? "%.1f %%" : "%.2f %%", fraction * 100);
    }
}
