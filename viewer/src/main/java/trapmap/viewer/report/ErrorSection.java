package trapmap.viewer.report;

import java.io.IOException;
import java.util.List;

/** The files that could not be inspected, with their reasons. */
final class ErrorSection {
    private ErrorSection() {
    }

    static void draw(ReportFlow flow, BatchContent c) throws IOException {
        List<BatchContent.Row> errors = c.rows().stream().filter(r -> !r.inspected()).toList();
        if (errors.isEmpty()) {
            return;
        }
        flow.part("Files not inspected (" + errors.size() + ")");
        for (BatchContent.Row r : errors) {
            flow.need(30);
            flow.paragraph(r.file(), PdfPage.BOLD, 8.5f);
            flow.paragraph(r.error().isEmpty() ? "no reason given" : r.error(), ReportFlow.LEFT + 12,
                    ReportFlow.FULL - 12, PdfPage.REGULAR, 8);
        }
    }
}
