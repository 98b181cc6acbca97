package trapmap.physics.defect;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import org.junit.jupiter.api.DisplayName;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import trapmap.physics.material.Doping;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.recombination.SrhRecombination;
import trapmap.shared.error.InvalidValueException;

/** The built-in defect library against published symmetry factors and levels (docs/check-values.md). */
class DefectLibraryTest {

    // Every library entry carries absolute σ (except bo-lid), g = 1 (effective levels of lifetime spectroscopy) and
    // states its velocity convention and source (docs/check-values.md "Defect library")
    @Test
    void everyEntryStatesItsConventionAndSource() {
        for (Defect d : DefectLibrary.all()) {
            assertThat(d.level().degeneracy()).as(d.id()).isEqualTo(1.0);
            assertThat(d.velocityConvention()).as(d.id()).isEqualTo(ThermalVelocityModel.FIXED);
            assertThat(d.source()).as(d.id()).isNotBlank();
            assertThat(d.hasAbsoluteCrossSections()).as(d.id()).isEqualTo(!d.id().equals("bo-lid"));
        }
    }

    // Lifetime spectroscopy measures the symmetry factor k = σ_n/σ_p from the injection dependence of τ_SRH: for a
    // level deep in the gap, τ(high injection)/τ(low injection) = 1 + k v_n/v_p in p-type and 1 + v_p/(k v_n) in
    // n-type (Shockley & Read 1952 / Hall 1952 limits). Here that ratio is taken from the conversion's SRH model at
    // N_dop 1e18, Δn 1e8 and 1e22, with the library σ and its 1.1e7 cm/s convention, and compared with the published
    // k and its published uncertainty (docs/check-values.md R-DEF-1 to R-DEF-9 give the source of each row).
    @ParameterizedTest(name = "{0}: k = {2} ± {3}")
    @CsvSource({
        // id,  type, k published, tolerance (absolute)
        "fe-i,  p,    186,    4",    // R-DEF-1 ratio of the σ pair of Macdonald, Tan & Trupke 2008 (not independent)
        "fe-b,  p,    1.67,   0.04", // R-DEF-2 ratio of the σ pair of Macdonald et al., APL 89, 142107 (2006)
        "cr-i,  p,    5,      0.1",  // R-DEF-3 Schmidt et al., JAP 102, 123701 (2007)
        "cr-b,  p,    0.5,    0.01", // R-DEF-4 Schmidt et al. (2007); Sun 2014 gives 5.8: uncertain
        "ti-i,  p,    12,     1",    // R-DEF-5 Rein, Lifetime Spectroscopy (2005): k = 12 ± 1
        "mo-i,  p,    13,     3",    // R-DEF-6 Rein (2005): k = 13 ± 3
        "au-a,  n,    0.0184, 0.0004", // R-DEF-7 ratio of Graff (2000) σ pair (not independent)
        "au-d,  p,    0.70,   0.02", // R-DEF-8 Graff (2000) σ_n, Dubois et al. (2006) σ_p (not independent)
        "ni-s,  p,    0.7,    0.4"   // R-DEF-9 Rein (2005): k = 0.7 ± 0.4
    })
    @DisplayName("R-DEF-1..9 — symmetry factor k from the SRH injection dependence vs the published k")
    void symmetryFactorFromInjectionDependence(String id, String type, double k, double tol) {
        Defect d = DefectLibrary.byId(id);
        Silicon si = Silicon.at(300);
        boolean p = type.equals("p");
        SrhRecombination srh = SrhRecombination.of(d, p ? Doping.pType(1e18) : Doping.nType(1e18), si);
        double ratio = srh.lifetimeS(1e22, 1e11) / srh.lifetimeS(1e8, 1e11);
        double velocities = si.electronVthCmPerS() / si.holeVthCmPerS();
        double kFromLifetimes = p ? (ratio - 1) / velocities : 1 / ((ratio - 1) * velocities);
        assertThat(kFromLifetimes).as("%s k from tau_high/tau_low", id).isCloseTo(k, within(tol));
    }

    // Published levels with a stated uncertainty: Rein (2005) Ti_i E_v + 0.289 ± 0.005, Mo_i E_v + 0.317 ± 0.005,
    // Ni_s E_c − 0.40 ± 0.03 eV; DLTS Au_s acceptor E_c − 0.55 ± 0.01 eV (DLTS values, e.g. Graff 2000) (R-DEF-10)
    @ParameterizedTest(name = "{0}")
    @CsvSource({"ti-i, VALENCE_BAND, 0.289, 0.005", "mo-i, VALENCE_BAND, 0.317, 0.005",
        "ni-s, CONDUCTION_BAND, 0.40, 0.03", "au-a, CONDUCTION_BAND, 0.55, 0.01"})
    void levelsWithinThePublishedUncertainty(String id, EnergyReference ref, double ev, double tol) {
        TrapLevel level = DefectLibrary.byId(id).level();
        assertThat(level.reference()).isEqualTo(ref);
        assertThat(level.energyEv()).isCloseTo(ev, within(tol));
    }

    // Rein & Glunz, APL 82, 1054 (2003): BO-LID centre at E_c − 0.41 eV, k = 9.3 (from memory), no absolute σ
    @Test
    @DisplayName("R-DEF-11 — bo-lid: E_c − 0.41 eV, k = 9.3, no absolute cross-section (Rein & Glunz 2003, from memory)")
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
    @DisplayName("R-DEF-12 — BO normalised density N_t* = 1/40 − 1/300 µs⁻¹ (Bothe & Schmidt 2006, from memory)")
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
