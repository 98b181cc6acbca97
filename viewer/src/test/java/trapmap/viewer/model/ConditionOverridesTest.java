package trapmap.viewer.model;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.Map;
import org.junit.jupiter.api.Test;
import trapmap.maps.model.MeasurementConditions;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.TrapLevel;
import trapmap.physics.material.Doping;
import trapmap.physics.material.ThermalVelocityModel;

class ConditionOverridesTest {
    private static final MeasurementConditions SIDECAR = new MeasurementConditions(Doping.pType(1e16), 180.0, 300.0,
            null, 1e19, 10.0, null, null, Map.of("lot", "A01"));

    @Test
    void emptyOverridesKeepTheSidecar() {
        assertThat(ConditionOverrides.NONE.applyTo(SIDECAR)).isEqualTo(SIDECAR);
    }

    @Test
    void anInjectionLevelReplacesTheSidecarsGenerationRate() {
        MeasurementConditions c = ConditionOverrides.NONE.withInjection(1e14).applyTo(SIDECAR);
        assertThat(c.injectionPerCm3()).isEqualTo(1e14);
        assertThat(c.generationPerCm3PerS()).isNull();
        assertThat(c.thicknessUm()).isEqualTo(180.0);
        assertThat(c.extra()).containsEntry("lot", "A01");
    }

    @Test
    void settingGenerationClearsAnInjectionOverride() {
        ConditionOverrides o = ConditionOverrides.NONE.withInjection(1e14).withGeneration(2e19);
        assertThat(o.injectionPerCm3()).isNull();
        assertThat(o.applyTo(SIDECAR).generationPerCm3PerS()).isEqualTo(2e19);
    }

    @Test
    void resistivityIsConvertedAndOverridesTheType() {
        MeasurementConditions c = ConditionOverrides.NONE.withDoping("n:2ohmcm").applyTo(SIDECAR);
        assertThat(c.doping().type().name()).isEqualTo("N");
        // ASTM F723 (Thurber et al., NBS SP 400-64) phosphorus at 2 Ω·cm: 2.3372e15 cm^-3 (computed from the
        // standard's fit; docs/check-values.md R-ASTM-1), 0.1 %
        assertThat(c.doping().densityPerCm3()).isCloseTo(2.3372e15,
                org.assertj.core.data.Percentage.withPercentage(0.1));
    }

    @Test
    void outOfRangeValuesNameFieldAndUnit() {
        assertThatThrownBy(() -> ConditionOverrides.NONE.withThickness(-5.0)).hasMessageContaining("thickness")
                .hasMessageContaining("µm");
        assertThatThrownBy(() -> ConditionOverrides.NONE.withDoping("x:1e16")).isInstanceOf(
                IllegalArgumentException.class);
    }

    @Test
    void userDefectsMayNotReuseALibraryId() {
        DefectChoices choices = new DefectChoices();
        Defect clash = Defect.of("fe-i", "another iron", TrapLevel.aboveValenceBand(0.38), 1e-14, 1e-16,
                ThermalVelocityModel.FIXED, "test", null);
        assertThatThrownBy(() -> choices.add(clash)).hasMessageContaining("library defect");
        Defect own = Defect.of("my-fe", "another iron", TrapLevel.aboveValenceBand(0.38), 1e-14, 1e-16,
                ThermalVelocityModel.FIXED, "test", null);
        choices.add(own);
        assertThat(choices.byId("my-fe")).isSameAs(own);
        assertThat(choices.all()).last().isSameAs(own);
        assertThat(DefectChoices.library()).allMatch(Defect::hasAbsoluteCrossSections);
    }

    @Test
    void dopingTextIsReadByTheOneParserWhateverItsSpelling() {
        assertThat(ConditionOverrides.NONE.parsedDoping()).isNull();
        var ohm = ConditionOverrides.NONE.withDoping("n : 2 Ohm.cm").parsedDoping();
        assertThat(ohm.fromResistivity()).isTrue();
        assertThat(ohm.resistivityOhmCm()).isEqualTo(2.0);
        assertThat(ohm.doping()).isEqualTo(Doping.parse("n:2ohmcm"));
        var density = ConditionOverrides.NONE.withDoping("p:5e15 cm^-3").parsedDoping();
        assertThat(density.fromResistivity()).isFalse();
        assertThat(density.doping()).isEqualTo(Doping.pType(5e15));
    }

    @Test
    void badDopingNamesTheFieldAndTheUnit() {
        assertThatThrownBy(() -> ConditionOverrides.NONE.withDoping("p:1e25"))
                .isInstanceOfSatisfying(trapmap.shared.error.InvalidValueException.class, e -> {
                    assertThat(e.field()).isEqualTo("doping");
                    assertThat(e.unit()).isEqualTo("cm^-3");
                    assertThat(e.getMessage()).isEqualTo("density must be in [1e10, 1e19] cm^-3 (got 1e25)");
                });
    }
}
