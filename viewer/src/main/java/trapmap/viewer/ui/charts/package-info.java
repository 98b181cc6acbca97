/**
 * Charts of the viewer, each a panel around a JFreeChart {@code ChartPanel} with a {@code show(…)} method and a
 * static {@code createChart(…)} that works headless (for reports and PNG export through {@link
 * trapmap.viewer.ui.charts.ChartExport}): histogram with statistics, line and radial profiles, and the injection
 * dependence of a probed pixel's lifetimes. Computations that may be heavy ({@link
 * trapmap.viewer.ui.charts.HistogramView#compute}, {@link trapmap.maps.process.PixelInjection#sweep}) are separate
 * from the Swing parts so that they can run on a worker thread.
 */
package trapmap.viewer.ui.charts;
