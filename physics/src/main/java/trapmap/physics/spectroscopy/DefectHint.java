package trapmap.physics.spectroscopy;

/**
 * The short answer of a ranking: the best candidate, the runner-up and how much worse the runner-up fits.
 *
 * @param best            the candidate with the lowest χ²
 * @param runnerUp        the second lowest, null when only one candidate was fitted
 * @param chiSquaredRatio χ²(runner-up)/χ²(best); +∞ when the best fits exactly, NaN without a runner-up
 */
public record DefectHint(CandidateFit best, CandidateFit runnerUp, double chiSquaredRatio) {
}
