package trapmap.maps.io;

import com.fasterxml.jackson.core.StreamWriteFeature;
import com.fasterxml.jackson.core.io.NumberOutput;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.json.JsonMapper;
import java.math.BigDecimal;
import java.math.RoundingMode;

/**
 * The text of every number trapmap writes to CSV and JSON files, by one rule set:
 *
 * <ul>
 *   <li>{@link #of(double)}: computed values (fractions, ratios, means, settings) as the shortest decimal that reads
 *       back ({@link Double#parseDouble}) to the same double;</li>
 *   <li>{@link #of(float)} and {@link #sample(double)}: values of a map (its float samples, and statistics taken from
 *       them: quantiles, peaks) at the map's float precision, the shortest decimal that reads back
 *       ({@link Float#parseFloat}) to the same float;</li>
 *   <li>{@link #mm(double)}: positions and lengths on the wafer rounded to {@link #POSITION_RESOLUTION_MM};</li>
 *   <li>{@link #mm2(double)}: areas rounded to {@link #AREA_RESOLUTION_MM2}.</li>
 * </ul>
 *
 * Shortest means fewest significant digits (and the nearest such decimal). Java 17's {@code Double.toString} is not
 * always shortest (it writes 1e23 as {@code 9.999999999999999E22}); the digits come from Jackson's Schubfach writer
 * ({@link NumberOutput#toString(double, boolean)}, R. Giulietti's algorithm, the one Java 19 adopted). A trailing
 * {@code .0} is left out ({@code 858}, {@code 1E12}). Non-finite values are written as the empty cell.
 */
public final class NumberText {
    /** Resolution of positions and lengths on the wafer in the outputs, mm. */
    public static final double POSITION_RESOLUTION_MM = 0.001;
    /** Resolution of areas in the outputs, mm². */
    public static final double AREA_RESOLUTION_MM2 = 0.001;
    private static final int POSITION_DECIMALS = 3;
    private static final int AREA_DECIMALS = 3;

    private NumberText() {
    }

    /** The shortest text that reads back to {@code v}; "" when not finite. */
    public static String of(double v) {
        if (!Double.isFinite(v)) {
            return "";
        }
        if (v != 0 && Math.abs(v) < Double.MIN_NORMAL) {
            String one = oneDigit(v, false);
            if (one != null) {
                return one;
            }
        }
        return trim(NumberOutput.toString(v, true));
    }

    /** The shortest text that reads back to the float {@code v}; "" when not finite. */
    public static String of(float v) {
        if (!Float.isFinite(v)) {
            return "";
        }
        if (v != 0 && Math.abs(v) < Float.MIN_NORMAL) {
            String one = oneDigit(v, true);
            if (one != null) {
                return one;
            }
        }
        return trim(NumberOutput.toString(v, true));
    }

    /** A value of a map's float samples (a sample, quantile or peak) at float precision: {@code of((float) v)}. */
    public static String sample(double v) {
        return of((float) v);
    }

    /** A position or length in mm rounded to {@link #POSITION_RESOLUTION_MM}; "" when not finite. */
    public static String mm(double v) {
        return rounded(v, POSITION_DECIMALS);
    }

    /** An area in mm² rounded to {@link #AREA_RESOLUTION_MM2}; "" when not finite. */
    public static String mm2(double v) {
        return rounded(v, AREA_DECIMALS);
    }

    /**
     * The position of pixel {@code indexPx} on an axis of a map with centre {@code centrePx} and pitch {@code pitchMm}:
     * the exact decimal of (index − centre) × pitch, where centre and pitch are taken as their shortest texts (so
     * 0.3 mm × 248 is {@code 74.4}, not the double product 74.39999999999999), for map files that must read back onto
     * the same pixels. Falls back to {@link #of(double)} of the double product when that decimal would be longer.
     */
    public static String gridPosition(long indexPx, double centrePx, double pitchMm) {
        BigDecimal exact = BigDecimal.valueOf(indexPx).subtract(new BigDecimal(of(centrePx)))
                .multiply(new BigDecimal(of(pitchMm)));
        if (exact.signum() == 0) {
            return "0";
        }
        exact = exact.stripTrailingZeros();
        if (exact.precision() > 17) {
            return of((indexPx - centrePx) * pitchMm);
        }
        return exact.scale() < 0 ? exact.setScale(0).toPlainString() : exact.toPlainString();
    }

    /** {@code v} rounded to {@link #POSITION_RESOLUTION_MM}, as the double {@link #mm(double)} reads back to. */
    public static double roundMm(double v) {
        return Double.isFinite(v) ? roundedValue(v, POSITION_DECIMALS) : v;
    }

    /** {@code v} rounded to {@link #AREA_RESOLUTION_MM2}, as the double {@link #mm2(double)} reads back to. */
    public static double roundMm2(double v) {
        return Double.isFinite(v) ? roundedValue(v, AREA_DECIMALS) : v;
    }

    /**
     * {@code Double.parseDouble(rounded(v, decimals))} for a finite v, mostly without its decimal text: x = v·10^d is
     * within half an ulp of the exact product, so where x is more than an ulp away from the midpoint between two
     * integers, the exact product rounds (half to even) to the integer nearest x, r; r / 10^d, one correctly rounded
     * division of two exact numbers, is then the double nearest the decimal r·10^−d, which is what that decimal text
     * reads back to. Near a midpoint, and for products of 2^52 or more, the decimal text decides.
     */
    private static double roundedValue(double v, int decimals) {
        double scale = DECIMAL_SCALES[decimals];
        double x = v * scale;
        if (Math.abs(x) < 0x1p52) {
            double r = Math.rint(x);
            if (Math.abs(Math.abs(x - r) - 0.5) > Math.ulp(x)) {
                return r == 0 ? 0.0 : r / scale; // "0" (not "-0") where the rounded value is zero
            }
        }
        return Double.parseDouble(rounded(v, decimals));
    }

    /** 10^d, exact, for the decimals of {@link #roundedValue}. */
    private static final double[] DECIMAL_SCALES = {1, 10, 100, 1e3, 1e4, 1e5, 1e6};

    /**
     * A new JSON mapper that writes doubles and floats with the shortest digits (Jackson's Schubfach writer, as
     * {@link #of(double)} less the trimming of {@code .0}); every JSON output of numbers is written by one.
     */
    public static ObjectMapper jsonMapper() {
        return JsonMapper.builder().enable(StreamWriteFeature.USE_FAST_DOUBLE_WRITER).build();
    }

    /**
     * Schubfach (like Java 19's {@code Double.toString}) writes at least two digits: where one digit reads back, the
     * two-digit text is the closer one. That happens only for subnormal numbers, whose rounding interval is wide
     * (4.9E-324 where 5E-324 reads back too); there the one-digit text nearest {@code v} that reads back, or null.
     */
    private static String oneDigit(double v, boolean isFloat) {
        BigDecimal exact = new BigDecimal(v);
        String best = null;
        BigDecimal bestDistance = null;
        for (RoundingMode m : new RoundingMode[] {RoundingMode.FLOOR, RoundingMode.CEILING}) {
            BigDecimal d = exact.round(new java.math.MathContext(1, m));
            String text = d.toString();
            boolean back = isFloat ? Float.parseFloat(text) == (float) v : Double.parseDouble(text) == v;
            BigDecimal distance = d.subtract(exact).abs();
            if (back && (bestDistance == null || distance.compareTo(bestDistance) < 0)) {
                best = text;
                bestDistance = distance;
            }
        }
        return best;
    }

    private static String rounded(double v, int decimals) {
        if (!Double.isFinite(v)) {
            return "";
        }
        BigDecimal d = new BigDecimal(v).setScale(decimals, RoundingMode.HALF_EVEN).stripTrailingZeros();
        if (d.signum() == 0) {
            return "0";
        }
        return d.scale() < 0 ? d.setScale(0).toPlainString() : d.toPlainString();
    }

    private static String trim(String s) {
        if (s.endsWith(".0")) {
            return s.substring(0, s.length() - 2);
        }
        int e = s.indexOf(".0E");
        return e >= 0 ? s.substring(0, e) + s.substring(e + 2) : s;
    }
}
