package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.awt.image.BufferedImage;
import java.nio.file.Files;
import java.nio.file.Path;
import javax.imageio.ImageIO;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.Provenance;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.FloatRaster;
import trapmap.maps.raster.PixelGrid;

class PngMapsTest {
    @TempDir
    Path dir;

    private static WaferMap ramp(Quantity q, int w, float from, float to) {
        float[] s = new float[w * 2];
        for (int x = 0; x < w; x++) {
            s[x] = from + (to - from) * x / (w - 1);
            s[w + x] = x == 0 ? Float.NaN : s[x];
        }
        return new WaferMap(FloatRaster.wrap(w, 2, s), PixelGrid.centred(w, 2, 1), q, "r",
                MeasurementConditions.UNKNOWN, Provenance.of("ramp"));
    }

    @Test
    void writtenPngDecodesWithTransparentNoData() throws Exception {
        WaferMap m = ramp(Quantity.OCCUPANCY, 101, 0, 1);
        Path f = dir.resolve("map.png");
        MapFiles.write(m, f);

        BufferedImage img = ImageIO.read(f.toFile());
        // the map at the top left; colour bar and caption strip around it (CaptionedPictureTest)
        assertThat(img.getWidth()).isEqualTo(CaptionedPicture.MIN_WIDTH_PX);
        assertThat(img.getHeight()).isEqualTo(CaptionedPicture.MIN_BAR_PX + CaptionedPicture.STRIP_PX);
        assertThat(img.getRGB(0, 1) >>> 24).isZero(); // NaN: transparent
        assertThat(img.getRGB(1, 1) >>> 24).isEqualTo(255);
        // 1st..99th percentile range: the ends take the first and last colours
        assertThat(img.getRGB(0, 0) & 0xFFFFFF).isEqualTo(ColourMap.BLUE_YELLOW.rgb(0));
        assertThat(img.getRGB(100, 0) & 0xFFFFFF).isEqualTo(ColourMap.BLUE_YELLOW.rgb(255));
    }

    @Test
    void greyScaleWithAFixedRange() throws Exception {
        WaferMap m = ramp(Quantity.OCCUPANCY, 11, 0, 1);
        Path f = dir.resolve("grey.png");
        MapFiles.write(m, f, WriteOptions.DEFAULTS.withPng(new PngStyle(ColourMap.GREY, PngStyle.Scale.LINEAR, 0,
                2)));

        BufferedImage img = ImageIO.read(f.toFile());
        assertThat(img.getRGB(0, 0) & 0xFF).isZero();
        assertThat(img.getRGB(10, 0) & 0xFF).isEqualTo(128); // 1 of [0, 2]
    }

    @Test
    void logarithmicQuantitiesAreDrawnOnALogScaleByDefault() {
        // 1 .. 1000 µs, a decade every third of the way
        float[] s = {1, 10, 100, 1000};
        WaferMap m = new WaferMap(FloatRaster.wrap(4, 1, s), PixelGrid.centred(4, 1, 1),
                Quantity.EFFECTIVE_LIFETIME, "", MeasurementConditions.UNKNOWN, Provenance.of(""));
        BufferedImage img = PngMaps.render(m, PngStyle.DEFAULT.withColours(ColourMap.GREY).withRange(1, 1000));
        assertThat(img.getRGB(1, 0) & 0xFF).isEqualTo(85);
        assertThat(img.getRGB(2, 0) & 0xFF).isEqualTo(170);
    }

    @Test
    void everyPixelHasTheColourOfItsValueOnTheLogScale() {
        java.util.Random rnd = new java.util.Random(4);
        int w = 53;
        int h = 41;
        float[] s = new float[w * h];
        for (int i = 0; i < s.length; i++) {
            s[i] = rnd.nextInt(7) == 0 ? Float.NaN : rnd.nextInt(9) == 0 ? -rnd.nextFloat()
                    : (float) Math.pow(10, 4 * rnd.nextDouble() - 0.5);
        }
        WaferMap m = new WaferMap(FloatRaster.wrap(w, h, s), PixelGrid.centred(w, h, 1),
                Quantity.EFFECTIVE_LIFETIME, "", MeasurementConditions.UNKNOWN, Provenance.of(""));
        PngStyle style = PngStyle.DEFAULT.withRange(2, 900);
        BufferedImage img = PngMaps.render(m, style);
        double lo = Math.log10(2);
        double span = Math.log10(900) - lo;
        for (int i = 0; i < s.length; i++) {
            int expected = Float.isFinite(s[i]) && s[i] > 0
                    ? 0xFF000000 | style.colours().rgbAt((Math.log10(s[i]) - lo) / span) : 0;
            assertThat(img.getRGB(i % w, i / w)).as("pixel %d", i).isEqualTo(expected);
        }
    }

    @Test
    void largePicturesTakeTheSameColoursFromTheBoundsOfEachColour() {
        // 256 x 256 pixels: at least TABLE_PIXELS, so drawn through logBounds; the reference is rgbAt per pixel
        java.util.Random rnd = new java.util.Random(11);
        int w = 256;
        int h = 256;
        assertThat(w * h).isGreaterThanOrEqualTo(PngMaps.TABLE_PIXELS);
        double lo = Math.log10(3.7);
        double span = Math.log10(812.5) - lo;
        int[] bounds = PngMaps.logBounds(lo, span);
        float[] s = new float[w * h];
        for (int i = 0; i < s.length; i++) {
            int kind = rnd.nextInt(10);
            s[i] = switch (kind) {
                case 0 -> Float.NaN;
                case 1 -> -rnd.nextFloat();
                case 2 -> Float.intBitsToFloat(rnd.nextInt(0x7F800000)); // any positive float, subnormals included
                case 3 -> Float.intBitsToFloat(bounds[rnd.nextInt(256)] - rnd.nextInt(2)); // at and below a bound
                case 4 -> rnd.nextBoolean() ? Float.MIN_VALUE : Float.MAX_VALUE;
                default -> (float) Math.pow(10, 4 * rnd.nextDouble() - 0.5);
            };
        }
        WaferMap m = new WaferMap(FloatRaster.wrap(w, h, s), PixelGrid.centred(w, h, 1),
                Quantity.EFFECTIVE_LIFETIME, "", MeasurementConditions.UNKNOWN, Provenance.of(""));
        PngStyle style = PngStyle.DEFAULT.withRange(3.7, 812.5);
        BufferedImage img = PngMaps.render(m, style);
        double styleLo = Math.log10(3.7);
        double styleSpan = Math.log10(812.5) - styleLo;
        for (int i = 0; i < s.length; i++) {
            int expected = Float.isFinite(s[i]) && s[i] > 0
                    ? 0xFF000000 | style.colours().rgbAt((Math.log10(s[i]) - styleLo) / styleSpan) : 0;
            assertThat(img.getRGB(i % w, i / w)).as("pixel %d (%s)", i, s[i]).isEqualTo(expected);
        }
    }

    @Test
    void eachColoursBoundIsTheFirstFloatOfThatColour() {
        for (double[] r : new double[][] {{0, 3}, {Math.log10(2), 2.65}, {-12, 30}, {5, 1e-3}}) {
            int[] bounds = PngMaps.logBounds(r[0], r[1]);
            for (int j = 1; j < 256; j++) {
                assertThat(bounds[j]).isGreaterThanOrEqualTo(bounds[j - 1]);
                if (bounds[j] < 0x7F800000) {
                    assertThat(PngMaps.logIndex(Float.intBitsToFloat(bounds[j]), r[0], r[1])).isGreaterThanOrEqualTo(j);
                }
                if (bounds[j] > 1 && bounds[j] <= 0x7F800000) {
                    assertThat(PngMaps.logIndex(Float.intBitsToFloat(bounds[j] - 1), r[0], r[1])).isLessThan(j);
                }
            }
            java.util.Random rnd = new java.util.Random(3);
            for (int k = 0; k < 20000; k++) {
                int bits = 1 + rnd.nextInt(0x7F7FFFFF);
                assertThat(PngMaps.colourIndex(bounds, bits))
                        .isEqualTo(PngMaps.logIndex(Float.intBitsToFloat(bits), r[0], r[1]));
            }
        }
    }

    /**
     * The bounds found from an estimate of where each colour starts are those of a bisection over every positive
     * float (from the previous bound up to +∞), for narrow, wide, far and degenerate ranges.
     */
    @Test
    void boundsFromTheEstimateEqualTheBisectionOverAllFloats() {
        java.util.Random rnd = new java.util.Random(17);
        java.util.List<double[]> ranges = new java.util.ArrayList<>(java.util.List.of(new double[] {0, 3},
                new double[] {Math.log10(2), 2.65}, new double[] {-12, 30}, new double[] {5, 1e-3},
                new double[] {1, 1e-9}, new double[] {-40, 80}, new double[] {50, 1}, new double[] {-60, 1},
                new double[] {Math.log10(Float.MIN_VALUE), 1e-6}, new double[] {38.5, 1e-7}));
        for (int k = 0; k < 40; k++) {
            ranges.add(new double[] {-50 + 100 * rnd.nextDouble(), Math.pow(10, -8 + 10 * rnd.nextDouble())});
        }
        for (double[] r : ranges) {
            int[] want = new int[256];
            int from = 1;
            for (int j = 0; j < 256; j++) {
                from = PngMaps.bisect(j, from, 0x7F800000, r[0], r[1]);
                want[j] = from;
            }
            assertThat(PngMaps.logBounds(r[0], r[1])).as("range %s", java.util.Arrays.toString(r)).isEqualTo(want);
        }
    }

    @Test
    void theTableOfGroupsGivesTheIndexOfTheBisection() {
        // narrow, wide, everything-one-colour and nothing-coloured ranges; bits at, just below and just above every
        // bound, at the edges of the table's groups of 2^16 patterns, and at random over all positive finite floats
        for (double[] r : new double[][] {{0, 3}, {Math.log10(2), 2.65}, {-12, 30}, {5, 1e-3}, {1, 1e-9}, {-40, 80},
            {50, 1}, {-60, 1}}) {
            int[] bounds = PngMaps.logBounds(r[0], r[1]);
            PngMaps.LogColours table = new PngMaps.LogColours(bounds);
            java.util.List<Integer> probes = new java.util.ArrayList<>();
            for (int b : bounds) {
                for (int d = -2; d <= 2; d++) {
                    probes.add(b + d);
                    probes.add(((b >>> 16) << 16) + d);
                }
            }
            java.util.Random rnd = new java.util.Random(5);
            for (int k = 0; k < 20000; k++) {
                probes.add(1 + rnd.nextInt(0x7F7FFFFF));
            }
            probes.add(1);
            probes.add(0x7F7FFFFF);
            for (int bits : probes) {
                if (bits < 1 || bits > 0x7F7FFFFF) {
                    continue; // not a positive finite float
                }
                assertThat(table.index(bits)).as("bits %x, range %s", bits, java.util.Arrays.toString(r))
                        .isEqualTo(PngMaps.colourIndex(bounds, bits))
                        .isEqualTo(PngMaps.logIndex(Float.intBitsToFloat(bits), r[0], r[1]));
            }
        }
    }

    @Test
    void nonPositiveValuesAreTransparentOnALogScale() {
        WaferMap m = new WaferMap(FloatRaster.wrap(3, 1, new float[] {-1, 0, 5}), PixelGrid.centred(3, 1, 1),
                Quantity.TRAP_DENSITY, "", MeasurementConditions.UNKNOWN, Provenance.of(""));
        BufferedImage img = PngMaps.render(m, PngStyle.DEFAULT);
        assertThat(img.getRGB(0, 0) >>> 24).isZero();
        assertThat(img.getRGB(1, 0) >>> 24).isZero();
        assertThat(img.getRGB(2, 0) >>> 24).isEqualTo(255);
    }

    @Test
    void mapWithoutDataGivesATransparentPicture() throws Exception {
        WaferMap m = new WaferMap(FloatRaster.filled(3, 3, Float.NaN), PixelGrid.centred(3, 3, 1),
                Quantity.EFFECTIVE_LIFETIME, "", MeasurementConditions.UNKNOWN, Provenance.of(""));
        Path f = dir.resolve("empty.png");
        MapFiles.write(m, f);
        assertThat(ImageIO.read(f.toFile()).getRGB(1, 1) >>> 24).isZero();
    }

    @Test
    void logScaleRefusesARangeReachingZero() {
        WaferMap m = ramp(Quantity.TRAP_DENSITY, 5, 1, 5);
        assertThatThrownBy(() -> PngMaps.render(m, PngStyle.DEFAULT.withRange(0, 10)))
                .hasMessageContaining("a log scale needs a colour range above 0");
    }

    @Test
    void blueYellowLightnessRisesSteadily() {
        double last = -1;
        for (int i = 0; i < 256; i += 5) {
            double l = lightness(ColourMap.BLUE_YELLOW.rgb(i));
            assertThat(l).isGreaterThan(last);
            last = l;
        }
        assertThat(lightness(ColourMap.BLUE_YELLOW.rgb(0))).isLessThan(20);
        assertThat(lightness(ColourMap.BLUE_YELLOW.rgb(255))).isGreaterThan(85);
        int first = ColourMap.BLUE_YELLOW.rgb(0);
        int end = ColourMap.BLUE_YELLOW.rgb(255);
        assertThat(first & 0xFF).isGreaterThan(first >> 16 & 0xFF); // blue end
        assertThat(end >> 16 & 0xFF).isGreaterThan(end & 0xFF); // yellow end
    }

    @Test
    void greyIsLinearInCodeValues() {
        assertThat(ColourMap.GREY.rgb(0)).isZero();
        assertThat(ColourMap.GREY.rgb(128)).isEqualTo(0x808080);
        assertThat(ColourMap.GREY.rgb(255)).isEqualTo(0xFFFFFF);
    }

    /** CIE L* of an sRGB colour. */
    private static double lightness(int rgb) {
        double y = 0.2126 * lin(rgb >> 16 & 0xFF) + 0.7152 * lin(rgb >> 8 & 0xFF) + 0.0722 * lin(rgb & 0xFF);
        return y > 216.0 / 24389 ? 116 * Math.cbrt(y) - 16 : 24389.0 / 27 * y;
    }

    private static double lin(int c) {
        double v = c / 255.0;
        return v <= 0.04045 ? v / 12.92 : Math.pow((v + 0.055) / 1.055, 2.4);
    }

    @Test
    void pngIsNotReadAsAMap() throws Exception {
        Path f = dir.resolve("p.png");
        MapFiles.write(ramp(Quantity.OCCUPANCY, 3, 0, 1), f);
        Files.copy(f, dir.resolve("p.tif"));
        assertThatThrownBy(() -> MapFiles.read(f)).isInstanceOf(MapFormatException.class)
                .hasMessage(f + ": is a PNG picture; pictures are not quantitative, so maps are read from TIFF or CSV"
                        + " files");
        assertThatThrownBy(() -> MapFiles.read(dir.resolve("p.tif"))).hasMessageContaining("is a PNG picture");
    }
}
