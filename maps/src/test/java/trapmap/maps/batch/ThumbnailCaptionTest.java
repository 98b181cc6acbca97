package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.awt.image.BufferedImage;
import java.util.BitSet;
import org.junit.jupiter.api.Test;
import trapmap.maps.io.CaptionedPicture;
import trapmap.maps.io.PngFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;

class ThumbnailCaptionTest {
    private static WaferMap lifetime() {
        int w = 300;
        int h = 200;
        float[] s = new float[w * h];
        for (int i = 0; i < s.length; i++) {
            s[i] = 5 + (i % w) + 0.5f * (i / w);
        }
        return new WaferMap(FloatRaster.wrap(w, h, s), PixelGrid.centred(w, h, 0.5), Quantity.EFFECTIVE_LIFETIME,
                "LOT-B02-W11", MeasurementConditions.UNKNOWN, Provenance.of("test"));
    }

    @Test
    void captionedThumbnailIsThePlainOneWithASmallStripBelowAndTheSameInEveryRun() {
        WaferMap m = lifetime();
        BitSet flagged = new BitSet();
        flagged.set(150 * 300 + 40, 150 * 300 + 60);
        BufferedImage plain = Thumbnails.thumbnail(m, flagged, 10, 300);
        BufferedImage captioned = Thumbnails.thumbnail(m, flagged, 10, 300, true);
        assertThat(captioned.getWidth()).isEqualTo(plain.getWidth()).isEqualTo(Thumbnails.THUMBNAIL_PX);
        assertThat(captioned.getHeight()).isEqualTo(plain.getHeight() + CaptionedPicture.SMALL_STRIP_PX);
        for (int y = 0; y < plain.getHeight(); y++) {
            for (int x = 0; x < plain.getWidth(); x++) {
                assertThat(captioned.getRGB(x, y)).isEqualTo(plain.getRGB(x, y));
            }
        }
        int ink = 0;
        for (int y = plain.getHeight(); y < captioned.getHeight(); y++) {
            for (int x = 0; x < captioned.getWidth(); x++) {
                ink += (captioned.getRGB(x, y) & 0xFFFFFF) != CaptionedPicture.BACKGROUND_RGB ? 1 : 0;
            }
        }
        assertThat(ink).as("caption text pixels").isGreaterThan(50);
        assertThat(PngFiles.encode(Thumbnails.thumbnail(m, flagged, 10, 300, true)))
                .isEqualTo(PngFiles.encode(captioned));
        assertThat(Thumbnails.thumbnail(m, flagged, 10, 300, false).getHeight()).isEqualTo(plain.getHeight());
    }
}
