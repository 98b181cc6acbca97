package trapmap.physics.defect;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.shared.error.InvalidValueException;

/**
 * Validation paths of user-defined defects (DefectSpecs, Defect) and the level text shown in reports that the
 * library tests leave open: every bad field gives one message naming the file, the field and the unit. The
 * mutation-testing run (scripts/mutation) showed these gaps.
 */
class DefectMutationGuardTest {
    private static final String FILE = "my-defects.json";

    /** A valid description of a deep level 0.38 eV above E_v, changed by {@code edits}. */
    private static Map<String, Object> spec(Object... edits) {
        Map<String, Object> level = new HashMap<>(Map.of("reference", "Ev", "energy_ev", 0.38));
        Map<String, Object> m = new HashMap<>(Map.of("id", "my-level", "source", "own measurement",
                "level", level, "sigma_n_cm2", 5e-14, "sigma_p_cm2", 7e-17));
        for (int i = 0; i < edits.length; i += 2) {
            String key = (String) edits[i];
            if (key.startsWith("level.")) {
                level.put(key.substring(6), edits[i + 1]);
            } else {
                m.put(key, edits[i + 1]);
            }
        }
        return m;
    }

    private static InvalidValueException refused(Map<String, Object> spec) {
        return org.junit.jupiter.api.Assertions.assertThrows(InvalidValueException.class,
                () -> DefectSpecs.fromMap(spec, FILE));
    }

    @Test
    void aValidDescriptionGivesTheDefectWithDefaults() {
        Defect d = DefectSpecs.fromMap(spec(), FILE);
        assertThat(d.name()).isEqualTo("my-level");
        assertThat(d.level().degeneracy()).isEqualTo(1.0);
        assertThat(d.velocityConvention()).isEqualTo(ThermalVelocityModel.FIXED);
        assertThat(d.spread().energyEv()).isEqualTo(Range.of(0.38));
        assertThat(DefectSpecs.fromMap(spec("vth_convention", " Green "), FILE).velocityConvention())
                .isEqualTo(ThermalVelocityModel.GREEN_1990);
        assertThat(DefectSpecs.fromMap(spec("vth_convention", "FIXED"), FILE).velocityConvention())
                .isEqualTo(ThermalVelocityModel.FIXED);
    }

    // Model errors inside the level are reported under the file's field names, level.energy_ev and
    // level.degeneracy, with the file name in the message.
    @Test
    void levelErrorsNameTheFilesFields() {
        InvalidValueException energy = refused(spec("level.energy_ev", 1.5));
        assertThat(energy.field()).isEqualTo("level.energy_ev");
        assertThat(energy.getMessage()).startsWith(FILE + ": ");
        InvalidValueException g = refused(spec("level.degeneracy", -2.0));
        assertThat(g.field()).isEqualTo("level.degeneracy");
        InvalidValueException sigma = refused(spec("sigma_n_cm2", 1e-5));
        assertThat(sigma.field()).isEqualTo("sigma_n_cm2");
        assertThat(sigma.unit()).isEqualTo("cm^2");
    }

    @Test
    void numbersAndTextsOfTheWrongKindAreNamed() {
        assertThat(refused(spec("level.energy_ev", "deep")).getMessage())
                .contains("'level.energy_ev' must be a number in eV but was 'deep'");
        assertThat(refused(spec("level.degeneracy", "two")).getMessage())
                .contains("'level.degeneracy' must be a number but was 'two'");
        Map<String, Object> noEnergy = spec();
        ((Map<String, Object>) noEnergy.get("level")).remove("energy_ev");
        assertThat(refused(noEnergy).getMessage()).contains("'level.energy_ev' is required (a number in eV)");
        Map<String, Object> noG = spec("level.degeneracy", null);
        assertThat(DefectSpecs.fromMap(noG, FILE).level().degeneracy()).isEqualTo(1.0);
        assertThat(refused(spec("id", "  ")).getMessage()).contains("'id' must be a non-empty text");
        assertThat(refused(spec("name", 42)).getMessage()).contains("'name' must be a non-empty text");
        assertThat(refused(spec("vth_convention", "slow")).field()).isEqualTo("vth_convention");
    }

    @Test
    void spreadIsValidatedFieldByField() {
        assertThat(refused(spec("spread", List.of(1, 2))).field()).isEqualTo("spread");
        assertThat(refused(spec("spread", Map.of("energy_ev", List.of(0.3, 0.4, 0.5)))).field())
                .isEqualTo("spread.energy_ev");
        assertThat(refused(spec("spread", Map.of("energy_ev", List.of("a", 0.4)))).getMessage())
                .contains("list of two numbers [min, max] in eV");
        assertThat(refused(spec("spread", Map.of("energy_ev", List.of(0.3, "b")))).field())
                .isEqualTo("spread.energy_ev");
        assertThat(refused(spec("spread", Map.of("energy_ev", List.of(0.4, 0.5)))).getMessage())
                .contains("must contain the nominal value 0.38");
        assertThat(refused(spec("spread", Map.of("energy_ev", List.of(0.3, 0.37)))).getMessage())
                .contains("must contain the nominal value 0.38");
        assertThat(refused(spec("spread", Map.of("sigma_p_cm2", List.of(1e-17, 1e-9)))).getMessage())
                .contains("must lie within");
        // Closed ranges: the nominal value alone, and the full energy range [0, 1.2] eV from a band edge.
        Defect d = DefectSpecs.fromMap(spec("spread", Map.of("energy_ev", List.of(0.0, 1.2),
                "sigma_n_cm2", List.of(5e-14, 5e-14))), FILE);
        assertThat(d.spread().energyEv()).isEqualTo(new Range(0.0, 1.2));
        assertThat(d.spread().electronCrossSectionCm2()).isEqualTo(Range.of(5e-14));
        assertThat(d.spread().holeCrossSectionCm2()).isEqualTo(Range.of(7e-17));
        assertThat(d.spread().note()).isEqualTo("user-defined");
    }

    // A level given from mid-gap (E_i) may lie below it: its spread runs from −0.6 to +0.6 eV; one given from a
    // band edge cannot be negative.
    @Test
    void midgapLevelsMayHaveANegativeSpread() {
        Defect d = DefectSpecs.fromMap(spec("level.reference", "Ei", "level.energy_ev", -0.1,
                "spread", Map.of("energy_ev", List.of(-0.6, 0.0))), FILE);
        assertThat(d.spread().energyEv().min()).isEqualTo(-0.6);
        assertThat(refused(spec("level.reference", "Ei", "level.energy_ev", -0.1,
                "spread", Map.of("energy_ev", List.of(-0.61, 0.0)))).getMessage()).contains("must lie within");
        assertThat(refused(spec("level.reference", "Ei", "level.energy_ev", -0.1,
                "spread", Map.of("energy_ev", List.of(-0.2, 0.61)))).getMessage()).contains("must lie within [-0.6, 0.6]");
        assertThat(refused(spec("spread", Map.of("energy_ev", List.of(-0.01, 0.4)))).getMessage())
                .contains("must lie within [0.0, 1.2]");
    }

    // Defect: both cross-sections or neither; the ratio must match them; a missing source reads as empty text.
    @Test
    void defectNeedsBothCrossSectionsAndAConsistentRatio() {
        TrapLevel l = TrapLevel.aboveValenceBand(0.38);
        InvalidValueException one = org.junit.jupiter.api.Assertions.assertThrows(InvalidValueException.class,
                () -> new Defect("x", "x", l, 1e-14, Double.NaN, 1, ThermalVelocityModel.FIXED, "s", null));
        assertThat(one.field()).isEqualTo("sigma_p");
        assertThat(one.unit()).isEqualTo("cm^2");
        InvalidValueException other = org.junit.jupiter.api.Assertions.assertThrows(InvalidValueException.class,
                () -> new Defect("x", "x", l, Double.NaN, 1e-14, 1, ThermalVelocityModel.FIXED, "s", null));
        assertThat(other.field()).isEqualTo("sigma_n");
        assertThatThrownBy(() -> new Defect("x", "x", l, 1e-14, 1e-15, 10.001, ThermalVelocityModel.FIXED, "s",
                null)).hasMessageContaining("captureRatio 10.001 differs from sigma_n/sigma_p");
        assertThat(new Defect("x", "x", l, 1e-14, 1e-15, 1e-14 / 1e-15, ThermalVelocityModel.FIXED, null, null)
                .source()).isEmpty();
    }

    // The level text of reports and help (EnergyReference.format): reference, sign and energy to 4 decimals.
    @Test
    void levelTextNamesReferenceSignAndEnergy() {
        assertThat(TrapLevel.aboveValenceBand(0.38).toString()).isEqualTo("E_v + 0.38 eV");
        assertThat(TrapLevel.belowConductionBand(0.2).toString()).isEqualTo("E_c - 0.2 eV");
        assertThat(TrapLevel.fromIntrinsic(-0.1).toString()).isEqualTo("E_i - 0.1 eV");
        assertThat(TrapLevel.fromIntrinsic(0.0).toString()).isEqualTo("E_i + 0.0 eV");
        assertThat(TrapLevel.fromIntrinsic(0.05).toString()).isEqualTo("E_i + 0.05 eV");
        assertThat(new TrapLevel(EnergyReference.VALENCE_BAND, 0.1, 2).toString()).isEqualTo("E_v + 0.1 eV (g = 2.0)");
    }

    @Test
    void rangeIsClosed() {
        Range r = new Range(1, 2);
        assertThat(r.contains(1)).isTrue();
        assertThat(r.contains(2)).isTrue();
        assertThat(r.contains(0.999)).isFalse();
        assertThat(r.contains(2.001)).isFalse();
        assertThat(Range.of(3).contains(3)).isTrue();
        assertThat(Range.of(3).contains(3.0001)).isFalse();
    }
}
