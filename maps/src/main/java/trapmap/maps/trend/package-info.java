/**
 * Control charts over time from stored wafer results, pure computation (no files, no pictures): the individuals and
 * moving-range chart and the X̄ and R chart by subgroup with the centre line and 3σ limits from a baseline period
 * (Montgomery, <i>Introduction to Statistical Quality Control</i>, ch. 6), the run rules of the Western Electric
 * <i>Statistical Quality Control Handbook</i> (1956) and the trend rule of Nelson (J. Qual. Technol. 16, 237 (1984)),
 * the yield per group and the Pareto of failed rules. Entry point: {@link trapmap.maps.trend.TrendAnalysis}.
 */
package trapmap.maps.trend;
