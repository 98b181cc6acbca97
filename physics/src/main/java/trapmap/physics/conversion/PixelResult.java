package trapmap.physics.conversion;

import java.util.Set;

/**
 * Everything the conversion knows about one pixel. Lifetimes in µs, densities in cm^-3.
 *
 * @param status                 outcome
 * @param injectionPerCm3        Δn used
 * @param effectiveLifetimeUs    τ_eff as given
 * @param intrinsicLifetimeUs    τ_intr at Δn
 * @param surfaceLifetimeUs      τ_surf (infinite for ideal surfaces)
 * @param srhLifetimeUs          τ_SRH = 1/(1/τ_eff − 1/τ_intr − 1/τ_surf) (infinite when below the limit)
 * @param trapDensityPerCm3      equivalent trap density (the detection limit when {@code BELOW_LIMIT})
 * @param trapDensityMinPerCm3   smallest density over the defect's published parameter spread
 * @param trapDensityMaxPerCm3   largest density over the defect's published parameter spread
 * @param occupancy              steady-state fraction of traps occupied by electrons
 * @param lifetimeAtReferenceUs  lifetime the same pixel would have at the reference injection (NaN when none)
 * @param warnings               cautions
 */
public record PixelResult(PixelStatus status, double injectionPerCm3, double effectiveLifetimeUs,
                          double intrinsicLifetimeUs, double surfaceLifetimeUs, double srhLifetimeUs,
                          double trapDensityPerCm3, double trapDensityMinPerCm3, double trapDensityMaxPerCm3,
                          double occupancy, double lifetimeAtReferenceUs, Set<ConversionWarning> warnings) {

    public PixelResult {
        warnings = Set.copyOf(warnings);
    }

    /** Density of traps occupied by electrons, f_t·N_t, cm^-3. */
    public double occupiedDensityPerCm3() {
        return occupancy * trapDensityPerCm3;
    }
}
