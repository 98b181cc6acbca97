package trapmap.physics.pl;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static trapmap.physics.ReferenceSets.assertRelative;

import java.util.SplittableRandom;
import org.junit.jupiter.api.DisplayName;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import trapmap.shared.error.InvalidValueException;

/** Generation rate and PL calibration (docs/check-values.md R-PL-1 to R-PL-4). */
class PlReferenceTest {

    // R-PL-1 (computed): Φ 2.5e17 cm^-2 s^-1, bare Si at 800 nm (n = 3.675, Fresnel R = ((n − 1)/(n + 1))² = 0.327),
    // W 180 µm, α 850 cm^-1 (Green, Sol. Energy Mater. Sol. Cells 92, 1305 (2008)):
    // G = 9.342e18 cm^-3 s^-1; with τ = 100 µs the calibration returns the lifetime from Δn = G·τ. 0.5 %.
    @Test
    @DisplayName("R-PL-1 — G = 9.342e18 cm^-3 s^-1; 100 µs back through the calibration (computed, 0.5 %)")
    void generationExample() {
        double g = GenerationRate.perCm3PerS(2.5e17, 0.327, 850, 0.018);
        assertRelative("G", g, 9.342e18, 0.005);
        // steady state through the calibration: τ_eff = Δn/G
        PlCalibration cal = new PlCalibration(1e-20, 1e16);
        assertRelative("tau from counts", cal.lifetimeUs(cal.counts(g * 100e-6), g), 100, 1e-9);
    }

    // R-PL-2 (computed): Φ = P/(h c/λ); 0.1 W/cm² → 4.068e17 (808 nm) and 4.606e17 (915 nm) photons cm^-2 s^-1, 0.5 %
    @ParameterizedTest(name = "{0} nm: {1}")
    @CsvSource({"808, 4.068e17", "915, 4.606e17"})
    @DisplayName("R-PL-2 — photon flux of 0.1 W/cm² at 808 / 915 nm (computed, 0.5 %)")
    void photonFlux(double nm, double expected) {
        assertRelative("photon flux", GenerationRate.photonFluxPerCm2PerS(0.1, nm), expected, 0.005);
    }

    // f_abs = 1 − exp(−αW), single pass (Beer–Lambert, R-PL-3): thin/weakly absorbing case where it matters
    @Test
    void singlePassAbsorption() {
        double g = GenerationRate.perCm3PerS(1e17, 0, 271, 0.018); // 910 nm, Green 2008
        assertRelative("G", g, 1e17 * (1 - Math.exp(-271 * 0.018)) / 0.018, 1e-12);
        assertThat(GenerationRate.perCm3PerS(0, 0.3, 850, 0.018)).isZero();
    }

    // Trupke et al., APL 89, 044107 (2006) (from memory), R-PL-4: I = A·Δn·(Δn + N_dop);
    // Δn = (−N_dop + sqrt(N_dop² + 4I/A))/2 — round trip exact; seeded grid
    @Test
    @DisplayName("R-PL-4 — PL signal model round trip dn → I → dn (exact)")
    void plRoundTrip() {
        SplittableRandom rnd = new SplittableRandom(7);
        for (int i = 0; i < 5000; i++) {
            double a = Math.pow(10, rnd.nextDouble(-35, -15));
            double ndop = Math.pow(10, rnd.nextDouble(13, 18));
            double dn = Math.pow(10, rnd.nextDouble(6, 18));
            PlCalibration cal = new PlCalibration(a, ndop);
            double counts = cal.counts(dn);
            assertRelative("counts", counts, a * dn * (dn + ndop), 1e-12);
            assertRelative("dn back", cal.injectionPerCm3(counts), dn, 1e-12);
        }
        PlCalibration cal = new PlCalibration(1e-20, 1e16);
        assertThat(cal.injectionPerCm3(0)).isZero();
        assertThat(cal.injectionPerCm3(-1)).isNaN();
        assertThat(cal.injectionPerCm3(Double.NaN)).isNaN();
        assertThat(cal.injectionPerCm3(Double.POSITIVE_INFINITY)).isNaN();
        // low / high injection limits: I ∝ Δn N_dop and I ∝ Δn²
        assertRelative("low injection", cal.injectionPerCm3(1e-20 * 1e10 * 1e16), 1e10, 1e-5);
        PlCalibration high = new PlCalibration(1e-20, 1e13);
        assertRelative("high injection", high.injectionPerCm3(1e-20 * 1e36), 1e18, 1e-4);
    }

    // Reference calibration: Δn_ref = G τ_ref, A = I_ref/(Δn_ref (Δn_ref + N_dop)); the reference pixel returns τ_ref
    @Test
    void calibrationFromReference() {
        double g = 9.342e18;
        PlCalibration cal = PlCalibration.fromReference(5000, 120, g, 1.5e16);
        assertRelative("reference lifetime back", cal.lifetimeUs(5000, g), 120, 1e-12);
        double dn = g * 120e-6;
        assertRelative("A", cal.constant(), 5000 / (dn * (dn + 1.5e16)), 1e-12);
        // more counts → longer lifetime at fixed G
        assertThat(cal.lifetimeUs(10000, g)).isGreaterThan(120);
    }

    @Test
    void invalidInputs() {
        rejects(() -> GenerationRate.perCm3PerS(-1, 0.1, 850, 0.018), "photonFlux", "cm^-2 s^-1");
        rejects(() -> GenerationRate.perCm3PerS(Double.NaN, 0.1, 850, 0.018), "photonFlux", "cm^-2 s^-1");
        rejects(() -> GenerationRate.perCm3PerS(1e17, 1.2, 850, 0.018), "reflectance", "");
        rejects(() -> GenerationRate.perCm3PerS(1e17, -0.1, 850, 0.018), "reflectance", "");
        rejects(() -> GenerationRate.perCm3PerS(1e17, 0.1, 0, 0.018), "absorptionCoefficient", "cm^-1");
        rejects(() -> GenerationRate.perCm3PerS(1e17, 0.1, 850, 0), "thickness", "cm");
        rejects(() -> GenerationRate.perCm3PerS(1e17, 0.1, 850, -0.018), "thickness", "cm");
        rejects(() -> GenerationRate.perCm3PerS(1e17, 0.1, 850, Double.POSITIVE_INFINITY), "thickness", "cm");
        rejects(() -> GenerationRate.photonFluxPerCm2PerS(-0.1, 808), "powerDensity", "W/cm^2");
        rejects(() -> GenerationRate.photonFluxPerCm2PerS(0.1, 0), "wavelength", "nm");
        rejects(() -> new PlCalibration(0, 1e16), "calibrationConstant", "counts*cm^6");
        rejects(() -> new PlCalibration(1e-20, -1e16), "doping", "cm^-3");
        rejects(() -> new PlCalibration(1e-20, Double.NaN), "doping", "cm^-3");
        rejects(() -> PlCalibration.fromReference(0, 100, 1e19, 1e16), "referenceCounts", "counts");
        rejects(() -> PlCalibration.fromReference(100, -1, 1e19, 1e16), "referenceLifetime", "us");
        rejects(() -> PlCalibration.fromReference(100, 100, 0, 1e16), "generation", "cm^-3 s^-1");
        rejects(() -> PlCalibration.fromReference(100, 100, 1e19, 0), "doping", "cm^-3");
        rejects(() -> new PlCalibration(1e-20, 1e16).lifetimeUs(100, -1), "generation", "cm^-3 s^-1");
    }

    private static void rejects(org.assertj.core.api.ThrowableAssert.ThrowingCallable call, String field, String unit) {
        assertThatThrownBy(call).isInstanceOf(InvalidValueException.class).hasMessageContaining(field)
                .hasMessageContaining(unit)
                .satisfies(e -> assertThat(((InvalidValueException) e).field()).isEqualTo(field))
                .satisfies(e -> assertThat(((InvalidValueException) e).unit()).isEqualTo(unit));
    }
}
