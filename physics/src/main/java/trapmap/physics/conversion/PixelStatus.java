package trapmap.physics.conversion;

/** Outcome of converting one pixel. The code is what status rasters store. */
public enum PixelStatus {
    /** Converted: the density is the equivalent density of the chosen defect. */
    OK(0),
    /**
     * τ_eff at or above what intrinsic and surface recombination alone allow: the density is below the detection
     * limit, and the reported density is that limit (an upper bound).
     */
    BELOW_LIMIT(1),
    /** NaN, zero, negative or infinite input. */
    INVALID(2),
    /** Outside the wafer or masked. */
    NO_DATA(3);

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
