package trapmap.physics.conversion;

/** Outcome of converting one pixel. The code is what status rasters store. */
public enum PixelStatus {
    /** Converted: the density is the equivalent density of the chosen defect. */
    OK(0),
    /**
     * The SRH share of 1/τ_eff is below the detection resolution (τ_eff near or above what intrinsic and surface
     * recombination alone allow): the density is below the detection limit, and the reported density is that limit
     * (an upper bound).
     */
    BELOW_LIMIT(1),
    /** NaN, zero, negative or infinite input, or a lifetime below the physical floor (1 ns). */
    INVALID(2),
    /** Outside the wafer or masked. */
    NO_DATA(3),
    /**
     * Iron pairs only: the lifetime changed in the direction the iron chemistry forbids at this Δn (below the
     * Fe_i/FeB crossover dissociation must lower it, above it raise it) by more than the resolution.
     */
    INCONSISTENT(4);

    private final byte code;

    PixelStatus(int code) {
        this.code = (byte) code;
    }

    public byte code() {
        return code;
    }

    /** The status with this code. */
    public static PixelStatus ofCode(int code) {
        for (PixelStatus s : values()) {
            if (s.code == code) {
                return s;
            }
        }
        throw new IllegalArgumentException("no pixel status with code " + code);
    }
}
