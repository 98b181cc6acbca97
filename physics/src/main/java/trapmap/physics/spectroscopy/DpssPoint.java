package trapmap.physics.spectroscopy;

/**
 * The DPSS at one trial level: the non-negative least-squares (τ_n0, τ_p0) and what follows from them.
 *
 * @param energyFromIntrinsicEv E_t − E_i, eV (negative: lower half of the gap)
 * @param tauN0S                τ_n0 = 1/(σ_n v_n N_t), s (≥ 0)
 * @param tauP0S                τ_p0 = 1/(σ_p v_p N_t), s (≥ 0)
 * @param captureRatio          k = σ_n/σ_p = τ_p0 v_p/(τ_n0 v_n); +∞ when τ_n0 = 0, 0 when τ_p0 = 0
 * @param chiSquared            weighted residual Σ [(τ_i − τ_n0 A_i − τ_p0 B_i)/(u_i τ_i)]²
 */
public record DpssPoint(double energyFromIntrinsicEv, double tauN0S, double tauP0S, double captureRatio,
                        double chiSquared) {
}
