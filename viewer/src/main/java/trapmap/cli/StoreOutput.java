package trapmap.cli;

import java.io.PrintWriter;
import java.time.Instant;
import java.util.List;
import java.util.regex.Pattern;
import trapmap.maps.batch.RunManifest;
import trapmap.maps.trend.TrendSettings;
import trapmap.physics.conversion.PhysicsSettings;
import trapmap.store.BatchTrend;
import trapmap.store.ResultsStore;
import trapmap.store.RunInfo;
import trapmap.store.StoreException;
import trapmap.store.StoreWriter;

/**
 * The results store of a batch command's {@code --store} ({@code inspect}, {@code watch}): opened with one run
 * before the first wafer, told each wafer through its {@link StoreWriter}, and closed with one line on failure.
 */
final class StoreOutput {
    private final ResultsStore results;
    private final String runId;
    private final StoreWriter writer;

    private StoreOutput(ResultsStore results, String runId, StoreWriter writer) {
        this.results = results;
        this.runId = runId;
        this.writer = writer;
    }

    /**
     * Opens {@code store} and starts a run in it; warnings (a sidecar's bad {@code measured_at}) go to {@code err} as
     * {@code COMMAND: warning: ...} lines.
     *
     * @throws InputException {@code --store NAME: ...} when the store cannot be opened or the run not started
     */
    static StoreOutput open(String store, RunManifest.Source source, PhysicsSettings physics, Pattern lots,
                            String command, PrintWriter err) {
        ResultsStore results = null;
        try {
            results = ResultsStore.open(store);
            String run = results.startRun(RunInfo.of(source, physics, Instant.now()));
            StoreWriter writer = new StoreWriter(results, run, lots, line -> {
                synchronized (err) {
                    err.println(command + ": warning: " + line);
                    err.flush();
                }
            });
            return new StoreOutput(results, run, writer);
        } catch (StoreException e) {
            if (results != null) {
                results.close();
            }
            throw new InputException("--store " + Flags.storeProblem(e.getMessage())); // "--store NAME: ..."
        }
    }

    /** The writer the batch tells each finished wafer. */
    StoreWriter writer() {
        return writer;
    }

    /**
     * The maps of {@code listed} (as the results table writes them) that the store does not hold under this run's
     * rules and settings, by file name: a restarted watch inspects them again (a killed watch may have written their
     * rows into the folder but not into the store). A store that cannot be asked counts as missing them all, so that
     * their writes tell.
     */
    java.util.Set<String> missing(java.util.List<String> listed) {
        java.util.Set<String> out = new java.util.LinkedHashSet<>(listed);
        try {
            out.removeAll(results.storedOf(runId, listed));
        } catch (StoreException e) {
            // all of them
        }
        return out;
    }

    /** The store (for reading it, e.g. its trend; the writer keeps writing into it). */
    ResultsStore results() {
        return results;
    }

    /**
     * Whether map {@code file} is not yet in the store under this run's rules and settings: a resumed run inspects
     * such a kept wafer again (its rows may have reached the folder while its store write still waited when the
     * earlier run was killed). A store that cannot be asked counts as missing it, so that the wafer's write tells.
     */
    boolean misses(String file) {
        try {
            return !results.holds(runId, file);
        } catch (StoreException e) {
            return true;
        }
    }

    /**
     * The trend page's trend of a batch judged by {@code rules}: {@link Rules#summaryTrend()} (the rules' block, else
     * its defaults, said so) over the store once every wafer told so far is stored.
     */
    BatchTrend summaryTrend(trapmap.maps.batch.Rules rules, List<String> files) throws java.io.InterruptedIOException {
        BatchTrend t = trend(rules.summaryTrend(), files);
        return rules.trend().isPresent() ? t : t.from(BatchTrend.FROM_DEFAULTS);
    }

    /**
     * The trend of {@code settings} over the store once every wafer told so far is stored ({@link BatchTrend#of}),
     * the batch's wafers being the results of {@code files} under this run's rules; a wafer that could not be stored
     * or a trend that cannot be charted gives the trend's reason instead (the store's failure is also told when it
     * closes).
     */
    BatchTrend trend(TrendSettings settings, List<String> files) throws java.io.InterruptedIOException {
        try {
            writer.awaitStored();
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new java.io.InterruptedIOException("trend cancelled");
        } catch (StoreException e) {
            return BatchTrend.failed(settings, results.name(), "not every wafer of this run was stored: "
                    + e.getMessage());
        }
        try {
            return BatchTrend.of(results, settings, runId, files);
        } catch (RuntimeException e) { // the page says why; the summary and the results stay as they are
            return BatchTrend.failed(settings, results.name(), "the trend could not be computed: " + e);
        }
    }

    /**
     * Waits for the wafers still to be stored and closes the store (nothing when {@code output} is null); false,
     * with one line on {@code err}, when some wafer could not be stored.
     *
     * @param again how the user stores the wafers again, e.g. {@code "inspecting the wafers again with --store"}
     */
    static boolean close(StoreOutput output, String command, String again, PrintWriter err) {
        if (output == null) {
            return true;
        }
        try (ResultsStore r = output.results) {
            output.writer.close();
            return true;
        } catch (StoreException e) {
            err.println(command + ": --" + e.getMessage() + "; the results in --out are complete, and " + again
                    + " writes them (a stored wafer is replaced, not doubled)");
            err.flush();
            return false;
        }
    }
}
