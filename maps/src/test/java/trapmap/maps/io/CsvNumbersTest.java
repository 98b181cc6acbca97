package trapmap.maps.io;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

class CsvNumbersTest {
    @ParameterizedTest
    @ValueSource(strings = {"0", "-1", "+2.", ".5", "1e3", "1.5E-07", "-0.0e+1"})
    void decimalNumbersAreNumbers(String t) {
        assertThat(CsvNumbers.isNumber(t)).isTrue();
    }

    @ParameterizedTest
    @ValueSource(strings = {"", "-", ".", "e3", "1e", "1e+", "0x10", "1,5", "NaN", "Infinity", "1d", " 1"})
    void otherTextIsNotANumber(String t) {
        assertThat(CsvNumbers.isNumber(t)).isFalse();
    }

    @Test
    void valueReadsDecimalCommasOnlyUnderSemicolonsAndEmptyOrNanAsNoData() throws Exception {
        assertThat(CsvNumbers.value("1,5", "w.csv", 3, "us", ';', 1)).isEqualTo(1.5f);
        assertThat(CsvNumbers.value("\"2.5\"", "w.csv", 3, "us", ',', 1)).isEqualTo(2.5f);
        assertThat(CsvNumbers.value("", "w.csv", 3, "us", ',', 1)).isNaN();
        assertThat(CsvNumbers.value("-NaN", "w.csv", 3, "us", ',', 1)).isNaN();
        assertThatThrownBy(() -> CsvNumbers.value("1,5", "w.csv", 3, "us", '\t', 1))
                .isInstanceOf(MapFormatException.class).hasMessageContaining("line 3")
                .hasMessageContaining("value '1,5' is not a number").hasMessageContaining("µs");
    }

    @Test
    void valueAppliesTheUnitFactorToTheDecimalText() throws Exception {
        // 0.001 s read with the factor 1e6 µs/s is exactly 1000 µs
        assertThat(CsvNumbers.value("0.001", "w.csv", 2, "s", ',', 1e6)).isEqualTo(1000f);
        assertThatThrownBy(() -> CsvNumbers.value("1e33", "w.csv", 2, "s", ',', 1e6))
                .isInstanceOf(MapFormatException.class).hasMessageContaining("beyond the 32-bit float range");
    }

    @Test
    void coordinatesOutsideAMillionMillimetresAreRefusedInMm() {
        assertThatThrownBy(() -> CsvNumbers.coordinate("2e6", "w.csv", 4, "x_mm", ','))
                .isInstanceOf(MapFormatException.class).hasMessageContaining("x_mm '2e6' is outside [-1e6, 1e6]")
                .hasMessageContaining("mm");
    }

    @Test
    void lifetimeFactorTakesLifetimesToMicrosecondsAndLeavesOtherQuantities() {
        Sidecar ms = new Sidecar(null, null, "ms", null, null, null, null, null, null, null, null, null, List.of());
        assertThat(CsvNumbers.lifetimeFactor(ms, null)).isEqualTo(1000.0);
        Sidecar none = new Sidecar(null, null, null, null, null, null, null, null, null, null, null, null, List.of());
        assertThat(CsvNumbers.lifetimeFactor(none, "ns")).isEqualTo(1e-3);
        assertThat(CsvNumbers.lifetimeFactor(none, "counts")).isEqualTo(1.0);
        assertThat(CsvNumbers.lifetimeFactor(none, null)).isEqualTo(1.0);
    }

    @Test
    void niceGivesTheShortestDecimalWithinOnePartInABillion() {
        assertThat(CsvNumbers.nice(0.1 + 0.2)).isEqualTo(0.3);
        assertThat(CsvNumbers.nice(2.0000000001)).isEqualTo(2.0);
        assertThat(CsvNumbers.nice(1.2345)).isEqualTo(1.2345);
    }
}
