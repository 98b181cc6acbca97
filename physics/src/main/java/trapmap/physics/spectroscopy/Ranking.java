package trapmap.physics.spectroscopy;

import java.util.List;
import java.util.Objects;
import java.util.function.Supplier;
import trapmap.shared.check.Checks;

/**
 * A library ranking of one τ_SRH(Δn) curve: its status, the candidates' fits and the one-line reason. The reason is
 * written when {@link #reason()} is first called (the maps rank every pixel and keep only the numbers, so most
 * reasons are never read); the text is the same whenever it is written. Immutable and thread-safe; equality, hash
 * and {@code toString} are those of its five parts, as for a record.
 */
public final class Ranking {
    private final RankingStatus status;
    private final int usableLevels;
    private final List<CandidateFit> candidates;
    private final DefectHint hint;
    /** Writes the reason; null once {@link #reason} is set. */
    private Supplier<String> reasonWriter;
    private volatile String reason;

    /**
     * @param status       outcome
     * @param reason       one line saying why (names the levels, the best candidate and its p-value)
     * @param usableLevels levels with a finite positive τ_SRH
     * @param candidates   fitted candidates by rising χ² (ties in library order), then the ones not fitted
     * @param hint         best and runner-up; null when nothing was fitted
     */
    public Ranking(RankingStatus status, String reason, int usableLevels, List<CandidateFit> candidates,
                   DefectHint hint) {
        this(status, usableLevels, candidates, hint, null);
        this.reason = Checks.notNull(reason, "reason");
    }

    /** A ranking whose reason {@code reasonWriter} writes when it is first asked for. */
    Ranking(RankingStatus status, int usableLevels, List<CandidateFit> candidates, DefectHint hint,
            Supplier<String> reasonWriter) {
        this.status = Checks.notNull(status, "status");
        this.usableLevels = usableLevels;
        this.candidates = List.copyOf(candidates);
        this.hint = hint;
        this.reasonWriter = reasonWriter;
    }

    /** Outcome. */
    public RankingStatus status() {
        return status;
    }

    /** One line saying why (names the levels, the best candidate and its p-value). */
    public String reason() {
        String r = reason;
        if (r == null) {
            synchronized (this) {
                r = reason;
                if (r == null) {
                    r = Objects.requireNonNull(reasonWriter.get(), "reason");
                    reason = r;
                    reasonWriter = null;
                }
            }
        }
        return r;
    }

    /** Levels with a finite positive τ_SRH. */
    public int usableLevels() {
        return usableLevels;
    }

    /** Fitted candidates by rising χ² (ties in library order), then the ones not fitted. */
    public List<CandidateFit> candidates() {
        return candidates;
    }

    /** Best and runner-up; null when nothing was fitted. */
    public DefectHint hint() {
        return hint;
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof Ranking r && status == r.status && usableLevels == r.usableLevels
                && candidates.equals(r.candidates) && Objects.equals(hint, r.hint) && reason().equals(r.reason());
    }

    @Override
    public int hashCode() {
        return Objects.hash(status, reason(), usableLevels, candidates, hint);
    }

    @Override
    public String toString() {
        return "Ranking[status=" + status + ", reason=" + reason() + ", usableLevels=" + usableLevels + ", candidates="
                + candidates + ", hint=" + hint + "]";
    }
}
