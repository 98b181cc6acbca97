package trapmap.physics.conversion;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.iron.IronImaging;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;

/** Cautions that must travel with results (README, Models: warnings that travel with results). */
class ConversionWarningsTest {
    @Test
    void surfaceTermAtHighInjectionIsFlagged() {
        Conditions low = Conditions.of(Doping.pType(1e15), Injection.fixed(5e13)).withSurface(Surface.sproul(180, 10));
        Conditions high = low.withInjection(Injection.fixed(5e14));
        assertThat(new TrapDensityConverter(low, DefectLibrary.byId("fe-i")).convert(20).warnings())
                .doesNotContain(ConversionWarning.SURFACE_LOW_INJECTION_DIFFUSIVITY);
        assertThat(new TrapDensityConverter(high, DefectLibrary.byId("fe-i")).convert(20).warnings())
                .contains(ConversionWarning.SURFACE_LOW_INJECTION_DIFFUSIVITY);
        Conditions ideal = high.withSurface(Surface.IDEAL);
        assertThat(new TrapDensityConverter(ideal, DefectLibrary.byId("fe-i")).convert(20).warnings())
                .doesNotContain(ConversionWarning.SURFACE_LOW_INJECTION_DIFFUSIVITY);
    }

    @Test
    void surfaceLimitedLifetimeIsFlagged() {
        // S = 1e4 cm/s on 180 µm: τ_surf ≈ 2 µs (Sproul 1994), so a 3 µs lifetime is surface-limited.
        Conditions c = Conditions.of(Doping.pType(1e16), Injection.fixed(1e14)).withSurface(Surface.sproul(180, 1e4));
        PixelResult r = new TrapDensityConverter(c, DefectLibrary.byId("fe-i")).convert(1.5);
        assertThat(r.warnings()).contains(ConversionWarning.SURFACE_LIMITED);
    }

    @Test
    void ironWithGreenVelocitiesAndFixedConventionParametersIsFlagged() {
        IronImaging green = new IronImaging(Doping.pType(1e16), Silicon.at(300, ThermalVelocityModel.GREEN_1990));
        IronImaging fixed = new IronImaging(Doping.pType(1e16), Silicon.at(300));
        assertThat(green.evaluate(20, 8, 1e12).warnings()).contains(ConversionWarning.VELOCITY_CONVENTION);
        assertThat(fixed.evaluate(20, 8, 1e12).warnings()).doesNotContain(ConversionWarning.VELOCITY_CONVENTION);
    }

    @Test
    void temperatureAwayFrom300KIsFlagged() {
        Conditions c = Conditions.of(Doping.pType(1e16), Injection.fixed(1e14)).withSilicon(Silicon.at(320));
        assertThat(new TrapDensityConverter(c, DefectLibrary.byId("fe-i")).convert(10).warnings())
                .contains(ConversionWarning.TEMPERATURE_NOT_300K);
    }
}
