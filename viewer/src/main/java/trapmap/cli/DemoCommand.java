package trapmap.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import java.util.stream.Stream;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import trapmap.maps.demo.DemoScenario;

/** {@code trapmap demo}: writes the invented demonstration batch with its planted-defect truth file. */
@Command(name = "demo", version = TrapmapCommand.VERSION, mixinStandardHelpOptions = true, sortOptions = false,
        usageHelpAutoWidth = true,
        header = "Writes an invented batch of wafer maps with planted defects, their sidecars and truth.json.",
        description = {
            "Generates, from a fixed seed, lifetime maps and one PL image of invented wafers (multicrystalline",
            "p-type with grains, iron-rich edge zones and handling marks; n-type mono with rings; a gettering pair;",
            "an FeB-dissociation pair; a 200 mm monitor wafer with boat-contact spots), each as a TIFF with a JSON",
            "sidecar, plus truth.json (the planted defects) and README.md; and, in the subfolder injection-stack/,",
            "one wafer measured at three injection levels (1e13, 1e14, 1e15 cm^-3) with its own truth.json, for",
            "defect identification. Every run writes the same bytes.",
            ""},
        footer = {"", "Nothing written by this command is measured data.", "", Help.EXIT_CODES_OUTPUT})
final class DemoCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Option(names = "--out", paramLabel = "<dir>", required = true, order = 1,
            description = "Folder to write into (created when missing; must be empty unless --force).")
    Path out;

    @Option(names = "--force", order = 2,
            description = "Write into a folder that is not empty, replacing files of the same names.")
    boolean force;

    @Override
    public Integer call() {
        if (Files.exists(out) && !Files.isDirectory(out)) {
            throw new InputException("--out " + out + " is a file, not a folder");
        }
        if (!force && Files.isDirectory(out) && !empty(out)) {
            throw new InputException("--out " + out + " is not empty; choose an empty folder or add --force");
        }
        List<Path> written;
        try {
            written = DemoScenario.write(out);
        } catch (IOException e) {
            throw new MapInput.OutputException("cannot write the demonstration set to " + out + ": "
                    + e.getMessage(), e);
        }
        PrintWriter pw = spec.commandLine().getOut();
        long total = 0;
        for (Path p : written) {
            long size = size(p);
            total += size;
            pw.println(String.format(Locale.ROOT, "%-40s %9d bytes", out.relativize(p).toString()
                    .replace('\\', '/'), size));
        }
        pw.println(String.format(Locale.ROOT, "wrote %d files (%.2f MB) to %s", written.size(), total / 1e6, out));
        pw.flush();
        return Exit.OK;
    }

    private static boolean empty(Path dir) {
        try (Stream<Path> s = Files.list(dir)) {
            return s.findAny().isEmpty();
        } catch (IOException e) {
            throw new InputException("--out " + dir + " cannot be listed (" + e.getMessage() + ")", e);
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
