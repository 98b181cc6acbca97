package trapmap.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import trapmap.maps.batch.RulesException;
import trapmap.shared.error.InvalidValueException;
import trapmap.viewer.report.WaferPages;

/**
 * {@code trapmap report MAP --rules R.json -o wafer.pdf}: the viewer's one-page wafer report, made without a display,
 * with the verdict of the batch's own judgement (the viewer's headless model judges the map by the rules).
 */
@Command(name = "report", version = TrapmapCommand.VERSION, mixinStandardHelpOptions = true, sortOptions = false,
        usageHelpAutoWidth = true,
        header = "Writes the one-page wafer report of a map, judged by a rules file.",
        description = {
            "Judges MAP against RULES.json exactly as 'trapmap inspect' does (profile, defect, figures, flagged regions,"
                + " verdict, grade, failed rules, graded-down-by) and writes the page the viewer writes with"
                + " Ctrl+P: the map, histogram, statistics, measurement settings, defect, flagged regions, the"
                + " verdict and the caution. Needs no display.",
            ""},
        footer = {"", "Exit codes: 0 the wafer passes; 1 it fails; 2 invalid input (map, rules file, options) or a map"
                + " that cannot be judged; 3 internal error, or the report could not be written (disk full, no"
                + " permission); 5 the wafer was judged (the verdict is printed) but the"
                + " PDF could not be made: this Java runtime lacks font libraries, fonts or a display (one line names"
                + " what and the packages to install)."})
final class ReportCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Parameters(index = "0", paramLabel = "MAP", description = "A lifetime or PL map (TIFF or CSV, with its sidecar).")
    Path map;

    @Option(names = "--rules", required = true, paramLabel = "<RULES.json>",
            description = "Inspection rules (schema in the README, 'Batch inspection').")
    Path rulesFile;

    @Option(names = {"-o", "--out", "--output"}, required = true, paramLabel = "<FILE.pdf>", description = "The report to write.")
    Path out;

    @Option(names = "--physics", paramLabel = "<physics.json>", description = PhysicsOption.DESCRIPTION
            + " Replaces the rules file's physics block.")
    Path physics;

    @Option(names = "--quantity", paramLabel = "<q>", defaultValue = "lifetime",
            description = "The map shown: lifetime, trap-density, occupancy, srh-lifetime, status or"
                    + " exceedance-probability (P(N_t > N*), 0-1: a rules flag with a confidence gives N* and the"
                    + " uncertainties, else N* = 3e11 cm^-3 and the defaults) (default: ${DEFAULT-VALUE}).")
    String quantity;

    @Option(names = "--defect", paramLabel = "<id>",
            description = "Judge with this defect instead of the rules profile's; the report says it was overridden.")
    String defect;

    @Override
    public Integer call() throws IOException {
        if (!Files.isRegularFile(map)) { // a FIFO is never opened: it would wait for a writer
            throw new InputException(map + ": " + (Files.exists(map) ? trapmap.maps.io.InputFiles.notRegular(
                    Files.readAttributes(map, java.nio.file.attribute.BasicFileAttributes.class)) : "no such file"));
        }
        if (!out.getFileName().toString().toLowerCase(Locale.ROOT).endsWith(".pdf")) {
            throw new InputException("-o " + out + " must name a .pdf file");
        }
        WaferPages.Written v;
        Pictures pictures = Pictures.start();
        String page = out.getFileName().toString();
        try {
            v = WaferPages.write(map, rulesFile, quantity, defect, out,
                    physics == null ? null : PhysicsOption.load(physics), step -> pictures.run(page, () -> {
                        try {
                            step.write();
                        } catch (IOException e) { // judged and drawn: only the file could not be written
                            throw MapInput.cannotWrite(out, e);
                        }
                    }));
        } catch (RulesException e) {
            throw new InputException("--rules " + e.getMessage());
        } catch (InvalidValueException e) {
            throw new InputException(switch (e.field()) {
                case "quantity" -> "--quantity ";
                case "defect" -> "--defect ";
                default -> "";
            } + e.getMessage());
        }
        if (!v.written()) {
            PrintWriter err = spec.commandLine().getErr();
            err.println(spec.qualifiedName() + ": " + pictures.line().orElse(page + " was not made"));
            err.flush();
        }
        PrintWriter o = spec.commandLine().getOut();
        o.println(map.getFileName() + ": " + v.headline() + " (" + v.basis() + ")"
                + (v.failedRules().isEmpty() ? "" : "; failed " + String.join(", ", v.failedRules()))
                + (v.gradedDownBy().isEmpty() ? "" : "; graded down by " + String.join(", ", v.gradedDownBy()))
                + (v.written() ? "; report: " + out : "; no report (see the line above)"));
        o.flush();
        if (!v.written()) {
            return Exit.REPORT_MISSING;
        }
        return v.pass() ? Exit.OK : Exit.SOME_WAFERS_NOT_PASSED;
    }
}
