package trapmap.viewer.report;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.io.InputStream;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.apache.fontbox.ttf.TTFParser;
import org.apache.fontbox.ttf.TrueTypeFont;
import org.apache.pdfbox.io.RandomAccessReadBuffer;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.pdmodel.font.PDFont;
import org.apache.pdfbox.pdmodel.font.PDType0Font;
import org.junit.jupiter.api.Test;
import trapmap.maps.model.Caution;

/**
 * {@link PdfPage#width} adds the advance widths of the code points it looked up once in each face; it must give the
 * very float that PDFBox's own {@link PDFont#getStringWidth} gives for the cleaned text, so that every line break,
 * cut and right-aligned cell of the reports stays where it was.
 */
class PdfTextWidthTest {
    @Test
    void widthsEqualPdfBoxsOwnMeasure() throws IOException {
        List<String> texts = new ArrayList<>(List.of("", " ", "W-0001", "trap density P95", "1.23e11 cm⁻³ Fe_i",
                "Ω·cm, Δn, σₙ, τ, mm², µs", "largest flagged region: 12.5 mm² at (3.1, -4.0), peak 2.3 µs",
                "tab\there and\nnew line", "unknown glyph \u4E2D and emoji \uD83D\uDE00 and \u0007 bell",
                Caution.TEXT, "page 12 of 345"));
        Random rnd = new Random(17);
        for (int k = 0; k < 300; k++) { // printable ASCII, Latin-1, Greek and sub/superscripts, mixed
            StringBuilder b = new StringBuilder();
            int n = rnd.nextInt(60);
            for (int i = 0; i < n; i++) {
                int range = rnd.nextInt(4);
                b.append((char) (range == 0 ? 32 + rnd.nextInt(95) : range == 1 ? 0xA0 + rnd.nextInt(96)
                        : range == 2 ? 0x391 + rnd.nextInt(56) : 0x2070 + rnd.nextInt(32)));
            }
            texts.add(b.toString());
        }
        for (PDFont font : List.of(PdfPage.REGULAR, PdfPage.BOLD)) {
            for (float size : new float[] {7, 8.5f, 10.5f}) {
                for (String t : texts) {
                    float expected;
                    synchronized (font) {
                        expected = font.getStringWidth(PdfPage.clean(t)) / 1000 * size;
                    }
                    assertThat(PdfPage.width(t, font, size)).as("'%s' at %s pt", t, size).isEqualTo(expected);
                }
            }
        }
    }

    /**
     * The measuring faces are loaded as subsets (nothing embedded, no Unicode map of every glyph built): for every
     * code point of the Basic Multilingual Plane they give the width and encoding (or refusal) of the same face loaded
     * for full embedding and of the faces a document draws with.
     */
    @Test
    void measuringFacesMeasureAndEncodeAsFullyLoadedFaces() throws IOException {
        String[] files = {"fonts/DejaVuSansCondensed.ttf", "fonts/DejaVuSansCondensed-Bold.ttf"};
        PDFont[] measuring = {PdfPage.REGULAR, PdfPage.BOLD};
        try (PDDocument full = new PDDocument(); PDDocument drawn = new PDDocument()) {
            PDFont[] documentFaces = PdfPage.fontsOf(drawn);
            for (int f = 0; f < files.length; f++) {
                PDFont reference;
                try (InputStream in = PdfPage.class.getResourceAsStream(files[f])) {
                    TrueTypeFont ttf = new TTFParser().parse(new RandomAccessReadBuffer(in.readAllBytes()));
                    ttf.setEnableGsub(false);
                    reference = PDType0Font.load(full, ttf, false);
                }
                int encoded = 0;
                for (int c = 0; c <= Character.MAX_VALUE; c++) {
                    if (Character.isSurrogate((char) c)) {
                        continue;
                    }
                    String s = String.valueOf((char) c);
                    String expected = measure(reference, s);
                    assertThat(measure(measuring[f], s)).as("%s U+%04X", files[f], c).isEqualTo(expected);
                    assertThat(measure(documentFaces[f], s)).as("%s U+%04X drawn", files[f], c).isEqualTo(expected);
                    encoded += expected.startsWith("refused") ? 0 : 1;
                }
                assertThat(encoded).as("code points the face encodes").isGreaterThan(3000);
            }
        }
    }

    /** The encoding and width of {@code s} in {@code font}, or that the font refused it. */
    private static String measure(PDFont font, String s) {
        synchronized (font) {
            try {
                return java.util.Arrays.toString(font.encode(s)) + " " + font.getStringWidth(s);
            } catch (IOException | IllegalArgumentException e) {
                return "refused";
            }
        }
    }

    @Test
    void cleanKeepsShownTextAndReplacesTheRest() {
        assertThat(PdfPage.clean("cm⁻³ at 5 µs")).isEqualTo("cm⁻³ at 5 µs");
        assertThat(PdfPage.clean("a\tb\nc")).isEqualTo("a b c");
        assertThat(PdfPage.clean("x\u0007y")).isEqualTo("x?y");
        assertThat(PdfPage.clean("cm⁻³ again")).isEqualTo("cm⁻³ again"); // from the table of known characters
    }
}
