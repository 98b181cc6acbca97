/**
 * Picture and chart styling shared by the desktop viewer ({@code trapmap.viewer.ui}) and the headless PDF reports
 * ({@code trapmap.viewer.report}): colour styles of maps ({@link trapmap.viewer.graphics.DisplayStyle},
 * {@link trapmap.viewer.graphics.AutoStyle}), chart look and axes ({@link trapmap.viewer.graphics.ChartStyle}),
 * numbers and units as printed ({@link trapmap.viewer.graphics.Labels}), off-screen chart pictures
 * ({@link trapmap.viewer.graphics.ChartExport}) and the histogram chart ({@link trapmap.viewer.graphics.HistogramChart}).
 * No Swing: both sides use it, and it uses neither ({@code ArchitectureTest}).
 */
package trapmap.viewer.graphics;
