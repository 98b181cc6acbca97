package trapmap.cli;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import picocli.CommandLine.Option;
import trapmap.store.StoreFilter;

/**
 * The results store and the query over it, as {@code trend} and {@code recurrence} take them: the store, a period, a
 * profile, lots and sidecar facts, converted into one {@link StoreFilter}.
 */
final class StoreQueryOptions {
    @Option(names = "--store", required = true, paramLabel = "<store>",
            description = "The results store: a SQLite file, or postgresql://host[:port]/database (user and password"
                    + " from PGUSER/PGPASSWORD or ~/.pgpass, never on the command line).")
    String store;

    @Option(names = "--since", paramLabel = "<date>",
            description = "Only wafers measured at or after this UTC date (2026-11-02) or time (2026-11-02T08:00:00Z).")
    String since;

    @Option(names = "--until", paramLabel = "<date>",
            description = "Only wafers measured on or before this UTC date (the whole day), or before this time.")
    String until;

    @Option(names = "--profile", paramLabel = "<name>", description = "Only wafers judged by this rules profile.")
    String profile;

    @Option(names = "--lot", paramLabel = "<lot>", description = "Only wafers of this lot; repeat for several.")
    List<String> lots = new ArrayList<>();

    @Option(names = "--where", paramLabel = "<NAME=VALUE>",
            description = "Only wafers whose sidecar fact NAME has this VALUE (e.g. furnace_tube=T2); repeat: all must"
                    + " hold.")
    List<String> where = new ArrayList<>();

    /** The query of the options. */
    StoreFilter filter() {
        Instant from = since == null ? null : TrendCommand.time("--since", since);
        Instant to = null;
        if (until != null) {
            to = TrendCommand.time("--until", until);
            if (until.trim().length() == 10) {
                to = to.plus(Duration.ofDays(1)); // a date: the whole day
            }
        }
        if (from != null && to != null && !from.isBefore(to)) {
            throw new InputException("--until " + until + " must be after --since " + since);
        }
        Map<String, String> facts = new LinkedHashMap<>();
        for (String w : where) {
            int eq = w.indexOf('=');
            if (eq <= 0 || w.substring(0, eq).isBlank()) {
                throw new InputException("--where must be NAME=VALUE (e.g. furnace_tube=T2) but was " + w);
            }
            String name = w.substring(0, eq).trim();
            if (facts.put(name, w.substring(eq + 1).trim()) != null) {
                throw new InputException("--where names " + name + " twice; a wafer has one value of each fact");
            }
        }
        return new StoreFilter(from, to, profile, lots, facts);
    }
}
