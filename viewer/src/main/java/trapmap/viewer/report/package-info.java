/**
 * PDF reports written with PDFBox, headless: {@link trapmap.viewer.report.WaferReport} (one A4 page per wafer) and
 * {@link trapmap.viewer.report.BatchReport} (the summary of a batch inspection, written by {@code trapmap inspect}).
 * Charts and maps are embedded as pictures at twice the page resolution; text uses the standard PDF fonts.
 */
package trapmap.viewer.report;
