package trapmap.viewer.model;

import trapmap.shared.check.Checks;

/**
 * Everything the user chooses about how the open wafers are analysed and shown; one immutable value, so that the
 * undo history is a list of them.
 *
 * @param conditions      conditions that replace the sidecars' values
 * @param defectId        defect for conversions (library or user-defined id), or null for none
 * @param quantity        what the map view shows
 * @param display         colour map and range
 * @param threshold       flag rule, in {@code quantity}'s unit
 * @param line            line-profile line, or null
 * @param edgeExclusionMm band along the fitted wafer edge left out of statistics and regions, mm
 * @param exceedance      uncertainty, threshold N*, samples and seed of the probability of exceeding N*
 */
public record Analysis(ConditionOverrides conditions, String defectId, DisplayedQuantity quantity,
                       DisplaySettings display, ThresholdRule threshold, ProfileLine line, double edgeExclusionMm,
                       ExceedanceSettings exceedance) {
    /** Sidecar conditions, interstitial iron, effective lifetime, 20 µs below, 2 mm edge exclusion. */
    public static final Analysis DEFAULT = new Analysis(ConditionOverrides.NONE, "fe-i", DisplayedQuantity.LIFETIME,
            DisplaySettings.DEFAULT, ThresholdRule.defaultFor(DisplayedQuantity.LIFETIME), null, 2, ExceedanceSettings.DEFAULT);

    public Analysis {
        Checks.notNull(conditions, "conditions");
        Checks.notNull(quantity, "quantity");
        Checks.notNull(display, "display");
        Checks.notNull(threshold, "threshold");
        Checks.notNull(exceedance, "exceedance settings");
        Checks.inRange(edgeExclusionMm, 0, 50, "edge exclusion", "mm");
        if (quantity.needsDefect() && defectId == null) {
            throw new IllegalArgumentException("showing the " + quantity.label() + " needs a defect");
        }
    }

    /** An analysis with the default exceedance settings. */
    public Analysis(ConditionOverrides conditions, String defectId, DisplayedQuantity quantity,
                    DisplaySettings display, ThresholdRule threshold, ProfileLine line, double edgeExclusionMm) {
        this(conditions, defectId, quantity, display, threshold, line, edgeExclusionMm, ExceedanceSettings.DEFAULT);
    }

    public Analysis withExceedance(ExceedanceSettings e) {
        return new Analysis(conditions, defectId, quantity, display, threshold, line, edgeExclusionMm, e);
    }

    public Analysis withConditions(ConditionOverrides c) {
        return new Analysis(c, defectId, quantity, display, threshold, line, edgeExclusionMm, exceedance);
    }

    public Analysis withDefect(String id) {
        return new Analysis(conditions, id, quantity, display, threshold, line, edgeExclusionMm, exceedance);
    }

    /**
     * Shows another quantity: the threshold moves to that quantity's default (a value in µs means nothing in cm⁻³)
     * and the colour scale to its natural one.
     */
    public Analysis withQuantity(DisplayedQuantity q) {
        if (q == quantity) {
            return this;
        }
        ThresholdRule t = ThresholdRule.defaultFor(q).withMinArea(threshold.minAreaMm2())
                .withMaxFraction(threshold.maxFlaggedFraction());
        return new Analysis(conditions, defectId, q, display.withLogarithmic(q.logarithmic()).withAutoRange(
                display.lowPercent(), display.highPercent()), t, line, edgeExclusionMm, exceedance);
    }

    public Analysis withDisplay(DisplaySettings d) {
        return new Analysis(conditions, defectId, quantity, d, threshold, line, edgeExclusionMm, exceedance);
    }

    public Analysis withThreshold(ThresholdRule t) {
        return new Analysis(conditions, defectId, quantity, display, t, line, edgeExclusionMm, exceedance);
    }

    public Analysis withLine(ProfileLine l) {
        return new Analysis(conditions, defectId, quantity, display, threshold, l, edgeExclusionMm, exceedance);
    }

    public Analysis withEdgeExclusion(double mm) {
        return new Analysis(conditions, defectId, quantity, display, threshold, line, mm, exceedance);
    }

    /** True when {@code other} needs the same conversion (conditions and defect). */
    boolean sameConversion(Analysis other) {
        return other != null && conditions.equals(other.conditions) && java.util.Objects.equals(defectId,
                other.defectId);
    }

    /** True when {@code other} gives the same statistics, flags and regions (the display and line aside). */
    boolean sameResults(Analysis other) {
        return sameConversion(other) && quantity == other.quantity && threshold.equals(other.threshold)
                && edgeExclusionMm == other.edgeExclusionMm && exceedance.equals(other.exceedance);
    }
}
