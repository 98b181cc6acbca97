/**
 * PDF reports written with PDFBox, headless: {@link trapmap.viewer.report.WaferReport} (one A4 page per wafer) and
 * {@link trapmap.viewer.report.BatchReport} (the summary of a batch inspection, written by {@code trapmap inspect}).
 * The batch summary reads the batch folder into a {@link trapmap.viewer.report.BatchContent}
 * ({@code BatchFolder}) and draws it section by section (summary, profiles, wafer table, failed wafers,
 * recurrence, errors) down the pages of a {@code ReportFlow}. Charts and maps are embedded as pictures at twice the
 * page resolution; text uses the standard PDF fonts. Nothing here uses the desktop viewer's {@code trapmap.viewer.ui}
 * packages: shared styling lives in {@code trapmap.viewer.graphics}.
 */
package trapmap.viewer.report;
