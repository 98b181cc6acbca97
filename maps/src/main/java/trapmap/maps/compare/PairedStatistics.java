package trapmap.maps.compare;

import trapmap.maps.model.Quantity;

/**
 * Pixel-by-pixel statistics of a before and an after map of one wafer on one grid. Differences and harmonic means
 * are in {@code unit} (the maps' unit); ratios, changes, fractions and reductions are dimensionless. Ratio-type
 * figures (ratios, harmonic means, the improved/unchanged/degraded classification, the reduction) are taken over
 * the pixels where both samples are positive: a zero or negative lifetime or density has no meaningful ratio.
 *
 * @param quantity           quantity of both maps
 * @param unit               unit of the differences and harmonic means ({@code ""} when dimensionless)
 * @param improvement        which way counts as better
 * @param relativeTolerance  |after − before| / before up to which a pixel counts as unchanged (0.05 = ±5 %)
 * @param count              pixels with data in both maps (in the region)
 * @param meanDifference     mean of after − before, in {@code unit}
 * @param medianDifference   median of after − before, in {@code unit}
 * @param positiveCount      pixels of {@code count} where both samples are positive
 * @param meanRatio          mean of after / before
 * @param medianRatio        median of after / before
 * @param harmonicMeanBefore positiveCount / Σ(1/before), in {@code unit}: the device-relevant average lifetime
 * @param harmonicMeanAfter  positiveCount / Σ(1/after), in {@code unit}
 * @param improvedFraction   share of the positive pixels that changed by more than the tolerance the better way
 * @param unchangedFraction  share of the positive pixels within ±tolerance
 * @param degradedFraction   share of the positive pixels that changed by more than the tolerance the worse way
 * @param medianReduction    median of 1 − after/before (gettering efficiency) for density quantities, else NaN
 */
public record PairedStatistics(Quantity quantity, String unit, Improvement improvement, double relativeTolerance,
                               int count, double meanDifference, double medianDifference, int positiveCount,
                               double meanRatio, double medianRatio, double harmonicMeanBefore,
                               double harmonicMeanAfter, double improvedFraction, double unchangedFraction,
                               double degradedFraction, double medianReduction) {

    /** Change of the harmonic mean, after − before, in {@code unit}. */
    public double harmonicMeanChange() {
        return harmonicMeanAfter - harmonicMeanBefore;
    }
}
