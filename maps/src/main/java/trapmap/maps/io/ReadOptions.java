package trapmap.maps.io;

import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;

/**
 * Limits and choices for reading map files.
 *
 * @param maxPixels       most pixels read from one file, all pages together; checked from the file header before
 *                        anything is allocated (default 8192² = 67,108,864, i.e. 256 MiB of samples)
 * @param maxFileBytes    largest file accepted, bytes (default 1 GiB)
 * @param csvResampling   what to do with CSV point lists whose points do not lie on a regular grid
 * @param resamplePitchMm pixel pitch of the resampled grid, mm; NaN to take the file's or estimate it
 * @param defaultPitchMm  pixel pitch assumed when neither the file nor its sidecar gives one, mm (the assumption is
 *                        recorded in the map's provenance)
 */
public record ReadOptions(long maxPixels, long maxFileBytes, Resampling csvResampling, double resamplePitchMm,
                          double defaultPitchMm) {

    /** Default pixel limit: 8192 × 8192. */
    public static final long DEFAULT_MAX_PIXELS = 8192L * 8192L;
    /** Default file-size limit: 1 GiB. */
    public static final long DEFAULT_MAX_FILE_BYTES = 1L << 30;
    /** Largest pixel limit the raster model can hold (one Java array). */
    public static final long MAX_PIXELS_LIMIT = Integer.MAX_VALUE - 8;

    /** 8192² pixels, 1 GiB, no resampling, 1 mm pitch when unknown. */
    public static final ReadOptions DEFAULTS = new ReadOptions(DEFAULT_MAX_PIXELS, DEFAULT_MAX_FILE_BYTES,
            Resampling.OFF, Double.NaN, 1.0);

    /**
     * Treatment of scattered CSV points (points not on one regular grid).
     * <ul>
     *   <li>{@link #OFF}: refuse the file with a message naming the first point off the grid;</li>
     *   <li>{@link #NEAREST}: each pixel takes the value of the nearest point within √2 pitches of its centre
     *       (NaN when there is none);</li>
     *   <li>{@link #INVERSE_DISTANCE}: each pixel takes the 1/d²-weighted mean of the points within √2 pitches of its
     *       centre (a point closer than 10⁻⁹ pitch is taken as is; NaN when there is none).</li>
     * </ul>
     */
    public enum Resampling { OFF, NEAREST, INVERSE_DISTANCE }

    public ReadOptions {
        if (maxPixels < 1 || maxPixels > MAX_PIXELS_LIMIT) {
            throw new InvalidValueException("maxPixels", "pixels", "maxPixels must be in [1, " + MAX_PIXELS_LIMIT
                    + "] pixels but was " + maxPixels);
        }
        if (maxFileBytes < 1) {
            throw new InvalidValueException("maxFileBytes", "bytes", "maxFileBytes must be >= 1 bytes but was "
                    + maxFileBytes);
        }
        Checks.notNull(csvResampling, "csvResampling");
        if (!Double.isNaN(resamplePitchMm)) {
            Checks.positive(resamplePitchMm, "resamplePitch", "mm");
        }
        Checks.positive(defaultPitchMm, "defaultPitch", "mm");
    }

    public ReadOptions withMaxPixels(long pixels) {
        return new ReadOptions(pixels, maxFileBytes, csvResampling, resamplePitchMm, defaultPitchMm);
    }

    public ReadOptions withMaxFileBytes(long bytes) {
        return new ReadOptions(maxPixels, bytes, csvResampling, resamplePitchMm, defaultPitchMm);
    }

    public ReadOptions withCsvResampling(Resampling r) {
        return new ReadOptions(maxPixels, maxFileBytes, r, resamplePitchMm, defaultPitchMm);
    }

    public ReadOptions withResamplePitch(double mm) {
        return new ReadOptions(maxPixels, maxFileBytes, csvResampling, mm, defaultPitchMm);
    }

    public ReadOptions withDefaultPitch(double mm) {
        return new ReadOptions(maxPixels, maxFileBytes, csvResampling, resamplePitchMm, mm);
    }
}
