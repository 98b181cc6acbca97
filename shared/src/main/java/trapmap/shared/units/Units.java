package trapmap.shared.units;

/** Conversion factors between the units trapmap uses. Names read "target per source". */
public final class Units {
    /** Centimetres per micrometre. */
    public static final double CM_PER_UM = 1e-4;
    /** Centimetres per millimetre. */
    public static final double CM_PER_MM = 0.1;
    /** Seconds per microsecond. */
    public static final double S_PER_US = 1e-6;
    /** Microseconds per second. */
    public static final double US_PER_S = 1e6;

    private Units() {
    }

    /**
     * A unit as messages and screens show it: the ASCII micro prefix of settings and rules keys becomes the micro
     * sign ({@code um} → {@code µm}, {@code us} → {@code µs}, {@code 1/us} → {@code 1/µs}); other units are
     * returned as they are ({@code ms}, {@code mm}, {@code cm^-3}). Null becomes "".
     */
    public static String label(String unit) {
        return unit == null ? "" : unit.replaceAll("(?<![A-Za-z])u(?=[ms](?![A-Za-z]))", "\u00b5");
    }
}
