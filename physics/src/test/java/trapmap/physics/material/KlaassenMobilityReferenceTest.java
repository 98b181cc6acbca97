package trapmap.physics.material;

import static trapmap.physics.ReferenceSets.assertRelative;

import org.junit.jupiter.api.DisplayName;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvFileSource;
import org.junit.jupiter.params.provider.CsvSource;

/** Klaassen 1992 unified mobility (docs/check-values.md R-MOB-1 to R-MOB-3). */
class KlaassenMobilityReferenceTest {
    private static final double NI = 9.65e9;

    // Klaassen, SSE 35, 953 (1992); computed from the model's equations (R-MOB-1), 1 %
    @ParameterizedTest(name = "N = {0}")
    @CsvFileSource(resources = "/trapmap/physics/klaassen-mobility-300k.csv", numLinesToSkip = 1)
    @DisplayName("R-MOB-1 — Klaassen 1992 mobilities at 300 K (computed, 1 %)")
    void mobilityTable(double n, double pMajH, double pMinE, double nMajE, double nMinH) {
        assertRelative("p-type mu_h", KlaassenMobility.holeCm2PerVs(n, 0, 0, 300, NI), pMajH, 0.01);
        assertRelative("p-type mu_e", KlaassenMobility.electronCm2PerVs(n, 0, 0, 300, NI), pMinE, 0.01);
        assertRelative("n-type mu_e", KlaassenMobility.electronCm2PerVs(0, n, 0, 300, NI), nMajE, 0.01);
        assertRelative("n-type mu_h", KlaassenMobility.holeCm2PerVs(0, n, 0, 300, NI), nMinH, 0.01);
    }

    // Klaassen 1992; D_n = (kT/q) μ_e and D_amb = (n+p)/(n/D_p + p/D_n) at N_A = 1e16, computed (R-MOB-2), 1 %
    @ParameterizedTest(name = "dn = {0}: D_n = {1}, D_amb = {2}")
    @CsvSource({"1e14, 28.59, 28.15", "1e15, 28.37, 25.09", "1e16, 26.59, 17.67"})
    @DisplayName("R-MOB-2 — Klaassen diffusivities at N_A = 1e16 vs injection (computed, 1 %)")
    void diffusivityVersusInjection(double dn, double dnExpected, double dAmbExpected) {
        double kt = Silicon.at(300).thermalEnergyEv();
        double mue = KlaassenMobility.electronCm2PerVs(1e16, 0, dn, 300, NI);
        double muh = KlaassenMobility.holeCm2PerVs(1e16, 0, dn, 300, NI);
        double n = dn;
        double p = 1e16 + dn;
        assertRelative("D_n", kt * mue, dnExpected, 0.01);
        assertRelative("D_amb", kt * (n + p) / (n / muh + p / mue), dAmbExpected, 0.01);
    }

    // Klaassen 1992 minority diffusivity used for the surface term: D = (kT/q) μ_minority at Δn = 0,
    // from the R-MOB-1 mobilities: p 1e16 → 0.025852 × 1106.8 = 28.61 cm²/s; n 1e16 → 0.025852 × 416.5 = 10.77 cm²/s
    @Test
    @DisplayName("R-MOB-3 — minority-carrier diffusivity at 1e16: 28.61 (p), 10.77 (n) cm²/s (computed, 1 %)")
    void minorityDiffusivity() {
        Silicon si = Silicon.at(300);
        assertRelative("D_n p-type", KlaassenMobility.minorityDiffusivityCm2PerS(Doping.pType(1e16), si), 28.61, 0.01);
        assertRelative("D_p n-type", KlaassenMobility.minorityDiffusivityCm2PerS(Doping.nType(1e16), si), 10.77, 0.01);
    }
}
