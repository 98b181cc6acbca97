/**
 * Charts of the viewer, each a panel around a JFreeChart {@code ChartPanel} with a {@code show(…)} method and a
 * static {@code createChart(…)} that works headless (for PNG export through {@link
 * trapmap.viewer.graphics.ChartExport}): histogram with statistics, line and radial profiles, and the injection
 * dependence of a probed pixel's lifetimes. Computations that may be heavy ({@link
 * trapmap.viewer.graphics.HistogramChart#compute}, {@link trapmap.maps.process.PixelInjection#sweep}) are separate
 * from the Swing parts so that they can run on a worker thread. The chart styling, labels, picture export and the
 * histogram chart shared with the PDF reports are in {@code trapmap.viewer.graphics}.
 */
package trapmap.viewer.ui.charts;
