package trapmap.physics.iron;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;
import trapmap.physics.conversion.ConversionWarning;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;

/**
 * Below the Fe_i/FeB crossover dissociating the pairs lowers the lifetime (C &gt; 0), above it raises it (C &lt; 0)
 * (Macdonald, Geerligs &amp; Azzizi, JAP 95, 1021 (2004)); a change the other way beyond the resolution is
 * INCONSISTENT, not "no iron".
 */
class IronDirectionTest {
    private final IronImaging iron = new IronImaging(Doping.pType(1e15), Silicon.at(300));

    @Test
    void crossoverOfThisWaferLiesBetweenTheTwoInjections() {
        assertThat(iron.crossoverPerCm3()).isBetween(3.5e13, 4.2e13);
        assertThat(iron.prefactorSCm3(1e14)).isNegative();
        assertThat(iron.prefactorSCm3(1e12)).isPositive();
    }

    @Test
    void aboveTheCrossoverAFallIsInconsistentAndARiseIsIron() {
        IronResult fall = iron.evaluate(20, 8, 1e14);
        assertThat(fall.status()).isEqualTo(PixelStatus.INCONSISTENT);
        assertThat(fall.ironPerCm3()).isNaN();
        assertThat(fall.reason()).contains("above").contains("raise").contains("fell");
        IronResult rise = iron.evaluate(8, 20, 1e14);
        assertThat(rise.status()).isEqualTo(PixelStatus.OK);
        assertThat(rise.ironPerCm3()).isPositive();
        assertThat(rise.reason()).isEmpty();
    }

    @Test
    void belowTheCrossoverARiseIsInconsistentAndAFallIsIron() {
        assertThat(iron.evaluate(20, 8, 1e12).status()).isEqualTo(PixelStatus.OK);
        IronResult rise = iron.evaluate(8, 20, 1e12);
        assertThat(rise.status()).isEqualTo(PixelStatus.INCONSISTENT);
        assertThat(rise.reason()).contains("below").contains("lower").contains("rose");
    }

    @Test
    void aWrongWayChangeWithinTheResolutionIsBelowTheLimit() {
        // 0.5 % change, resolution 5 %: no signal either way
        IronResult r = iron.evaluate(20, 19.9, 1e14);
        assertThat(r.status()).isEqualTo(PixelStatus.BELOW_LIMIT);
        assertThat(r.ironPerCm3()).isPositive();
        IronResult unchanged = iron.evaluate(20, 20, 1e14);
        assertThat(unchanged.status()).isEqualTo(PixelStatus.BELOW_LIMIT);
    }

    @Test
    void ironIsContinuousAcrossItsDetectionLimit() {
        // below the crossover: the lifetime falls on dissociation; sweep the fall from 0 to 10 % in steps of 1e-4
        double previous = 0;
        int ok = 0;
        int below = 0;
        for (double f = 1.0; f >= 0.9; f -= 1e-4) {
            IronResult r = iron.evaluate(100, 100 * f, 1e12);
            assertThat(r.status()).isIn(PixelStatus.OK, PixelStatus.BELOW_LIMIT);
            double fe = r.ironPerCm3();
            assertThat(fe).as("after = %s·before", f).isGreaterThanOrEqualTo(previous * (1 - 1e-12));
            if (previous > 0) {
                assertThat(fe / previous).as("step at %s", f).isLessThan(1.01);
            }
            previous = fe;
            if (r.status() == PixelStatus.OK) {
                ok++;
            } else {
                below++;
            }
        }
        assertThat(ok).isGreaterThan(100);
        assertThat(below).isGreaterThan(100);
    }

    @Test
    void warnsWithinAFactorTwoOfTheCrossover() {
        double x = iron.crossoverPerCm3();
        assertThat(iron.evaluate(8, 20, 1.9 * x).warnings()).contains(ConversionWarning.NEAR_IRON_CROSSOVER);
        assertThat(iron.evaluate(20, 8, x / 1.9).warnings()).contains(ConversionWarning.NEAR_IRON_CROSSOVER);
        assertThat(iron.evaluate(8, 20, 2.1 * x).warnings()).doesNotContain(ConversionWarning.NEAR_IRON_CROSSOVER);
    }
}
