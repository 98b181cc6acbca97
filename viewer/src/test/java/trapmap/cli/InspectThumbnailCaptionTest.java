package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.awt.image.BufferedImage;
import java.nio.file.Files;
import java.nio.file.Path;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.CaptionedPicture;
import trapmap.maps.io.MapFiles;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;

/** {@code inspect --thumbnail-captions}: thumbnails with a small caption strip, the same in every run. */
class InspectThumbnailCaptionTest {
    @TempDir
    Path dir;

    @Test
    void captionedThumbnailsAreTallerByTheStripAndByteStable() throws Exception {
        int n = 121;
        float[] s = new float[n * n];
        PixelGrid g = PixelGrid.centred(n, n, 0.5);
        for (int i = 0; i < s.length; i++) {
            s[i] = Math.hypot(g.xMm(i % n), g.yMm(i / n)) > 30 ? Float.NaN : 40 + (i % n) * 0.2f;
        }
        Path in = Files.createDirectories(dir.resolve("in"));
        MapFiles.write(new WaferMap(FloatRaster.wrap(n, n, s), g, Quantity.EFFECTIVE_LIFETIME, "w9",
                MeasurementConditions.UNKNOWN, Provenance.of("test")), in.resolve("w9.tif"));
        Path rules = dir.resolve("rules.json");
        Files.writeString(rules, "{\"flag\": {\"quantity\": \"lifetime\", \"threshold\": 10}}");

        Path plain = dir.resolve("plain");
        Path one = dir.resolve("one");
        Path two = dir.resolve("two");
        assertThat(Cli.run("inspect", in.toString(), "--rules", rules.toString(), "--out", plain.toString()).code())
                .isZero();
        for (Path out : new Path[] {one, two}) {
            Cli.Run r = Cli.run("inspect", in.toString(), "--rules", rules.toString(), "--out", out.toString(),
                    "--thumbnail-captions");
            assertThat(r.code()).as(r.err()).isZero();
        }
        BufferedImage p = ImageIO.read(plain.resolve("thumbnails/w9.tif.png").toFile());
        BufferedImage c = ImageIO.read(one.resolve("thumbnails/w9.tif.png").toFile());
        assertThat(c.getWidth()).isEqualTo(p.getWidth());
        assertThat(c.getHeight()).isEqualTo(p.getHeight() + CaptionedPicture.SMALL_STRIP_PX);
        assertThat(Files.readAllBytes(two.resolve("thumbnails/w9.tif.png")))
                .isEqualTo(Files.readAllBytes(one.resolve("thumbnails/w9.tif.png")));
    }
}
