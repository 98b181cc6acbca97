package trapmap.physics.material;

import static org.assertj.core.api.Assertions.assertThat;
import static trapmap.physics.ReferenceSets.assertRelative;

import org.junit.jupiter.api.DisplayName;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvFileSource;
import org.junit.jupiter.params.provider.CsvSource;

/**
 * Resistivity ↔ dopant density by ASTM F723 (Thurber et al., NBS SP 400-64) (docs/check-values.md R-ASTM-1 to
 * R-ASTM-4).
 */
class AstmF723ReferenceTest {

    // ASTM F723 (Thurber et al., NBS SP 400-64); computed pairs (R-ASTM-1), 0.1 %
    @ParameterizedTest(name = "rho = {0} ohm cm")
    @CsvFileSource(resources = "/trapmap/physics/astm-f723-pairs.csv", numLinesToSkip = 1)
    @DisplayName("R-ASTM-1 — ASTM F723 forward fits, boron and phosphorus (computed pairs, 0.1 %)")
    void forwardFits(double rho, double boron, double rhoBackB, double phosphorus, double rhoBackP) {
        assertRelative("N_B(" + rho + ")", AstmF723.boronPerCm3(rho), boron, 0.001);
        assertRelative("N_P(" + rho + ")", AstmF723.phosphorusPerCm3(rho), phosphorus, 0.001);
        assertRelative("Doping.fromResistivity(P)", Doping.fromResistivity(ConductivityType.P, rho).densityPerCm3(),
                boron, 0.001);
        assertRelative("Doping.fromResistivity(N)", Doping.fromResistivity(ConductivityType.N, rho).densityPerCm3(),
                phosphorus, 0.001);
    }

    // ASTM F723 (Thurber et al., NBS SP 400-64); inverse fits, computed pairs (R-ASTM-2), 0.1 %.
    // The forward and inverse fits are separate and round-trip only to about 2 %.
    @ParameterizedTest(name = "rho = {0} ohm cm")
    @CsvFileSource(resources = "/trapmap/physics/astm-f723-pairs.csv", numLinesToSkip = 1)
    @DisplayName("R-ASTM-2 — ASTM F723 inverse fits (rho back) and the ~2 % round trip (computed pairs)")
    void inverseFits(double rho, double boron, double rhoBackB, double phosphorus, double rhoBackP) {
        assertRelative("rho_B(N_B)", AstmF723.boronResistivityOhmCm(boron), rhoBackB, 0.001);
        assertRelative("rho_P(N_P)", AstmF723.phosphorusResistivityOhmCm(phosphorus), rhoBackP, 0.001);
        // chained forward → inverse: only ~2 %
        assertRelative("round trip B", Doping.fromResistivity(ConductivityType.P, rho).resistivityOhmCm(), rho, 0.02);
        assertRelative("round trip P", Doping.fromResistivity(ConductivityType.N, rho).resistivityOhmCm(), rho, 0.02);
    }

    // ASTM F723 (Thurber et al., NBS SP 400-64) at 1 and 10 Ω·cm, computed from the fits (R-ASTM-1); 0.1 %
    @ParameterizedTest(name = "rho = {0}: N_B = {1}, N_P = {2}")
    @CsvSource({"1, 1.4588e16, 4.8643e15", "10, 1.3402e15, 4.4452e14"})
    @DisplayName("R-ASTM-1 — ASTM F723 at 1 and 10 ohm cm (computed, 0.1 %)")
    void checkCases15to17(double rho, double boron, double phosphorus) {
        assertRelative("N_B", AstmF723.boronPerCm3(rho), boron, 0.001);
        assertRelative("N_P", AstmF723.phosphorusPerCm3(rho), phosphorus, 0.001);
    }

    // Klaassen 1992 resistivity ρ = 1/(q (n0 μ_e + p0 μ_h)) at 300 K vs the ASTM pairs (R-ASTM-3,
    // computed from the model's equations); the table values carry 3–4 digits, 1 %.
    @ParameterizedTest(name = "N_B = {0}, N_P = {2}")
    @CsvSource({
        "3.2064e16, 0.504, 1.0385e16, 0.510",
        "1.4588e16, 1.024, 4.8643e15, 1.014",
        "6.9512e15, 2.050, 2.3372e15, 2.020",
        "2.7039e15, 5.091, 9.0456e14, 5.053",
        "1.3402e15, 10.124, 4.4452e14, 10.143",
        "1.3308e14, 100.1, 4.2742e13, 103.7"
    })
    @DisplayName("R-ASTM-3 — Klaassen 1992 resistivity of the ASTM densities (computed, 1 %)")
    void klaassenResistivity(double nb, double rhoB, double np, double rhoP) {
        assertRelative("rho Klaassen(N_B)", klaassenResistivity(Doping.pType(nb)), rhoB, 0.01);
        assertRelative("rho Klaassen(N_P)", klaassenResistivity(Doping.nType(np)), rhoP, 0.01);
    }

    private static double klaassenResistivity(Doping d) {
        Silicon si = Silicon.at(300);
        Carriers eq = d.equilibrium(si.intrinsicPerCm3());
        double mue = KlaassenMobility.electronCm2PerVs(d.acceptorsPerCm3(), d.donorsPerCm3(), 0, 300,
                si.intrinsicPerCm3());
        double muh = KlaassenMobility.holeCm2PerVs(d.acceptorsPerCm3(), d.donorsPerCm3(), 0, 300,
                si.intrinsicPerCm3());
        return 1 / (1.602176634e-19 * (eq.electronsPerCm3() * mue + eq.holesPerCm3() * muh));
    }

    // Validity limits stated with the ASTM F723 fits: ρ 1e-4 … 1e4 Ω·cm (R-ASTM-4)
    @Test
    @DisplayName("R-ASTM-4 — the fits are offered over rho 1e-4 … 1e4 ohm cm")
    void validityRange() {
        assertThat(AstmF723.boronPerCm3(1e-4)).isFinite().isPositive();
        assertThat(AstmF723.phosphorusPerCm3(1e4)).isFinite().isPositive();
        assertThat(AstmF723.boronResistivityOhmCm(1e12)).isFinite().isPositive();
        assertThat(AstmF723.phosphorusResistivityOhmCm(5e20)).isFinite().isPositive();
    }

    // Both fits fall monotonically: higher resistivity, fewer dopants (common sense check over the valid range)
    @Test
    void densityFallsAsResistivityRises() {
        double prevB = Double.POSITIVE_INFINITY;
        double prevP = Double.POSITIVE_INFINITY;
        for (double lg = -3; lg <= 4; lg += 0.05) {
            double rho = Math.pow(10, lg);
            double b = AstmF723.boronPerCm3(rho);
            double p = AstmF723.phosphorusPerCm3(rho);
            assertThat(b).as("N_B(%s)", rho).isLessThan(prevB);
            assertThat(p).as("N_P(%s)", rho).isLessThan(prevP);
            prevB = b;
            prevP = p;
        }
    }
}
