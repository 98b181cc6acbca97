package trapmap.physics.spectroscopy;

import trapmap.physics.defect.Defect;

/**
 * The fit of one library defect to one τ_SRH(Δn) curve (see {@link LibraryRanking}). Skipped candidates (no
 * absolute cross-sections) and unfitted ones (too few levels) carry NaN numbers and the reason.
 *
 * @param defect              the candidate
 * @param fitted              true when the numbers below are a fit
 * @param reason              why the candidate was not fitted; for a fitted one a caution (its cross-sections
 *                            belong to another thermal-velocity convention than the silicon's) or empty
 * @param ntPerCm3            weighted least-squares N_t, cm^-3
 * @param standardErrorPerCm3 standard error of N_t from the stated uncertainties, cm^-3
 * @param lowerPerCm3         lower 95 % bound N_t − 1.96 σ, at least 0, cm^-3
 * @param upperPerCm3         upper 95 % bound N_t + 1.96 σ, cm^-3
 * @param chiSquared          χ² of the fit
 * @param degreesOfFreedom    usable levels − 1
 * @param pValue              probability of a χ² at least this large if the candidate is right
 */
public record CandidateFit(Defect defect, boolean fitted, String reason, double ntPerCm3, double standardErrorPerCm3,
                           double lowerPerCm3, double upperPerCm3, double chiSquared, int degreesOfFreedom,
                           double pValue) {

    static CandidateFit notFitted(Defect defect, String reason) {
        return new CandidateFit(defect, false, reason, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN,
                0, Double.NaN);
    }

    /** The candidate's defect id. */
    public String id() {
        return defect.id();
    }
}
