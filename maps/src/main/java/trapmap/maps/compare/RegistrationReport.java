package trapmap.maps.compare;

import java.util.List;

/**
 * A registration with the evidence for it: the placement kept, which candidate it was, the scores of the searched
 * and the unregistered (identity) placements, and the warnings of {@link RegistrationWarnings}.
 *
 * @param registration  the placement kept, with its score and overlap
 * @param kept          which candidate was kept
 * @param searchScore   score of the placement the search found, NaN when no search ran
 * @param identityScore score of the maps laid on each other as they are (no mirror, turn or shift)
 * @param warnings      one line each; empty when the pair looks like two maps of one wafer, well placed
 */
public record RegistrationReport(Registration registration, Kept kept, double searchScore, double identityScore,
                                 List<String> warnings) {

    /** Which placement was kept. */
    public enum Kept {
        /** The placement found by the search scored higher than the maps as they lie. */
        SEARCH("search"),
        /** The maps as they lie scored at least as high as the search: the identity was kept. */
        IDENTITY("identity"),
        /** No search ran (the maps were taken as aligned). */
        UNREGISTERED("unregistered");

        private final String key;

        Kept(String key) {
            this.key = key;
        }

        /** Lower-case key for results and JSON. */
        public String key() {
            return key;
        }
    }

    public RegistrationReport {
        warnings = List.copyOf(warnings);
    }

    /** True when there is at least one warning. */
    public boolean hasWarnings() {
        return !warnings.isEmpty();
    }
}
