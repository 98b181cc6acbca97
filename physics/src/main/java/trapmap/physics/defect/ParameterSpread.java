package trapmap.physics.defect;

/**
 * The published spread of a defect's parameters, used to bound the equivalent trap density.
 *
 * @param energyEv      range of the level energy, in the defect level's own reference, eV
 * @param electronCrossSectionCm2 range of σ_n, cm²
 * @param holeCrossSectionCm2     range of σ_p, cm²
 * @param note          where the range comes from
 */
public record ParameterSpread(Range energyEv, Range electronCrossSectionCm2, Range holeCrossSectionCm2,
                              String note) {
}
