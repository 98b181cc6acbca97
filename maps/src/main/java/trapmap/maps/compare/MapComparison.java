package trapmap.maps.compare;

import java.util.Arrays;
import java.util.Locale;
import java.util.function.DoubleBinaryOperator;
import java.util.stream.IntStream;
import org.apache.commons.math3.util.KthSelector;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.Mask;
import trapmap.maps.raster.PixelGrid;
import trapmap.shared.check.Checks;
import trapmap.shared.error.InvalidValueException;

/**
 * Compares a before and an after map of one wafer that lie on the same grid (register and resample the after map
 * first with {@link MapRegistration#apply}). Gives the difference, ratio and relative-change maps, for densities
 * the reduction 1 − N_after/N_before (gettering efficiency), and paired statistics over the pixels with data in
 * both. Ratio-type results need both samples positive; elsewhere they are NaN.
 */
public final class MapComparison {
    /** ±5 %: changes within it count as unchanged (common practice for repeat lifetime maps). */
    public static final double DEFAULT_RELATIVE_TOLERANCE = 0.05;

    /** Size of the pivot cache of {@link KthSelector} (as Commons Math's {@code Percentile} uses). */
    private static final int PIVOTS_HEAP = 0x1FF;
    /** Pixels per parallel task when a map is derived. */
    private static final int CHUNK = 1 << 16;

    private MapComparison() {
    }

    /** after − before, in the maps' unit. */
    public static WaferMap difference(WaferMap before, WaferMap after) {
        check(before, after);
        return derive(before, after, Quantity.DIFFERENCE, "difference", "after - before", (b, a) -> a - b);
    }

    /** after / before, where both are positive. */
    public static WaferMap ratio(WaferMap before, WaferMap after) {
        check(before, after);
        return derive(before, after, Quantity.RATIO, "ratio", "after / before", (b, a) -> b > 0 && a > 0 ? a / b
                : Double.NaN);
    }

    /** (after − before) / before, where both are positive. */
    public static WaferMap relativeChange(WaferMap before, WaferMap after) {
        check(before, after);
        return derive(before, after, Quantity.RELATIVE_CHANGE, "relative-change", "(after - before) / before",
                (b, a) -> b > 0 && a > 0 ? (a - b) / b : Double.NaN);
    }

    /**
     * 1 − after/before of a density map (trap, iron or normalised defect density), where both are positive: 0.8
     * means 80 % of the defects were removed, a negative value means the density rose.
     *
     * @throws InvalidValueException for a quantity that is not a density
     */
    public static WaferMap reduction(WaferMap before, WaferMap after) {
        check(before, after);
        if (!isDensity(before.quantity())) {
            throw new InvalidValueException("quantity", "", "a reduction 1 - after/before needs a density map"
                    + " but the maps hold " + before.quantity().key());
        }
        return derive(before, after, Quantity.FRACTION, "reduction", "1 - after / before",
                (b, a) -> b > 0 && a > 0 ? 1 - a / b : Double.NaN);
    }

    /** All maps and the statistics over every pixel, ±5 % tolerance, the quantity's own better direction. */
    public static Comparison compare(WaferMap before, WaferMap after) {
        return compare(before, after, null, DEFAULT_RELATIVE_TOLERANCE, Improvement.of(before.quantity()));
    }

    /**
     * All maps (over every pixel) and the statistics over {@code region}.
     *
     * @param region            pixels to summarise, null for all
     * @param relativeTolerance changes within ±this fraction count as unchanged
     * @param improvement       which way is better
     */
    public static Comparison compare(WaferMap before, WaferMap after, Mask region, double relativeTolerance,
                                     Improvement improvement) {
        PairedStatistics s = statistics(before, after, region, relativeTolerance, improvement);
        return new Comparison(difference(before, after), ratio(before, after), relativeChange(before, after),
                isDensity(before.quantity()) ? reduction(before, after) : null, s);
    }

    /** Statistics over every pixel, ±5 % tolerance, the quantity's own better direction. */
    public static PairedStatistics statistics(WaferMap before, WaferMap after) {
        check(before, after);
        return statistics(before, after, null, DEFAULT_RELATIVE_TOLERANCE, Improvement.of(before.quantity()));
    }

    /**
     * Paired statistics over the pixels of {@code region} (null: all) with data in both maps.
     *
     * @throws InvalidValueException for maps on different grids or of different quantities, a region of another
     *                               size or a tolerance outside [0, 1]
     */
    public static PairedStatistics statistics(WaferMap before, WaferMap after, Mask region,
                                              double relativeTolerance, Improvement improvement) {
        check(before, after);
        Checks.inRange(relativeTolerance, 0, 1, "relativeTolerance", "");
        Checks.notNull(improvement, "improvement");
        if (region != null && (region.width() != before.width() || region.height() != before.height())) {
            throw new InvalidValueException("region", "px", "the region is " + region.width() + "x"
                    + region.height() + " px but the maps are " + before.width() + "x" + before.height() + " px");
        }
        return PairedPass.run(before.quantity(), before.raster().samples(), after.raster().samples(), region,
                relativeTolerance, improvement, isDensity(before.quantity())).statistics();
    }

    /**
     * As {@link #statistics(WaferMap, WaferMap, Mask, double, Improvement)} over every pixel, with the overlap: the
     * pixels with data in {@code before} whose sample in {@code after} is not NaN (all of them finite when
     * {@code after} was resampled), counted in the same pass.
     */
    static PairedPass.Result statisticsAndOverlap(WaferMap before, WaferMap after, double relativeTolerance,
                                                  Improvement improvement) {
        check(before, after);
        Checks.inRange(relativeTolerance, 0, 1, "relativeTolerance", "");
        Checks.notNull(improvement, "improvement");
        return PairedPass.run(before.quantity(), before.raster().samples(), after.raster().samples(), null,
                relativeTolerance, improvement, isDensity(before.quantity()));
    }

    /** True for trap, iron and normalised defect densities (the quantities whose reduction is meaningful). */
    public static boolean isDensity(Quantity q) {
        return switch (q) {
            case TRAP_DENSITY, TRAP_DENSITY_MIN, TRAP_DENSITY_MAX, IRON_DENSITY, NORMALISED_DENSITY -> true;
            default -> false;
        };
    }

    /**
     * Median of the first n values (reorders them; the mean of the two middle values for even n), NaN for none.
     * The middle values are selected (Commons Math {@link KthSelector}, expected linear time), not sorted: the
     * straightforward way that {@link PairedPass}'s medians are tested against.
     */
    static double median(double[] v, int n) {
        if (n == 0) {
            return Double.NaN;
        }
        double[] w = n == v.length ? v : Arrays.copyOf(v, n);
        KthSelector selector = new KthSelector();
        int[] pivots = new int[PIVOTS_HEAP];
        Arrays.fill(pivots, -1);
        double upper = selector.select(w, pivots, n / 2);
        if (n % 2 == 1) {
            return upper;
        }
        return 0.5 * (selector.select(w, pivots, n / 2 - 1) + upper);
    }

    private static WaferMap derive(WaferMap before, WaferMap after, Quantity q, String what, String formula,
                                   DoubleBinaryOperator f) {
        float[] b = before.raster().samples();
        float[] a = after.raster().samples();
        float[] out = new float[b.length];
        // each pixel alone, rows of blocks in parallel: the same map on any number of threads
        IntStream.range(0, (out.length + CHUNK - 1) / CHUNK).parallel().forEach(c -> {
            for (int i = c * CHUNK, end = Math.min(out.length, i + CHUNK); i < end; i++) {
                double vb = b[i];
                double va = a[i];
                out[i] = Double.isFinite(vb) && Double.isFinite(va) ? (float) f.applyAsDouble(vb, va) : Float.NaN;
            }
        });
        String unit = q == Quantity.DIFFERENCE ? before.quantity().unit() : "";
        ProcessingStep step = ProcessingStep.of("compare", "result", what, "formula", formula,
                "of", before.quantity().key(), "unit", unit,
                "before", before.waferId().isEmpty() ? before.provenance().source() : before.waferId());
        return after.derive(FloatRaster.wrap(after.width(), after.height(), out), q, step);
    }

    private static void check(WaferMap before, WaferMap after) {
        Checks.notNull(before, "before");
        Checks.notNull(after, "after");
        if (!before.grid().equals(after.grid())) {
            throw new InvalidValueException("after", "", "the after map lies on " + describe(after.grid())
                    + " but the before map on " + describe(before.grid())
                    + "; register and resample it onto the before grid first");
        }
        if (before.quantity() != after.quantity()) {
            throw new InvalidValueException("quantity", "", "the before map holds " + before.quantity().key()
                    + " but the after map " + after.quantity().key() + "; compare like with like");
        }
    }

    private static String describe(PixelGrid g) {
        return String.format(Locale.ROOT, "%dx%d px at %.4g mm centred at (%.2f, %.2f) px", g.width(), g.height(),
                g.pitchMm(), g.centreXPx(), g.centreYPx());
    }
}
