package trapmap.physics.defect;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import org.junit.jupiter.api.DisplayName;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.shared.error.InvalidValueException;

/** The built-in defect library against the Part 1 default table. */
class DefectLibraryTest {

    // Part 1 default defect library (levels and σ as tabulated there, each with its cited source)
    @ParameterizedTest(name = "{0}")
    @CsvSource({
        // id,    reference,       energy, sigma_n, sigma_p
        "fe-i,   VALENCE_BAND,    0.38, 1.3e-14, 7e-17",   // Istratov 1999; Macdonald, Tan & Trupke 2008
        "fe-b,   CONDUCTION_BAND, 0.26, 5e-15,   3e-15",   // Macdonald et al., APL 89, 142107 (2006)
        "cr-i,   CONDUCTION_BAND, 0.24, 2e-14,   4e-15",   // Schmidt et al., JAP 102, 123701 (2007)
        "cr-b,   VALENCE_BAND,    0.28, 5e-15,   1e-14",   // Schmidt et al. (2007)
        "ti-i,   VALENCE_BAND,    0.29, 2.28e-15, 1.9e-16", // Rein, Lifetime Spectroscopy (2005), k = 12
        "mo-i,   VALENCE_BAND,    0.32, 7.8e-15, 6e-16",   // Rein (2005), k = 13
        "au-a,   CONDUCTION_BAND, 0.55, 1.4e-16, 7.6e-15", // Graff (2000)
        "au-d,   VALENCE_BAND,    0.35, 1.9e-15, 2.7e-15", // Graff (2000); Dubois et al. (2006)
        "ni-s,   CONDUCTION_BAND, 0.40, 5.6e-17, 8e-17",   // Rein (2005)
        "midgap, INTRINSIC,       0.0,  1e-15,   1e-15"    // common practice
    })
    @DisplayName("Part 1 — default defect library entries")
    void defaultEntries(String id, EnergyReference ref, double e, double sn, double sp) {
        Defect d = DefectLibrary.byId(id);
        assertThat(d.level().reference()).isEqualTo(ref);
        assertThat(d.level().energyEv()).isCloseTo(e, org.assertj.core.data.Offset.offset(1e-12));
        assertThat(d.level().degeneracy()).isEqualTo(1.0);
        assertThat(d.electronCrossSectionCm2()).isCloseTo(sn, org.assertj.core.data.Percentage.withPercentage(1e-9));
        assertThat(d.holeCrossSectionCm2()).isCloseTo(sp, org.assertj.core.data.Percentage.withPercentage(1e-9));
        assertThat(d.captureRatio()).isCloseTo(sn / sp, org.assertj.core.data.Percentage.withPercentage(1e-9));
        assertThat(d.velocityConvention()).isEqualTo(ThermalVelocityModel.FIXED);
        assertThat(d.source()).isNotBlank();
        assertThat(d.hasAbsoluteCrossSections()).isTrue();
    }

    // Rein & Glunz, APL 82, 1054 (2003): BO-LID centre at E_c − 0.41 eV, k = 9.3 (from memory), no absolute σ
    @Test
    @DisplayName("Part 1 — bo-lid: E_c − 0.41 eV, k = 9.3, no absolute cross-section (Rein & Glunz 2003, from memory)")
    void boronOxygenEntry() {
        Defect bo = DefectLibrary.byId("bo-lid");
        assertThat(bo.level()).isEqualTo(TrapLevel.belowConductionBand(0.41));
        assertThat(bo.captureRatio()).isEqualTo(9.3);
        assertThat(bo.hasAbsoluteCrossSections()).isFalse();
        assertThatThrownBy(bo::requireAbsoluteCrossSections).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("bo-lid").hasMessageContaining("normalised density");
    }

    // Bothe & Schmidt, JAP 99, 013701 (2006): N_t* = 1/τ_degraded − 1/τ_annealed (µs⁻¹), from memory
    @Test
    @DisplayName("§6 — BO normalised density N_t* = 1/40 − 1/300 µs⁻¹ (Bothe & Schmidt 2006, from memory)")
    void boronOxygenNormalisedDensity() {
        assertThat(BoronOxygen.normalisedDensityPerUs(40, 300)).isCloseTo(1.0 / 40 - 1.0 / 300,
                org.assertj.core.data.Offset.offset(1e-15));
        assertThat(BoronOxygen.normalisedDensityPerUs(300, 40)).isNegative();
        assertThat(BoronOxygen.normalisedDensityPerUs(100, 100)).isZero();
    }

    @Test
    void lookupIsCaseInsensitiveAndUnknownIdsAreNamed() {
        assertThat(DefectLibrary.byId(" FE-I ")).isSameAs(DefectLibrary.byId("fe-i"));
        assertThatThrownBy(() -> DefectLibrary.byId("fe-x")).isInstanceOf(InvalidValueException.class)
                .hasMessageContaining("fe-x").hasMessageContaining("fe-i").hasMessageContaining("midgap");
        assertThatThrownBy(() -> DefectLibrary.byId(null)).isInstanceOf(InvalidValueException.class);
        assertThat(DefectLibrary.all()).hasSize(11);
        assertThat(DefectLibrary.defaultConvention()).isEqualTo(ThermalVelocityModel.FIXED);
    }
}
