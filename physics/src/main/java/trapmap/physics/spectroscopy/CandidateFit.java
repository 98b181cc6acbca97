package trapmap.physics.spectroscopy;

import java.util.Objects;
import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import trapmap.physics.defect.Defect;

/**
 * The fit of one library defect to one τ_SRH(Δn) curve (see {@link LibraryRanking}). Skipped candidates (no
 * absolute cross-sections) and unfitted ones (too few levels) carry NaN numbers and the reason.
 * <p>
 * A fit made by {@link LibraryRanking} works out its p-value when {@link #pValue()} is first called (the maps rank
 * every pixel and read only the best candidate's); the value is the same whenever it is computed. Immutable and
 * thread-safe; equality, hash and {@code toString} are those of its ten parts, as for a record.
 */
public final class CandidateFit {
    private final Defect defect;
    private final boolean fitted;
    private final String reason;
    private final double ntPerCm3;
    private final double standardErrorPerCm3;
    private final double lowerPerCm3;
    private final double upperPerCm3;
    private final double chiSquared;
    private final int degreesOfFreedom;
    /** The χ² distribution of {@link #degreesOfFreedom} while the p-value is not yet computed, else null. */
    private ChiSquaredDistribution pending;
    private double pValue;

    /**
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
    public CandidateFit(Defect defect, boolean fitted, String reason, double ntPerCm3, double standardErrorPerCm3,
                        double lowerPerCm3, double upperPerCm3, double chiSquared, int degreesOfFreedom,
                        double pValue) {
        this(defect, fitted, reason, ntPerCm3, standardErrorPerCm3, lowerPerCm3, upperPerCm3, chiSquared,
                degreesOfFreedom, null);
        this.pValue = pValue;
    }

    /** A fit whose p-value, 1 − F_χ²(χ²; ν) of {@code distribution} (ν degrees of freedom), waits until asked. */
    CandidateFit(Defect defect, boolean fitted, String reason, double ntPerCm3, double standardErrorPerCm3,
                 double lowerPerCm3, double upperPerCm3, double chiSquared, int degreesOfFreedom,
                 ChiSquaredDistribution distribution) {
        this.defect = defect;
        this.fitted = fitted;
        this.reason = reason;
        this.ntPerCm3 = ntPerCm3;
        this.standardErrorPerCm3 = standardErrorPerCm3;
        this.lowerPerCm3 = lowerPerCm3;
        this.upperPerCm3 = upperPerCm3;
        this.chiSquared = chiSquared;
        this.degreesOfFreedom = degreesOfFreedom;
        this.pending = distribution;
    }

    static CandidateFit notFitted(Defect defect, String reason) {
        return new CandidateFit(defect, false, reason, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN,
                0, Double.NaN);
    }

    /** The candidate's defect id. */
    public String id() {
        return defect.id();
    }

    /** The candidate. */
    public Defect defect() {
        return defect;
    }

    /** True when the numbers are a fit. */
    public boolean fitted() {
        return fitted;
    }

    /**
     * Why the candidate was not fitted; for a fitted one a caution (its cross-sections belong to another
     * thermal-velocity convention than the silicon's) or empty.
     */
    public String reason() {
        return reason;
    }

    /** Weighted least-squares N_t, cm^-3. */
    public double ntPerCm3() {
        return ntPerCm3;
    }

    /** Standard error of N_t from the stated uncertainties, cm^-3. */
    public double standardErrorPerCm3() {
        return standardErrorPerCm3;
    }

    /** Lower 95 % bound N_t − 1.96 σ, at least 0, cm^-3. */
    public double lowerPerCm3() {
        return lowerPerCm3;
    }

    /** Upper 95 % bound N_t + 1.96 σ, cm^-3. */
    public double upperPerCm3() {
        return upperPerCm3;
    }

    /** χ² of the fit. */
    public double chiSquared() {
        return chiSquared;
    }

    /** Usable levels − 1. */
    public int degreesOfFreedom() {
        return degreesOfFreedom;
    }

    /** Probability of a χ² at least this large if the candidate is right: 1 − F_χ²(χ²; ν). */
    public synchronized double pValue() {
        if (pending != null) {
            pValue = 1.0 - pending.cumulativeProbability(chiSquared);
            pending = null;
        }
        return pValue;
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof CandidateFit f && Objects.equals(defect, f.defect) && fitted == f.fitted
                && Objects.equals(reason, f.reason) && Double.compare(ntPerCm3, f.ntPerCm3) == 0
                && Double.compare(standardErrorPerCm3, f.standardErrorPerCm3) == 0
                && Double.compare(lowerPerCm3, f.lowerPerCm3) == 0 && Double.compare(upperPerCm3, f.upperPerCm3) == 0
                && Double.compare(chiSquared, f.chiSquared) == 0 && degreesOfFreedom == f.degreesOfFreedom
                && Double.compare(pValue(), f.pValue()) == 0;
    }

    @Override
    public int hashCode() {
        return Objects.hash(defect, fitted, reason, ntPerCm3, standardErrorPerCm3, lowerPerCm3, upperPerCm3,
                chiSquared, degreesOfFreedom, pValue());
    }

    @Override
    public String toString() {
        return "CandidateFit[defect=" + defect + ", fitted=" + fitted + ", reason=" + reason + ", ntPerCm3="
                + ntPerCm3 + ", standardErrorPerCm3=" + standardErrorPerCm3 + ", lowerPerCm3=" + lowerPerCm3
                + ", upperPerCm3=" + upperPerCm3 + ", chiSquared=" + chiSquared + ", degreesOfFreedom="
                + degreesOfFreedom + ", pValue=" + pValue() + "]";
    }
}
