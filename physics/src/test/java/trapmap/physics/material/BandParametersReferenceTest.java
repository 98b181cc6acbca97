package trapmap.physics.material;

import static org.assertj.core.api.Assertions.assertThat;
import static trapmap.physics.ReferenceSets.assertRelative;

import org.junit.jupiter.api.DisplayName;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.params.provider.ValueSource;

/** n_i(T), E_g(T), N_c/N_v and thermal velocities (docs/check-values.md R-BAND-1 to R-BAND-11). */
class BandParametersReferenceTest {

    // Default (R-BAND-1): n_i(300 K) = 9.65e9 cm^-3 (Altermatt et al., JAP 93, 1598 (2003), from memory) with the
    // T-form 9.65e9 (T/300)^2 exp(6880/300 − 6880/T) (T-form of Sproul & Green, JAP 70, 846 (1991));
    // values computed from that formula here.
    @ParameterizedTest
    @ValueSource(doubles = {250, 296.15, 300, 310, 350})
    @DisplayName("R-BAND-1 — Altermatt 2003 n_i with the Sproul & Green 1991 T-form (computed from the formula)")
    void defaultIntrinsicDensityTemperatureForm(double t) {
        double expected = 9.65e9 * Math.pow(t / 300, 2) * Math.exp(6880.0 / 300 - 6880.0 / t);
        assertRelative("n_i(" + t + ")", Silicon.at(t).intrinsicPerCm3(), expected, 1e-12);
    }

    // Misiakos & Tsamakis, JAP 74, 3293 (1993); value computed from the formula (R-BAND-2)
    @Test
    @DisplayName("R-BAND-2 — Misiakos & Tsamakis 1993: n_i(300 K) = 9.696e9 (computed, 0.1 %)")
    void misiakos1993() {
        assertRelative("n_i Misiakos", IntrinsicDensityModel.MISIAKOS_1993.densityPerCm3(300), 9.696e9, 0.001);
    }

    // Couderc, Amara & Lemiti, JAP 115, 093705 (2014) with the Paessler band gap; computed (R-BAND-3)
    @ParameterizedTest(name = "T = {0} K: n_i = {1}")
    @CsvSource({
        "300,    9.685e9",
        "298.15, 8.295e9",
        "303.15, 1.256e10",
        "296.15, 7.00e9",
        "325,    6.66e10"
    })
    @DisplayName("R-BAND-3 — Couderc 2014 n_i(T) (computed from the formula; 0.5 %)")
    void couderc2014(double t, double expected) {
        assertRelative("n_i Couderc(" + t + ")", IntrinsicDensityModel.COUDERC_2014.densityPerCm3(t), expected, 0.005);
    }

    // Sproul & Green, JAP 70, 846 (1991), library form 1.016666667e15 T^2 exp(−6880/T); computed (R-BAND-4)
    @Test
    @DisplayName("R-BAND-4 — Sproul & Green 1991 library form: n_i(300 K) = 1.004e10 (computed, 0.1 %)")
    void sproulGreen1991() {
        assertRelative("n_i Sproul-Green", IntrinsicDensityModel.SPROUL_GREEN_1991.densityPerCm3(300), 1.004e10,
                0.001);
    }

    // Paessler, PRB 66, 085201 (2002), Couderc 2014 parameters: E_g(300 K) = 1.1242 eV; computed (R-BAND-5)
    // Green, JAP 67, 2944 (1990): E_g(300 K) = 1.1241 eV; computed (R-BAND-5)
    @Test
    @DisplayName("R-BAND-5 — band gap at 300 K: Paessler 1.1242 eV, Green 1990 1.1241 eV (computed)")
    void bandGapAt300K() {
        assertThat(BandGap.paesslerEv(300)).isCloseTo(1.1242, org.assertj.core.data.Offset.offset(0.00005));
        assertThat(BandGap.green1990Ev(300)).isCloseTo(1.1241, org.assertj.core.data.Offset.offset(0.00005));
    }

    // Green, JAP 67, 2944 (1990): N_c = 2.86e19 (T/300)^1.58, N_v = 3.10e19 (T/300)^1.85 (default; R-BAND-6)
    @ParameterizedTest
    @ValueSource(doubles = {200, 300, 400})
    @DisplayName("R-BAND-6 — Green 1990 N_c, N_v (default; published formula)")
    void greenDensitiesOfStates(double t) {
        Silicon si = Silicon.at(t);
        assertRelative("N_c", si.conductionDosPerCm3(), 2.86e19 * Math.pow(t / 300, 1.58), 1e-12);
        assertRelative("N_v", si.valenceDosPerCm3(), 3.10e19 * Math.pow(t / 300, 1.85), 1e-12);
    }

    // Couderc, Amara & Lemiti, JAP 115, 093705 (2014): N_c(300) = 2.857e19, N_v(300) = 2.513e19; computed
    // from the paper's parameters (R-BAND-7; the N_v value is not checked against the paper's table)
    @Test
    @DisplayName("R-BAND-7 — Couderc 2014 N_c, N_v at 300 K = 2.857e19, 2.513e19 (computed, 0.5 %)")
    void couderc2014DensitiesOfStates() {
        assertRelative("N_c Couderc", DensityOfStatesModel.COUDERC_2014.conductionPerCm3(300), 2.857e19, 0.005);
        assertRelative("N_v Couderc", DensityOfStatesModel.COUDERC_2014.valencePerCm3(300), 2.513e19, 0.005);
    }

    // Green, JAP 67, 2944 (1990), thermal effective masses: 2.0457e7 / 1.6879e7 cm/s at 300 K; computed, matching
    // the 2.046e7 / 1.688e7 quoted in defect compilations (R-BAND-8)
    @Test
    @DisplayName("R-BAND-8 — Green 1990 thermal velocities 2.0457e7 (e), 1.6879e7 (h) cm/s (computed, 0.1 %)")
    void greenThermalVelocities() {
        Silicon si = Silicon.at(300, ThermalVelocityModel.GREEN_1990);
        assertRelative("v_th,e", si.electronVthCmPerS(), 2.0457e7, 0.001);
        assertRelative("v_th,h", si.holeVthCmPerS(), 1.6879e7, 0.001);
        assertThat(si.velocityModel()).isEqualTo(ThermalVelocityModel.GREEN_1990);
    }

    // Default (R-BAND-9): 1.1e7 cm/s for both carriers at 300 K (convention of Macdonald et al.; "Bullis 1996"),
    // scaled by sqrt(T/300)
    @ParameterizedTest
    @ValueSource(doubles = {250, 300, 350})
    @DisplayName("R-BAND-9 — default thermal velocity 1.1e7 cm/s · sqrt(T/300) (common practice)")
    void defaultThermalVelocity(double t) {
        Silicon si = Silicon.at(t);
        assertRelative("v_th,e", si.electronVthCmPerS(), 1.1e7 * Math.sqrt(t / 300), 1e-12);
        assertRelative("v_th,h", si.holeVthCmPerS(), 1.1e7 * Math.sqrt(t / 300), 1e-12);
        assertThat(si.velocityModel()).isEqualTo(ThermalVelocityModel.FIXED);
    }

    // R-BAND-10: E_i − midgap = (kT/2) ln(N_v/N_c) = +1.0 meV with the Green 1990 parametrisation (computed)
    @Test
    @DisplayName("R-BAND-10 — E_i − midgap with Green 1990 N_c/N_v = +1.0 meV (computed)")
    void intrinsicLevelOffsetGreen() {
        Silicon si = Silicon.at(300);
        double offsetEv = si.thermalEnergyEv() / 2 * Math.log(si.valenceDosPerCm3() / si.conductionDosPerCm3());
        assertThat(offsetEv * 1000).isCloseTo(1.0, org.assertj.core.data.Offset.offset(0.05));
    }

    // kT from the SI defining constants k_B = 1.380649e-23 J/K and e = 1.602176634e-19 C (BIPM, The International
    // System of Units, 9th ed. (2019)): kT(300 K) = 0.0258520 eV (R-BAND-11)
    @Test
    @DisplayName("R-BAND-11 — kT(300 K) from the SI defining constants k_B and e = 0.0258520 eV")
    void thermalEnergy() {
        assertRelative("kT", Silicon.at(300).thermalEnergyEv(), 1.380649e-23 * 300 / 1.602176634e-19, 1e-9);
    }
}
