package trapmap.physics.iron;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;
import trapmap.physics.conversion.Conditions;
import trapmap.physics.conversion.ConversionWarning;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;

/**
 * Iron imaging when the two states never cross over: no crossover, no crossover warning, and a finite prefactor
 * of one sign at every injection. The mutation-testing run (scripts/mutation) showed this path untested.
 */
class IronMutationGuardTest {

    // Macdonald, Geerligs & Azzizi, JAP 95, 1021 (2004): C = 1/(χ_Fei − χ_FeB). A "pair" state with both capture
    // cross-sections of Fe_i doubled recombines twice as fast per trap at every Δn (χ is linear in c_n, c_p when
    // both scale together), so χ_Fei − χ_FeB = −χ_Fei never vanishes: there is no crossover, and C = −1/χ_Fei.
    @Test
    void statesThatNeverCrossHaveNoCrossoverAndNoWarning() {
        Defect fei = DefectLibrary.byId("fe-i");
        Defect twiceAsStrong = fei.withParameters(fei.level().energyEv(), 2 * fei.electronCrossSectionCm2(),
                2 * fei.holeCrossSectionCm2());
        Silicon si = Silicon.at(300, fei.velocityConvention());
        IronImaging iron = new IronImaging(Doping.pType(1e15), si, fei, twiceAsStrong, Conditions.DEFAULT_RESOLUTION);
        assertThat(iron.crossoverPerCm3()).isNaN();
        for (double dn : new double[] {1e10, 1e13, 1e16}) {
            IronResult r = iron.evaluate(10, 20, dn);
            assertThat(r.warnings()).doesNotContain(ConversionWarning.NEAR_IRON_CROSSOVER);
            assertThat(r.prefactorUsCm3()).isNegative();
            // Lifetime rose on dissociation while the new state recombines more weakly: positive iron.
            assertThat(r.status()).isEqualTo(PixelStatus.OK);
            assertThat(r.ironPerCm3()).isPositive();
        }
    }
}
