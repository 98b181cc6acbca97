package trapmap.maps.raster;

import java.math.BigDecimal;
import java.math.RoundingMode;

/**
 * How many decimals a length or an area read off a map carries: no more than the map resolves. A position is known
 * to one pixel pitch, so it gets the fewest decimals whose last digit is no coarser than the pitch (pitch 0.5 mm → 1
 * decimal, 0.05 mm → 2, 1 mm or more → 0); an area is a whole number of pixels, so it gets the decimals of one
 * pixel's area (pitch² mm²: 0.36 mm² → 1 decimal).
 *
 * <p>The evaluated area of a wafer is, everywhere trapmap prints it, the pixels counted times the pixel area
 * ({@link PixelGrid#pixelAreaMm2()}, as {@code MapStatistics.areaMm2} computes it), not the geometric area of the
 * outline less the edge exclusion: the pixels counted are what the statistics are taken over.
 */
public final class PitchPrecision {
    /** The most decimals given, whatever the pitch (0.1 µm). */
    public static final int MAX_DECIMALS = 4;

    private PitchPrecision() {
    }

    /** The fewest decimals d (0 to {@link #MAX_DECIMALS}) with 10⁻ᵈ ≤ {@code step}; 0 for a step that is not positive. */
    public static int decimals(double step) {
        if (!(step > 0) || Double.isInfinite(step)) {
            return 0;
        }
        int d = 0;
        while (d < MAX_DECIMALS && Math.pow(10, -d) > step * (1 + 1e-9)) {
            d++;
        }
        return d;
    }

    /** A position in mm with {@link #decimals} of the pitch, e.g. "-73.7"; never "-0.0"; "n/a" for NaN. */
    public static String mm(double valueMm, double pitchMm) {
        return fixed(valueMm, decimals(pitchMm));
    }

    /** An area in mm² with {@link #decimals} of one pixel's area (pitch²), e.g. "23461.9"; "n/a" for NaN. */
    public static String areaMm2(double areaMm2, double pitchMm) {
        return fixed(areaMm2, decimals(pitchMm * pitchMm));
    }

    /**
     * An area of {@code pixels} pixels, {@code areaMm2} in all, with the decimals of one pixel's area: the same text
     * as {@link #areaMm2} where the pitch is not at hand.
     */
    public static String areaOfPixels(double areaMm2, long pixels) {
        return pixels <= 0 ? fixed(areaMm2, 0) : fixed(areaMm2, decimals(areaMm2 / pixels));
    }

    /** {@code v} rounded half-up to {@code decimals} places, without exponent and without a negative zero. */
    public static String fixed(double v, int decimals) {
        if (Double.isNaN(v)) {
            return "n/a";
        }
        if (Double.isInfinite(v)) {
            return v > 0 ? "inf" : "-inf";
        }
        BigDecimal r = new BigDecimal(v).setScale(decimals, RoundingMode.HALF_UP);
        if (r.signum() == 0) {
            r = r.abs();
        }
        return r.toPlainString();
    }
}
