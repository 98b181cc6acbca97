package trapmap.cli;

import java.util.Locale;
import java.util.regex.Pattern;
import picocli.CommandLine.ITypeConverter;
import picocli.CommandLine.TypeConversionException;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.shared.units.Units;

/**
 * The numeric kinds of input the commands take, each with its unit and sign rule. Parsing is strict (plain decimal
 * or scientific notation, no NaN, no hexadecimal) and every failure says what was expected, in which unit, and what
 * was given. The nested converters plug these into picocli options; cases files use {@link #parse} directly.
 */
enum Quantity {
    LIFETIME_US("µs", true),
    DENSITY_CM3("cm^-3", true),
    GENERATION("cm^-3 s^-1", true),
    THICKNESS_UM("µm", true),
    SRV_CM_S("cm/s", false),
    TEMPERATURE_K("K", true),
    COUNTS("counts", true);

    private static final Pattern NUMBER = Pattern.compile("[+-]?(\\d+\\.?\\d*|\\.\\d+)([eE][+-]?\\d+)?");

    private final String unit;
    private final boolean strictlyPositive;

    Quantity(String unit, boolean strictlyPositive) {
        this.unit = unit;
        this.strictlyPositive = strictlyPositive;
    }

    String unit() {
        return unit;
    }

    /**
     * The value of {@code text}.
     *
     * @throws BadValue with the rule and the text, e.g. {@code must be > 0 µs (got -5)}
     */
    double parse(String text) {
        double v = number(text, unit);
        if (strictlyPositive && !(v > 0)) {
            throw new BadValue("must be > 0 " + unit + " (got " + text.trim() + ")");
        }
        if (!strictlyPositive && !(v >= 0)) {
            throw new BadValue("must be >= 0 " + unit + " (got " + text.trim() + ")");
        }
        if (this == LIFETIME_US && v < TrapDensityConverter.LIFETIME_FLOOR_US) {
            throw new BadValue(belowLifetimeFloor(v, text.trim()));
        }
        return v;
    }

    /**
     * The rule for a lifetime below the physical floor, naming the likely unit mistake: a value that is a plausible
     * lifetime (1 ns – 0.1 s) once read as seconds was most likely typed in seconds.
     */
    static String belowLifetimeFloor(double us, String text) {
        double asSeconds = us * Units.US_PER_S;
        String rule = "must be >= " + TrapDensityConverter.LIFETIME_FLOOR_US + " µs (1 ns, the shortest lifetime"
                + " converted: below it no lifetime tool measures and the trap density would reach the doping) (got "
                + text + ")";
        if (asSeconds >= TrapDensityConverter.LIFETIME_FLOOR_US && asSeconds <= 1e5) {
            rule += "; " + text + " looks like a lifetime in seconds typed as µs: " + text + " s = "
                    + String.format(Locale.ROOT, "%.6g", asSeconds).replaceFirst("\\.?0+$", "") + " µs";
        }
        return rule;
    }

    /** A finite number in {@code unit}. */
    static double number(String text, String unit) {
        String t = text == null ? "" : text.trim();
        if (!NUMBER.matcher(t).matches()) {
            throw new BadValue("must be a number in " + unit + " (got '" + t + "')");
        }
        double v = Double.parseDouble(t);
        if (!Double.isFinite(v)) {
            throw new BadValue("must be a finite number in " + unit + " (got '" + t + "')");
        }
        return v;
    }

    /**
     * A finite number in plain decimal or scientific notation, for options without a unit converter; the caller
     * names the option and what it expects.
     *
     * @throws TypeConversionException when {@code text} is not such a number
     */
    static Double plainNumber(String text) {
        String t = text == null ? "" : text.trim();
        if (!NUMBER.matcher(t).matches() || !Double.isFinite(Double.parseDouble(t))) {
            throw new TypeConversionException("'" + t + "' is not a number");
        }
        return Double.parseDouble(t);
    }

    /** A value that does not fit its option; the message is the rule, without the flag. */
    static final class BadValue extends TypeConversionException {
        private static final long serialVersionUID = 1L;

        BadValue(String rule) {
            super(rule);
        }
    }

    static final class Lifetime implements ITypeConverter<Double> {
        @Override
        public Double convert(String value) {
            return LIFETIME_US.parse(value);
        }
    }

    static final class Density implements ITypeConverter<Double> {
        @Override
        public Double convert(String value) {
            return DENSITY_CM3.parse(value);
        }
    }

    static final class Generation implements ITypeConverter<Double> {
        @Override
        public Double convert(String value) {
            return GENERATION.parse(value);
        }
    }

    static final class Thickness implements ITypeConverter<Double> {
        @Override
        public Double convert(String value) {
            return THICKNESS_UM.parse(value);
        }
    }

    static final class Srv implements ITypeConverter<Double> {
        @Override
        public Double convert(String value) {
            return SRV_CM_S.parse(value);
        }
    }

    static final class Temperature implements ITypeConverter<Double> {
        @Override
        public Double convert(String value) {
            return TEMPERATURE_K.parse(value);
        }
    }

    static final class Counts implements ITypeConverter<Double> {
        @Override
        public Double convert(String value) {
            return COUNTS.parse(value);
        }
    }
}
