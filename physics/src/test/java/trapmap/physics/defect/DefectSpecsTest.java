package trapmap.physics.defect;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.function.Consumer;
import org.junit.jupiter.api.Test;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.shared.error.InvalidValueException;

/** Validation of user-defined defects: every rejected field is named, with its unit where it has one. */
class DefectSpecsTest {
    private static final String ORIGIN = "my-defects.json";

    /** A valid FeB-like description; each test breaks one field. */
    private static Map<String, Object> valid() {
        Map<String, Object> level = new HashMap<>();
        level.put("reference", "Ec");
        level.put("energy_ev", 0.26);
        Map<String, Object> spread = new HashMap<>();
        spread.put("energy_ev", List.of(0.23, 0.26));
        spread.put("sigma_n_cm2", List.of(2.5e-15, 3e-14));
        spread.put("sigma_p_cm2", List.of(1.1e-15, 5.5e-15));
        Map<String, Object> m = new HashMap<>();
        m.put("id", "my-feb");
        m.put("name", "iron-boron, own set");
        m.put("source", "Macdonald et al., APL 89, 142107 (2006)");
        m.put("level", level);
        m.put("sigma_n_cm2", 5e-15);
        m.put("sigma_p_cm2", 3e-15);
        m.put("spread", spread);
        return m;
    }

    private static Map<String, Object> with(Consumer<Map<String, Object>> change) {
        Map<String, Object> m = valid();
        change.accept(m);
        return m;
    }

    @SuppressWarnings("unchecked")
    private static Map<String, Object> level(Map<String, Object> m) {
        return (Map<String, Object>) m.get("level");
    }

    @SuppressWarnings("unchecked")
    private static Map<String, Object> spread(Map<String, Object> m) {
        return (Map<String, Object>) m.get("spread");
    }

    private static void rejects(Map<String, Object> spec, String field, String unit) {
        assertThatThrownBy(() -> DefectSpecs.fromMap(spec, ORIGIN))
                .isInstanceOf(InvalidValueException.class)
                .hasMessageContaining(ORIGIN)
                .hasMessageContaining(field)
                .hasMessageContaining(unit)
                .satisfies(e -> assertThat(((InvalidValueException) e).field()).contains(field))
                .satisfies(e -> assertThat(((InvalidValueException) e).unit()).isEqualTo(unit));
    }

    @Test
    void acceptsAValidDescription() {
        Defect d = DefectSpecs.fromMap(valid(), ORIGIN);
        assertThat(d.id()).isEqualTo("my-feb");
        assertThat(d.level()).isEqualTo(TrapLevel.belowConductionBand(0.26));
        assertThat(d.electronCrossSectionCm2()).isEqualTo(5e-15);
        assertThat(d.holeCrossSectionCm2()).isEqualTo(3e-15);
        assertThat(d.captureRatio()).isCloseTo(5.0 / 3.0, org.assertj.core.data.Offset.offset(1e-12));
        assertThat(d.velocityConvention()).isEqualTo(ThermalVelocityModel.FIXED);
        assertThat(d.spread().electronCrossSectionCm2()).isEqualTo(new Range(2.5e-15, 3e-14));
        assertThat(d.source()).contains("Macdonald");
    }

    @Test
    void optionalFields() {
        Map<String, Object> m = with(x -> {
            x.remove("name");
            x.remove("spread");
            x.put("vth_convention", "green");
            level(x).put("degeneracy", 2);
            level(x).put("reference", "Ei");
            level(x).put("energy_ev", -0.1);
        });
        Defect d = DefectSpecs.fromMap(m, ORIGIN);
        assertThat(d.name()).isEqualTo("my-feb");
        assertThat(d.velocityConvention()).isEqualTo(ThermalVelocityModel.GREEN_1990);
        assertThat(d.level()).isEqualTo(new TrapLevel(EnergyReference.INTRINSIC, -0.1, 2));
        assertThat(d.spread().energyEv()).isEqualTo(Range.of(-0.1));
        assertThat(DefectSpecs.fromMap(with(x -> level(x).put("reference", "Ev")), ORIGIN).level().reference())
                .isEqualTo(EnergyReference.VALENCE_BAND);
    }

    @Test
    void missingRequiredFields() {
        rejects(with(x -> x.remove("id")), "id", "");
        rejects(with(x -> x.remove("source")), "source", "");
        rejects(with(x -> x.remove("level")), "level", "");
        rejects(with(x -> level(x).remove("reference")), "reference", "");
        rejects(with(x -> level(x).remove("energy_ev")), "energy_ev", "eV");
        rejects(with(x -> x.remove("sigma_n_cm2")), "sigma_n_cm2", "cm^2");
        rejects(with(x -> x.remove("sigma_p_cm2")), "sigma_p_cm2", "cm^2");
    }

    @Test
    void wrongTypes() {
        rejects(with(x -> x.put("id", 42)), "id", "");
        rejects(with(x -> x.put("id", " ")), "id", "");
        rejects(with(x -> x.put("source", List.of("a"))), "source", "");
        rejects(with(x -> x.put("level", "Ec - 0.26")), "level", "");
        rejects(with(x -> level(x).put("energy_ev", "0.26")), "energy_ev", "eV");
        rejects(with(x -> level(x).put("degeneracy", "two")), "degeneracy", "");
        rejects(with(x -> x.put("sigma_n_cm2", "5e-15")), "sigma_n_cm2", "cm^2");
        rejects(with(x -> x.put("sigma_p_cm2", true)), "sigma_p_cm2", "cm^2");
        rejects(with(x -> x.put("vth_convention", 1.1e7)), "vth_convention", "");
        rejects(with(x -> x.put("spread", List.of(0.23, 0.26))), "spread", "");
        rejects(with(x -> spread(x).put("sigma_n_cm2", List.of(1e-15))), "spread.sigma_n_cm2", "cm^2");
        rejects(with(x -> spread(x).put("energy_ev", List.of("a", "b"))), "spread.energy_ev", "eV");
    }

    @Test
    void unknownKeys() {
        rejects(with(x -> x.put("sigma_n", 5e-15)), "sigma_n", "");
        rejects(with(x -> level(x).put("energy", 0.26)), "level.energy", "");
        rejects(with(x -> spread(x).put("k", List.of(1, 2))), "spread.k", "");
        assertThatThrownBy(() -> DefectSpecs.fromMap(with(x -> x.put("colour", "red")), ORIGIN))
                .hasMessageContaining("known:").hasMessageContaining("sigma_n_cm2");
    }

    @Test
    void badReferenceAndConvention() {
        rejects(with(x -> level(x).put("reference", "Ef")), "level.reference", "");
        rejects(with(x -> x.put("vth_convention", "bullis")), "vth_convention", "");
    }

    @Test
    void spreadMustContainNominal() {
        rejects(with(x -> spread(x).put("energy_ev", List.of(0.27, 0.30))), "spread.energy_ev", "eV");
        rejects(with(x -> spread(x).put("sigma_n_cm2", List.of(1e-15, 4e-15))), "spread.sigma_n_cm2", "cm^2");
        rejects(with(x -> spread(x).put("sigma_p_cm2", List.of(4e-15, 1e-14))), "spread.sigma_p_cm2", "cm^2");
        rejects(with(x -> spread(x).put("sigma_p_cm2", List.of(0.0, 1e-14))), "spread.sigma_p_cm2", "cm^2");
        assertThatThrownBy(() -> DefectSpecs.fromMap(with(x -> spread(x).put("energy_ev", List.of(0.27, 0.30))),
                ORIGIN)).hasMessageContaining("nominal");
    }

    @Test
    void outOfRangeValues() {
        rejects(with(x -> level(x).put("energy_ev", -0.1)), "energy", "eV");
        rejects(with(x -> level(x).put("energy_ev", 1.5)), "energy", "eV");
        rejects(with(x -> level(x).put("degeneracy", 0)), "degeneracy", "");
        rejects(with(x -> level(x).put("degeneracy", -2)), "degeneracy", "");
        rejects(with(x -> {
            x.put("sigma_n_cm2", 1e-30);
            x.remove("spread");
        }), "sigma_n", "cm^2");
        rejects(with(x -> {
            x.put("sigma_p_cm2", 1e-3);
            x.remove("spread");
        }), "sigma_p", "cm^2");
        rejects(with(x -> x.put("id", "Fe B")), "id", "");
    }

    // A negative or zero cross-section must be reported under its own field and unit.
    @Test
    void negativeOrZeroCrossSectionNamesItsField() {
        rejects(with(x -> {
            x.put("sigma_n_cm2", -5e-15);
            x.remove("spread");
        }), "sigma_n", "cm^2");
        rejects(with(x -> {
            x.put("sigma_n_cm2", 0.0);
            x.remove("spread");
        }), "sigma_n", "cm^2");
        rejects(with(x -> {
            x.put("sigma_p_cm2", 0.0);
            x.remove("spread");
        }), "sigma_p", "cm^2");
    }

    // A non-finite cross-section (possible from JSON/YAML readers that accept NaN/Infinity) must be reported under
    // its own field and unit.
    @Test
    void nonFiniteCrossSectionNamesItsField() {
        rejects(with(x -> {
            x.put("sigma_n_cm2", Double.NaN);
            x.remove("spread");
        }), "sigma_n", "cm^2");
        rejects(with(x -> {
            x.put("sigma_p_cm2", Double.POSITIVE_INFINITY);
            x.remove("spread");
        }), "sigma_p", "cm^2");
    }

    // A spread reaching outside the values a level or cross-section may take must be rejected when the description
    // is read, not accepted and then fail (or silently give nonsense bounds) during conversion.
    @Test
    void energySpreadOutsideTheLevelRangeIsRejected() {
        Map<String, Object> spec = with(x -> spread(x).put("energy_ev", List.of(-0.5, 0.3)));
        rejects(spec, "spread.energy_ev", "eV");
    }

    @Test
    void crossSectionSpreadOutsideTheValidRangeIsRejected() {
        rejects(with(x -> spread(x).put("sigma_n_cm2", List.of(2.5e-15, 1.0))), "spread.sigma_n_cm2", "cm^2");
    }

    @Test
    void aSpreadErrorNamesTheOriginOnce() {
        Map<String, Object> m = with(x -> spread(x).put("energy", List.of(0.2, 0.3)));
        assertThatThrownBy(() -> DefectSpecs.fromMap(m, ORIGIN)).isInstanceOf(InvalidValueException.class)
                .hasMessageStartingWith(ORIGIN + ": field 'spread.energy' is not a known field");
    }
}
