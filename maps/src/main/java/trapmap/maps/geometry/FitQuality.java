package trapmap.maps.geometry;

/**
 * How well a fitted outline explains the valid data of a map.
 *
 * @param model            which model was fitted
 * @param rmsResidualMm    root-mean-square distance of the inlier edge points from the fitted outline, mm
 * @param inlierFraction   fraction of edge points within max(3σ, one pixel) of the outline (σ from the median
 *                         absolute deviation); chips, cracks and unmodelled marks lower it
 * @param mismatchFraction pixels where data and outline disagree (valid but outside, or inside but without data),
 *                         as a fraction of the valid pixels: the criterion that picks the model
 * @param edgePoints       number of edge points the fit used
 */
public record FitQuality(OutlineFit.Model model, double rmsResidualMm, double inlierFraction,
                         double mismatchFraction, int edgePoints) {
}
