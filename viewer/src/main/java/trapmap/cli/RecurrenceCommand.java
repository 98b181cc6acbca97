package trapmap.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.Callable;
import java.util.stream.Stream;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.BatchOutputException;
import trapmap.maps.batch.HotSpots;
import trapmap.maps.batch.Recurrence;
import trapmap.maps.batch.RecurrenceFiles;
import trapmap.maps.batch.RunManifest;
import trapmap.maps.region.Region;
import trapmap.shared.error.InvalidValueException;
import trapmap.store.ResultsStore;
import trapmap.store.StoreException;
import trapmap.store.StoreFilter;
import trapmap.store.StoreRecurrence;

/**
 * {@code trapmap recurrence --store S -o DIR}: the recurrence maps of the wafers of a results-store query, per family
 * or per value of a sidecar fact and family, with their hot spots. The computation is {@link StoreRecurrence}, the
 * files are {@link RecurrenceFiles} (as a batch writes its own); this class converts the options and prints.
 */
@Command(name = "recurrence", version = TrapmapCommand.VERSION, mixinStandardHelpOptions = true, sortOptions = false,
        usageHelpAutoWidth = true,
        header = "Maps where stored wafers were flagged again and again, from a results store.",
        description = {
            "Adds up the footprints that 'inspect --store' kept of each wafer (the 1 mm cells where it was evaluated"
                + " and where it was flagged) over the wafers of the query: per wafer family, or with --by per value"
                + " of a sidecar fact (boat_slot, furnace_tube, ...) or lot, day or week and family. Each cell shows"
                + " the share of the wafers evaluated there that were flagged there.",
            "Hot spots: cells flagged on more than 25 %% of their wafers, covered by at least 5 wafers and half of"
                + " the group's wafers of the family; 8-connected cells form one spot.",
            ""},
        footer = {"", "Output in DIR: recurrence-[GROUP-]FAMILY.tif (share of wafers flagged, 0 to 1, 1 mm cells),"
                + " recurrence-[GROUP-]FAMILY.png (0-100 %% with the hot spots outlined), recurrence.csv (group, family,"
                + " wafers, file) and hotspots.csv (group, family, wafers, spot, cells, peak_share 0 to 1,"
                + " centroid_x_mm, centroid_y_mm, wafer coordinates); on stdout one line per map.",
            "Exit codes: 0 done; 2 invalid input (one line on stderr names the option), or the store cannot be read"
                + " or holds no wafer for the query; 3 internal error; 4 an output could not be written (disk full,"
                + " no permission); 5 the pictures could not be drawn: this Java runtime lacks font libraries or fonts"
                + " (one line names what and the packages to install; the maps and tables are written)."})
final class RecurrenceCommand implements Callable<Integer> {
    /** The step named when the runtime cannot draw the pictures. */
    static final String PICTURES = "the recurrence pictures";

    @Spec
    CommandSpec spec;

    @Mixin
    StoreQueryOptions query = new StoreQueryOptions();

    @Option(names = "--by", paramLabel = "<grouping>",
            description = "One map per value of a sidecar fact (boat_slot, furnace_tube, ...), or per lot, day (UTC)"
                    + " or week (ISO), and family; default: one map per family.")
    String by;

    @Option(names = "--cell", paramLabel = "<mm>", defaultValue = "1",
            description = "The cell size, mm: 1 (the stored cells) or an odd number (3, 5, ...) for coarser maps, or"
                    + " for footprints stored with only the cell under each pixel's centre, which on pixels larger"
                    + " than 1 mm show one spot as scattered single cells (default: ${DEFAULT-VALUE}).")
    int cellMm;

    @Option(names = {"-o", "--out", "--output"}, required = true, paramLabel = "<DIR>",
            description = "The output folder (made when missing; not a batch's own output folder).")
    Path out;

    @Option(names = "--json", description = "Print one JSON object (the query, every map with its hot spots) instead"
            + " of the lines.")
    boolean json;

    @Override
    public Integer call() throws IOException {
        StoreFilter filter = filter();
        if (cellMm < 1 || cellMm % 2 == 0) {
            throw new InputException("--cell must be 1 or an odd number of mm (3, 5, ...), so that the stored 1 mm"
                    + " cells nest in it, but was " + cellMm);
        }
        if (by != null && (by.isBlank() || by.trim().equals("none"))) {
            by = null;
        }
        if (Files.exists(out) && !Files.isDirectory(out)) {
            throw new InputException("-o " + out + ": is a file; give a folder");
        }
        if (Files.exists(out.resolve(RunManifest.FILE_NAME)) || Files.exists(out.resolve(BatchInspection.CSV_NAME))) {
            throw new InputException("-o " + out + ": is a batch's output folder (it holds "
                    + RunManifest.FILE_NAME + " or " + BatchInspection.CSV_NAME + "); give another folder");
        }
        StoreRecurrence.Outcome outcome;
        try (ResultsStore s = ResultsStore.open(query.existingStore())) {
            StoreQueryOptions.requireKnownGrouping(s, by);
            outcome = StoreRecurrence.analyse(s, filter, by, cellMm);
        } catch (StoreException e) {
            throw new InputException("--store " + Flags.storeProblem(e.getMessage()));
        } catch (InvalidValueException e) {
            throw new InputException("--store " + Flags.oneLine(e.getMessage()));
        }
        Pictures pictures = Pictures.start();
        List<Path> written;
        try {
            Files.createDirectories(out);
            boolean draw = pictures.allows(PICTURES);
            written = RecurrenceFiles.write(out, outcome.entries(), outcome.grouped(), draw);
            RecurrenceFiles.writeHotSpots(out, outcome.entries(), HotSpots.Criteria.DEFAULT);
            removeStale(written);
        } catch (BatchOutputException e) {
            PrintWriter err = spec.commandLine().getErr();
            err.println(spec.qualifiedName() + ": " + Flags.oneLine(e.getMessage()));
            err.flush();
            return Exit.OUTPUT_NOT_WRITTEN;
        } catch (IOException e) {
            PrintWriter err = spec.commandLine().getErr();
            err.println(spec.qualifiedName() + ": -o " + out + ": cannot be made: " + MapInput.writeFailure(e));
            err.flush();
            return Exit.OUTPUT_NOT_WRITTEN;
        }
        PrintWriter o = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        for (String why : outcome.refused()) {
            err.println(spec.qualifiedName() + ": warning: " + why);
        }
        for (String note : outcome.notes()) {
            err.println(spec.qualifiedName() + ": note: " + note);
        }
        if (json) {
            o.println(Output.json(json(outcome)));
        } else {
            o.println("store " + query.store + "; " + outcome.describe());
            for (String line : outcome.lines(HotSpots.Criteria.DEFAULT)) {
                o.println("  " + line);
            }
            o.println("written: " + out.resolve(BatchInspection.RECURRENCE_NAME) + ", "
                    + out.resolve(RecurrenceFiles.HOT_SPOTS_NAME) + " and " + written.size() + " map files");
        }
        o.flush();
        if (pictures.line().isPresent()) {
            err.println(spec.qualifiedName() + ": " + pictures.line().get());
            err.flush();
            return Exit.REPORT_MISSING;
        }
        err.flush();
        return Exit.OK;
    }

    /** The query of the options. */
    StoreFilter filter() {
        return query.filter();
    }

    /** Removes recurrence maps and pictures of an earlier query in the folder that this one did not write. */
    private void removeStale(List<Path> written) throws IOException {
        Set<Path> keep = Set.copyOf(written.stream().map(p -> p.getFileName()).toList());
        try (Stream<Path> files = Files.list(out)) {
            for (Path p : files.toList()) {
                String n = p.getFileName().toString();
                if (n.startsWith(BatchInspection.RECURRENCE_PREFIX) && (n.endsWith(".tif") || n.endsWith(".png"))
                        && !keep.contains(p.getFileName())) {
                    Files.deleteIfExists(p);
                }
            }
        }
    }

    private static Map<String, Object> json(StoreRecurrence.Outcome outcome) {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("query", outcome.filter().describe());
        m.put("by", outcome.by());
        m.put("wafers", outcome.wafers());
        List<Map<String, Object>> maps = new ArrayList<>();
        HotSpots.Criteria c = HotSpots.Criteria.DEFAULT;
        for (RecurrenceFiles.Entry e : outcome.entries()) {
            Recurrence r = e.recurrence();
            HotSpots.Result hot = HotSpots.find(r, c);
            Map<String, Object> mm = new LinkedHashMap<>();
            mm.put("group", e.group());
            mm.put("family", r.family());
            mm.put("wafers", r.wafers());
            mm.put("wafers_needed", hot.wafersNeeded());
            List<Map<String, Object>> spots = new ArrayList<>();
            for (Region g : hot.regions().byArea()) {
                Map<String, Object> sm = new LinkedHashMap<>();
                sm.put("spot", g.id());
                sm.put("cells", g.pixelCount());
                sm.put("peak_share", Output.sample(g.peakValue()));
                sm.put("centroid_x_mm", Output.mm(g.centroidXMm()));
                sm.put("centroid_y_mm", Output.mm(g.centroidYMm()));
                spots.add(sm);
            }
            mm.put("hot_spots", spots);
            maps.add(mm);
        }
        m.put("maps", maps);
        m.put("left_out", outcome.refused());
        m.put("notes", outcome.notes());
        return m;
    }
}
