package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;

import java.awt.image.BufferedImage;
import java.nio.file.Path;
import java.util.Map;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.ProcessingStep;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;

class CaptionedPictureTest {
    @TempDir
    Path dir;

    private static WaferMap density(int w, int h) {
        float[] s = new float[w * h];
        for (int i = 0; i < s.length; i++) {
            s[i] = (float) Math.pow(10, 10 + 3.0 * (i % w) / (w - 1));
        }
        s[0] = Float.NaN;
        return new WaferMap(FloatRaster.wrap(w, h, s), PixelGrid.centred(w, h, 0.5), Quantity.TRAP_DENSITY, "LOT-7-W03",
                MeasurementConditions.UNKNOWN, Provenance.of("test").then(new ProcessingStep("convert",
                        Map.of("defect", "fe-i", "doping", "p:1e16"))));
    }

    @Test
    void captionNamesWaferQuantityUnitAndDefectOfTheMap() {
        Caption c = Caption.of(density(4, 3));
        assertThat(c.text()).isEqualTo("wafer LOT-7-W03  ·  trap-density (cm^-3)  ·  defect fe-i");
        assertThat(c.withDate("2026-12-04").text()).endsWith("  ·  defect fe-i  ·  2026-12-04");
        assertThat(c.shortText()).isEqualTo("LOT-7-W03  ·  trap-density (cm^-3)");
        assertThat(new Caption(null, "occupancy", "", null, null).text()).isEqualTo("occupancy");
    }

    @Test
    void writtenPngHasTheMapAColourBarAndACaptionStrip() throws Exception {
        int w = 300;
        int h = 200;
        WaferMap m = density(w, h);
        Path f = dir.resolve("nt.png");
        MapFiles.write(m, f);
        BufferedImage img = ImageIO.read(f.toFile());
        assertThat(img.getHeight()).isEqualTo(h + CaptionedPicture.STRIP_PX);
        assertThat(img.getWidth()).isEqualTo(w + CaptionedPicture.BAR_AREA_PX);

        // the map part is the map's own picture
        BufferedImage plain = MapFiles.picture(m, PngStyle.DEFAULT);
        for (int y = 0; y < h; y += 7) {
            for (int x = 0; x < w; x += 5) {
                assertThat(img.getRGB(x, y)).as("map pixel %d,%d", x, y).isEqualTo(plain.getRGB(x, y));
            }
        }
        // the colour bar: the first colour at its foot, the last at its top
        int barX = w + 8 + CaptionedPicture.BAR_PX / 2;
        assertThat(img.getRGB(barX, h - 8) & 0xFFFFFF).isEqualTo(ColourMap.BLUE_YELLOW.rgbAt(1.5 / (h - 12)));
        assertThat(img.getRGB(barX, 7) & 0xFFFFFF).isEqualTo(ColourMap.BLUE_YELLOW.rgbAt(1 - 1.5 / (h - 12)));
        assertThat(nonBackground(img, w, 0, w + CaptionedPicture.BAR_AREA_PX, h)).isGreaterThan(h * 10);
        // the unit label turned along the bar, right of the tick labels
        assertThat(nonBackground(img, img.getWidth() - 20, 0, img.getWidth(), h)).isGreaterThan(50);
        // caption text in the strip
        assertThat(nonBackground(img, 0, h, img.getWidth(), img.getHeight())).isGreaterThan(100);
    }

    @Test
    void captionStripIsAddedBelowAPictureThatHasItsBar() {
        BufferedImage view = new BufferedImage(400, 300, BufferedImage.TYPE_INT_RGB);
        BufferedImage out = CaptionedPicture.withCaption(view, Caption.of(density(4, 3)));
        assertThat(out.getWidth()).isEqualTo(400);
        assertThat(out.getHeight()).isEqualTo(300 + CaptionedPicture.STRIP_PX);
        assertThat(nonBackground(out, 0, 300, 400, out.getHeight())).isGreaterThan(100);
        BufferedImage small = CaptionedPicture.withSmallCaption(view, Caption.of(density(4, 3)));
        assertThat(small.getHeight()).isEqualTo(300 + CaptionedPicture.SMALL_STRIP_PX);
    }

    @Test
    void tickLabelsAreShort() {
        assertThat(CaptionedPicture.number(1.5e12)).isEqualTo("1.50e12");
        assertThat(CaptionedPicture.number(2.5e-3)).isEqualTo("2.50e-3");
        assertThat(CaptionedPicture.number(120)).isEqualTo("120");
        assertThat(CaptionedPicture.number(0.5)).isEqualTo("0.5");
        assertThat(CaptionedPicture.number(0)).isEqualTo("0");
        // between 1000 and 99 999 plain digits, not 4.94e+04
        assertThat(CaptionedPicture.number(49_400)).isEqualTo("49400");
        assertThat(CaptionedPicture.number(1459.4)).isEqualTo("1460");
        assertThat(CaptionedPicture.number(-2_048)).isEqualTo("-2050");
        assertThat(CaptionedPicture.number(999.6)).isEqualTo("1000");
    }

    @Test
    void aUniformMapsBarHasOneLabelNotThreeEqualOnes() {
        BufferedImage map = new BufferedImage(200, 200, BufferedImage.TYPE_INT_ARGB);
        int uniform = ticks(CaptionedPicture.compose(map, new CaptionedPicture.ColourBar(ColourMap.BLUE_YELLOW, 1e14,
                1e14, true, "injection (cm^-3)"), new Caption("W", "injection", "cm^-3", null, null)));
        int ranged = ticks(CaptionedPicture.compose(map, new CaptionedPicture.ColourBar(ColourMap.BLUE_YELLOW, 1e13,
                1e14, true, "injection (cm^-3)"), new Caption("W", "injection", "cm^-3", null, null)));
        assertThat(ranged).isEqualTo(3);
        assertThat(uniform).isEqualTo(1);
    }

    @Test
    void aStatusMapsBarIsLabelledAtEachCodeAndNotHalfway() {
        BufferedImage map = new BufferedImage(200, 200, BufferedImage.TYPE_INT_ARGB);
        Caption c = new Caption("W", "status", "", null, null);
        assertThat(ticks(CaptionedPicture.compose(map, new CaptionedPicture.ColourBar(ColourMap.BLUE_YELLOW, 0, 5,
                false, "status", true), c))).isEqualTo(6);
        assertThat(ticks(CaptionedPicture.compose(map, new CaptionedPicture.ColourBar(ColourMap.BLUE_YELLOW, 0, 3,
                false, "status", true), c))).isEqualTo(4);
    }

    @Test
    void aComparisonsPictureNamesWhatItMadeAndADifferenceItsUnit() {
        float[] s = {1, 2, 3, 4};
        WaferMap before = new WaferMap(FloatRaster.wrap(2, 2, s), PixelGrid.centred(2, 2, 1),
                Quantity.EFFECTIVE_LIFETIME, "W", MeasurementConditions.UNKNOWN, Provenance.of("test"));
        assertThat(Caption.of(trapmap.maps.compare.MapComparison.difference(before, before)).quantityWithUnit())
                .isEqualTo("difference (µs)");
        WaferMap density = new WaferMap(FloatRaster.wrap(2, 2, s), PixelGrid.centred(2, 2, 1), Quantity.TRAP_DENSITY,
                "W", MeasurementConditions.UNKNOWN, Provenance.of("test"));
        assertThat(Caption.of(trapmap.maps.compare.MapComparison.reduction(density, density)).quantityWithUnit())
                .isEqualTo("reduction");
    }

    /** The tick marks right of the colour bar: runs of inked pixels in the column just right of the bar. */
    private static int ticks(BufferedImage img) {
        int x = img.getWidth() - CaptionedPicture.BAR_AREA_PX + 8 + CaptionedPicture.BAR_PX + 2;
        int runs = 0;
        boolean inked = false;
        for (int y = 0; y < img.getHeight() - CaptionedPicture.STRIP_PX; y++) {
            int argb = img.getRGB(x, y);
            boolean ink = (argb >>> 24) != 0 && (argb & 0xFFFFFF) != CaptionedPicture.BACKGROUND_RGB;
            runs += ink && !inked ? 1 : 0;
            inked = ink;
        }
        return runs;
    }

    private static int nonBackground(BufferedImage img, int x0, int y0, int x1, int y1) {
        int n = 0;
        for (int y = y0; y < y1; y++) {
            for (int x = x0; x < x1; x++) {
                int argb = img.getRGB(x, y);
                if ((argb >>> 24) != 0 && (argb & 0xFFFFFF) != CaptionedPicture.BACKGROUND_RGB) {
                    n++;
                }
            }
        }
        return n;
    }
}
