package trapmap.viewer.ui.charts;

import java.util.Locale;
import trapmap.maps.model.Quantity;

/** How quantities, units and numbers read on charts, tables and reports. */
public final class Labels {
    private Labels() {
    }

    /** A readable name of the quantity, e.g. "effective lifetime". */
    public static String name(Quantity q) {
        return switch (q) {
            case EFFECTIVE_LIFETIME -> "effective lifetime";
            case PL_COUNTS -> "PL signal";
            case INJECTION -> "injection Δn";
            case TRAP_DENSITY -> "trap density";
            case TRAP_DENSITY_MIN -> "trap density (lower bound)";
            case TRAP_DENSITY_MAX -> "trap density (upper bound)";
            case OCCUPANCY -> "trap occupancy";
            case SRH_LIFETIME -> "SRH lifetime";
            case LIFETIME_AT_REFERENCE -> "lifetime at reference injection";
            case IRON_DENSITY -> "interstitial iron [Fe_i]";
            case NORMALISED_DENSITY -> "normalised defect density";
            case STATUS -> "conversion status";
            case DIFFERENCE -> "difference after − before";
            case RATIO -> "ratio after / before";
            case RELATIVE_CHANGE -> "relative change";
            case FRACTION -> "fraction";
            case UNKNOWN -> "value";
        };
    }

    /** The unit as it is printed: "µs", "cm⁻³", "counts", "" for dimensionless. */
    public static String unit(Quantity q) {
        return unit(q.unit());
    }

    /** A stored unit text ("cm^-3", "us", "1/µs", "mm2") as it is printed ("cm⁻³", "µs", "1/µs", "mm²"). */
    public static String unit(String stored) {
        if (stored == null) {
            return "";
        }
        return switch (stored) {
            case "cm^-3" -> "cm⁻³";
            case "us" -> "µs";
            case "mm2", "mm^2" -> "mm²";
            case "cm^-3 s^-1" -> "cm⁻³ s⁻¹";
            default -> stored;
        };
    }

    /** "name (unit)" or just the name for a dimensionless quantity: an axis label. */
    public static String axis(Quantity q) {
        String u = unit(q);
        return u.isEmpty() ? name(q) : name(q) + " (" + u + ")";
    }

    /**
     * A number with about four significant digits: plain for 0.01 ≤ |v| &lt; 1e5, otherwise in the form 2.35e14;
     * "n/a" for NaN, "∞" for infinity.
     */
    public static String number(double v) {
        if (Double.isNaN(v)) {
            return "n/a";
        }
        if (Double.isInfinite(v)) {
            return v > 0 ? "∞" : "−∞";
        }
        if (v == 0) {
            return "0";
        }
        double a = Math.abs(v);
        if (a >= 0.01 && a < 1e5) {
            String s = String.format(Locale.ROOT, "%.4g", v);
            if (s.contains(".") && !s.contains("e")) {
                s = s.replaceAll("0+$", "").replaceAll("\\.$", "");
            }
            return s;
        }
        String s = String.format(Locale.ROOT, "%.3e", v);
        String[] parts = s.split("e");
        String mantissa = parts[0].replaceAll("0+$", "").replaceAll("\\.$", "");
        int exponent = Integer.parseInt(parts[1]);
        return mantissa + "e" + exponent;
    }

    /** A number followed by its unit (no unit: the number alone). */
    public static String number(double v, String unit) {
        String u = unit(unit);
        return u.isEmpty() || Double.isNaN(v) ? number(v) : number(v) + " " + u;
    }

    /** A fraction as a percentage with one decimal, e.g. "12.5 %". */
    public static String percent(double fraction) {
        return Double.isNaN(fraction) ? "n/a" : String.format(Locale.ROOT, "%.1f %%", 100 * fraction);
    }
}
