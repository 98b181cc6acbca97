package trapmap.cli;

import java.util.Locale;
import picocli.CommandLine.ITypeConverter;
import trapmap.physics.material.Doping;
import trapmap.physics.material.DopingText;
import trapmap.shared.error.InvalidValueException;

/**
 * A doping as given on the command line, parsed by {@link DopingText}: {@code p:1e16} or {@code n:5e15} (net dopant
 * density, cm^-3), or {@code p:1.5ohmcm} / {@code n:2Ohm.cm} / {@code p:3 ohm*cm} (resistivity at 23 °C, Ω·cm,
 * converted by ASTM F723 for boron or phosphorus). An optional {@code cm^-3} / {@code cm-3} / {@code /cm3} suffix
 * marks a density.
 *
 * @param doping           the net doping
 * @param resistivityOhmCm the resistivity it was derived from, Ω·cm (NaN when a density was given)
 */
record DopingValue(Doping doping, double resistivityOhmCm) {
    static final String EXPECTED = DopingText.EXPECTED;

    /**
     * Parses a doping.
     *
     * @throws Quantity.BadValue naming the expected form or range and what was given
     */
    static DopingValue parse(String text) {
        try {
            DopingText d = DopingText.parse(text);
            return new DopingValue(d.doping(), d.resistivityOhmCm());
        } catch (InvalidValueException e) {
            throw new Quantity.BadValue(e.getMessage());
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

    /**
     * The generated record text, written out: picocli takes the text of every option value it sets, and a record's
     * generated {@code toString} is linked at its first call through method handles, tens of milliseconds of a
     * command's start.
     */
    @Override
    public String toString() {
        return "DopingValue[doping=" + doping + ", resistivityOhmCm=" + resistivityOhmCm + "]";
    }

    static final class Converter implements ITypeConverter<DopingValue> {
        @Override
        public DopingValue convert(String value) {
            return parse(value);
        }
    }
}
