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
}
