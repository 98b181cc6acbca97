package trapmap.maps.geometry;

/**
 * The standard format nearest to a measured or fitted outline.
 *
 * @param format          the nearest format
 * @param deviationMm     largest deviation of a compared dimension (diameter; or side and diagonal), mm
 * @param withinTolerance true when every compared dimension lies inside the format's tolerance
 */
public record FormatMatch(WaferFormat format, double deviationMm, boolean withinTolerance) {
}
