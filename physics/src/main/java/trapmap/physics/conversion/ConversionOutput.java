package trapmap.physics.conversion;

/**
 * Output rasters of an array conversion, row-major like the input. Any array may be null when that quantity is
 * not wanted; each non-null array must have the input's length. The caller owns the arrays, so that repeated
 * conversions (live redraws) allocate nothing.
 */
public final class ConversionOutput {
    /** Equivalent trap density, cm^-3. */
    public final float[] trapDensity;
    /** Lower density bound over the published parameter spread, cm^-3. */
    public final float[] trapDensityMin;
    /** Upper density bound over the published parameter spread, cm^-3. */
    public final float[] trapDensityMax;
    /** Steady-state electron occupancy of the traps. */
    public final float[] occupancy;
    /** SRH lifetime, µs. */
    public final float[] srhLifetimeUs;
    /** Excess carrier density used, cm^-3. */
    public final float[] injection;
    /** Lifetime at the reference injection, µs. */
    public final float[] lifetimeAtReferenceUs;
    /** {@link PixelStatus#code()} per pixel. */
    public final byte[] status;
    /** {@link ConversionWarning} bits per pixel. */
    public final byte[] warnings;

    public ConversionOutput(float[] trapDensity, float[] trapDensityMin, float[] trapDensityMax, float[] occupancy,
                            float[] srhLifetimeUs, float[] injection, float[] lifetimeAtReferenceUs, byte[] status,
                            byte[] warnings) {
        this.trapDensity = trapDensity;
        this.trapDensityMin = trapDensityMin;
        this.trapDensityMax = trapDensityMax;
        this.occupancy = occupancy;
        this.srhLifetimeUs = srhLifetimeUs;
        this.injection = injection;
        this.lifetimeAtReferenceUs = lifetimeAtReferenceUs;
        this.status = status;
        this.warnings = warnings;
    }

    /** Every output for {@code pixels} pixels. */
    public static ConversionOutput allocateAll(int pixels) {
        return new ConversionOutput(new float[pixels], new float[pixels], new float[pixels], new float[pixels],
                new float[pixels], new float[pixels], new float[pixels], new byte[pixels], new byte[pixels]);
    }

    /** Checks that every non-null plane holds at least {@code n} pixels (a band converted into longer planes). */
    void checkAtLeast(int n) {
        Object[] all = {trapDensity, trapDensityMin, trapDensityMax, occupancy, srhLifetimeUs, injection,
            lifetimeAtReferenceUs};
        for (Object a : all) {
            if (a != null && ((float[]) a).length < n) {
                throw new IllegalArgumentException("output raster has " + ((float[]) a).length
                        + " pixels but the rows converted reach pixel " + n);
            }
        }
        if ((status != null && status.length < n) || (warnings != null && warnings.length < n)) {
            throw new IllegalArgumentException("status/warning raster is shorter than the " + n
                    + " pixels the rows converted reach");
        }
    }

    void checkLength(int n) {
        Object[] all = {trapDensity, trapDensityMin, trapDensityMax, occupancy, srhLifetimeUs, injection,
            lifetimeAtReferenceUs};
        for (Object a : all) {
            if (a != null && ((float[]) a).length != n) {
                throw new IllegalArgumentException("output raster has " + ((float[]) a).length
                        + " pixels but the input has " + n);
            }
        }
        if ((status != null && status.length != n) || (warnings != null && warnings.length != n)) {
            throw new IllegalArgumentException("status/warning raster length differs from the input's " + n);
        }
    }
}
