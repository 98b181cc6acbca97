package trapmap.physics.iron;

import java.util.Set;
import trapmap.physics.conversion.ConversionWarning;
import trapmap.physics.conversion.PixelStatus;

/**
 * Interstitial iron from one before/after FeB-dissociation pair.
 *
 * @param status            {@code OK}; {@code BELOW_LIMIT} (no iron detectable: the density is the detection limit);
 *                          {@code INVALID} (bad lifetimes, or Δn within ±10 % of the crossover where the method
 *                          has no signal); {@code INCONSISTENT} (the lifetime moved the way the iron chemistry
 *                          forbids at this Δn: no value)
 * @param ironPerCm3        [Fe_i], cm^-3
 * @param prefactorUsCm3    C(Δn, N_A, T), µs·cm^-3
 * @param crossoverPerCm3   Δn at which Fe_i and FeB give equal lifetimes, cm^-3 (NaN when there is none)
 * @param warnings          cautions
 * @param reason            why the status is INCONSISTENT or INVALID, one line (empty otherwise)
 */
public record IronResult(PixelStatus status, double ironPerCm3, double prefactorUsCm3, double crossoverPerCm3,
                         Set<ConversionWarning> warnings, String reason) {
    public IronResult {
        warnings = Set.copyOf(warnings);
    }
}
