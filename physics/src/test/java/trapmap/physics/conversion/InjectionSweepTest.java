package trapmap.physics.conversion;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;


import org.junit.jupiter.api.Test;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.defect.TrapLevel;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.shared.error.InvalidValueException;

/** The injection sweep of a pixel agrees with the conversion and with textbook SRH limits. */
class InjectionSweepTest {


    @Test
    void effectiveLifetimeAtTheOperatingPointIsTheMeasuredOneForFixedInjection() {
        Conditions cond = Conditions.of(Doping.pType(1.5e16), Injection.fixed(1e14)).withSurface(
                Surface.sproul(180, 10));
        TrapDensityConverter conv = new TrapDensityConverter(cond, DefectLibrary.byId("fe-i"));
        InjectionSweep c = InjectionSweep.of(conv, 35.0);
        assertThat(c.pixel().status()).isEqualTo(PixelStatus.OK);
        assertThat(c.pixel().injectionPerCm3()).isEqualTo(1e14);
        // consistency with TrapDensityConverter: its N_t put back at the operating point gives the measured τ
        double back = conv.lifetimeAtInjectionUs(c.pixel().trapDensityPerCm3(), c.pixel().injectionPerCm3());
        assertThat(back).isCloseTo(35.0, within(35.0 * 1e-6));
        // Δn = 1e14 is a grid point of the curve (10^(12 + 5·40/100)): the curve passes through the point there
        assertThat(c.injectionPerCm3()[40]).isCloseTo(1e14, within(1e14 * 1e-12));
        assertThat(c.effectiveUs()[40]).isCloseTo(35.0, within(35.0 * 1e-6));
    }

    @Test
    void effectiveLifetimeAtTheOperatingPointIsTheMeasuredOneForFixedGeneration() {
        Conditions cond = Conditions.of(Doping.pType(1e16), Injection.generation(1e19));
        TrapDensityConverter conv = new TrapDensityConverter(cond, DefectLibrary.byId("cr-i"));
        InjectionSweep c = InjectionSweep.of(conv, 20.0);
        assertThat(c.pixel().injectionPerCm3()).isCloseTo(1e19 * 20e-6, within(1.0));
        double back = conv.lifetimeAtInjectionUs(c.pixel().trapDensityPerCm3(), c.pixel().injectionPerCm3());
        assertThat(back).isCloseTo(20.0, within(20.0 * 1e-6));
    }

    @Test
    void lowInjectionTendsToTheMinorityCarrierCaptureTimeForADeepLevelInPType() {
        // Textbook SRH (Schroder, Semiconductor Material and Device Characterization, 3rd ed., ch. 7, from memory;
        // R-LIM-1):
        // in p-type at low injection with a deep level (n1, p1 ≪ p0), τ_SRH → τ_n0 = 1/(σ_n v_th N_t).
        double sigmaN = 1e-14;
        Defect deep = Defect.of("deep-test", "mid-gap test level", TrapLevel.fromIntrinsic(0), sigmaN, 1e-15,
                ThermalVelocityModel.FIXED, "test level", null);
        Silicon si = Silicon.at(300, ThermalVelocityModel.FIXED);
        Conditions cond = Conditions.of(Doping.pType(1e16), Injection.fixed(1e13)).withSilicon(si);
        TrapDensityConverter conv = new TrapDensityConverter(cond, deep);
        InjectionSweep c = InjectionSweep.of(conv, 10.0);
        double nt = c.pixel().trapDensityPerCm3();
        double tauN0Us = 1e6 / (sigmaN * si.electronVthCmPerS() * nt);
        // at Δn = 1e12 cm⁻³ = 1e-4·p0 the remaining terms are of order Δn/p0·(τ_p0/τ_n0) = 1e-3
        assertThat(c.srhUs()[0]).isCloseTo(tauN0Us, within(2e-3 * tauN0Us));
        // with n0, n1, p1 ≪ p0 the same formula reads τ_SRH = τ_n0 + τ_p0·Δn/(p0 + Δn) at any Δn (same source),
        // tending to τ_n0 + τ_p0 at high injection; at Δn = 1e17 = 10·p0, τ_p0 = 10·τ_n0: τ_n0·(1 + 10·10/11)
        double tauHigh = tauN0Us * (1 + 10.0 * 10 / 11);
        assertThat(c.srhUs()[c.srhUs().length - 1]).isCloseTo(tauHigh, within(1e-3 * tauHigh));
    }

    @Test
    void curvesAreTheLimitsTheyCombine() {
        Conditions cond = Conditions.of(Doping.pType(1e16), Injection.fixed(1e15)).withSurface(Surface.sproul(180, 20));
        TrapDensityConverter conv = new TrapDensityConverter(cond, DefectLibrary.byId("fe-i"));
        InjectionSweep c = InjectionSweep.of(conv, 50.0);
        for (int i = 0; i < c.injectionPerCm3().length; i += 10) {
            double sum = 1 / c.srhUs()[i] + 1 / c.intrinsicUs()[i] + 1 / c.surfaceUs();
            assertThat(c.effectiveUs()[i]).isCloseTo(1 / sum, within(1e-9 / sum));
        }
    }
}
