package trapmap.shared.units;

import java.util.Locale;

/** Units a lifetime may be given in. Everything inside trapmap works in microseconds. */
public enum LifetimeUnit {
    S(1e6, "s"),
    MS(1e3, "ms"),
    US(1.0, "µs"),
    NS(1e-3, "ns");

    private final double microsecondsPerUnit;
    private final String symbol;

    LifetimeUnit(double microsecondsPerUnit, String symbol) {
        this.microsecondsPerUnit = microsecondsPerUnit;
        this.symbol = symbol;
    }

    /** Converts a value in this unit to microseconds. */
    public double toMicroseconds(double value) {
        return value * microsecondsPerUnit;
    }

    public String symbol() {
        return symbol;
    }

    /**
     * Parses a unit symbol: {@code s}, {@code ms}, {@code us}, {@code µs} (micro sign or Greek mu), {@code ns},
     * case-insensitive.
     *
     * @throws IllegalArgumentException with the accepted spellings when the text is none of them
     */
    public static LifetimeUnit parse(String text) {
        String t = text.trim().toLowerCase(Locale.ROOT).replace('\u00b5', 'u').replace('\u03bc', 'u');
        switch (t) {
            case "s": case "sec": case "second": case "seconds": return S;
            case "ms": return MS;
            case "us": case "usec": case "microsecond": case "microseconds": return US;
            case "ns": return NS;
            default:
                throw new IllegalArgumentException("unknown lifetime unit '" + text + "' (expected s, ms, us/µs or ns)");
        }
    }
}
