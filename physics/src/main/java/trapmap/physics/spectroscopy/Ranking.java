package trapmap.physics.spectroscopy;

import java.util.List;

/**
 * A library ranking of one τ_SRH(Δn) curve.
 *
 * @param status       outcome
 * @param reason       one line saying why (names the levels, the best candidate and its p-value)
 * @param usableLevels levels with a finite positive τ_SRH
 * @param candidates   fitted candidates by rising χ² (ties in library order), then the ones not fitted
 * @param hint         best and runner-up; null when nothing was fitted
 */
public record Ranking(RankingStatus status, String reason, int usableLevels, List<CandidateFit> candidates,
                     DefectHint hint) {
    public Ranking {
        candidates = List.copyOf(candidates);
    }
}
