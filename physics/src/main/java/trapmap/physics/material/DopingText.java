package trapmap.physics.material;

import java.math.BigDecimal;
import java.math.MathContext;
import java.util.Locale;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import trapmap.shared.error.InvalidValueException;

/**
 * A doping written as text, the one notation of the command line, sidecars, rules files, sessions and the viewer:
 * {@code p:1e16} or {@code n:5e15} (net dopant density, cm^-3; an optional {@code cm^-3}, {@code cm-3},
 * {@code /cm3} or {@code cm⁻³} suffix), or {@code p:1.5ohmcm}, {@code n:2 Ohm.cm}, {@code p:3 Ω·cm} (resistivity at
 * 23 °C, Ω·cm, converted to a density by ASTM F723 for boron (p) or phosphorus (n), see {@link AstmF723}).
 * Pure parsing: no I/O.
 *
 * @param doping           the net doping
 * @param resistivityOhmCm the resistivity it was derived from, Ω·cm (NaN when a density was given)
 */
public record DopingText(Doping doping, double resistivityOhmCm) {
    /** The field name carried by the exceptions of {@link #parse(String)}. */
    public static final String FIELD = "doping";
    /** What a doping text looks like, for messages and help. */
    public static final String EXPECTED = "<type>:<value> with type p or n and a density in cm^-3 (p:1e16) or a"
            + " resistivity in Ω·cm (p:1.5ohmcm)";

    private static final Pattern FORM = Pattern.compile(
            "([pPnN])\\s*:\\s*([+-]?(?:\\d+\\.?\\d*|\\.\\d+)(?:[eE][+-]?\\d+)?)\\s*(.*)");
    private static final Pattern OHM_CM = Pattern.compile("(ohm|Ω)\\s*[.*·⋅-]?\\s*cm", Pattern.CASE_INSENSITIVE);
    private static final Pattern PER_CM3 = Pattern.compile("(cm\\^?-3|/cm\\^?3|cm⁻³)", Pattern.CASE_INSENSITIVE);

    /**
     * Parses a doping text.
     *
     * @throws InvalidValueException with field {@value #FIELD} and unit {@link #unitOf(String)}, whose message is
     *                               the rule without the field name, e.g.
     *                               {@code density must be in [1e10, 1e19] cm^-3 (got 1e25)}
     */
    public static DopingText parse(String text) {
        String t = text == null ? "" : text.trim();
        Matcher m = FORM.matcher(t);
        if (!m.matches()) {
            throw fail("cm^-3", "must be " + EXPECTED + " (got '" + t + "')");
        }
        ConductivityType type = m.group(1).equalsIgnoreCase("p") ? ConductivityType.P : ConductivityType.N;
        String unit = m.group(3).trim();
        String number = m.group(2);
        double value = Double.parseDouble(number);
        if (OHM_CM.matcher(unit).matches()) {
            if (!(value >= AstmF723.MIN_RESISTIVITY_OHM_CM && value <= AstmF723.MAX_RESISTIVITY_OHM_CM)) {
                throw fail("Ω·cm", "resistivity must be in [" + exact(AstmF723.MIN_RESISTIVITY_OHM_CM) + ", "
                        + exact(AstmF723.MAX_RESISTIVITY_OHM_CM) + "] Ω·cm (got " + number + ")");
            }
            double n = type == ConductivityType.P ? AstmF723.boronPerCm3(value) : AstmF723.phosphorusPerCm3(value);
            if (!(n >= Doping.MIN_DENSITY_PER_CM3 && n <= Doping.MAX_DENSITY_PER_CM3)) {
                throw fail("Ω·cm", "resistivity " + number + " Ω·cm gives " + fourDigits(n) + " cm^-3 by ASTM F723,"
                        + " outside the accepted [" + exact(Doping.MIN_DENSITY_PER_CM3) + ", "
                        + exact(Doping.MAX_DENSITY_PER_CM3) + "] cm^-3");
            }
            return new DopingText(new Doping(type, n), value);
        }
        if (!unit.isEmpty() && !PER_CM3.matcher(unit).matches()) {
            throw fail("cm^-3", "unit '" + unit + "' is neither cm^-3 nor Ω·cm (ohmcm); expected " + EXPECTED
                    + " (got '" + t + "')");
        }
        if (!(value >= Doping.MIN_DENSITY_PER_CM3 && value <= Doping.MAX_DENSITY_PER_CM3)) {
            throw fail("cm^-3", "density must be in [" + exact(Doping.MIN_DENSITY_PER_CM3) + ", "
                    + exact(Doping.MAX_DENSITY_PER_CM3) + "] cm^-3 (got " + number + ")");
        }
        return new DopingText(new Doping(type, value), Double.NaN);
    }

    /** The unit a doping text is given in: {@code Ω·cm} for a resistivity, {@code cm^-3} otherwise. */
    public static String unitOf(String text) {
        Matcher m = FORM.matcher(text == null ? "" : text.trim());
        return m.matches() && OHM_CM.matcher(m.group(3).trim()).matches() ? "Ω·cm" : "cm^-3";
    }

    /** True when the doping was given as a resistivity. */
    public boolean fromResistivity() {
        return !Double.isNaN(resistivityOhmCm);
    }

    private static InvalidValueException fail(String unit, String rule) {
        return new InvalidValueException(FIELD, unit, rule);
    }

    /** The shortest exact form: {@code 10000}, {@code 1e19}, {@code 1e-4}, {@code 0.5}. */
    static String exact(double v) {
        return trapmap.shared.check.Checks.exact(v);
    }

    /** Four significant digits: {@code 4.61e11}, {@code 1.5e20}. */
    private static String fourDigits(double v) {
        if (!Double.isFinite(v)) {
            return Double.toString(v);
        }
        return exact(new BigDecimal(v).round(new MathContext(4)).doubleValue()).toLowerCase(Locale.ROOT);
    }
}
