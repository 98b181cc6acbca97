package trapmap.store;

import java.io.IOException;
import java.io.StringReader;
import java.io.UncheckedIOException;
import java.time.Duration;
import java.time.Instant;
import java.time.LocalDate;
import java.time.ZoneOffset;
import java.time.format.DateTimeParseException;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import trapmap.shared.error.InvalidValueException;

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

    /**
     * The filter of a query as a user types it, the one reading of {@code trapmap trend --since/--until/--profile/--lot
     * /--where} and of the viewer's history window. {@code since} and {@code until} are a UTC date ({@code 2026-11-02})
     * or time ({@code 2026-11-02T08:00:00Z}); an {@code until} date takes that whole day; {@code where} holds
     * {@code NAME=VALUE} facts that must all hold. Each text of {@code lots} and {@code where} is a list
     * ({@link #items}: separated by commas, an item holding a comma in double quotes). Blank texts, lots and profile
     * mean no bound.
     *
     * @param prefix how the caller writes a field name before it in messages: {@code "--"} for the command line,
     *               {@code ""} for the window
     * @throws InvalidValueException one line naming the field ({@code since}, {@code until}, {@code lot} or
     *                               {@code where}): a date that is none, an until not after the since, a quote not
     *                               closed, a fact not {@code NAME=VALUE}, a fact named twice
     */
    public static StoreFilter parse(String since, String until, String profile, List<String> lots,
                                    List<String> where, String prefix) {
        String p = prefix == null ? "" : prefix;
        Instant from = blank(since) ? null : time(p + "since", since);
        Instant to = null;
        if (!blank(until)) {
            to = time(p + "until", until);
            if (until.trim().length() == 10) {
                to = to.plus(Duration.ofDays(1)); // a date: the whole day
            }
        }
        if (from != null && to != null && !from.isBefore(to)) {
            throw new InvalidValueException("until", "UTC date", p + "until " + until.trim() + " must be after " + p
                    + "since " + since.trim());
        }
        List<String> lotList = new ArrayList<>();
        for (String l : lots == null ? List.<String>of() : lots) {
            lotList.addAll(items(l, "lot", p));
        }
        List<String> whereItems = new ArrayList<>();
        for (String w : where == null ? List.<String>of() : where) {
            whereItems.addAll(items(w, "where", p));
        }
        Map<String, String> facts = new LinkedHashMap<>();
        for (String w : whereItems) {
            int eq = w.indexOf('=');
            if (eq <= 0 || w.substring(0, eq).isBlank()) {
                throw new InvalidValueException("where", "", p + "where must be NAME=VALUE (e.g. furnace_tube=T2)"
                        + " but was " + w.trim());
            }
            String name = w.substring(0, eq).trim();
            if (facts.put(name, w.substring(eq + 1).trim()) != null) {
                throw new InvalidValueException("where", "", p + "where names " + name + " twice; a wafer has one"
                        + " value of each fact");
            }
        }
        return new StoreFilter(from, to, blank(profile) ? null : profile.trim(), lotList, facts);
    }

    /**
     * The start of a UTC date ({@code 2026-11-02}) or a UTC time ({@code 2026-11-02T08:00:00Z}).
     *
     * @param name the field as the caller writes it, for the message ({@code --since}, {@code baseline})
     * @throws InvalidValueException (unit {@code UTC date}) naming {@code name} and the text when it is neither
     */
    public static Instant time(String name, String text) {
        String t = text.trim();
        try {
            if (t.length() == 10) {
                return LocalDate.parse(t).atStartOfDay(ZoneOffset.UTC).toInstant();
            }
            return Instant.parse(t);
        } catch (DateTimeParseException e) {
            throw new InvalidValueException(name.replaceFirst("^-+", ""), "UTC date", name + " must be a UTC date"
                    + " (2026-11-02) or time (2026-11-02T08:00:00Z) but was " + t);
        }
    }

    /** How a list is read: CSV (RFC 4180) without header, blanks around items and quotes ignored. */
    private static final CSVFormat LIST = CSVFormat.DEFAULT.builder().setIgnoreSurroundingSpaces(true)
            .setIgnoreEmptyLines(true).build();

    /**
     * The items of a list as the query's lot and fact fields are typed (the window's fields, each {@code --lot} and
     * {@code --where} value of the commands): separated by commas, each trimmed, blank ones left out; an item that
     * holds a comma or a double quote is written in double quotes, a double quote inside it doubled, as in a CSV file
     * (RFC 4180): {@code L1, "A,1"} is the lots {@code L1} and {@code A,1}; {@code "furnace_tube=T2,new"} one fact.
     * Text without quotes reads as before: split at its commas.
     *
     * @param field  the field's name for the message ({@code lot}, {@code where})
     * @param prefix how the caller writes a field name ({@code "--"} or {@code ""})
     * @throws InvalidValueException naming the field when a quote is not closed or text follows a closing quote
     */
    public static List<String> items(String text, String field, String prefix) {
        List<String> out = new ArrayList<>();
        if (blank(text)) {
            return out;
        }
        try (CSVParser parser = LIST.parse(new StringReader(text))) {
            for (CSVRecord r : parser) {
                for (String item : r) {
                    if (!item.isBlank()) {
                        out.add(item.strip());
                    }
                }
            }
        } catch (IOException | UncheckedIOException | IllegalStateException e) {
            throw new InvalidValueException(field, "", (prefix == null ? "" : prefix) + field + " has a quote that"
                    + " does not close its item: write an item holding a comma in double quotes, a quote inside it"
                    + " doubled (\"A,1\", L2), but was " + text.strip());
        }
        return out;
    }

    private static boolean blank(String s) {
        return s == null || s.isBlank();
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
