package trapmap.cli;

import java.util.Locale;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import picocli.CommandLine.ITypeConverter;
import trapmap.physics.material.AstmF723;
import trapmap.physics.material.ConductivityType;
import trapmap.physics.material.Doping;

/**
 * A doping as given on the command line: {@code p:1e16} or {@code n:5e15} (net dopant density, cm^-3), or
 * {@code p:1.5ohmcm} / {@code n:2Ohm.cm} / {@code p:3 ohm*cm} (resistivity at 23 °C, Ω·cm, converted by ASTM F723 for
 * boron or phosphorus). An optional {@code cm^-3} / {@code cm-3} / {@code /cm3} suffix marks a density.
 *
 * @param doping           the net doping
 * @param resistivityOhmCm the resistivity it was derived from, Ω·cm (NaN when a density was given)
 */
record DopingValue(Doping doping, double resistivityOhmCm) {
    static final String EXPECTED = "<type>:<value> with type p or n and a density in cm^-3 (p:1e16) or a"
            + " resistivity in Ω·cm (p:1.5ohmcm)";

    private static final Pattern FORM = Pattern.compile(
            "([pPnN])\\s*:\\s*([+-]?(?:\\d+\\.?\\d*|\\.\\d+)(?:[eE][+-]?\\d+)?)\\s*(.*)");
    private static final Pattern OHM_CM = Pattern.compile("(ohm|Ω)\\s*[.*·⋅-]?\\s*cm", Pattern.CASE_INSENSITIVE);
    private static final Pattern PER_CM3 = Pattern.compile("(cm\\^?-3|/cm\\^?3|cm⁻³)", Pattern.CASE_INSENSITIVE);

    /**
     * Parses a doping.
     *
     * @throws Quantity.BadValue naming the expected form or range and what was given
     */
    static DopingValue parse(String text) {
        String t = text == null ? "" : text.trim();
        Matcher m = FORM.matcher(t);
        if (!m.matches()) {
            throw new Quantity.BadValue("must be " + EXPECTED + " (got '" + t + "')");
        }
        ConductivityType type = m.group(1).equalsIgnoreCase("p") ? ConductivityType.P : ConductivityType.N;
        String unit = m.group(3).trim();
        boolean resistivity = OHM_CM.matcher(unit).matches();
        if (!resistivity && !unit.isEmpty() && !PER_CM3.matcher(unit).matches()) {
            throw new Quantity.BadValue("unit '" + unit + "' is neither cm^-3 nor Ω·cm (ohmcm); expected " + EXPECTED
                    + " (got '" + t + "')");
        }
        String number = m.group(2).trim();
        if (resistivity) {
            double rho = Quantity.number(number, "Ω·cm");
            if (!(rho >= AstmF723.MIN_RESISTIVITY_OHM_CM && rho <= AstmF723.MAX_RESISTIVITY_OHM_CM)) {
                throw new Quantity.BadValue("resistivity must be in [" + Format.exact(AstmF723.MIN_RESISTIVITY_OHM_CM)
                        + ", " + Format.exact(AstmF723.MAX_RESISTIVITY_OHM_CM) + "] Ω·cm (got " + number + ")");
            }
            double n = type == ConductivityType.P ? AstmF723.boronPerCm3(rho) : AstmF723.phosphorusPerCm3(rho);
            checkDensity(n, "resistivity " + number + " Ω·cm gives " + Format.number(n) + " cm^-3 by ASTM F723");
            return new DopingValue(new Doping(type, n), rho);
        }
        double n = Quantity.number(number, "cm^-3");
        if (!(n >= Doping.MIN_DENSITY_PER_CM3 && n <= Doping.MAX_DENSITY_PER_CM3)) {
            throw new Quantity.BadValue("density must be in [" + Format.exact(Doping.MIN_DENSITY_PER_CM3) + ", "
                    + Format.exact(Doping.MAX_DENSITY_PER_CM3) + "] cm^-3 (got " + number + ")");
        }
        return new DopingValue(new Doping(type, n), Double.NaN);
    }

    private static void checkDensity(double n, String what) {
        if (!(n >= Doping.MIN_DENSITY_PER_CM3 && n <= Doping.MAX_DENSITY_PER_CM3)) {
            throw new Quantity.BadValue(what + ", outside the accepted [" + Format.exact(Doping.MIN_DENSITY_PER_CM3)
                    + ", " + Format.exact(Doping.MAX_DENSITY_PER_CM3) + "] cm^-3");
        }
    }

    /** True when the doping was given as a resistivity. */
    boolean fromResistivity() {
        return !Double.isNaN(resistivityOhmCm);
    }

    /** {@code "p"} or {@code "n"}. */
    String typeLetter() {
        return doping.type().name().toLowerCase(Locale.ROOT);
    }

    /** Human-readable form, e.g. {@code p-type, 1e16 cm^-3 (from 1.5 Ω·cm, ASTM F723)}. */
    String describe() {
        String s = typeLetter() + "-type, " + Format.number(doping.densityPerCm3()) + " cm^-3";
        return fromResistivity() ? s + " (from " + Format.number(resistivityOhmCm) + " Ω·cm, ASTM F723)" : s;
    }

    static final class Converter implements ITypeConverter<DopingValue> {
        @Override
        public DopingValue convert(String value) {
            return parse(value);
        }
    }
}
