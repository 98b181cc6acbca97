package trapmap.physics.spectroscopy;

/** Outcome of a library ranking; {@link Ranking#reason()} says why in one line. */
public enum RankingStatus {
    /** Every level usable and the best candidate fits (p ≥ 0.01). */
    OK,
    /** Some levels have no finite positive τ_SRH (SRH not resolvable there); ranked on the others. */
    BELOW_LIMIT,
    /** Fewer than two usable levels: the shape of the curve is unknown, nothing is ranked. */
    TOO_FEW_LEVELS,
    /** The best candidate has p &lt; 0.01: no single library defect explains the curve. */
    NO_SINGLE_DEFECT
}
