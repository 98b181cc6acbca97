package trapmap.viewer.report;

import java.awt.image.BufferedImage;
import java.io.Closeable;
import java.io.IOException;
import java.util.ArrayList;
import java.util.List;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.pdmodel.font.PDFont;

/**
 * Text, tables and pictures laid out down the pages of a document: a cursor moves down the current {@link PdfPage}
 * and a new page is started (with the part's title and "continued") when the next block does not fit. Tables wrap
 * their cells and repeat their header on each page, so that no row is cut or left out.
 */
final class ReportFlow implements Closeable {
    static final float LEFT = PdfPage.MARGIN;
    /** Most lines of one table cell; a longer cell ends in dots. */
    static final int MAX_CELL_LINES = 6;
    static final float FULL = PdfPage.WIDTH - 2 * PdfPage.MARGIN;
    /** Lowest point a block may reach (the footer sits below). */
    static final float BOTTOM = PdfPage.HEIGHT - PdfPage.MARGIN;

    private final PDDocument doc;
    /** The page that the flow's pages go before, null: after the last. */
    private final org.apache.pdfbox.pdmodel.PDPage before;
    private PdfPage page;
    private float y;
    private String title = "";

    ReportFlow(PDDocument doc) {
        this(doc, null);
    }

    /** A flow whose pages go before {@code before}, a page of {@code doc} (null: after the last page). */
    ReportFlow(PDDocument doc, org.apache.pdfbox.pdmodel.PDPage before) {
        this.doc = doc;
        this.before = before;
    }

    PdfPage page() throws IOException {
        if (page == null) {
            newPage();
        }
        return page;
    }

    float y() {
        return y;
    }

    void down(float dy) {
        y += dy;
    }

    /** Room left on the current page, points. */
    float room() {
        return page == null ? 0 : BOTTOM - y;
    }

    void newPage() throws IOException {
        close();
        page = new PdfPage(doc, before);
        y = PdfPage.MARGIN;
    }

    /** Starts a part on a new page with its title; pages it runs onto repeat the title with "(continued)". */
    void part(String partTitle) throws IOException {
        newPage();
        title = partTitle;
        page.text(partTitle, LEFT, y, PdfPage.BOLD, 14);
        y += 22;
    }

    /**
     * Starts a part below what is on the page when at least {@code keep} points are left under its title, else on a
     * new page; pages it runs onto repeat the title with "(continued)".
     */
    void section(String partTitle, float keep) throws IOException {
        if (page == null || y + 30 + keep > BOTTOM) {
            part(partTitle);
            return;
        }
        y += 10;
        title = partTitle;
        page.text(partTitle, LEFT, y, PdfPage.BOLD, 14);
        y += 22;
    }

    /** Makes sure {@code h} points fit below the cursor; returns true when a new page was started for it. */
    boolean need(float h) throws IOException {
        if (page != null && y + h <= BOTTOM) {
            return false;
        }
        newPage();
        if (!title.isEmpty()) {
            page.text(title + " (continued)", LEFT, y, PdfPage.BOLD, 12);
            y += 20;
        }
        return true;
    }

    /** Room of a page the flow runs onto, below its "(continued)" title, points. */
    float pageRoom() {
        return BOTTOM - PdfPage.MARGIN - (title.isEmpty() ? 0 : 20);
    }

    /**
     * Keeps a block of {@code h} points together: starts a new page for it when it does not fit the rest of this one
     * but fits a page; a block taller than a page starts where it is. Returns true when a new page was started.
     */
    boolean keep(float h) throws IOException {
        return h <= pageRoom() && need(h);
    }

    /** The height {@link #paragraph(String, PDFont, float)} of {@code s} takes, points. */
    float paragraphHeight(String s, PDFont font, float size) {
        return PdfPage.wrap(s, font, size, FULL).size() * size * 1.3f + 3;
    }

    /** The height {@link #table(float[], boolean[], String[], List, float)} of these rows takes on one page, points. */
    static float tableHeight(float[] widths, String[] header, List<String[]> rows, float size) {
        float leading = size * 1.3f;
        float h = height(wrapRow(header, widths, PdfPage.BOLD, size)) * leading + 4;
        for (String[] row : rows) {
            h += height(wrapRow(row, widths, PdfPage.REGULAR, size)) * leading + 2;
        }
        return h + 4;
    }

    /** A section heading with a rule, kept together with at least {@code keep} points of what follows. */
    void heading(String s, float keep) throws IOException {
        need(22 + keep);
        page.heading(s, LEFT, y, FULL);
        y += 20;
    }

    /** A wrapped paragraph across the page, broken over pages line by line when long. */
    void paragraph(String s, PDFont font, float size) throws IOException {
        paragraph(s, LEFT, FULL, font, size);
    }

    void paragraph(String s, float x, float width, PDFont font, float size) throws IOException {
        float leading = size * 1.3f;
        for (String line : PdfPage.wrap(s, font, size, width)) {
            need(leading);
            page.text(line, x, y, font, size);
            y += leading;
        }
        y += 3;
    }

    /** A picture of {@code w} × {@code h} points at {@code x}, on this page when it fits; the cursor stays. */
    void image(BufferedImage img, float x, float w, float h) throws IOException {
        need(h);
        page.image(img, x, y, w, h);
    }

    /** The caution box across the page. */
    void caution(String text) throws IOException {
        need(PdfPage.cautionHeight(text, FULL) + 4);
        y += page.caution(text, LEFT, y, FULL) + 8;
    }

    /**
     * A table across pages: a bold header with a rule (repeated on each page), cells wrapped within their column
     * (a word longer than its column is cut with dots), a light rule between rows. A table that fits on one page is
     * kept on one ({@link #keep}): it starts on a new page when it does not fit the rest of this one.
     */
    void table(float[] widths, boolean[] right, String[] header, List<String[]> rows, float size) throws IOException {
        keep(tableHeight(widths, header, rows, size));
        Table t = table(widths, right, header, size);
        for (String[] row : rows) {
            t.row(row);
        }
        t.end();
    }

    /** A {@linkplain #table(float[], boolean[], String[], List, float) table} drawn row by row: rows, then the end. */
    Table table(float[] widths, boolean[] right, String[] header, float size) {
        return new Table(widths, right, header, size);
    }

    /** A table being drawn down the flow, one row at a time ({@link #table(float[], boolean[], String[], float)}). */
    final class Table {
        private final float[] widths;
        private final boolean[] right;
        private final float size;
        private final float leading;
        private final float total;
        private final List<List<String>> head;
        private final float headH;
        private int rows;

        private Table(float[] widths, boolean[] right, String[] header, float size) {
            this.widths = widths.clone();
            this.right = right == null ? null : right.clone();
            this.size = size;
            this.leading = size * 1.3f;
            float sum = 0;
            for (float w : widths) {
                sum += w;
            }
            this.total = sum;
            this.head = wrapRow(header, widths, PdfPage.BOLD, size);
            this.headH = height(head) * leading + 4;
        }

        /** The next row; the header goes above the first row and is repeated on each page the table runs onto. */
        void row(String[] row) throws IOException {
            List<List<String>> cells = wrapRow(row, widths, PdfPage.REGULAR, size);
            float rowH = height(cells) * leading + 2;
            if (rows == 0) {
                need(headH + rowH);
                header(head, widths, right, size, leading, total);
            } else if (need(rowH)) {
                header(head, widths, right, size, leading, total);
            }
            drawRow(cells, widths, right, PdfPage.REGULAR, size, leading);
            y += height(cells) * leading;
            page.line(LEFT, y + 0.5f, LEFT + total, y + 0.5f, PdfPage.LIGHT_RULE, 0.3f);
            y += 2;
            rows++;
        }

        /** After the last row (a table without rows is its header alone). */
        void end() throws IOException {
            if (rows == 0) {
                need(headH);
                header(head, widths, right, size, leading, total);
            }
            y += 4;
        }
    }

    private void header(List<List<String>> head, float[] widths, boolean[] right, float size, float leading,
                        float total) throws IOException {
        drawRow(head, widths, right, PdfPage.BOLD, size, leading);
        y += height(head) * leading + 1;
        page.line(LEFT, y, LEFT + total, y, PdfPage.RULE, 0.6f);
        y += 3;
    }

    private static List<List<String>> wrapRow(String[] row, float[] widths, PDFont font, float size) {
        List<List<String>> out = new ArrayList<>();
        for (int c = 0; c < widths.length; c++) {
            String cell = c < row.length && row[c] != null ? row[c] : "";
            List<String> lines = new ArrayList<>();
            for (String l : PdfPage.wrap(cell, font, size, widths[c] - 4, MAX_CELL_LINES)) {
                lines.add(PdfPage.fit(l, font, size, widths[c] - 4));
            }
            out.add(lines);
        }
        return out;
    }

    private static int height(List<List<String>> row) {
        int h = 1;
        for (List<String> c : row) {
            h = Math.max(h, c.size());
        }
        return h;
    }

    private void drawRow(List<List<String>> row, float[] widths, boolean[] right, PDFont font, float size,
                         float leading) throws IOException {
        float x = LEFT;
        for (int c = 0; c < widths.length; c++) {
            List<String> lines = row.get(c);
            for (int i = 0; i < lines.size(); i++) {
                if (right != null && right[c]) {
                    page.textRight(lines.get(i), x + widths[c] - 4, y + i * leading, font, size);
                } else {
                    page.text(lines.get(i), x, y + i * leading, font, size);
                }
            }
            x += widths[c];
        }
    }

    @Override
    public void close() throws IOException {
        if (page != null) {
            page.close();
            page = null;
        }
    }
}
