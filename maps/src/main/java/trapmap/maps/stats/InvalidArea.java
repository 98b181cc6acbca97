package trapmap.maps.stats;

import java.util.Locale;
import trapmap.maps.raster.Blocks;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.conversion.TrapDensityConverter;
import trapmap.shared.check.Checks;

/**
 * The share of the evaluated area (the wafer less the edge exclusion) whose measured value cannot be used, with the
 * number of pixels of each cause. It is the figure {@code invalid_area_fraction} of the batch, {@code trapmap stats},
 * the viewer and the reports; every face takes it from here.
 *
 * <p>A pixel of the evaluated area is unusable for the first of these causes that applies:
 * <ol>
 *   <li><b>non-finite</b>: NaN (no data inside the wafer) or ±∞;</li>
 *   <li><b>non-positive</b>: a value ≤ 0 (a lifetime of 0 µs, a negative PL count). Such pixels are left out of the
 *       harmonic and geometric means, which are only defined for positive values, so a map with many zeros would
 *       otherwise report a <em>higher</em> harmonic mean than the same map with those pixels low;</li>
 *   <li><b>invalid conversion</b>: a finite positive value the trap-density conversion marks
 *       {@link PixelStatus#INVALID} or {@link PixelStatus#NO_DATA}. With the conversion's statuses at hand they decide;
 *       without them (an effective-lifetime map, µs) the conversion's own test is applied: lifetimes below
 *       {@link TrapDensityConverter#LIFETIME_FLOOR_US} (1 ns) are the only finite positive ones it makes INVALID.</li>
 * </ol>
 * Pixels below the detection limit ({@link PixelStatus#BELOW_LIMIT}) are usable measurements and not counted here
 * (they have their own figure, {@code below_limit_area_fraction}).
 *
 * <p>Without a wafer outline (none fitted, no format given) a NaN pixel cannot be told from the background around
 * the wafer, so the evaluated area is then the map's non-NaN pixels and only infinities, non-positive values and
 * invalid conversions count.
 *
 * @param evaluatedCount         pixels of the evaluated area, unusable ones included
 * @param nonFiniteCount         of them, NaN or infinite
 * @param nonPositiveCount       finite and ≤ 0
 * @param invalidConversionCount finite, positive and marked invalid or no-data by the conversion
 * @param pixelAreaMm2           area of one pixel, mm²
 */
public record InvalidArea(int evaluatedCount, int nonFiniteCount, int nonPositiveCount, int invalidConversionCount,
                          double pixelAreaMm2) {

    /**
     * The share of the evaluated area above which a wafer fails when its rules set no limit on
     * {@code invalid_area_fraction}, and above which the quick threshold check and {@code trapmap stats} warn:
     * 0.05 (5 %). This is the program's own default (a measurement that lost more than one pixel in twenty of the
     * wafer is not a sound basis for a verdict), not a standard; a rules file changes it with a limit of its own.
     */
    public static final double DEFAULT_LIMIT = 0.05;

    /** Why a pixel is unusable. */
    public enum Cause {
        USABLE, NON_FINITE, NON_POSITIVE, INVALID_CONVERSION
    }

    public InvalidArea {
        if (evaluatedCount < 0 || nonFiniteCount < 0 || nonPositiveCount < 0 || invalidConversionCount < 0
                || nonFiniteCount + nonPositiveCount + invalidConversionCount > evaluatedCount) {
            throw new IllegalArgumentException("invalid-area counts " + nonFiniteCount + " + " + nonPositiveCount
                    + " + " + invalidConversionCount + " must be >= 0 and at most the evaluated " + evaluatedCount);
        }
    }

    /**
     * The cause of one pixel.
     *
     * @param value         the measured value
     * @param status        the conversion's status code of the pixel, or -1 when it was not converted
     * @param lifetimeFloor true for an effective-lifetime map (µs): without a status, the conversion's 1 ns floor
     *                      applies
     */
    public static Cause cause(float value, int status, boolean lifetimeFloor) {
        if (!Float.isFinite(value)) {
            return Cause.NON_FINITE;
        }
        if (value <= 0) {
            return Cause.NON_POSITIVE;
        }
        if (status >= 0) {
            return status == PixelStatus.INVALID.code() || status == PixelStatus.NO_DATA.code()
                    ? Cause.INVALID_CONVERSION : Cause.USABLE;
        }
        return lifetimeFloor && value < TrapDensityConverter.LIFETIME_FLOOR_US ? Cause.INVALID_CONVERSION
                : Cause.USABLE;
    }

    /** Counts pixels one at a time (one pass of a caller that visits the evaluated pixels anyway). */
    public static final class Tally {
        private final boolean lifetimeFloor;
        private int evaluated;
        private int nonFinite;
        private int nonPositive;
        private int invalidConversion;

        /** @param lifetimeFloor as in {@link InvalidArea#cause} */
        public Tally(boolean lifetimeFloor) {
            this.lifetimeFloor = lifetimeFloor;
        }

        /** Adds one evaluated pixel with its value and conversion status (-1: not converted). */
        public void add(float value, int status) {
            evaluated++;
            switch (cause(value, status, lifetimeFloor)) {
                case NON_FINITE -> nonFinite++;
                case NON_POSITIVE -> nonPositive++;
                case INVALID_CONVERSION -> invalidConversion++;
                default -> {
                }
            }
        }

        /** Adds the counts of {@code other} (a tally of other pixels) to this one. */
        public void add(Tally other) {
            evaluated += other.evaluated;
            nonFinite += other.nonFinite;
            nonPositive += other.nonPositive;
            invalidConversion += other.invalidConversion;
        }

        /** Adds {@code n} evaluated pixels that a caller found usable ({@link Cause#USABLE}) without adding each. */
        public void addUsable(int n) {
            evaluated += n;
        }

        /** Adds {@code n} evaluated pixels without data (NaN inside the wafer), which a caller skipped. */
        public void addMissing(int n) {
            evaluated += n;
            nonFinite += n;
        }

        public InvalidArea result(double pixelAreaMm2) {
            return new InvalidArea(evaluated, nonFinite, nonPositive, invalidConversion, pixelAreaMm2);
        }
    }

    /**
     * The invalid area of {@code values} over {@code area}.
     *
     * @param values        the measured map's samples
     * @param area          the evaluated area: inside the wafer less the edge exclusion, whatever the values (with
     *                      no outline: the non-NaN pixels)
     * @param status        the conversion's status code of every pixel ({@link PixelStatus#code()}, as
     *                      {@code MapConversion.Result.statusCodes()} holds them), or null when the map was not converted
     * @param lifetimeFloor true for an effective-lifetime map in µs (see {@link #cause})
     * @param grid          the pixel grid
     */
    public static InvalidArea of(FloatRaster values, Mask area, byte[] status, boolean lifetimeFloor,
                                 PixelGrid grid) {
        Checks.notNull(values, "values");
        Checks.notNull(area, "area");
        Checks.notNull(grid, "grid");
        MapStatistics.checkSizes(values, area, grid);
        float[] v = values.samples();
        if (status != null && status.length != v.length) {
            throw new IllegalArgumentException(status.length + " status codes do not match the map "
                    + values.width() + "x" + values.height());
        }
        byte[] st = status;
        long[] words = area.words();
        int blocks = Blocks.count(v.length, Mask.BLOCK_PX);
        Tally[] tallies = new Tally[blocks];
        // blocks of the area in parallel, each with its own tally; the counts are integers, so their sum is the
        // one-thread count whatever the split
        Blocks.run(blocks, v.length, b -> {
            Tally t = new Tally(lifetimeFloor);
            int end = Math.min(v.length, (b + 1) * Mask.BLOCK_PX);
            for (int wi = b * (Mask.BLOCK_PX >>> 6), we = (end + 63) >>> 6; wi < we; wi++) {
                for (long word = words[wi]; word != 0; word &= word - 1) {
                    int i = (wi << 6) + Long.numberOfTrailingZeros(word);
                    t.add(v[i], st == null ? -1 : (int) st[i]);
                }
            }
            tallies[b] = t;
        });
        Tally all = new Tally(lifetimeFloor);
        for (Tally t : tallies) {
            all.add(t);
        }
        return all.result(grid.pixelAreaMm2());
    }

    /** Unusable pixels, all causes. */
    public int invalidCount() {
        return nonFiniteCount + nonPositiveCount + invalidConversionCount;
    }

    /** Unusable pixels over the evaluated ones; NaN when nothing was evaluated. */
    public double fraction() {
        return evaluatedCount == 0 ? Double.NaN : (double) invalidCount() / evaluatedCount;
    }

    /** Area of the unusable pixels, mm². */
    public double areaMm2() {
        return invalidCount() * pixelAreaMm2;
    }

    /** True when the fraction is above {@link #DEFAULT_LIMIT}. */
    public boolean aboveDefaultLimit() {
        return fraction() > DEFAULT_LIMIT;
    }

    /**
     * One line: the fraction and what makes it up, e.g. {@code 0.34 of the evaluated area (340 of 1000 px:
     * non-finite 0, non-positive 340, invalid conversion 0)}.
     */
    public String describe() {
        return String.format(Locale.ROOT, "%s of the evaluated area (%d of %d px: non-finite %d, non-positive %d,"
                + " invalid conversion %d)", number(fraction()), invalidCount(), evaluatedCount, nonFiniteCount,
                nonPositiveCount, invalidConversionCount);
    }

    /**
     * The warning of a fraction above the default limit, e.g. {@code invalid_area_fraction 0.34 > 0.05 (default
     * limit)}; empty when it is within it.
     */
    public String defaultLimitWarning() {
        return aboveDefaultLimit() ? exceeds(fraction(), DEFAULT_LIMIT) : "";
    }

    /**
     * The failed-rule text of a fraction over the default limit: {@code invalid_area_fraction 0.34 > 0.05 (default
     * limit)}.
     */
    public static String exceeds(double fraction, double limit) {
        return "invalid_area_fraction " + number(fraction) + " > " + number(limit) + " (default limit)";
    }

    /** A fraction with at most three significant digits ("n/a" for NaN). */
    static String number(double v) {
        if (Double.isNaN(v)) {
            return "n/a";
        }
        if (v == 0) {
            return "0";
        }
        String s = new java.math.BigDecimal(v).round(new java.math.MathContext(3)).stripTrailingZeros()
                .toPlainString();
        return s;
    }
}
