package trapmap.cli;

import java.util.ArrayList;
import java.util.List;
import picocli.CommandLine.Option;
import trapmap.shared.error.InvalidValueException;
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

    @Option(names = "--lot", paramLabel = "<lot>", description = "Only wafers of this lot; repeat for several, or"
            + " separate them by commas (L1,L2); a lot holding a comma in double quotes ('\"A,1\"').")
    List<String> lots = new ArrayList<>();

    @Option(names = "--where", paramLabel = "<NAME=VALUE>",
            description = "Only wafers whose sidecar fact NAME has this VALUE (e.g. furnace_tube=T2); repeat, or"
                    + " separate them by commas: all must hold; one holding a comma in double quotes"
                    + " ('\"recipe=B,2\"').")
    List<String> where = new ArrayList<>();

    /**
     * The store to read, refused ({@link trapmap.viewer.model.StoreHistory#address}, as the history window refuses it)
     * when it is a SQLite file that does not exist or a folder: opening one would make an empty store there (a
     * mistyped name would leave a new file behind and answer "holds no wafer").
     */
    String existingStore() {
        try {
            trapmap.viewer.model.StoreHistory.address(store);
        } catch (InvalidValueException e) {
            throw new InputException("--store " + Flags.storeProblem(e.getMessage()), e);
        }
        return store;
    }

    /**
     * Refuses a {@code --by} that names a sidecar fact none of the stored wafers has: every wafer would fall into the
     * one group of wafers without it, charted or mapped as if asked for.
     *
     * @param by the grouping given (null: none)
     */
    static void requireKnownGrouping(trapmap.store.ResultsStore store, String by) {
        if (by == null || !trapmap.store.ResultsStore.groupsByAttribute(by)) {
            return;
        }
        List<String> facts = new ArrayList<>(store.attributeNames());
        facts.removeAll(List.of("lot", "measured_at")); // the lot is a grouping of its own, the time the axis
        if (!facts.contains(by.trim())) {
            throw new InputException("--by " + by + " is neither lot, day, week, none nor a sidecar fact of the stored"
                    + " wafers" + (facts.isEmpty() ? " (they have none)" : " (their facts: " + String.join(", ", facts)
                    + ")"));
        }
    }

    /** The query of the options ({@link StoreFilter#parse}, the reading the history window shares). */
    StoreFilter filter() {
        try {
            return StoreFilter.parse(since, until, profile, lots, where, "--");
        } catch (InvalidValueException e) {
            throw new InputException(e.getMessage(), e);
        }
    }
}
