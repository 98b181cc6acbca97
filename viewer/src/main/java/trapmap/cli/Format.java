package trapmap.cli;

import java.math.BigDecimal;
import java.math.MathContext;
import java.util.Locale;

/** Number formatting for messages and tables. */
final class Format {
    private Format() {
    }

    /** Four significant digits, scientific outside [1e-3, 1e5): {@code 4.61e11}, {@code 12.5}, {@code 0.6904}. */
    static String number(double v) {
        if (!Double.isFinite(v)) {
            return Double.isNaN(v) ? "n/a" : v > 0 ? "infinite" : "-infinite";
        }
        double a = Math.abs(v);
        if (v == 0 || (a >= 1e-3 && a < 1e5)) {
            return new BigDecimal(v).round(new MathContext(4)).stripTrailingZeros().toPlainString();
        }
        return scientific(String.format(Locale.ROOT, "%.3e", v));
    }

    /** The shortest exact form: {@code 5000}, {@code 1e19}, {@code 1e-4}, {@code 0.5}, {@code 4.6104e11}. */
    static String exact(double v) {
        if (!Double.isFinite(v)) {
            return number(v);
        }
        if (v == Math.rint(v) && Math.abs(v) < 1e6) {
            return Long.toString((long) v);
        }
        double a = Math.abs(v);
        if (a >= 1e-3 && a < 1e6) {
            return Double.toString(v);
        }
        return scientific(String.format(Locale.ROOT, "%.15e", v));
    }

    private static String scientific(String s) {
        int e = s.indexOf('e');
        String mantissa = stripZeros(s.substring(0, e));
        int exp = Integer.parseInt(s.substring(e + 1));
        return mantissa + "e" + exp;
    }

    private static String stripZeros(String s) {
        if (!s.contains(".")) {
            return s;
        }
        return s.replaceAll("0+$", "").replaceAll("\\.$", "");
    }
}
