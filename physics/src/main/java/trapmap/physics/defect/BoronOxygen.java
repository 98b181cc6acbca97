package trapmap.physics.defect;

import trapmap.shared.check.Checks;

/**
 * The boron–oxygen light-induced-degradation centre has no reliable absolute capture cross-section, so only its
 * normalised density N_t* = 1/τ_degraded − 1/τ_annealed (µs⁻¹) can be given (Bothe &amp; Schmidt, JAP 99, 013701
 * (2006); level E_c − 0.41 eV, k = 9.3 after Rein &amp; Glunz, APL 82, 1054 (2003)).
 */
public final class BoronOxygen {
    private BoronOxygen() {
    }

    /** N_t* in 1/µs from the degraded and annealed (or regenerated) lifetimes, µs. May be negative (no LID). */
    public static double normalisedDensityPerUs(double degradedUs, double annealedUs) {
        Checks.positive(degradedUs, "degradedLifetime", "us");
        Checks.positive(annealedUs, "annealedLifetime", "us");
        return 1.0 / degradedUs - 1.0 / annealedUs;
    }
}
