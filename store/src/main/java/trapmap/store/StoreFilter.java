package trapmap.store;

import java.time.Instant;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;

/**
 * Which stored wafers a query takes. A wafer's time is its measured time (the sidecar's {@code measured_at}) where it
 * has one, else the time its result was stored.
 *
 * @param since      only wafers at or after this time; null for no lower bound
 * @param until      only wafers before this time (exclusive); null for no upper bound
 * @param profile    only wafers judged by this rules profile; null for all
 * @param lots       only wafers of one of these lots; empty for all
 * @param attributes only wafers whose sidecar facts have all these values (name → value, as text); empty for all
 */
public record StoreFilter(Instant since, Instant until, String profile, List<String> lots,
                          Map<String, String> attributes) {
    /** Every stored wafer. */
    public static final StoreFilter ALL = new StoreFilter(null, null, null, List.of(), Map.of());

    public StoreFilter {
        lots = lots == null ? List.of() : List.copyOf(lots);
        attributes = attributes == null ? Map.of()
                : java.util.Collections.unmodifiableMap(new LinkedHashMap<>(attributes));
        attributes.forEach((k, v) -> {
            Objects.requireNonNull(k, "attribute name");
            Objects.requireNonNull(v, "attribute value");
        });
        if (since != null && until != null && !since.isBefore(until)) {
            throw new IllegalArgumentException("since (" + since + ") must be before until (" + until + ")");
        }
    }

    /** This filter with only wafers at or after {@code t}. */
    public StoreFilter since(Instant t) {
        return new StoreFilter(t, until, profile, lots, attributes);
    }

    /** The filter in words, for captions and logs, e.g. {@code since 2026-11-02T00:00:00Z; lot L1, L2}. */
    public String describe() {
        StringBuilder s = new StringBuilder();
        if (since != null) {
            s.append("; since ").append(since);
        }
        if (until != null) {
            s.append("; until ").append(until);
        }
        if (profile != null) {
            s.append("; profile ").append(profile);
        }
        if (!lots.isEmpty()) {
            s.append("; lot ").append(String.join(", ", lots));
        }
        attributes.forEach((k, v) -> s.append("; ").append(k).append('=').append(v));
        return s.length() == 0 ? "all wafers" : s.substring(2);
    }
}
