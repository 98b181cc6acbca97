package trapmap.physics.material;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.params.provider.ValueSource;
import trapmap.shared.error.InvalidValueException;

class DopingTextTest {
    @ParameterizedTest
    @CsvSource(delimiter = '|', value = {
        "p:1e16          | P | 1e16",
        "P : 1.5E16      | P | 1.5e16",
        "n:5e15 cm^-3    | N | 5e15",
        "n:5e15cm-3      | N | 5e15",
        "p:2e15 /cm3     | P | 2e15",
        "p:3e14 cm⁻³     | P | 3e14",
        "n:.5e12         | N | 5e11"})
    void densityFormsGiveTheirDensity(String text, ConductivityType type, double perCm3) {
        DopingText d = DopingText.parse(text);

        assertThat(d.doping()).isEqualTo(new Doping(type, perCm3));
        assertThat(d.fromResistivity()).isFalse();
        assertThat(DopingText.unitOf(text)).isEqualTo("cm^-3");
    }

    @ParameterizedTest
    @ValueSource(strings = {"p:1.5ohmcm", "p:1.5 Ohm.cm", "p:1.5 ohm*cm", "p:1.5Ω·cm", "p:1.5 OHM-CM"})
    void resistivityFormsGoThroughAstmF723(String text) {
        DopingText d = DopingText.parse(text);

        // the density is the one ASTM F723 gives for boron at 1.5 Ω·cm (AstmF723ReferenceTest checks the fit)
        assertThat(d.doping()).isEqualTo(Doping.fromResistivity(ConductivityType.P, 1.5));
        assertThat(d.resistivityOhmCm()).isEqualTo(1.5);
        assertThat(d.fromResistivity()).isTrue();
        assertThat(DopingText.unitOf(text)).isEqualTo("Ω·cm");
    }

    @Test
    void nTypeResistivityUsesPhosphorus() {
        assertThat(DopingText.parse("n:2ohmcm").doping())
                .isEqualTo(new Doping(ConductivityType.N, AstmF723.phosphorusPerCm3(2)));
        assertThat(Doping.parse("n:2ohmcm")).isEqualTo(DopingText.parse("n:2ohmcm").doping());
    }

    @ParameterizedTest
    @CsvSource(delimiter = '|', value = {
        "x:1e16          | cm^-3 | must be <type>:<value> with type p or n",
        "1e16            | cm^-3 | (got '1e16')",
        "''              | cm^-3 | (got '')",
        "p:              | cm^-3 | must be <type>:<value>",
        "p:1e16furlongs  | cm^-3 | unit 'furlongs' is neither cm^-3 nor Ω·cm (ohmcm)",
        "p:1e25          | cm^-3 | density must be in [1e10, 1e19] cm^-3 (got 1e25)",
        "n:-5e15         | cm^-3 | density must be in [1e10, 1e19] cm^-3 (got -5e15)",
        "p:1e999         | cm^-3 | density must be in [1e10, 1e19] cm^-3 (got 1e999)",
        "p:1e9ohmcm      | Ω·cm  | resistivity must be in [1e-4, 10000] Ω·cm (got 1e9)",
        "p:0ohmcm        | Ω·cm  | resistivity must be in [1e-4, 10000] Ω·cm (got 0)",
        "p:0.001ohmcm    | Ω·cm  | resistivity 0.001 Ω·cm gives",
        "p:0.001ohmcm    | Ω·cm  | cm^-3 by ASTM F723, outside the accepted [1e10, 1e19] cm^-3"})
    void invalidFormsNameTheFieldTheUnitAndTheRule(String text, String unit, String message) {
        assertThatThrownBy(() -> DopingText.parse(text)).isInstanceOfSatisfying(InvalidValueException.class, e -> {
            assertThat(e.field()).isEqualTo("doping");
            assertThat(e.unit()).isEqualTo(unit);
            assertThat(e.getMessage()).contains(message);
        });
    }

    @Test
    void nullIsRefusedLikeEmptyText() {
        assertThatThrownBy(() -> DopingText.parse(null)).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("(got '')");
    }

    @Test
    void exactFormsAreShort() {
        assertThat(DopingText.exact(1e10)).isEqualTo("1e10");
        assertThat(DopingText.exact(1e-4)).isEqualTo("1e-4");
        assertThat(DopingText.exact(10000)).isEqualTo("10000");
        assertThat(DopingText.exact(4.61e11)).isEqualTo("4.61e11");
        assertThat(DopingText.exact(0.5)).isEqualTo("0.5");
    }
}
