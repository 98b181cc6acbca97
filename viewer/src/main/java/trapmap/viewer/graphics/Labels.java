package trapmap.viewer.graphics;

import java.math.BigDecimal;
import java.math.MathContext;
import java.util.Locale;
import java.util.regex.Pattern;
import trapmap.maps.model.Quantity;

/** How quantities, units and numbers read on charts, tables and reports. */
public final class Labels {
    /** "delta chi2" as a word pair. */
    private static final Pattern DELTA_CHI2 = Pattern.compile("(?<![\\w/.-])delta chi2\\b");
    /** "chi2" as a word (not inside a name such as "hint-chi2"). */
    private static final Pattern CHI2 = Pattern.compile("(?<![\\w/.-])chi2\\b");
    /** "tau_SRH" as a word. */
    private static final Pattern TAU_SRH = Pattern.compile("(?<![\\w/.-])tau_SRH\\b");

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
            case DEFECT_INDEX -> "defect (legend index)";
            case CHI_SQUARED -> "χ² of the fit";
            case IDENTIFICATION_STATUS -> "identification status";
            case REGION_LABEL -> "region";
            case IRON_DENSITY -> "interstitial iron [Fe_i]";
            case NORMALISED_DENSITY -> "normalised defect density";
            case STATUS -> "conversion status";
            case DIFFERENCE -> "difference after − before";
            case RATIO -> "ratio after / before";
            case RELATIVE_CHANGE -> "relative change";
            case FRACTION -> "fraction";
            case EXCEEDANCE_PROBABILITY -> "probability of exceeding N*";
            case DENSITY_QUANTILE -> "trap density (confidence quantile)";
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

    /**
     * A text of the identification engine (a ranking's or DPSS's reason, a candidate's caution), which is written in
     * ASCII for the files and logs that carry it, as it reads on screen: "cm^-3" → "cm⁻³", "cm^2" → "cm²",
     * "chi2" → "χ²", "delta chi2" → "Δχ²", "tau_SRH" → "τ_SRH", "E_t - E_i" → "E_t − E_i". Everything else is kept
     * as it is; null reads as "".
     */
    public static String prose(String ascii) {
        if (ascii == null) {
            return "";
        }
        String s = ascii.replace("cm^-3", "cm⁻³").replace("cm^2", "cm²").replace("E_t - E_i", "E_t − E_i");
        s = DELTA_CHI2.matcher(s).replaceAll("Δχ²");
        s = CHI2.matcher(s).replaceAll("χ²");
        return TAU_SRH.matcher(s).replaceAll("τ_SRH");
    }

    /** "name (unit)" or just the name for a dimensionless quantity: an axis label. */
    public static String axis(Quantity q) {
        String u = unit(q);
        return u.isEmpty() ? name(q) : name(q) + " (" + u + ")";
    }

    /**
     * A number with four significant digits: plain for 0.01 ≤ |v| &lt; 1e5, otherwise in the form 2.35e14; "n/a" for
     * NaN, "∞" for infinity.
     */
    public static String number(double v) {
        return significant(v, 4);
    }

    /** A number with three significant digits, as {@link #number(double)}: for axis ticks. */
    public static String compact(double v) {
        return significant(v, 3);
    }

    private static String significant(double v, int digits) {
        if (Double.isNaN(v)) {
            return "n/a";
        }
        if (Double.isInfinite(v)) {
            return v > 0 ? "∞" : "−∞";
        }
        if (v == 0) {
            return "0";
        }
        BigDecimal r = new BigDecimal(v).round(new MathContext(digits)).stripTrailingZeros();
        double a = Math.abs(r.doubleValue());
        if (a >= 0.01 && a < 1e5) {
            return r.toPlainString();
        }
        String mantissa = r.unscaledValue().abs().toString();
        int exponent = mantissa.length() - 1 - r.scale();
        String m = mantissa.length() == 1 ? mantissa : mantissa.charAt(0) + "." + mantissa.substring(1);
        return (r.signum() < 0 ? "-" : "") + m + "e" + exponent;
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
