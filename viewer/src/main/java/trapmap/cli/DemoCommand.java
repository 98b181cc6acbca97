package trapmap.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import java.util.concurrent.Callable;
import java.util.stream.Stream;
import picocli.CommandLine.ArgGroup;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import trapmap.maps.demo.DemoScenario;
import trapmap.maps.demo.HistoryScenario;

/** {@code trapmap demo}: writes the invented demonstration batch with its planted-defect truth file. */
@Command(name = "demo", version = TrapmapCommand.VERSION, mixinStandardHelpOptions = true, sortOptions = false,
        usageHelpAutoWidth = true,
        header = "Writes an invented batch of wafer maps with planted defects, their sidecars and truth.json.",
        description = {
            "Generates, from a fixed seed, lifetime maps and one PL image of invented wafers (multicrystalline"
                    + " p-type with grains, iron-rich edge zones and handling marks; n-type mono with rings; a"
                    + " gettering pair; an FeB-dissociation pair; a 200 mm monitor wafer with boat-contact spots),"
                    + " each as a TIFF with a JSON sidecar, plus truth.json (the planted defects) and README.md;"
                    + " and, in the subfolder injection-stack/, one wafer measured at three injection levels (1e13,"
                    + " 1e14, 1e15 cm^-3) with its own truth.json, for defect identification. Every run writes the"
                    + " same bytes.",
            "",
            "With --history instead: an invented production history for trend charts (three weeks, three lots a day"
                    + " in two furnace tubes, one of which drifts upward in interstitial iron after a planted date;"
                    + " the wafer of boat slot 7 carries a contamination spot at the same place), 64 x 64 px"
                    + " lifetime maps with sidecars holding lot, measured_at, furnace_tube and boat_slot,"
                    + " truth.json, rules-history.json and README.md.",
            ""},
        footer = {"", "Nothing written by this command is measured data.", "", Help.EXIT_CODES_OUTPUT})
final class DemoCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @ArgGroup(exclusive = true, multiplicity = "1")
    Target target;

    /** Where to write, and which set: exactly one of the two. */
    static final class Target {
        @Option(names = {"-o", "--out", "--output"}, paramLabel = "<dir>", required = true, order = 1,
                description = "Folder to write the demonstration set into (created when missing; must be empty"
                        + " unless --force).")
        Path out;

        @Option(names = "--history", paramLabel = "<dir>", required = true, order = 2,
                description = "Folder to write the invented production history into instead (created when"
                        + " missing; must be empty unless --force).")
        Path history;
    }

    @Option(names = "--force", order = 3,
            description = "Write into a folder that is not empty, replacing files of the same names.")
    boolean force;

    @Override
    public Integer call() {
        boolean history = target.history != null;
        Path out = history ? target.history : target.out;
        String option = history ? "--history" : "--out";
        if (Files.exists(out) && !Files.isDirectory(out)) {
            throw new InputException(option + " " + out + " is a file, not a folder");
        }
        if (!force && Files.isDirectory(out) && !empty(out, option)) {
            throw new InputException(option + " " + out + " is not empty; choose an empty folder or add --force");
        }
        List<Path> written;
        try {
            written = history ? HistoryScenario.write(out) : DemoScenario.write(out);
        } catch (IOException e) {
            throw new MapInput.OutputException("cannot write the demonstration " + (history ? "history" : "set")
                    + " to " + out + ": " + MapInput.writeFailure(e), e);
        }
        PrintWriter pw = spec.commandLine().getOut();
        long total = 0;
        Set<String> mapStems = new HashSet<>();
        for (Path p : written) {
            long size = size(p);
            total += size;
            String name = out.relativize(p).toString().replace('\\', '/');
            String stem = name.substring(0, name.lastIndexOf('.'));
            if (history && (name.endsWith(".tif") ? mapStems.add(stem) : mapStems.contains(stem))) {
                continue; // a line per map and sidecar of the history would bury the summary
            }
            pw.println(String.format(Locale.ROOT, "%-40s %9d bytes", name, size));
        }
        if (history) {
            pw.println(String.format(Locale.ROOT, "%d wafer maps (TIFF) with their JSON sidecars; drift, change"
                    + " date and bad slot in truth.json", mapStems.size()));
        }
        pw.println(String.format(Locale.ROOT, "wrote %d files (%.2f MB) to %s", written.size(), total / 1e6, out));
        pw.flush();
        return Exit.OK;
    }

    private static boolean empty(Path dir, String option) {
        try (Stream<Path> s = Files.list(dir)) {
            return s.findAny().isEmpty();
        } catch (IOException e) {
            throw new InputException(option + " " + dir + " cannot be listed (" + e.getMessage() + ")", e);
        }
    }

    private static long size(Path p) {
        try {
            return Files.size(p);
        } catch (IOException e) {
            return -1;
        }
    }
}
