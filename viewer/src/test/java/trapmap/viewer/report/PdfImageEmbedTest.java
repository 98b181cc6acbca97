package trapmap.viewer.report;

import static org.assertj.core.api.Assertions.assertThat;

import java.awt.image.BufferedImage;
import java.util.Random;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.apache.pdfbox.pdmodel.PDPage;
import org.apache.pdfbox.pdmodel.PDPageContentStream;
import org.apache.pdfbox.pdmodel.common.PDRectangle;
import org.apache.pdfbox.pdmodel.graphics.image.LosslessFactory;
import org.apache.pdfbox.pdmodel.graphics.image.PDImageXObject;
import org.apache.pdfbox.rendering.PDFRenderer;
import org.junit.jupiter.api.Test;

/** Pictures embedded without PNG predictors show exactly the pixels of the picture and of PDFBox's own embedding. */
class PdfImageEmbedTest {
    private static BufferedImage picture(int w, int h) {
        BufferedImage img = new BufferedImage(w, h, BufferedImage.TYPE_INT_RGB);
        Random rnd = new Random(7);
        for (int y = 0; y < h; y++) {
            for (int x = 0; x < w; x++) {
                int rgb = y < h / 2 ? (x * 255 / w) << 16 | (y * 255 / h) << 8 | ((x + y) & 0xFF)
                        : rnd.nextInt(1 << 24);
                img.setRGB(x, y, rgb);
            }
        }
        return img;
    }

    private static int[] pixels(BufferedImage img) {
        return img.getRGB(0, 0, img.getWidth(), img.getHeight(), null, 0, img.getWidth());
    }

    @Test
    void anEmbeddedPictureDecodesToItsOwnPixelsAsLosslessFactorysDoes() throws Exception {
        BufferedImage img = picture(301, 123);
        try (PDDocument doc = new PDDocument()) {
            PDImageXObject ours = PdfPage.embed(doc, img);
            PDImageXObject theirs = LosslessFactory.createFromImage(doc, img);
            assertThat(ours.getWidth()).isEqualTo(301);
            assertThat(ours.getHeight()).isEqualTo(123);
            assertThat(pixels(ours.getImage())).isEqualTo(pixels(img)).isEqualTo(pixels(theirs.getImage()));
        }
    }

    @Test
    void aPageWithThePictureRendersTheSameAsWithLosslessFactorysEmbedding() throws Exception {
        BufferedImage img = picture(200, 150);
        BufferedImage[] rendered = new BufferedImage[2];
        for (int k = 0; k < 2; k++) {
            try (PDDocument doc = new PDDocument()) {
                PDPage page = new PDPage(PDRectangle.A6);
                doc.addPage(page);
                PDImageXObject xo = k == 0 ? PdfPage.embed(doc, img) : LosslessFactory.createFromImage(doc, img);
                try (PDPageContentStream cs = new PDPageContentStream(doc, page)) {
                    cs.drawImage(xo, 20, 20, 100, 75);
                }
                rendered[k] = new PDFRenderer(doc).renderImageWithDPI(0, 144);
            }
        }
        assertThat(pixels(rendered[0])).isEqualTo(pixels(rendered[1]));
    }

    @Test
    void aPartOfALargerPictureIsEmbeddedWithItsOwnPixels() throws Exception {
        // a sub-picture shares its parent's pixels: its rows start at an offset and are the parent's width apart
        BufferedImage part = picture(301, 123).getSubimage(17, 9, 150, 60);
        try (PDDocument doc = new PDDocument()) {
            PDImageXObject ours = PdfPage.embed(doc, part);
            assertThat(ours.getWidth()).isEqualTo(150);
            assertThat(ours.getHeight()).isEqualTo(60);
            assertThat(pixels(ours.getImage())).isEqualTo(pixels(part))
                    .isEqualTo(pixels(LosslessFactory.createFromImage(doc, part).getImage()));
        }
    }

    @Test
    void theRowBytesAreRedGreenBlueOfEachPixelAsGetRgbGivesThem() {
        BufferedImage img = picture(37, 5);
        int[] row = new int[37];
        byte[] line = new byte[3 * 37];
        for (int y = 0; y < 5; y++) {
            img.getRaster().getDataElements(0, y, 37, 1, row);
            PdfPage.Packed.rgb(row, line);
            for (int x = 0; x < 37; x++) {
                int argb = img.getRGB(x, y);
                assertThat(new int[] {line[3 * x] & 0xFF, line[3 * x + 1] & 0xFF, line[3 * x + 2] & 0xFF})
                        .containsExactly(argb >> 16 & 0xFF, argb >> 8 & 0xFF, argb & 0xFF);
            }
        }
    }
}
