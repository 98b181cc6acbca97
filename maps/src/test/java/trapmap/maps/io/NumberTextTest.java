package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;

import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

class NumberTextTest {

    /**
     * Brute-force reference: the fewest significant digits p of a decimal that reads back to {@code v}. A p-digit
     * decimal reads back to v only if it lies in v's rounding interval, which is contiguous and contains v, so when
     * any p-digit decimal reads back, the p-digit decimal just below v or the one just above v does too: trying
     * both for p = 1, 2, … finds the least p.
     */
    private static int shortestDigits(double v) {
        BigDecimal exact = new BigDecimal(v);
        for (int p = 1; p <= 17; p++) {
            for (RoundingMode m : new RoundingMode[] {RoundingMode.FLOOR, RoundingMode.CEILING}) {
                if (Double.parseDouble(exact.round(new MathContext(p, m)).toString()) == v) {
                    return p;
                }
            }
        }
        throw new AssertionError("no decimal of at most 17 digits reads back to " + v);
    }

    /** The same reference for floats (9 digits always suffice). */
    private static int shortestDigits(float v) {
        BigDecimal exact = new BigDecimal(v);
        for (int p = 1; p <= 9; p++) {
            for (RoundingMode m : new RoundingMode[] {RoundingMode.FLOOR, RoundingMode.CEILING}) {
                if (Float.parseFloat(exact.round(new MathContext(p, m)).toString()) == v) {
                    return p;
                }
            }
        }
        throw new AssertionError("no decimal of at most 9 digits reads back to " + v);
    }

    /** Significant digits of a decimal text: its digits less the exponent and the leading and trailing zeros. */
    private static int digits(String text) {
        String mantissa = text.replaceFirst("[eE].*", "").replace("-", "").replace(".", "");
        String d = mantissa.replaceFirst("^0+", "").replaceFirst("0+$", "");
        return Math.max(1, d.length());
    }

    private static void assertShortest(double v) {
        String s = NumberText.of(v);
        assertThat(Double.parseDouble(s)).as("%s reads back to %s", s, v).isEqualTo(v);
        assertThat(digits(s)).as("digits of %s for %s", s, v).isEqualTo(shortestDigits(v));
    }

    private static void assertShortest(float v) {
        String s = NumberText.of(v);
        assertThat(Float.parseFloat(s)).as("%s reads back to %s", s, v).isEqualTo(v);
        assertThat(digits(s)).as("digits of %s for %s", s, v).isEqualTo(shortestDigits(v));
    }

    @Test
    void doublesReadBackWithTheFewestDigitsOverRandomBitPatternsAndDecimals() {
        SplittableRandom r = new SplittableRandom(20261204);
        for (int i = 0; i < 100_000; i++) {
            double v = Double.longBitsToDouble(r.nextLong());
            if (Double.isFinite(v)) {
                assertShortest(v);
            }
            // values as outputs hold them: sums and products of short decimals (0.1 + 0.2, 0.3 × 248)
            assertShortest(r.nextInt(100_000) / 100.0 + r.nextInt(1000) / 1000.0);
            assertShortest((r.nextInt(4000) - 2000) * 0.3);
            assertShortest(r.nextDouble() * Math.pow(10, r.nextInt(-20, 20)));
            assertShortest(Double.longBitsToDouble(r.nextLong(1L << (1 + r.nextInt(52))))); // subnormal
        }
    }

    @Test
    void floatsReadBackWithTheFewestDigitsOverRandomBitPatterns() {
        SplittableRandom r = new SplittableRandom(17);
        for (int i = 0; i < 40_000; i++) {
            float v = Float.intBitsToFloat(r.nextInt());
            if (Float.isFinite(v)) {
                assertShortest(v);
            }
            assertShortest((float) (r.nextDouble() * 1e13));
            assertShortest(Float.intBitsToFloat(r.nextInt(1 << (1 + r.nextInt(23))))); // subnormal
        }
    }

    @Test
    void javaSeventeensLongerTextsAreShortened() {
        // Double.toString of Java 17 writes 1e23 as 9.999999999999999E22 and 2^57 with 18 digits
        assertThat(NumberText.of(1e23)).isEqualTo("1E23");
        assertShortest(1e23);
        assertShortest(-2.31845256772633248E17);
        assertShortest(Double.MIN_VALUE);
        assertShortest(Double.MAX_VALUE);
        assertShortest(Float.MIN_VALUE);
    }

    @Test
    void shortTextsWithoutATrailingPointZero() {
        assertThat(NumberText.of(858.0)).isEqualTo("858");
        assertThat(NumberText.of(0.0)).isEqualTo("0");
        assertThat(NumberText.of(1.266396561408E12)).isEqualTo("1.266396561408E12");
        assertThat(NumberText.of(1e12)).isEqualTo("1E12");
        assertThat(NumberText.of(0.1 + 0.2)).isEqualTo("0.30000000000000004");
        assertThat(NumberText.of(0.1f)).isEqualTo("0.1");
        assertThat(NumberText.of(Double.NaN)).isEmpty();
        assertThat(NumberText.of(Double.POSITIVE_INFINITY)).isEmpty();
        assertThat(NumberText.of(Float.NaN)).isEmpty();
    }

    @Test
    void noisyPositionsAndAreasAreRoundedToTheirResolution() {
        assertThat(NumberText.mm(122.75999999999999)).isEqualTo("122.76");
        assertThat(NumberText.mm2(21.760000000000005)).isEqualTo("21.76");
        assertThat(NumberText.mm(2.0999999999989996)).isEqualTo("2.1");
        assertThat(NumberText.mm(248 * 0.3)).isEqualTo("74.4");
        assertThat(NumberText.mm(-73.73194968553459)).isEqualTo("-73.732");
        assertThat(NumberText.mm(75.0)).isEqualTo("75");
        assertThat(NumberText.mm(-0.0004)).isEqualTo("0");
        assertThat(NumberText.mm2(1e7 / 3)).isEqualTo("3333333.333");
        assertThat(NumberText.mm(Double.NaN)).isEmpty();
        assertThat(NumberText.roundMm(122.75999999999999)).isEqualTo(122.76);
        assertThat(NumberText.roundMm2(21.760000000000005)).isEqualTo(21.76);
        SplittableRandom r = new SplittableRandom(5);
        for (int i = 0; i < 10_000; i++) {
            double v = (r.nextDouble() - 0.5) * 400;
            double back = Double.parseDouble(NumberText.mm(v));
            assertThat(Math.abs(back - v)).isLessThanOrEqualTo(NumberText.POSITION_RESOLUTION_MM / 2 + 1e-12);
            assertThat(NumberText.mm(v)).matches("-?\\d+(\\.\\d{1,3})?");
        }
    }

    @Test
    void roundedValuesAreWhatTheirDecimalTextsReadBackTo() {
        SplittableRandom r = new SplittableRandom(17);
        java.util.List<Double> values = new java.util.ArrayList<>(java.util.List.of(0.0, -0.0, 0.0005, -0.0005,
                0.0625, -0.0625, 0.1875, 2.5e-4, 1e-300, -1e-300, 4503599627370.4965, 9.1e12, -9.1e12, 1e300,
                Double.MIN_VALUE, Double.MAX_VALUE, -Double.MAX_VALUE));
        for (int i = 0; i < 40_000; i++) {
            switch (i % 4) {
                case 0 -> values.add((r.nextDouble() - 0.5) * 400);
                // exact midpoints (odd sixteenths) and their neighbours
                case 1 -> {
                    double midpoint = (2 * (r.nextInt(20_000) - 10_000) + 1) / 16.0;
                    int k = r.nextInt(3);
                    values.add(k == 0 ? midpoint : k == 1 ? Math.nextUp(midpoint) : Math.nextDown(midpoint));
                }
                case 2 -> values.add(r.nextInt(2_000_000) / 1000.0 + 0.0005 * (r.nextInt(3) - 1));
                default -> values.add(Math.scalb(r.nextDouble() - 0.5, r.nextInt(120) - 60));
            }
        }
        for (double v : values) {
            assertThat(NumberText.roundMm(v)).as("%s", v).isEqualTo(Double.parseDouble(NumberText.mm(v)));
            assertThat(NumberText.roundMm2(v)).as("%s", v).isEqualTo(Double.parseDouble(NumberText.mm2(v)));
        }
        assertThat(1 / NumberText.roundMm(-0.0001)).isPositive(); // "0", not "-0"
        assertThat(NumberText.roundMm(Double.NaN)).isNaN();
    }

    @Test
    void samplesOfAFloatMapAreWrittenAtFloatPrecision() {
        float median = 243.05972f;
        assertThat(NumberText.sample(median)).isEqualTo("243.05972");
        assertThat(Float.parseFloat(NumberText.sample(median))).isEqualTo(median);
        assertThat(NumberText.sample(2.2769992990719986E11)).isEqualTo("2.2769993E11");
    }

    @Test
    void gridPositionsAreTheExactDecimalsOfIndexLessCentreTimesPitch() {
        for (double pitch : new double[] {0.3, 0.1, 0.15, 0.05, 1.2, 0.0625}) {
            for (double centre : new double[] {128, 128.5, 99.25, 0}) {
                for (int i = -5; i < 1200; i++) {
                    String s = NumberText.gridPosition(i, centre, pitch);
                    BigDecimal expected = BigDecimal.valueOf(i).subtract(BigDecimal.valueOf(centre))
                            .multiply(BigDecimal.valueOf(pitch));
                    assertThat(new BigDecimal(s)).as("pixel %d, centre %s, pitch %s", i, centre, pitch)
                            .isEqualByComparingTo(expected);
                    double px = centre + Double.parseDouble(s) / pitch;
                    assertThat(Math.abs(px - i)).isLessThan(1e-9);
                }
            }
        }
        assertThat(NumberText.gridPosition(376, 128, 0.3)).isEqualTo("74.4");
        assertThat(NumberText.gridPosition(128, 128, 0.3)).isEqualTo("0");
        // a centre whose decimal is long: the double product, shortest
        double centre = 1.0 / 3;
        assertThat(Double.parseDouble(NumberText.gridPosition(7, centre, 0.3))).isEqualTo((7 - centre) * 0.3);
    }

    @Test
    void aCsvMapAtAPitchWithoutAnExactDoubleReadsBackOntoTheSamePixelsWithShortTexts(
            @org.junit.jupiter.api.io.TempDir java.nio.file.Path dir) throws Exception {
        int w = 120;
        int h = 90;
        float[] samples = new float[w * h];
        SplittableRandom r = new SplittableRandom(3);
        for (int i = 0; i < samples.length; i++) {
            samples[i] = i % 17 == 0 ? Float.NaN : (float) (r.nextDouble() * 300);
        }
        trapmap.maps.raster.PixelGrid grid = new trapmap.maps.raster.PixelGrid(w, h, 0.3, 60.5, 44.5);
        trapmap.maps.model.WaferMap map = new trapmap.maps.model.WaferMap(
                trapmap.maps.raster.FloatRaster.wrap(w, h, samples), grid,
                trapmap.maps.model.Quantity.EFFECTIVE_LIFETIME, "w", trapmap.maps.model.MeasurementConditions.UNKNOWN,
                trapmap.maps.model.Provenance.of("test"));
        java.nio.file.Path f = dir.resolve("w.csv");
        MapFiles.write(map, f);
        for (String line : java.nio.file.Files.readAllLines(f)) {
            if (line.startsWith("#") || line.startsWith("x_mm")) {
                continue;
            }
            String[] c = line.split(",");
            assertThat(c[0]).matches("-?\\d+(\\.\\d?[1-9])?");
            assertThat(c[1]).matches("-?\\d+(\\.\\d?[1-9])?");
            assertThat(c[2]).isEqualTo(NumberText.of(Float.parseFloat(c[2])));
        }
        trapmap.maps.model.WaferMap back = MapFiles.readSingle(f);
        assertThat(back.grid()).isEqualTo(grid);
        assertThat(back.raster().samples()).isEqualTo(samples);
    }
}
