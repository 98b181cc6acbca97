package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.awt.image.BufferedImage;
import java.awt.image.IndexColorModel;
import java.io.ByteArrayInputStream;
import java.nio.file.Path;
import java.util.BitSet;
import javax.imageio.ImageIO;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import trapmap.maps.geometry.OutlineDetection;
import trapmap.maps.geometry.WaferShape;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.PngFiles;
import trapmap.maps.io.PngReference;
import trapmap.maps.model.WaferMap;
import trapmap.maps.region.RegionCriteria;

/**
 * Thumbnails of the demonstration wafers, with their flagged regions outlined, decode from the written PNG to the
 * same palette, indices and ARGB pixels as from the JDK writer's file of the same picture, which they were written
 * with before.
 */
class ThumbnailPngTest {
    private static final Path DEMO = Path.of("..", "demo-data");

    @ParameterizedTest
    @ValueSource(strings = {"LOT-A01-W02.tif", "MON-200-W01.tif", "LOT-A04-W01-pl.tif"})
    void thumbnailsDecodeAsTheJdkWritersFileDoes(String file) throws Exception {
        WaferMap m = MapFiles.readSingle(DEMO.resolve(file));
        WaferShape shape = OutlineDetection.fit(m).shape();
        Masks masks = Masks.of(m.raster().samples(), m.grid(), shape, 2, Double.NaN);
        float[] s = m.raster().samples();
        float[] sorted = new float[masks.count()];
        for (int k = 0; k < masks.count(); k++) {
            sorted[k] = s[masks.indices()[k]];
        }
        java.util.Arrays.sort(sorted);
        // the lowest tenth flagged, so that every thumbnail has outlines
        RegionCriteria low = RegionCriteria.below(sorted[sorted.length / 10], 0);
        BitSet flagged = FlaggedRegions.find(m.raster(), m.grid(), masks.indices(), masks.count(), low, shape, null)
                .pixels();
        assertThat(flagged.cardinality()).isPositive();
        for (double[] range : new double[][] {{Double.NaN, Double.NaN}, {sorted[0], sorted[sorted.length - 1]}}) {
            BufferedImage thumb = Thumbnails.thumbnail(m, flagged, range[0], range[1]);
            byte[] jdk = PngReference.jdkStored(thumb);
            assertThat(ImageIO.read(new ByteArrayInputStream(jdk)).getColorModel())
                    .isInstanceOf(IndexColorModel.class);
            BufferedImage back = PngReference.assertSameDecoded(PngFiles.encode(thumb), jdk);
            int w = thumb.getWidth();
            int h = thumb.getHeight();
            assertThat(back.getRGB(0, 0, w, h, null, 0, w)).containsExactly(thumb.getRGB(0, 0, w, h, null, 0, w));
            int outline = 0;
            for (int argb : thumb.getRGB(0, 0, w, h, null, 0, w)) {
                outline += argb == Thumbnails.OUTLINE_ARGB ? 1 : 0;
            }
            assertThat(outline).as("outline pixels").isPositive();
        }
    }
}
