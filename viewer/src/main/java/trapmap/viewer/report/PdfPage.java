package trapmap.viewer.report;

import java.awt.Color;
import java.awt.image.BufferedImage;
import java.awt.image.WritableRaster;
import java.io.ByteArrayInputStream;
import java.io.ByteArrayOutputStream;
import java.io.Closeable;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.WeakHashMap;
import java.util.concurrent.ConcurrentHashMap;
import java.util.zip.Deflater;
import java.util.zip.DeflaterOutputStream;
import org.apache.fontbox.ttf.TTFParser;
import org.apache.fontbox.ttf.TrueTypeFont;
import org.apache.pdfbox.cos.COSName;
import org.apache.pdfbox.io.RandomAccessReadBuffer;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.pdmodel.PDPage;
import org.apache.pdfbox.pdmodel.PDPageContentStream;
import org.apache.pdfbox.pdmodel.common.PDRectangle;
import org.apache.pdfbox.pdmodel.font.PDFont;
import org.apache.pdfbox.pdmodel.font.PDType0Font;
import org.apache.pdfbox.pdmodel.graphics.color.PDDeviceRGB;
import org.apache.pdfbox.pdmodel.graphics.image.LosslessFactory;
import org.apache.pdfbox.pdmodel.graphics.image.PDImageXObject;

/**
 * One A4 page being drawn, with coordinates in points from the top-left corner (PDF's own origin is bottom-left).
 * Text is set in DejaVu Sans Condensed (regular and bold, bundled under {@code trapmap/viewer/report/fonts} with its
 * licence), embedded as a subset in every document, so that units and symbols print as written: cm⁻³, Ω·cm, Δn, σₙ,
 * τ, mm², µs. {@link #REGULAR} and {@link #BOLD} measure text; each document draws with its own loaded copy of the
 * same face ({@link #fontsOf}).
 */
final class PdfPage implements Closeable {
    /**
     * PDFBox reports through java.util.logging that it builds a font cache; that does not matter for writing, and
     * the command line's stderr is for progress. Held here so the setting stays (loggers are weakly referenced).
     */
    private static final java.util.logging.Logger PDFBOX_LOG = quiet();

    static final float WIDTH = PDRectangle.A4.getWidth();
    static final float HEIGHT = PDRectangle.A4.getHeight();
    static final float MARGIN = 36;
    private static final String REGULAR_FILE = "fonts/DejaVuSansCondensed.ttf";
    private static final String BOLD_FILE = "fonts/DejaVuSansCondensed-Bold.ttf";
    private static final byte[] REGULAR_TTF = resource(REGULAR_FILE);
    private static final byte[] BOLD_TTF = resource(BOLD_FILE);
    /** Measures regular text (not drawn with: each document embeds its own copy, see {@link #fontsOf}). */
    static final PDFont REGULAR = measuring(REGULAR_TTF, REGULAR_FILE);
    /** Measures bold text. */
    static final PDFont BOLD = measuring(BOLD_TTF, BOLD_FILE);
    static final Color INK = new Color(0x222222);
    static final Color MUTED = new Color(0x666666);
    static final Color RULE = new Color(0xBBBBBB);
    static final Color LIGHT_RULE = new Color(0xE2E2E2);

    /** The regular and bold face loaded into each open document (subset-embedded when it is saved). */
    private static final Map<PDDocument, PDFont[]> DOCUMENT_FONTS = new WeakHashMap<>();
    /** Whether the face has a glyph for a code point beyond the basic plane, by code point. */
    private static final Map<Integer, Boolean> HAS_GLYPH = new ConcurrentHashMap<>();
    private static final byte GLYPH_UNKNOWN = 0;
    private static final byte GLYPH_YES = 1;
    private static final byte GLYPH_NO = 2;
    /**
     * Whether both faces have a glyph for a character of the basic plane, by character: unknown until asked; control
     * characters and surrogates stay unknown ({@link #clean} replaces them).
     */
    private static final byte[] BMP_GLYPH = new byte[Character.MAX_VALUE + 1];
    /** Advance widths of the basic plane's characters in {@link #REGULAR} and {@link #BOLD}, NaN until measured. */
    private static final float[] REGULAR_ADVANCE = unmeasured();
    private static final float[] BOLD_ADVANCE = unmeasured();

    private final PDDocument doc;
    /** The page drawn on, null for a page that only measures. */
    private final PDPage pdPage;
    private final PDPageContentStream cs;
    private final PDFont regular;
    private final PDFont bold;

    private static float[] unmeasured() {
        float[] a = new float[Character.MAX_VALUE + 1];
        java.util.Arrays.fill(a, Float.NaN);
        return a;
    }

    private static java.util.logging.Logger quiet() {
        java.util.logging.Logger l = java.util.logging.Logger.getLogger("org.apache.pdfbox");
        l.setLevel(java.util.logging.Level.SEVERE);
        return l;
    }

    private static byte[] resource(String name) {
        try (InputStream in = PdfPage.class.getResourceAsStream(name)) {
            if (in == null) {
                throw new IllegalStateException("font " + name + " missing from the application's resources");
            }
            return in.readAllBytes();
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read font " + name, e);
        }
    }

    /**
     * The face parsed with glyph substitution off: the text is drawn character by character, so "fl" and "fi" stay
     * two letters (no ligature glyphs) and the file's text reads back exactly as written.
     */
    private static TrueTypeFont face(byte[] ttf) throws IOException {
        TrueTypeFont font = new TTFParser().parse(new RandomAccessReadBuffer(ttf));
        font.setEnableGsub(false);
        return font;
    }

    /**
     * A copy of the face for measuring only: loaded into a document that is never saved, as a subset (as the
     * documents' faces are), so that nothing is embedded. Loaded for full embedding instead, PDFBox would compress
     * the whole font file and map every glyph back to Unicode at once (about 90 ms of CPU for the two faces, at the
     * first report of a run); the widths and encodings are the same either way (the face's own tables).
     */
    private static PDFont measuring(byte[] ttf, String name) {
        try {
            return PDType0Font.load(new PDDocument(), face(ttf), true);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot load font " + name, e);
        }
    }

    /**
     * The regular and bold face of {@code doc}, loaded on first use with subset embedding (only the glyphs used go
     * into the file).
     */
    static PDFont[] fontsOf(PDDocument doc) throws IOException {
        synchronized (DOCUMENT_FONTS) {
            PDFont[] f = DOCUMENT_FONTS.get(doc);
            if (f == null) {
                f = new PDFont[] {PDType0Font.load(doc, face(REGULAR_TTF), true),
                    PDType0Font.load(doc, face(BOLD_TTF), true)};
                DOCUMENT_FONTS.put(doc, f);
            }
            return f;
        }
    }

    PdfPage(PDDocument doc) throws IOException {
        this(doc, null);
    }

    /** A new page of {@code doc} placed before {@code before} (null: after the last page). */
    PdfPage(PDDocument doc, PDPage before) throws IOException {
        this.doc = doc;
        PDPage page = new PDPage(PDRectangle.A4);
        if (before == null) {
            doc.addPage(page);
        } else {
            doc.getPages().insertBefore(page, before);
        }
        this.pdPage = page;
        this.cs = new PDPageContentStream(doc, page);
        PDFont[] fonts = fontsOf(doc);
        this.regular = fonts[0];
        this.bold = fonts[1];
    }

    /** A page that draws nothing and measures as a real one: to lay out a part before drawing it. */
    private PdfPage() {
        this.doc = null;
        this.pdPage = null;
        this.cs = null;
        this.regular = REGULAR;
        this.bold = BOLD;
    }

    /** The document's page this draws on. */
    PDPage pdPage() {
        return pdPage;
    }

    /** A page that only measures: every drawing call returns the height a real page's would, drawing nothing. */
    static PdfPage measuringOnly() {
        return new PdfPage();
    }

    /**
     * Text the embedded face can show: line breaks and tabs become spaces, a character the face has no glyph for
     * becomes '?' (the bundled face covers Latin, Greek, super- and subscripts and the mathematical signs trapmap
     * writes).
     */
    static String clean(String s) {
        for (int i = 0; i < s.length(); i++) {
            if (BMP_GLYPH[s.charAt(i)] != GLYPH_YES) {
                return cleanEach(s);
            }
        }
        return s; // every character shows as itself
    }

    private static String cleanEach(String s) {
        StringBuilder b = new StringBuilder(s.length());
        s.codePoints().forEach(c -> {
            if (c == '\n' || c == '\t') {
                b.append(' ');
            } else if (c >= 32 && shows(c)) {
                b.appendCodePoint(c);
            } else {
                b.append('?');
            }
        });
        return b.toString();
    }

    /** Whether both faces have a glyph for {@code c} (at least 32), asked of the faces once per code point. */
    private static boolean shows(int c) {
        if (c < BMP_GLYPH.length && !Character.isSurrogate((char) c)) {
            byte known = BMP_GLYPH[c];
            if (known != GLYPH_UNKNOWN) {
                return known == GLYPH_YES;
            }
            boolean has = hasGlyph(c);
            BMP_GLYPH[c] = has ? GLYPH_YES : GLYPH_NO; // the same answer from any thread
            return has;
        }
        return HAS_GLYPH.computeIfAbsent(c, PdfPage::hasGlyph);
    }

    private static boolean hasGlyph(int codePoint) {
        synchronized (REGULAR) {
            String c = new String(Character.toChars(codePoint));
            try {
                REGULAR.encode(c);
                BOLD.encode(c);
                return true;
            } catch (IOException | IllegalArgumentException e) {
                return false;
            }
        }
    }

    /**
     * The width of {@code s} (after {@link #clean}) in {@code font} at {@code size} points: for the two faces, the sum
     * of each code point's advance width, taken once from the face: the same float sum in the same order as
     * {@link PDFont#getStringWidth} (which encodes the text and adds its glyphs' widths one by one) without encoding
     * the text at every call; any other font through {@code getStringWidth}.
     */
    static float width(String s, PDFont font, float size) {
        String text = clean(s);
        float[] advances = font == REGULAR ? REGULAR_ADVANCE : font == BOLD ? BOLD_ADVANCE : null;
        try {
            if (advances == null) {
                synchronized (font) {
                    return font.getStringWidth(text) / 1000 * size;
                }
            }
            float w = 0;
            for (int i = 0; i < text.length(); ) {
                int c = text.codePointAt(i);
                i += Character.charCount(c);
                w += advance(advances, font, c);
            }
            return w / 1000 * size;
        } catch (IOException e) {
            throw new IllegalStateException("cannot measure text '" + s + "'", e);
        }
    }

    /** The advance width of code point {@code c} in {@code font}, thousandths of the size (NaN in the table: not yet). */
    private static float advance(float[] table, PDFont font, int c) throws IOException {
        if (c < table.length) {
            float a = table[c];
            if (!Float.isNaN(a)) {
                return a;
            }
        }
        float a;
        synchronized (font) {
            a = font.getStringWidth(new String(Character.toChars(c))); // 0 + the glyph's width: that width exactly
        }
        if (c < table.length) {
            table[c] = a; // the same value from any thread
        }
        return a;
    }

    /** One line of text whose top is at {@code yTop}. */
    void text(String s, float x, float yTop, PDFont font, float size, Color colour) throws IOException {
        if (cs == null) {
            return;
        }
        cs.beginText();
        cs.setFont(font == BOLD ? bold : regular, size);
        cs.setNonStrokingColor(colour);
        cs.newLineAtOffset(x, HEIGHT - yTop - size * 0.82f);
        cs.showText(clean(s));
        cs.endText();
    }

    void text(String s, float x, float yTop, PDFont font, float size) throws IOException {
        text(s, x, yTop, font, size, INK);
    }

    /** Text right-aligned at {@code xRight}. */
    void textRight(String s, float xRight, float yTop, PDFont font, float size) throws IOException {
        text(s, xRight - width(s, font, size), yTop, font, size, INK);
    }

    /**
     * The text cut with "…"-style dots so that it fits {@code maxWidth}. Only candidates no longer than about twice
     * the part that fits are measured (a growing then halving search over the length), so a very long text costs
     * little more than a short one.
     */
    static String fit(String s, PDFont font, float size, float maxWidth) {
        int n = s.length();
        int fits = longestPrefix(s, 0, n, font, size, maxWidth, "");
        if (fits == n) {
            return s;
        }
        int keep = Math.max(1, longestPrefix(s, 0, fits, font, size, maxWidth, "..."));
        return s.substring(0, cutPoint(s, 0, keep)) + "...";
    }

    /**
     * The largest k in [0, end - from] such that {@code s[from, from + k) + suffix} is no wider than {@code maxWidth}
     * (the width grows with the length): doubling k until it no longer fits, then halving the gap. Measures
     * O(log k) candidates of at most 2k characters.
     */
    private static int longestPrefix(String s, int from, int end, PDFont font, float size, float maxWidth,
                                     String suffix) {
        int n = end - from;
        int good = 0;
        int bad = -1;
        int step = 1;
        while (bad < 0) {
            int k = Math.min(n, good + step);
            if (width(s.substring(from, from + k) + suffix, font, size) <= maxWidth) {
                good = k;
                if (k == n) {
                    return n;
                }
                step *= 2;
            } else {
                bad = k;
            }
        }
        while (bad - good > 1) {
            int mid = (good + bad) >>> 1;
            if (width(s.substring(from, from + mid) + suffix, font, size) <= maxWidth) {
                good = mid;
            } else {
                bad = mid;
            }
        }
        return good;
    }

    /** {@code k} characters from {@code from}, less one when the cut would split a surrogate pair. */
    private static int cutPoint(String s, int from, int k) {
        int at = from + k;
        return k > 1 && at < s.length() && Character.isHighSurrogate(s.charAt(at - 1)) ? k - 1 : k;
    }

    /**
     * The words of {@code s} broken into lines no wider than {@code width}; a word wider than a line is broken after
     * an underscore, hyphen or slash where it can be (figure names, wafer ids, file names), else between letters.
     */
    static List<String> wrap(String s, PDFont font, float size, float width) {
        List<String> lines = new ArrayList<>();
        StringBuilder line = new StringBuilder();
        List<String> words = new ArrayList<>();
        for (String word : s.split(" +")) {
            words.addAll(pieces(word, font, size, width));
        }
        for (String word : words) {
            String candidate = line.length() == 0 ? word : line + " " + word;
            if (width(candidate, font, size) <= width || line.length() == 0) {
                line.setLength(0);
                line.append(candidate);
            } else {
                lines.add(line.toString());
                line.setLength(0);
                line.append(word);
            }
        }
        if (line.length() > 0) {
            lines.add(line.toString());
        }
        return lines;
    }

    /**
     * {@link #wrap} cut to at most {@code maxLines} lines: the last one kept ends in dots when text was left out
     * (table cells of overlong names).
     */
    static List<String> wrap(String s, PDFont font, float size, float width, int maxLines) {
        List<String> lines = wrap(s, font, size, width);
        if (lines.size() <= maxLines) {
            return lines;
        }
        List<String> out = new ArrayList<>(lines.subList(0, maxLines - 1));
        String last = lines.get(maxLines - 1) + " " + lines.get(maxLines);
        out.add(fit(last, font, size, width));
        return out;
    }

    /**
     * A word cut into pieces that each fit {@code width}: after the last underscore, hyphen or slash that fits (figure
     * names, wafer ids, file names), else where it must.
     * Each piece is found by {@link #longestPrefix}, so the work grows with the word's length times the log of a
     * line's.
     */
    /** The characters a word too long for its line is broken after, where one fits. */
    private static final String BREAKS = "_-/";

    private static List<String> pieces(String word, PDFont font, float size, float width) {
        List<String> out = new ArrayList<>();
        int start = 0;
        int n = word.length();
        while (n - start > 1) {
            int fit = longestPrefix(word, start, n, font, size, width, "");
            if (fit == n - start) {
                break;
            }
            int cut = cutPoint(word, start, Math.max(1, fit));
            for (int i = start + cut - 1; i > start; i--) {
                if (BREAKS.indexOf(word.charAt(i)) >= 0) {
                    cut = i + 1 - start;
                    break;
                }
            }
            out.add(word.substring(start, start + cut));
            start += cut;
        }
        out.add(word.substring(start));
        return out;
    }

    /** A wrapped paragraph; returns its height. */
    float paragraph(String s, float x, float yTop, float width, PDFont font, float size) throws IOException {
        float leading = size * 1.3f;
        List<String> lines = wrap(s, font, size, width);
        for (int i = 0; i < lines.size(); i++) {
            text(lines.get(i), x, yTop + i * leading, font, size);
        }
        return lines.size() * leading;
    }

    /**
     * A table: the first row in bold with a rule under it when {@code header}; columns of the given widths, those
     * marked in {@code right} right-aligned; cells cut to fit. Returns its height.
     */
    float table(float x, float yTop, float[] widths, boolean[] right, List<String[]> rows, float size, boolean header)
            throws IOException {
        float leading = size * 1.35f;
        float y = yTop;
        for (int r = 0; r < rows.size(); r++) {
            PDFont font = header && r == 0 ? BOLD : REGULAR;
            float cx = x;
            String[] row = rows.get(r);
            for (int c = 0; c < widths.length && c < row.length; c++) {
                String cell = fit(row[c] == null ? "" : row[c], font, size, widths[c] - 4);
                if (right != null && right[c]) {
                    textRight(cell, cx + widths[c] - 4, y, font, size);
                } else {
                    text(cell, cx, y, font, size);
                }
                cx += widths[c];
            }
            y += leading;
            if (header && r == 0) {
                float total = 0;
                for (float w : widths) {
                    total += w;
                }
                line(x, y - leading * 0.15f, x + total, y - leading * 0.15f, RULE, 0.6f);
                y += leading * 0.15f;
            }
        }
        return y - yTop;
    }

    /** A picture scaled into the box (its own pixels are kept: draw it at 2× for print). */
    void image(BufferedImage img, float x, float yTop, float w, float h) throws IOException {
        if (cs == null) {
            return;
        }
        cs.drawImage(embed(doc, img), x, HEIGHT - yTop - h, w, h);
    }

    /**
     * The picture as a lossless image of the document: an opaque RGB picture goes in as its 8-bit RGB samples,
     * Flate-compressed without PNG predictors ({@link LosslessFactory} tries five predictors on every row, which cost
     * most of a summary's time for no visible change); any other picture through {@link LosslessFactory}. The pixels
     * shown are the same either way.
     */
    static PDImageXObject embed(PDDocument doc, BufferedImage img) throws IOException {
        Packed p = Packed.of(img);
        return p == null ? LosslessFactory.createFromImage(doc, img) : p.embed(doc);
    }

    /** A picture as {@link #image} draws it, made without a document: packed RGB samples or the picture itself. */
    static final class Picture {
        private final Packed packed;
        private final BufferedImage image;

        private Picture(Packed packed, BufferedImage image) {
            this.packed = packed;
            this.image = image;
        }

        /** {@code img} packed now when it is opaque RGB ({@link Packed}), else kept for {@link LosslessFactory}. */
        static Picture of(BufferedImage img) {
            Packed p = Packed.of(img);
            return new Picture(p, p == null ? img : null);
        }

        PDImageXObject embed(PDDocument doc) throws IOException {
            return packed != null ? packed.embed(doc) : LosslessFactory.createFromImage(doc, image);
        }
    }

    /** A picture drawn from a {@link Picture} made ahead, as {@link #image(BufferedImage, float, float, float, float)}. */
    void image(Picture picture, float x, float yTop, float w, float h) throws IOException {
        if (cs == null) {
            return;
        }
        cs.drawImage(picture.embed(doc), x, HEIGHT - yTop - h, w, h);
    }

    /** An opaque RGB picture's 8-bit RGB samples, Flate-compressed without predictors ({@link #embed}). */
    record Packed(int width, int height, byte[] flate) {
        /** The samples of {@code img}, null when it is not {@code TYPE_INT_RGB}. */
        static Packed of(BufferedImage img) {
            if (img.getType() != BufferedImage.TYPE_INT_RGB) {
                return null;
            }
            int w = img.getWidth();
            int h = img.getHeight();
            int[] row = new int[w];
            byte[] line = new byte[3 * w];
            WritableRaster raster = img.getRaster();
            ByteArrayOutputStream packed = new ByteArrayOutputStream(w * h);
            Deflater deflater = new Deflater(Deflater.DEFAULT_COMPRESSION);
            try (DeflaterOutputStream z = new DeflaterOutputStream(packed, deflater, 1 << 16)) {
                for (int y = 0; y < h; y++) {
                    // the row's stored pixels (0x00RRGGBB, copied as they are): getRGB would convert each through
                    // the colour model to the same red, green and blue, a long loop of calls compiled per batch
                    raster.getDataElements(0, y, w, 1, row);
                    z.write(rgb(row, line));
                }
            } catch (IOException e) {
                throw new UncheckedIOException(e); // a stream in memory
            } finally {
                deflater.end();
            }
            return new Packed(w, h, packed.toByteArray());
        }

        /** The red, green and blue bytes of the pixels {@code 0x··RRGGBB} of {@code row} into {@code line}. */
        static byte[] rgb(int[] row, byte[] line) {
            for (int i = 0, k = 0; i < row.length; i++, k += 3) {
                int p = row[i];
                line[k] = (byte) (p >> 16);
                line[k + 1] = (byte) (p >> 8);
                line[k + 2] = (byte) p;
            }
            return line;
        }

        PDImageXObject embed(PDDocument doc) throws IOException {
            return new PDImageXObject(doc, new ByteArrayInputStream(flate), COSName.FLATE_DECODE, width, height, 8,
                    PDDeviceRGB.INSTANCE);
        }
    }

    void rect(float x, float yTop, float w, float h, Color stroke, Color fill, float lineWidth) throws IOException {
        if (cs == null) {
            return;
        }
        cs.addRect(x, HEIGHT - yTop - h, w, h);
        if (fill != null) {
            cs.setNonStrokingColor(fill);
        }
        if (stroke != null) {
            cs.setStrokingColor(stroke);
            cs.setLineWidth(lineWidth);
        }
        if (fill != null && stroke != null) {
            cs.fillAndStroke();
        } else if (fill != null) {
            cs.fill();
        } else {
            cs.stroke();
        }
    }

    void line(float x0, float y0Top, float x1, float y1Top, Color colour, float lineWidth) throws IOException {
        if (cs == null) {
            return;
        }
        cs.setStrokingColor(colour);
        cs.setLineWidth(lineWidth);
        cs.moveTo(x0, HEIGHT - y0Top);
        cs.lineTo(x1, HEIGHT - y1Top);
        cs.stroke();
    }

    /** A section heading with a rule; returns its height. */
    float heading(String s, float x, float yTop, float width) throws IOException {
        text(s, x, yTop, BOLD, 10.5f);
        line(x, yTop + 14, x + width, yTop + 14, RULE, 0.6f);
        return 18;
    }

    /** The height of {@link #caution}'s box for this text and width. */
    static float cautionHeight(String s, float width) {
        return wrap("Caution: " + s, BOLD, 9, width - 16).size() * 9 * 1.3f + 12;
    }

    /** The caution in a framed, tinted box; returns its height. */
    float caution(String s, float x, float yTop, float width) throws IOException {
        float size = 9;
        List<String> lines = wrap("Caution: " + s, BOLD, size, width - 16);
        float h = lines.size() * size * 1.3f + 12;
        rect(x, yTop, width, h, new Color(0xB26A00), new Color(0xFFF4E0), 1f);
        for (int i = 0; i < lines.size(); i++) {
            text(lines.get(i), x + 8, yTop + 6 + i * size * 1.3f, BOLD, size, new Color(0x5A3500));
        }
        return h;
    }

    /** The widest a footer's left text runs before it wraps, in points (the page number keeps the rest). */
    static final float FOOTER_TEXT_WIDTH = WIDTH - 2 * MARGIN - 64;
    static final float FOOTER_SIZE = 7.5f;

    /**
     * Adds to every page of {@code doc} a footer: {@code left} at the left, wrapped (never cut: it carries the
     * caution) onto as many lines as it needs above the bottom edge, and "page i of n" at the right.
     */
    static void footers(PDDocument doc, String left) throws IOException {
        int n = doc.getNumberOfPages();
        float size = FOOTER_SIZE;
        float leading = size * 1.25f;
        float base = MARGIN - 18;
        List<String> lines = wrap(left, REGULAR, size, FOOTER_TEXT_WIDTH);
        PDFont face = fontsOf(doc)[0];
        for (int i = 0; i < n; i++) {
            try (PDPageContentStream c = new PDPageContentStream(doc, doc.getPage(i),
                    PDPageContentStream.AppendMode.APPEND, true, true)) {
                String p = "page " + (i + 1) + " of " + n;
                c.setNonStrokingColor(MUTED);
                for (int k = 0; k < lines.size(); k++) {
                    c.beginText();
                    c.setFont(face, size);
                    c.newLineAtOffset(MARGIN, base + (lines.size() - 1 - k) * leading);
                    c.showText(clean(lines.get(k)));
                    c.endText();
                }
                c.beginText();
                c.setFont(face, size);
                c.newLineAtOffset(WIDTH - MARGIN - width(p, REGULAR, size), base);
                c.showText(clean(p));
                c.endText();
            }
        }
    }

    @Override
    public void close() throws IOException {
        if (cs != null) {
            cs.close();
        }
    }
}
