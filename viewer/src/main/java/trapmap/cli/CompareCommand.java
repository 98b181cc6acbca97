package trapmap.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import trapmap.maps.compare.MapComparison;
import trapmap.maps.compare.Improvement;
import trapmap.maps.compare.PairedStatistics;
import trapmap.maps.compare.Registration;
import trapmap.maps.compare.RegisteredPair;
import trapmap.maps.compare.RegistrationOptions;
import trapmap.maps.compare.RegistrationReport;
import trapmap.maps.compare.RegistrationWarnings;
import trapmap.maps.io.MapFormatException;
import trapmap.maps.model.WaferMap;
import trapmap.physics.defect.Defect;
import trapmap.shared.progress.ProgressListener;

/** {@code trapmap compare}: two maps of the same wafer before and after a process step. */
@Command(name = "compare", version = TrapmapCommand.VERSION, mixinStandardHelpOptions = true, sortOptions = false,
        usageHelpAutoWidth = true,
        header = "Registers two maps of one wafer (before/after a process step) and compares them pixel by pixel.",
        description = {
            "Finds how AFTER lies on BEFORE (mirror, quarter turns, a small turn and a shift, from the data),"
                    + " resamples AFTER onto BEFORE's grid, and writes the difference, ratio, relative-change or"
                    + " reduction map. With --defect both maps are first converted to trap densities (conditions"
                    + " from each sidecar, overridden by the flags), so the reduction map is the per-pixel gettering"
                    + " efficiency 1 − N_after/N_before.",
            "",
            "The maps as they lie are scored too and kept when the search does not beat them. Different wafer ids,"
                    + " fitted sizes differing beyond the format's tolerance, or a score below "
                    + RegistrationWarnings.SCORE_FLOOR + " give a warning line on stderr (and a warnings array with --json); --strict then exits with"
                    + " status 2.",
            ""},
        footer = {"", Help.EXIT_CODES_STRICT})
final class CompareCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Parameters(index = "0", paramLabel = "BEFORE", description = "Map before the process step.")
    Path beforeFile;

    @Parameters(index = "1", paramLabel = "AFTER", description = "Map after the process step.")
    Path afterFile;

    @Option(names = "--quantity", paramLabel = "<name>", defaultValue = "ratio",
            description = "Map to write: difference (after − before, in the maps' unit), ratio (after/before),"
                    + " relative-change ((after − before)/before) or reduction (1 − after/before; density maps);"
                    + " needs -o. Default: ratio.")
    String quantity;

    @Option(names = {"-o", "--output", "--out"}, paramLabel = "<file>",
            description = "Output map: .tif, .csv (x_mm,y_mm,value) or .png. Default: none (statistics only).")
    Path output;

    @Option(names = "--no-registration", description = "Take the maps as already aligned (same grid).")
    boolean noRegistration;

    @Option(names = "--max-rotation-deg", paramLabel = "<deg>", defaultValue = "5",
            description = "Largest turn away from the nearest mirror/quarter-turn placement, in degrees; no stage"
                    + " returns a placement beyond it. Default: 5.")
    double maxRotationDeg;

    @Option(names = "--upright", description = "Search no mirrors or quarter turns: AFTER is only shifted and turned"
            + " within --max-rotation-deg.")
    boolean upright;

    @Option(names = "--strict", description = "Exit with status 2 when there is a warning (different wafer ids or"
            + " sizes, or a registration score below " + RegistrationWarnings.SCORE_FLOOR + ").")
    boolean strict;

    @Option(names = "--tolerance", paramLabel = "<fraction>", defaultValue = "0.05",
            description = "Relative change within which a pixel counts as unchanged (0.05 = ±5 %%, common"
                    + " practice). Default: 0.05.")
    double tolerance;

    @Mixin
    DensityOption density;

    @Option(names = "--json", description = "Print one JSON object with the registration and paired statistics.")
    boolean json;

    @Mixin
    MapConditionOptions conditions;

    @Override
    public Integer call() throws MapFormatException {
        conditions.settings(); // a bad --physics file is refused even when nothing is converted
        String kind = quantity.trim().toLowerCase(Locale.ROOT);
        if (!kind.equals("difference") && !kind.equals("ratio") && !kind.equals("relative-change")
                && !kind.equals("reduction")) {
            throw new InputException("--quantity '" + quantity + "' is not one of difference, ratio, relative-change,"
                    + " reduction");
        }
        if (output == null && spec.commandLine().getParseResult().hasMatchedOption("--quantity")) {
            // without an output map the statistics are the same for every quantity
            throw new InputException("--quantity belongs to -o (the map written): give -o FILE (.tif, .csv or .png)"
                    + " or leave --quantity out");
        }
        if (!(tolerance >= 0 && tolerance <= 1)) {
            throw new InputException("--tolerance must be a fraction in [0, 1] (got " + Format.exact(tolerance) + ")");
        }
        Flags.refuseWithoutRegistration(spec, noRegistration, "--max-rotation-deg", "--upright");
        if (!(maxRotationDeg >= 0 && maxRotationDeg <= 45)) {
            throw new InputException("--max-rotation-deg must be in [0, 45] degrees (got " + Format.exact(maxRotationDeg) + ")");
        }
        if (output != null) {
            MapInput.refuseOverwriting(output, List.of(output), List.of(beforeFile, afterFile));
        }
        WaferMap[] read = MapInput.firstPages(beforeFile, afterFile);
        WaferMap before = read[0];
        WaferMap after = read[1];
        Defect d = density.defectOrNull();
        before = DensityOption.apply(before, d, conditions, spec.commandLine().getErr());
        after = DensityOption.apply(after, d, conditions, spec.commandLine().getErr());
        if (before.quantity() != after.quantity()) {
            throw new InputException(afterFile + " holds " + after.quantity().key() + " but " + beforeFile + " holds "
                    + before.quantity().key() + "; compare maps of one quantity (or use --defect)");
        }
        if (kind.equals("reduction") && !MapComparison.isDensity(before.quantity())) {
            // 1 − after/before is a share of defects removed only for densities
            throw new InputException("--quantity reduction needs density maps (trap or iron density); these hold "
                    + before.quantity().key() + " (use --defect)");
        }
        if (noRegistration && (before.width() != after.width() || before.height() != after.height())) {
            throw new InputException("--no-registration needs maps of one size, but " + beforeFile + " is "
                    + before.width() + "x" + before.height() + " px and " + afterFile + " is " + after.width()
                    + "x" + after.height() + " px");
        }
        RegisteredPair pair = RegisteredPair.of(before, after, noRegistration ? null : RegistrationOptions.DEFAULTS
                        .withMaxRotation(maxRotationDeg).withSearchOrientations(!upright), tolerance,
                Improvement.of(before.quantity()), ProgressListener.NONE);
        RegistrationReport report = pair.report();
        WaferMap aligned = pair.aligned();
        PairedStatistics statistics = pair.statistics();
        if (output != null) {
            // only the map that is written is made
            WaferMap out = switch (kind) {
                case "difference" -> MapComparison.difference(before, aligned);
                case "relative-change" -> MapComparison.relativeChange(before, aligned);
                case "reduction" -> MapComparison.reduction(before, aligned);
                default -> MapComparison.ratio(before, aligned);
            };
            MapInput.write(out, output);
        }
        print(report, statistics);
        PrintWriter err = spec.commandLine().getErr();
        report.warnings().forEach(w -> err.println("warning: " + w));
        err.flush();
        return strict && report.hasWarnings() ? Exit.INVALID_INPUT : Exit.OK;
    }

    private void print(RegistrationReport report, PairedStatistics s) {
        Registration r = report.registration();
        Map<String, Object> reg = new LinkedHashMap<>();
        reg.put("flip_x", r.flipX());
        reg.put("flip_y", r.flipY());
        reg.put("rotation_deg", Output.num(r.rotationDeg()));
        reg.put("shift_x_mm", Output.num(r.shiftXMm()));
        reg.put("shift_y_mm", Output.num(r.shiftYMm()));
        reg.put("fine_rotation_deg", Output.num(r.fineRotationDeg()));
        reg.put("score", Output.num(r.score()));
        reg.put("overlap_pixels", r.overlapPixels());
        reg.put("kept", report.kept().key());
        reg.put("search_score", Output.num(report.searchScore()));
        reg.put("identity_score", Output.num(report.identityScore()));
        Map<String, Object> p = new LinkedHashMap<>();
        p.put("quantity", s.quantity().key());
        p.put("unit", s.unit());
        p.put("count", s.count());
        p.put("mean_difference", Output.num(s.meanDifference()));
        p.put("median_difference", Output.num(s.medianDifference()));
        p.put("mean_ratio", Output.num(s.meanRatio()));
        p.put("median_ratio", Output.num(s.medianRatio()));
        p.put("harmonic_mean_before", Output.num(s.harmonicMeanBefore()));
        p.put("harmonic_mean_after", Output.num(s.harmonicMeanAfter()));
        p.put("improved_fraction", Output.num(s.improvedFraction()));
        p.put("unchanged_fraction", Output.num(s.unchangedFraction()));
        p.put("degraded_fraction", Output.num(s.degradedFraction()));
        p.put("median_reduction", Output.num(s.medianReduction()));
        p.put("relative_tolerance", s.relativeTolerance());
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("before", beforeFile.toString());
        m.put("after", afterFile.toString());
        m.put("registration", reg);
        m.put("paired", p);
        m.put("warnings", report.warnings());
        if (output != null) {
            m.put("output", output.toString());
        }
        PrintWriter out = spec.commandLine().getOut();
        if (json) {
            out.println(Output.json(m));
        } else {
            Output.Table t = new Output.Table();
            Registration c = r.canonical();
            t.row("registration", (c.mirrored() ? "mirrored " + (c.flipX() ? "left-right" : "top-bottom") + ", " : "")
                    + Format.number(c.rotationDeg()) + "°, shift (" + Format.number(c.shiftXMm()) + ", "
                    + Format.number(c.shiftYMm()) + ") mm", "");
            t.number(reg, "score", "registration score (0..1)", "", "n/a");
            t.row("placement kept", switch (report.kept()) {
                case SEARCH -> "searched (unregistered scores " + Format.number(report.identityScore()) + ")";
                case IDENTITY -> "unregistered (the search scored " + Format.number(report.searchScore()) + ")";
                case UNREGISTERED -> "unregistered (--no-registration)";
            }, "");
            t.number(p, "count", "pixels compared", "", null);
            t.number(p, "median_ratio", "median ratio after/before", "", "n/a");
            t.number(p, "mean_difference", "mean difference after − before", s.unit(), "n/a");
            t.number(p, "harmonic_mean_before", "harmonic mean before", s.unit(), "n/a");
            t.number(p, "harmonic_mean_after", "harmonic mean after", s.unit(), "n/a");
            t.number(p, "improved_fraction", "improved fraction", "", "n/a");
            t.number(p, "unchanged_fraction", "unchanged fraction (±" + Format.number(100 * tolerance) + " %)", "",
                    "n/a");
            t.number(p, "degraded_fraction", "degraded fraction", "", "n/a");
            t.number(p, "median_reduction", "median reduction 1 − after/before", "", null);
            if (output != null) {
                t.row("wrote", output.toString(), "");
            }
            out.print(t.render());
        }
        out.flush();
    }
}
