package trapmap.physics.iron;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

/**
 * Numbers in the reason of an inconsistent iron pair read as a person writes them: three significant digits, plain
 * between 1e-3 and 1e5, otherwise with a short exponent.
 */
class IronReasonNumbersTest {

    @Test
    void plainInTheMiddleRangeAndShortExponentsOutsideIt() {
        assertThat(IronImaging.num(20)).isEqualTo("20");
        assertThat(IronImaging.num(8)).isEqualTo("8");
        assertThat(IronImaging.num(12.345)).isEqualTo("12.3");
        assertThat(IronImaging.num(0.001)).isEqualTo("0.001");
        assertThat(IronImaging.num(1.234e-8)).isEqualTo("1.23e-8");
        assertThat(IronImaging.num(99_000)).isEqualTo("99000");
        assertThat(IronImaging.num(1e5)).isEqualTo("1e5");
        assertThat(IronImaging.num(3.838e13)).isEqualTo("3.84e13");
        assertThat(IronImaging.num(-20)).isEqualTo("-20");
        assertThat(IronImaging.num(Double.NaN)).isEqualTo("NaN");
        assertThat(IronImaging.num(Double.POSITIVE_INFINITY)).isEqualTo("Infinity");
    }
}
