/**
 * Statistics of a map over a mask: means (arithmetic, harmonic, geometric), percentiles, extremes, spread and area
 * fractions beyond thresholds ({@link trapmap.maps.stats.MapStatistics}), and linear or logarithmic histograms
 * ({@link trapmap.maps.stats.Histogram}). NaN ("no data") is never counted.
 */
package trapmap.maps.stats;
