package trapmap.viewer.model;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

class UnitsTest {
    @Test
    void numbersDropTrailingZeros() {
        assertThat(Units.number(4)).isEqualTo("4");
        assertThat(Units.number(16.5)).isEqualTo("16.5");
        assertThat(Units.number(183.34)).isEqualTo("183.3");
        assertThat(Units.number(0.0123)).isEqualTo("0.0123");
        assertThat(Units.number(3e11)).isEqualTo("3e11");
        assertThat(Units.number(1.654e11)).isEqualTo("1.65e11");
        assertThat(Units.number(2.5e-5)).isEqualTo("2.5e-5");
        assertThat(Units.number(Double.NaN)).isEqualTo("–");
    }

    @Test
    void unitsReadAsWritten() {
        assertThat(Units.withUnit(3e11, "cm^-3")).isEqualTo("3e11 cm⁻³");
        assertThat(Units.withUnit(1e19, "cm^-3 s^-1")).isEqualTo("1e19 cm⁻³ s⁻¹");
        assertThat(Units.percent(0.0123)).isEqualTo("1.23 %");
    }
}
