package trapmap.physics.spectroscopy;

import java.util.List;
import java.util.Objects;
import java.util.function.Supplier;
import trapmap.shared.check.Checks;

/**
 * A library ranking of one τ_SRH(Δn) curve: its status, the candidates' fits and the one-line reason. The reason is
 * written, and the candidates sorted, when {@link #reason()} and {@link #candidates()} are first called (the maps rank
 * every pixel and keep only the best and runner-up, so most are never read); they are the same whenever made. Immutable and thread-safe; equality, hash
 * and {@code toString} are those of its five parts, as for a record.
 */
public final class Ranking {
    private final RankingStatus status;
    private final int usableLevels;
    private final DefectHint hint;
    /** Makes the candidates' list; null once {@link #candidates} is set. */
    private Supplier<List<CandidateFit>> candidatesWriter;
    private volatile List<CandidateFit> candidates;
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
        this(status, usableLevels, null, hint, null);
        this.candidates = List.copyOf(candidates);
        this.reason = Checks.notNull(reason, "reason");
    }

    /**
     * A ranking whose candidates' list and reason {@code candidatesWriter} and {@code reasonWriter} make when they are
     * first asked for.
     */
    Ranking(RankingStatus status, int usableLevels, Supplier<List<CandidateFit>> candidatesWriter, DefectHint hint,
            Supplier<String> reasonWriter) {
        this.status = Checks.notNull(status, "status");
        this.usableLevels = usableLevels;
        this.candidatesWriter = candidatesWriter;
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
        List<CandidateFit> c = candidates;
        if (c == null) {
            synchronized (this) {
                c = candidates;
                if (c == null) {
                    c = List.copyOf(candidatesWriter.get());
                    candidates = c;
                    candidatesWriter = null;
                }
            }
        }
        return c;
    }

    /** Best and runner-up; null when nothing was fitted. */
    public DefectHint hint() {
        return hint;
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof Ranking r && status == r.status && usableLevels == r.usableLevels
                && candidates().equals(r.candidates()) && Objects.equals(hint, r.hint) && reason().equals(r.reason());
    }

    @Override
    public int hashCode() {
        return Objects.hash(status, reason(), usableLevels, candidates(), hint);
    }

    @Override
    public String toString() {
        return "Ranking[status=" + status + ", reason=" + reason() + ", usableLevels=" + usableLevels + ", candidates="
                + candidates() + ", hint=" + hint + "]";
    }
}
