package trapmap.maps.raster;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

class PitchPrecisionTest {

    @Test
    void decimalsFollowThePitch() {
        assertThat(PitchPrecision.decimals(0.5)).isEqualTo(1);
        assertThat(PitchPrecision.decimals(0.1)).isEqualTo(1);
        assertThat(PitchPrecision.decimals(0.6)).isEqualTo(1);
        assertThat(PitchPrecision.decimals(0.05)).isEqualTo(2);
        assertThat(PitchPrecision.decimals(1.0)).isZero();
        assertThat(PitchPrecision.decimals(2.5)).isZero();
        assertThat(PitchPrecision.decimals(1e-9)).isEqualTo(PitchPrecision.MAX_DECIMALS);
        assertThat(PitchPrecision.decimals(0)).isZero();
        assertThat(PitchPrecision.decimals(Double.NaN)).isZero();
    }

    @Test
    void positionsHaveThePitchsDecimalsAndNoNegativeZero() {
        assertThat(PitchPrecision.mm(-3.116e-3, 0.5)).isEqualTo("0.0");
        assertThat(PitchPrecision.mm(-0.02456, 0.5)).isEqualTo("0.0");
        assertThat(PitchPrecision.mm(-73.73194968553459, 0.6)).isEqualTo("-73.7");
        assertThat(PitchPrecision.mm(12.345, 0.05)).isEqualTo("12.35");
        assertThat(PitchPrecision.mm(12.5, 1)).isEqualTo("13");
        assertThat(PitchPrecision.mm(Double.NaN, 1)).isEqualTo("n/a");
    }

    @Test
    void areasHaveTheDecimalsOfOnePixel() {
        // 65172 pixels of 0.6 mm: 23461.92 mm², one pixel 0.36 mm² -> one decimal
        assertThat(PitchPrecision.areaMm2(65172 * 0.36, 0.6)).isEqualTo("23461.9");
        assertThat(PitchPrecision.areaMm2(4 * 0.01, 0.1)).isEqualTo("0.04");
        assertThat(PitchPrecision.areaMm2(1234, 2)).isEqualTo("1234");
        assertThat(PitchPrecision.areaOfPixels(65172 * 0.36, 65172)).isEqualTo("23461.9");
        assertThat(PitchPrecision.areaOfPixels(0, 0)).isEqualTo("0");
    }
}
