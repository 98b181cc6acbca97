package trapmap.maps.batch;

import java.util.Locale;
import java.util.Objects;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import trapmap.maps.io.NumberText;

/**
 * A figure of merit of one wafer, named as in the rules file and the results' columns.
 *
 * <ul>
 *   <li>{@code harmonic_mean_lifetime_us}, {@code median_lifetime_us}, {@code pNN_lifetime_us}: lifetime
 *       statistics over the evaluated area (the wafer less the edge exclusion), µs</li>
 *   <li>{@code trap_density_pNN_cm3}: percentile of the trap-density map, cm^-3</li>
 *   <li>{@code flagged_area_fraction}: area of the flagged regions (at least the flag's minimum area) over the
 *       evaluated area</li>
 *   <li>{@code largest_region_mm2}: area of the largest flagged region, 0 when none, mm²</li>
 *   <li>{@code largest_interior_region_mm2}: area of the largest flagged region that keeps off the border of the
 *       evaluated area (every pixel centre more than {@link #INTERIOR_MARGIN_MM} or one pixel pitch, whichever is
 *       larger, inside the edge exclusion), 0 when none, mm²: contamination of the wafer's inside as opposed to edge
 *       zones</li>
 *   <li>{@code below_limit_area_fraction}: share of the evaluated area whose trap density is below the detection
 *       limit (converted pixels whose SRH share of 1/τ_eff is under the resolution); reported whenever trap
 *       densities are computed</li>
 *   <li>{@code invalid_area_fraction}: share of the evaluated area whose measured lifetime cannot be used
 *       (non-finite, ≤ 0, or invalid for the conversion: {@link trapmap.maps.stats.InvalidArea}); always reported,
 *       and limited to {@link trapmap.maps.stats.InvalidArea#DEFAULT_LIMIT} when the profile sets no limit on it</li>
 *   <li>{@code exceedance_area_fraction_cNN}: share of the evaluated area where the probability that the trap
 *       density exceeds the profile's trap-density flag threshold is at least NN % (over the uncertainties of the
 *       rules' {@code physics.uncertainty} block, {@link ConfidenceFlag}); e.g. {@code exceedance_area_fraction_c95}
 *       </li>
 *   <li>{@code best_defect_area_fraction}: share of the evaluated area whose τ_SRH(Δn) curve over the profile's
 *       injection stack ({@link StackRules}) is explained best by the profile's defect (ranking status OK);
 *       {@code no_single_defect_area_fraction}: share whose best candidate still fails the χ² test
 *       ({@code NO_SINGLE_DEFECT}); both reported whenever the profile has a stack</li>
 *   <li>{@code edge_to_centre_ratio}: harmonic-mean lifetime in the band of {@code edge_band_mm} along the inner
 *       border of the evaluated area over the harmonic-mean lifetime inside it</li>
 * </ul>
 *
 * @param name    the figure's name
 * @param kind    what it measures
 * @param percent the percentile for percentile kinds, the confidence in per cent for
 *                {@link Kind#EXCEEDANCE_AREA_FRACTION}, NaN otherwise
 */
public record Figure(String name, Kind kind, double percent) {

    /** How far inside the edge exclusion a region must keep to count as interior, mm (at least one pixel pitch). */
    public static final double INTERIOR_MARGIN_MM = 1.0;

    /** What a figure measures. */
    public enum Kind {
        HARMONIC_MEAN_LIFETIME, MEDIAN_LIFETIME, LIFETIME_PERCENTILE, TRAP_DENSITY_PERCENTILE,
        FLAGGED_AREA_FRACTION, LARGEST_REGION, LARGEST_INTERIOR_REGION, EDGE_TO_CENTRE_RATIO,
        BELOW_LIMIT_AREA_FRACTION, INVALID_AREA_FRACTION, EXCEEDANCE_AREA_FRACTION, BEST_DEFECT_AREA_FRACTION,
        NO_SINGLE_DEFECT_AREA_FRACTION
    }

    /** The name of the figure {@link Kind#BEST_DEFECT_AREA_FRACTION}. */
    public static final String BEST_DEFECT_AREA_FRACTION = "best_defect_area_fraction";
    /** The name of the figure {@link Kind#NO_SINGLE_DEFECT_AREA_FRACTION}. */
    public static final String NO_SINGLE_DEFECT_AREA_FRACTION = "no_single_defect_area_fraction";

    /** The name of the figure {@link Kind#INVALID_AREA_FRACTION}. */
    public static final String INVALID_AREA_FRACTION = "invalid_area_fraction";

    private static final Pattern LIFETIME_P = Pattern.compile("p(\\d{1,2}(?:\\.\\d+)?)_lifetime_us");
    private static final Pattern DENSITY_P = Pattern.compile("trap_density_p(\\d{1,2}(?:\\.\\d+)?)_cm3");
    private static final Pattern EXCEEDANCE_C = Pattern.compile("exceedance_area_fraction_c(\\d{1,3}(?:\\.\\d+)?)");

    /** The figure of a name; IllegalArgumentException listing the names when unknown. */
    public static Figure parse(String name) {
        switch (name) {
            case "harmonic_mean_lifetime_us": return new Figure(name, Kind.HARMONIC_MEAN_LIFETIME, Double.NaN);
            case "median_lifetime_us": return new Figure(name, Kind.MEDIAN_LIFETIME, Double.NaN);
            case "flagged_area_fraction": return new Figure(name, Kind.FLAGGED_AREA_FRACTION, Double.NaN);
            case "largest_region_mm2": return new Figure(name, Kind.LARGEST_REGION, Double.NaN);
            case "largest_interior_region_mm2": return new Figure(name, Kind.LARGEST_INTERIOR_REGION, Double.NaN);
            case "edge_to_centre_ratio": return new Figure(name, Kind.EDGE_TO_CENTRE_RATIO, Double.NaN);
            case "below_limit_area_fraction": return new Figure(name, Kind.BELOW_LIMIT_AREA_FRACTION, Double.NaN);
            case INVALID_AREA_FRACTION: return new Figure(name, Kind.INVALID_AREA_FRACTION, Double.NaN);
            case BEST_DEFECT_AREA_FRACTION: return new Figure(name, Kind.BEST_DEFECT_AREA_FRACTION, Double.NaN);
            case NO_SINGLE_DEFECT_AREA_FRACTION:
                return new Figure(name, Kind.NO_SINGLE_DEFECT_AREA_FRACTION, Double.NaN);
            default: break;
        }
        Matcher m = LIFETIME_P.matcher(name);
        if (m.matches()) {
            return new Figure(name, Kind.LIFETIME_PERCENTILE, percent(m.group(1), name));
        }
        m = DENSITY_P.matcher(name);
        if (m.matches()) {
            return new Figure(name, Kind.TRAP_DENSITY_PERCENTILE, percent(m.group(1), name));
        }
        m = EXCEEDANCE_C.matcher(name);
        if (m.matches()) {
            double c = Double.parseDouble(m.group(1));
            if (!(c > 0 && c <= 100)) {
                throw new IllegalArgumentException("confidence of " + name + " must be in (0, 100] per cent");
            }
            return new Figure(name, Kind.EXCEEDANCE_AREA_FRACTION, c);
        }
        throw new IllegalArgumentException("unknown figure; expected harmonic_mean_lifetime_us, median_lifetime_us,"
                + " pNN_lifetime_us, trap_density_pNN_cm3, flagged_area_fraction, largest_region_mm2,"
                + " largest_interior_region_mm2, edge_to_centre_ratio, below_limit_area_fraction,"
                + " exceedance_area_fraction_cNN, invalid_area_fraction, best_defect_area_fraction or"
                + " no_single_defect_area_fraction (the last two with a profile's stack)");
    }

    private static double percent(String digits, String name) {
        double p = Double.parseDouble(digits);
        if (!(p > 0 && p < 100)) {
            throw new IllegalArgumentException("percentile of " + name + " must be in (0, 100)");
        }
        return p;
    }

    /**
     * The figure's value as the results tables write it ({@link NumberText}): quantiles of the lifetime and
     * trap-density maps at the maps' float precision, areas rounded to {@link NumberText#AREA_RESOLUTION_MM2}, means,
     * fractions and ratios as the shortest text of the double; "" when not finite.
     */
    public String text(double value) {
        return switch (kind) {
            case MEDIAN_LIFETIME, LIFETIME_PERCENTILE, TRAP_DENSITY_PERCENTILE -> NumberText.sample(value);
            case LARGEST_REGION, LARGEST_INTERIOR_REGION -> NumberText.mm2(value);
            default -> NumberText.of(value);
        };
    }

    /** True when the figure is computed from the trap-density map. */
    public boolean needsTrapDensity() {
        return kind == Kind.TRAP_DENSITY_PERCENTILE || kind == Kind.BELOW_LIMIT_AREA_FRACTION
                || kind == Kind.EXCEEDANCE_AREA_FRACTION;
    }

    /** True when the figure comes from the defect identification of an injection stack (a profile's stack). */
    public boolean needsStack() {
        return kind == Kind.BEST_DEFECT_AREA_FRACTION || kind == Kind.NO_SINGLE_DEFECT_AREA_FRACTION;
    }

    /** The unit of the figure's values ("" for ratios). */
    public String unit() {
        return switch (kind) {
            case HARMONIC_MEAN_LIFETIME, MEDIAN_LIFETIME, LIFETIME_PERCENTILE -> "us";
            case TRAP_DENSITY_PERCENTILE -> "cm^-3";
            case LARGEST_REGION, LARGEST_INTERIOR_REGION -> "mm²";
            default -> "";
        };
    }

    /**
     * The figure as a reader names it, with its unit, for reports and charts: "harmonic-mean lifetime (µs)",
     * "trap density P95 (cm⁻³)", "largest interior region (mm²)", "flagged area fraction". The results' columns
     * keep {@link #name}.
     */
    public String label() {
        String u = switch (kind) {
            case HARMONIC_MEAN_LIFETIME, MEDIAN_LIFETIME, LIFETIME_PERCENTILE -> "µs";
            case TRAP_DENSITY_PERCENTILE -> "cm⁻³";
            case LARGEST_REGION, LARGEST_INTERIOR_REGION -> "mm²";
            default -> "";
        };
        return u.isEmpty() ? what() : what() + " (" + u + ")";
    }

    /** {@link #label} without the unit: "largest interior region", for text that gives the unit with the value. */
    public String what() {
        String pct = Double.isNaN(percent) ? "" : "P" + new java.math.BigDecimal(Double.toString(percent))
                .stripTrailingZeros().toPlainString();
        return switch (kind) {
            case HARMONIC_MEAN_LIFETIME -> "harmonic-mean lifetime";
            case MEDIAN_LIFETIME -> "median lifetime";
            case LIFETIME_PERCENTILE -> "lifetime " + pct;
            case TRAP_DENSITY_PERCENTILE -> "trap density " + pct;
            case FLAGGED_AREA_FRACTION -> "flagged area fraction";
            case LARGEST_REGION -> "largest region";
            case LARGEST_INTERIOR_REGION -> "largest interior region";
            case EDGE_TO_CENTRE_RATIO -> "edge-to-centre lifetime ratio";
            case BELOW_LIMIT_AREA_FRACTION -> "below-limit area fraction";
            case INVALID_AREA_FRACTION -> "invalid area fraction";
            case EXCEEDANCE_AREA_FRACTION -> "area fraction exceeding the flag threshold with "
                    + new java.math.BigDecimal(Double.toString(percent)).stripTrailingZeros().toPlainString()
                    + " % confidence";
            case BEST_DEFECT_AREA_FRACTION -> "best-defect area fraction";
            case NO_SINGLE_DEFECT_AREA_FRACTION -> "no-single-defect area fraction";
        };
    }

    /** {@link #label} of a figure's name; the name itself when it names no figure. */
    public static String labelOf(String name) {
        try {
            return parse(name).label();
        } catch (IllegalArgumentException e) {
            return name;
        }
    }

    /**
     * A failed rule as stored in the results ("largest_interior_region_mm2", or the name followed by a reason) with
     * the figure's name read as {@link #what}: "largest interior region".
     */
    public static String readable(String failedRule) {
        int space = failedRule.indexOf(' ');
        String head = space < 0 ? failedRule : failedRule.substring(0, space);
        try {
            return parse(head).what() + (space < 0 ? "" : failedRule.substring(space));
        } catch (IllegalArgumentException e) {
            return failedRule;
        }
    }

    @Override
    public String toString() {
        return name.toLowerCase(Locale.ROOT);
    }

    /*
     * equals and hashCode written out with the generated record semantics (name and kind by equals, percent with
     * Double.compare; hash = 31 * hash + hash of each component in order), so that a batch does not spin the method
     * handles of java.lang.runtime.ObjectMethods for them at run time. RecordMethodsTest checks the sameness.
     */
    @Override
    public boolean equals(Object o) {
        return o == this || o instanceof Figure f && Objects.equals(name, f.name) && kind == f.kind
                && Double.compare(percent, f.percent) == 0;
    }

    @Override
    public int hashCode() {
        int h = Objects.hashCode(name);
        h = 31 * h + Objects.hashCode(kind);
        return 31 * h + Double.hashCode(percent);
    }
}
