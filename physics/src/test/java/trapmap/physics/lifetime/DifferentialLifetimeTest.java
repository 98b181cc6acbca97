package trapmap.physics.lifetime;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import org.assertj.core.data.Percentage;
import org.junit.jupiter.api.Test;
import trapmap.shared.error.InvalidValueException;

/**
 * Schmidt, IEEE Trans. Electron Devices 46, 2018 (1999): differential versus actual lifetime. Check values computed
 * from that relation (docs/check-values.md R-DIFF-1).
 */
class DifferentialLifetimeTest {
    /** τ_act = 50 µs·(Δn/1e14)^0.3: τ_act(1e15) = 99.76 µs. */
    private static double actual(double dn) {
        return 50e-6 * Math.pow(dn / 1e14, 0.3);
    }

    @Test
    void powerLawActualLifetimeGivesDifferentialOverOneMinusExponent() {
        // R-DIFF-1: τ_act ∝ Δn^0.3, τ_act = 99.76 µs at 1e15 → τ_diff = 142.5 µs (0.5 %)
        double dn = 1e15;
        double slope = 0.3 * actual(dn) / dn;
        double diff = DifferentialLifetime.differentialS(actual(dn), slope, dn);
        assertThat(diff).isCloseTo(142.5e-6, Percentage.withPercentage(0.5));
    }

    @Test
    void integratingTheDifferentialLifetimeRecoversTheActualLifetime() {
        // R-DIFF-1: the integral back-conversion returns 99.76 µs (0.5 %)
        double back = DifferentialLifetime.actualS(dn -> actual(dn) / 0.7, 1e15);
        assertThat(back).isCloseTo(99.76e-6, Percentage.withPercentage(0.5));
        assertThat(back).isCloseTo(actual(1e15), Percentage.withPercentage(1e-3));
    }

    @Test
    void constantLifetimeIsItsOwnDifferentialLifetime() {
        assertThat(DifferentialLifetime.differentialS(100e-6, 0, 1e14)).isEqualTo(100e-6);
        assertThat(DifferentialLifetime.actualS(dn -> 100e-6, 1e14)).isCloseTo(100e-6, Percentage.withPercentage(1e-9));
    }

    @Test
    void rejectsNonPositiveInjectionNamingFieldAndUnit() {
        assertThatThrownBy(() -> DifferentialLifetime.actualS(dn -> 1e-4, -1))
                .isInstanceOf(InvalidValueException.class).hasMessageContaining("injection")
                .hasMessageContaining("cm^-3");
    }
}
