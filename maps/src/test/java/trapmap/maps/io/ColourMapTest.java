package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;

import java.util.Arrays;
import java.util.EnumSet;
import java.util.Set;
import java.util.stream.Collectors;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.EnumSource;

/**
 * Perceptual checks of the colour maps on the 8-bit colours they actually produce. Colours are taken back to CIELAB
 * with the sRGB decoding and sRGB→XYZ matrix of IEC 61966-2-1:1999 and the L*a*b* formulas of CIE 15:2004 (§8.2.1,
 * D65 white); colour differences are CIE76 ΔE*ab (CIE 15:2004 §8.3, Euclidean distance in L*a*b*).
 */
class ColourMapTest {
    /** Stride of the lightness and step checks: 8-bit rounding moves L* by up to about 0.1 between neighbours. */
    private static final int STRIDE = 4;

    private static final Set<ColourMap> SEQUENTIAL = EnumSet.complementOf(EnumSet.of(ColourMap.DIVERGING));

    /**
     * Machado, Oliveira &amp; Fernandes 2009, "A Physiologically-based Model for Simulation of Color Vision
     * Deficiency", IEEE TVCG 15(6) 1291–1298: simulation matrices at severity 1.0 from the authors' supplementary
     * table, applied to linear sRGB.
     */
    private static final double[][] DEUTERANOPIA = {
        {0.367322, 0.860646, -0.227968},
        {0.280085, 0.672501, 0.047413},
        {-0.011820, 0.042940, 0.968881},
    };
    private static final double[][] PROTANOPIA = {
        {0.152286, 1.052583, -0.204868},
        {0.114503, 0.786281, 0.099216},
        {-0.003882, -0.048116, 1.051998},
    };

    @Test
    void thereAreFourPerceptualMapsBesidesGreyWithNamesAndDescriptions() {
        assertThat(ColourMap.values()).hasSizeGreaterThanOrEqualTo(5);
        for (ColourMap m : ColourMap.values()) {
            assertThat(m.displayName()).isNotBlank();
            assertThat(m.description()).isNotBlank().doesNotContain("\n");
        }
        assertThat(Arrays.stream(ColourMap.values()).map(ColourMap::displayName).collect(Collectors.toSet()))
                .hasSize(ColourMap.values().length);
        assertThat(Arrays.stream(ColourMap.values()).filter(ColourMap::colourBlindSafe))
                .containsExactly(ColourMap.BLUE_YELLOW);
        assertThat(Arrays.stream(ColourMap.values()).filter(ColourMap::diverging))
                .containsExactly(ColourMap.DIVERGING);
    }

    @ParameterizedTest
    @EnumSource(ColourMap.class)
    void sequentialMapsRiseInLightnessThroughout(ColourMap m) {
        if (!SEQUENTIAL.contains(m)) {
            return;
        }
        for (int i = 0; i + STRIDE < 256; i++) {
            assertThat(lab(m.rgb(i + STRIDE))[0]).as("L* of %s entries %d → %d", m, i, i + STRIDE)
                    .isGreaterThan(lab(m.rgb(i))[0]);
            assertThat(lab(m.rgb(i + 1))[0] - lab(m.rgb(i))[0]).as("L* step of %s at %d (8-bit rounding)", m, i)
                    .isGreaterThan(-0.1);
        }
        assertThat(lab(m.rgb(0))[0]).isLessThan(15);
        assertThat(lab(m.rgb(255))[0]).isGreaterThan(90);
    }

    /**
     * The coloured maps are spaced evenly along their CIELAB path, so ΔE over 8 entries stays within ±15 % of its mean
     * along the whole map (band chosen from the 8-bit rounding, about ±0.7 ΔE on steps of about 4–6).
     */
    @ParameterizedTest
    @EnumSource(value = ColourMap.class, names = "GREY", mode = EnumSource.Mode.EXCLUDE)
    void perceptualStepIsNearlyUniform(ColourMap m) {
        double[] steps = new double[31];
        for (int k = 0; k < steps.length; k++) {
            steps[k] = deltaE(lab(m.rgb(8 * k)), lab(m.rgb(8 * k + 8)));
        }
        double mean = Arrays.stream(steps).average().orElseThrow();
        assertThat(mean).isGreaterThan(3);
        for (int k = 0; k < steps.length; k++) {
            assertThat(steps[k]).as("ΔE of %s entries %d → %d (mean %.2f)", m, 8 * k, 8 * k + 8, mean)
                    .isBetween(0.85 * mean, 1.15 * mean);
        }
    }

    @Test
    void divergingMapIsSymmetricInLightnessAboutItsPaleCentre() {
        ColourMap m = ColourMap.DIVERGING;
        for (int i = 0; i < 128; i++) {
            assertThat(lab(m.rgb(i))[0]).as("L* at %d and %d", i, 255 - i)
                    .isCloseTo(lab(m.rgb(255 - i))[0], org.assertj.core.data.Offset.offset(0.5));
        }
        for (int i = 0; i + STRIDE <= 124; i++) {
            assertThat(lab(m.rgb(i + STRIDE))[0]).isGreaterThan(lab(m.rgb(i))[0]);
            assertThat(lab(m.rgb(255 - i - STRIDE))[0]).isGreaterThan(lab(m.rgb(255 - i))[0]);
        }
        double[] centre = lab(m.rgb(128));
        assertThat(centre[0]).isGreaterThan(90);
        assertThat(Math.hypot(centre[1], centre[2])).as("chroma at the centre").isLessThan(6);
        double[] low = lab(m.rgb(0));
        double[] high = lab(m.rgb(255));
        assertThat(low[2]).as("b* of the low end (blue)").isLessThan(-30);
        assertThat(high[1]).as("a* of the high end (red)").isGreaterThan(30);
    }

    @Test
    void blueYellowStaysOrderedAndDistinctUnderDeuteranopiaAndProtanopia() {
        for (double[][] deficiency : new double[][][] {DEUTERANOPIA, PROTANOPIA}) {
            double[][] sim = new double[256][];
            for (int i = 0; i < 256; i++) {
                sim[i] = lab(simulate(ColourMap.BLUE_YELLOW.rgb(i), deficiency));
            }
            for (int i = 0; i + STRIDE < 256; i++) {
                assertThat(sim[i + STRIDE][0]).as("simulated L* %d → %d", i, i + STRIDE).isGreaterThan(sim[i][0]);
            }
            assertThat(sim[255][0] - sim[0][0]).as("simulated lightness span").isGreaterThan(70);
            assertThat(deltaE(sim[0], sim[255])).as("simulated ΔE of the ends").isGreaterThan(80);
        }
    }

    @Test
    void noEntryIsClippedToTheGamut() {
        for (ColourMap m : ColourMap.values()) {
            assertThat(m.gamutExcess()).as("%s", m).isZero();
        }
    }

    @Test
    void greyIsLinearInCodeValues() {
        for (int i = 0; i < 256; i++) {
            assertThat(ColourMap.GREY.rgb(i)).isEqualTo(i * 0x010101);
        }
    }

    @Test
    void positionsMapToTheNearestEntry() {
        for (ColourMap m : ColourMap.values()) {
            assertThat(m.rgbAt(0)).isEqualTo(m.rgb(0));
            assertThat(m.rgbAt(1)).isEqualTo(m.rgb(255));
            assertThat(m.rgbAt(-3)).isEqualTo(m.rgb(0));
            assertThat(m.rgbAt(7)).isEqualTo(m.rgb(255));
            assertThat(m.rgbAt(Double.NaN)).isEqualTo(m.rgb(0));
            assertThat(m.rgbAt(100 / 255.0)).isEqualTo(m.rgb(100));
        }
    }

    @Test
    void labRoundTripOfTheConversionUsedToBuildTheMaps() {
        // a mid grey and a saturated colour inside the gamut come back within 8-bit rounding
        for (double[] c : new double[][] {{50, 0, 0}, {60, -30, 20}, {40, 20, -40}}) {
            double[] back = lab(ColourMap.labToRgb(c[0], c[1], c[2]));
            assertThat(deltaE(c, back)).isLessThan(0.8);
        }
    }

    // ---- reference colour science (independent of the code under test) ----

    /** CIELAB (D65) of an sRGB colour: IEC 61966-2-1 decoding and matrix, CIE 15:2004 L*a*b* formulas. */
    static double[] lab(int rgb) {
        double[] lin = {lin(rgb >> 16 & 0xFF), lin(rgb >> 8 & 0xFF), lin(rgb & 0xFF)};
        return labOfLinear(lin);
    }

    private static double[] labOfLinear(double[] c) {
        double x = 0.4124564 * c[0] + 0.3575761 * c[1] + 0.1804375 * c[2];
        double y = 0.2126729 * c[0] + 0.7151522 * c[1] + 0.0721750 * c[2];
        double z = 0.0193339 * c[0] + 0.1191920 * c[1] + 0.9503041 * c[2];
        double fx = f(x / 0.95047);
        double fy = f(y);
        double fz = f(z / 1.08883);
        return new double[] {116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)};
    }

    /** CIE 15:2004 eq. 8.x: f(t) = t^(1/3) above (6/29)³, else t/(3·(6/29)²) + 4/29. */
    private static double f(double t) {
        double d = 6.0 / 29;
        return t > d * d * d ? Math.cbrt(t) : t / (3 * d * d) + 4.0 / 29;
    }

    private static double lin(int code) {
        double v = code / 255.0;
        return v <= 0.04045 ? v / 12.92 : Math.pow((v + 0.055) / 1.055, 2.4);
    }

    private static double deltaE(double[] a, double[] b) {
        return Math.sqrt((a[0] - b[0]) * (a[0] - b[0]) + (a[1] - b[1]) * (a[1] - b[1]) + (a[2] - b[2]) * (a[2] - b[2]));
    }

    /** The colour a dichromat sees, by the Machado 2009 model on linear sRGB, clipped to the gamut, as 0xRRGGBB. */
    private static int simulate(int rgb, double[][] m) {
        double[] c = {lin(rgb >> 16 & 0xFF), lin(rgb >> 8 & 0xFF), lin(rgb & 0xFF)};
        int out = 0;
        for (int r = 0; r < 3; r++) {
            double v = Math.max(0, Math.min(1, m[r][0] * c[0] + m[r][1] * c[1] + m[r][2] * c[2]));
            double e = v <= 0.0031308 ? 12.92 * v : 1.055 * Math.pow(v, 1 / 2.4) - 0.055;
            out = out << 8 | (int) Math.round(e * 255);
        }
        return out;
    }

    @Test
    void roundingOfTheColourIndexEqualsMathRound() {
        java.util.Random rnd = new java.util.Random(2);
        for (int k = 0; k <= 255; k++) {
            for (double x : new double[] {k, k + 0.5, Math.nextDown(k + 0.5), Math.nextUp(k + 0.5), Math.nextDown(k),
                    Math.nextUp(k), k + 0.49999999999999994}) {
                if (x >= 0 && x <= 255) {
                    assertThat(ColourMap.roundHalfUp(x)).as("x = %s", x).isEqualTo((int) Math.round(x));
                }
            }
        }
        for (int i = 0; i < 1_000_000; i++) {
            double x = rnd.nextDouble() * 255;
            assertThat(ColourMap.roundHalfUp(x)).isEqualTo((int) Math.round(x));
        }
        for (int i = 0; i <= 1000; i++) { // the positions rgbAt rounds: t · 255 for t in [0, 1]
            double x = (i / 1000.0) * 255;
            assertThat(ColourMap.roundHalfUp(x)).isEqualTo((int) Math.round(x));
        }
    }
}
