package trapmap.physics.conversion;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.util.Set;
import org.junit.jupiter.api.Test;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.material.ConductivityType;
import trapmap.physics.material.DensityOfStatesModel;
import trapmap.physics.material.IntrinsicDensityModel;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.recombination.SurfaceModel;
import trapmap.shared.error.InvalidValueException;

/**
 * The physics settings object: its names (the settings file's words), its description for provenance, the derived
 * silicon, and the conductivity types of the library defects that the type warning names.
 */
class PhysicsSettingsTest {

    @Test
    void defaultsAreTheNormativeChoicesAndSayTheyAreDefault() {
        PhysicsSettings d = PhysicsSettings.DEFAULTS;
        assertThat(d.isDefault()).isTrue();
        assertThat(d.velocities()).isEqualTo(ThermalVelocityModel.FIXED);
        assertThat(d.surfaceModel()).isEqualTo(SurfaceModel.SPROUL);
        assertThat(d.intrinsicDensity()).isEqualTo(IntrinsicDensityModel.ALTERMATT_2003);
        assertThat(d.densityOfStates()).isEqualTo(DensityOfStatesModel.GREEN_1990);
        assertThat(d.withVelocities(ThermalVelocityModel.GREEN_1990).isDefault()).isFalse();
        assertThat(d.withSurfaceModel(SurfaceModel.EXACT).isDefault()).isFalse();
    }

    @Test
    void withMethodsChangeOnlyTheirChoice() {
        PhysicsSettings g = PhysicsSettings.DEFAULTS.withVelocities(ThermalVelocityModel.GREEN_1990);
        assertThat(g.velocities()).isEqualTo(ThermalVelocityModel.GREEN_1990);
        assertThat(g.withVelocities(ThermalVelocityModel.FIXED)).isEqualTo(PhysicsSettings.DEFAULTS);
        PhysicsSettings e = PhysicsSettings.DEFAULTS.withSurfaceModel(SurfaceModel.EXACT);
        assertThat(e.surfaceModel()).isEqualTo(SurfaceModel.EXACT);
        assertThat(e.withSurfaceModel(SurfaceModel.SPROUL)).isEqualTo(PhysicsSettings.DEFAULTS);
    }

    @Test
    void descriptionUsesTheFileKeysAndNamesAndReadsBack() {
        PhysicsSettings s = PhysicsSettings.DEFAULTS.withVelocities(ThermalVelocityModel.GREEN_1990);
        assertThat(s.describe()).containsExactly(
                java.util.Map.entry("thermal_velocity", "green"),
                java.util.Map.entry("surface_model", "sproul"),
                java.util.Map.entry("intrinsic_density", "altermatt-2003"),
                java.util.Map.entry("density_of_states", "green-1990"),
                java.util.Map.entry("radiative_coefficient_cm3_s", Double.toString(s.radiativeCm3PerS())),
                java.util.Map.entry("detection_resolution", Double.toString(s.detectionResolution())));
        assertThat(s.oneLine()).startsWith("thermal_velocity=green, surface_model=sproul, intrinsic_density=")
                .endsWith("detection_resolution=" + s.detectionResolution());
        // every name written reads back to its choice
        for (ThermalVelocityModel v : ThermalVelocityModel.values()) {
            assertThat(PhysicsSettings.choice(ThermalVelocityModel.class, PhysicsSettings.name(v), "f")).isEqualTo(v);
        }
        for (IntrinsicDensityModel m : IntrinsicDensityModel.values()) {
            assertThat(PhysicsSettings.choice(IntrinsicDensityModel.class, PhysicsSettings.name(m), "f"))
                    .isEqualTo(m);
        }
    }

    @Test
    void choiceAcceptsTheEnumSpellingAndRefusesOthersNamingTheField() {
        assertThat(PhysicsSettings.choice(ThermalVelocityModel.class, " Green-1990 ", "thermal_velocity"))
                .isEqualTo(ThermalVelocityModel.GREEN_1990);
        assertThat(PhysicsSettings.choice(SurfaceModel.class, "EXACT", "surface_model")).isEqualTo(SurfaceModel.EXACT);
        assertThatThrownBy(() -> PhysicsSettings.choice(SurfaceModel.class, "fast", "surface_model"))
                .isInstanceOf(InvalidValueException.class)
                .hasMessage("surface_model 'fast' is not one of sproul, exact")
                .satisfies(e -> assertThat(((InvalidValueException) e).field()).isEqualTo("surface_model"));
        assertThatThrownBy(() -> PhysicsSettings.choice(SurfaceModel.class, null, "surface_model"))
                .isInstanceOf(InvalidValueException.class);
    }

    @Test
    void siliconCarriesTheChosenModels() {
        PhysicsSettings s = PhysicsSettings.DEFAULTS.withVelocities(ThermalVelocityModel.GREEN_1990);
        Silicon si = s.silicon(300);
        assertThat(si.velocityModel()).isEqualTo(ThermalVelocityModel.GREEN_1990);
        assertThat(si.intrinsicModel()).isEqualTo(IntrinsicDensityModel.ALTERMATT_2003);
        // Altermatt et al., JAP 93, 1598 (2003): n_i = 9.65e9 cm^-3 at 300 K
        assertThat(si.intrinsicPerCm3()).isCloseTo(9.65e9, within(1e3));
        // Green, JAP 67, 2944 (1990): v_th,e = 2.046e7 cm/s at 300 K
        assertThat(si.electronVthCmPerS()).isCloseTo(2.046e7, within(0.01e7));
    }

    @Test
    void outOfRangeNumbersNameFieldAndUnit() {
        assertThatThrownBy(() -> new PhysicsSettings(ThermalVelocityModel.FIXED, SurfaceModel.SPROUL,
                IntrinsicDensityModel.ALTERMATT_2003, DensityOfStatesModel.GREEN_1990, 1e-12, 0.05))
                .isInstanceOf(InvalidValueException.class)
                .satisfies(e -> assertThat(((InvalidValueException) e).field())
                        .isEqualTo("radiative_coefficient_cm3_s"));
        assertThatThrownBy(() -> new PhysicsSettings(ThermalVelocityModel.FIXED, SurfaceModel.SPROUL,
                IntrinsicDensityModel.ALTERMATT_2003, DensityOfStatesModel.GREEN_1990, 4.73e-15, 0))
                .isInstanceOf(InvalidValueException.class)
                .satisfies(e -> assertThat(((InvalidValueException) e).field()).isEqualTo("detection_resolution"));
    }

    @Test
    void intrinsicDensityFitRangesAreThePublishedOnes() {
        // Sproul & Green, JAP 70, 846 (1991): temperature form fitted over 275-375 K
        assertThat(IntrinsicDensityModel.ALTERMATT_2003.validMinK()).isEqualTo(275);
        assertThat(IntrinsicDensityModel.ALTERMATT_2003.validMaxK()).isEqualTo(375);
        assertThat(IntrinsicDensityModel.ALTERMATT_2003.covers(275)).isTrue();
        assertThat(IntrinsicDensityModel.ALTERMATT_2003.covers(375)).isTrue();
        assertThat(IntrinsicDensityModel.ALTERMATT_2003.covers(274.9)).isFalse();
        assertThat(IntrinsicDensityModel.ALTERMATT_2003.covers(375.1)).isFalse();
    }

    @Test
    void defectTypesFollowWhereTheDefectForms() {
        // iron-boron pairs need boron (p-type); the gold acceptor level governs n-type recombination (Graff 2000)
        assertThat(DefectLibrary.suitedTypes(DefectLibrary.byId("fe-b"))).containsExactly(ConductivityType.P);
        assertThat(DefectLibrary.suitedTypes(DefectLibrary.byId("au-a"))).containsExactly(ConductivityType.N);
        assertThat(DefectLibrary.suitedTypes(DefectLibrary.byId("midgap")))
                .isEqualTo(Set.of(ConductivityType.P, ConductivityType.N));
        assertThat(DefectLibrary.suitability(DefectLibrary.byId("fe-b")).label()).isEqualTo("p-type");
        assertThat(DefectLibrary.suitability(DefectLibrary.byId("au-a")).label()).isEqualTo("n-type");
        assertThat(DefectLibrary.suitability(DefectLibrary.byId("cr-i")).label()).isEqualTo("p- and n-type");
        assertThat(DefectLibrary.suitability(null).label()).isEqualTo("p- and n-type");
        assertThat(DefectLibrary.suitedFor(ConductivityType.N)).containsExactly("cr-i", "au-a", "midgap");
    }
}
