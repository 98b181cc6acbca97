package trapmap.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import trapmap.maps.compare.Registration;
import trapmap.maps.compare.RegistrationOptions;
import trapmap.maps.compare.RegistrationReport;
import trapmap.maps.io.MapFormatException;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.IronMapping;
import trapmap.maps.process.IronMapping.IronStatus;
import trapmap.shared.progress.ProgressListener;

/** {@code trapmap iron}: the interstitial-iron map of an FeB-state / Fe_i-state lifetime map pair. */
@Command(name = "iron", version = TrapmapCommand.VERSION, mixinStandardHelpOptions = true, sortOptions = false,
        usageHelpAutoWidth = true,
        header = "Maps interstitial iron [Fe_i] (cm^-3) from lifetime maps before and after FeB-pair dissociation.",
        description = {
            "FEB is the effective-lifetime map with the iron paired to boron (e.g. after 24 h in the dark), FEI the"
                    + " map right after dissociating the pairs (e.g. after strong illumination), both of one p-type"
                    + " wafer at one fixed injection level. FEI is registered onto FEB as in 'trapmap compare'"
                    + " (unless --no-registration), then each pixel gives [Fe_i] = C(Δn)·(1/τ_Fei − 1/τ_FeB), C ="
                    + " 1/(χ_Fei − χ_FeB) (Macdonald, Geerligs & Azzizi, JAP 95, 1021 (2004)). Pixel statuses: 0 ok,"
                    + " 1 below-limit (value = detection limit), 2 near-crossover (Δn within a factor 2 of the"
                    + " crossover), 3 crossover (Δn within ±10 %%: no signal), 4 invalid lifetime, 5 no data, 6"
                    + " inconsistent (the lifetime moved the way dissociation cannot move it at this Δn: a fall"
                    + " above the crossover, a rise below it; no value). 'trapmap calc iron' does the same for one"
                    + " pair of lifetimes.",
            ""},
        footer = {"", Help.EXIT_CODES_STRICT})
final class IronMapCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Parameters(index = "0", paramLabel = "FEB", description = "Lifetime map with the iron in FeB pairs (µs).")
    Path febFile;

    @Parameters(index = "1", paramLabel = "FEI", description = "Lifetime map after FeB dissociation (µs).")
    Path feiFile;

    @Option(names = {"-o", "--output", "--out"}, paramLabel = "<file>",
            description = "Iron map: .tif (with metadata), .csv (x_mm,y_mm,value in cm^-3) or .png. Default: none"
                    + " (statistics only).")
    Path output;

    @Option(names = "--status-output", paramLabel = "<file>",
            description = "Pixel status map (codes above): .tif, .csv or .png. Default: none.")
    Path statusOutput;

    @Option(names = "--no-registration", description = "Take the maps as already aligned (same grid).")
    boolean noRegistration;

    @Option(names = "--max-rotation-deg", paramLabel = "<deg>", defaultValue = "5",
            description = "Largest turn away from the nearest mirror/quarter-turn placement, in degrees. Default: 5.")
    double maxRotationDeg;

    @Option(names = "--strict", description = "Exit with status 2 when the registration warns (different wafer ids"
            + " or sizes, a low registration score).")
    boolean strict;

    @Option(names = "--json", description = "Print one JSON object with the statistics, status counts and"
            + " registration.")
    boolean json;

    @Mixin
    MapConditionOptions conditions;

    @Override
    public Integer call() throws MapFormatException {
        Flags.refuseWithoutRegistration(spec, noRegistration, "--max-rotation-deg");
        if (!(maxRotationDeg >= 0 && maxRotationDeg <= 45)) {
            throw new InputException("--max-rotation-deg must be in [0, 45] degrees (got " + Format.exact(maxRotationDeg) + ")");
        }
        List<Path> inputs = List.of(febFile, feiFile);
        if (output != null) {
            MapInput.refuseOverwriting("--output", output, List.of(output), inputs);
        }
        if (statusOutput != null) {
            MapInput.refuseOverwriting("--status-output", statusOutput, List.of(statusOutput), inputs);
        }
        // both outputs are checked before the work, so that a bad second one leaves no first one behind
        MapInput.requireOutputType("--output", output);
        MapInput.requireOutputType("--status-output", statusOutput);
        if (output != null && statusOutput != null
                && output.toAbsolutePath().normalize().equals(statusOutput.toAbsolutePath().normalize())) {
            throw new InputException("--status-output " + statusOutput + " is also --output: the status map would"
                    + " replace the iron map; give the two maps different names");
        }
        WaferMap feb = MapInput.page(febFile, 1);
        WaferMap fei = MapInput.page(feiFile, 1);
        feb = feb.withConditions(conditions.applyTo(feb.conditions()));
        fei = fei.withConditions(conditions.applyTo(fei.conditions()));
        if (noRegistration && (feb.width() != fei.width() || feb.height() != fei.height())) {
            throw new InputException("--no-registration needs maps of one size, but " + febFile + " is "
                    + feb.width() + "x" + feb.height() + " px and " + feiFile + " is " + fei.width() + "x"
                    + fei.height() + " px");
        }
        IronMapping.Result r = IronMapping.ofPair(feb, fei, noRegistration ? null
                : RegistrationOptions.DEFAULTS.withMaxRotation(maxRotationDeg), conditions.settings(),
                ProgressListener.NONE);
        if (output != null) {
            MapInput.write(r.iron(), output);
        }
        if (statusOutput != null) {
            MapInput.write(r.status(), statusOutput);
        }
        print(r);
        PrintWriter err = spec.commandLine().getErr();
        r.registrationWarnings().forEach(w -> err.println("warning: " + w));
        err.flush();
        return strict && !r.registrationWarnings().isEmpty() ? Exit.INVALID_INPUT : Exit.OK;
    }

    private void print(IronMapping.Result r) {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("feb_state", febFile.toString());
        m.put("fe_i_state", feiFile.toString());
        m.put("unit", "cm^-3");
        m.put("injection_cm3", Output.num(r.injectionPerCm3()));
        m.put("crossover_injection_cm3", Output.num(r.crossoverPerCm3()));
        m.put("pixels_with_value", r.statistics().count());
        m.put("iron_median_cm3", Output.num(r.medianPerCm3()));
        m.put("iron_p95_cm3", Output.num(r.p95PerCm3()));
        m.put("iron_mean_cm3", Output.num(r.statistics().count() == 0 ? Double.NaN : r.statistics().mean()));
        m.put("iron_max_cm3", Output.num(r.statistics().count() == 0 ? Double.NaN : r.statistics().max()));
        Map<String, Object> counts = new LinkedHashMap<>();
        for (IronStatus s : IronStatus.values()) {
            counts.put(s.key(), r.count(s));
        }
        m.put("status_counts", counts);
        RegistrationReport rr = r.registration();
        Registration g = rr.registration();
        Map<String, Object> reg = new LinkedHashMap<>();
        reg.put("kept", rr.kept().key());
        reg.put("flip_x", g.flipX());
        reg.put("flip_y", g.flipY());
        reg.put("rotation_deg", Output.num(g.rotationDeg()));
        reg.put("shift_x_mm", Output.num(g.shiftXMm()));
        reg.put("shift_y_mm", Output.num(g.shiftYMm()));
        reg.put("score", Output.num(g.score()));
        reg.put("search_score", Output.num(rr.searchScore()));
        reg.put("identity_score", Output.num(rr.identityScore()));
        m.put("registration", reg);
        List<String> warnings = new ArrayList<>(rr.warnings());
        warnings.addAll(Output.warningMessages(r.warnings()));
        if (!r.inconsistentNote().isEmpty()) {
            warnings.add(r.inconsistentNote());
        }
        m.put("warnings", warnings);
        m.put("caution", IronMapping.CAUTION);
        if (output != null) {
            m.put("output", output.toString());
        }
        if (statusOutput != null) {
            m.put("status_output", statusOutput.toString());
        }
        PrintWriter out = spec.commandLine().getOut();
        if (json) {
            out.println(Output.json(m));
        } else {
            Output.Table t = new Output.Table();
            t.number(m, "iron_median_cm3", "[Fe_i] median", "cm^-3", "n/a");
            t.number(m, "iron_p95_cm3", "[Fe_i] P95", "cm^-3", "n/a");
            t.number(m, "injection_cm3", "injection Δn", "cm^-3", null);
            t.number(m, "crossover_injection_cm3", "Fe_i/FeB crossover Δn", "cm^-3", "none");
            for (IronStatus s : IronStatus.values()) {
                t.row("pixels " + s.key(), Integer.toString(r.count(s)), "px");
            }
            t.row("registration", rr.kept().key() + ", score " + Format.number(g.score()), "");
            Output.warningMessages(r.warnings()).forEach(w -> t.note("warning: " + w));
            if (!r.inconsistentNote().isEmpty()) {
                t.note("warning: " + r.inconsistentNote());
            }
            t.note("caution: " + IronMapping.CAUTION);
            t.note("caution: " + trapmap.maps.model.Caution.TEXT); // a density map: as the viewer's iron view says
            if (output != null) {
                t.row("wrote", output.toString(), "");
            }
            if (statusOutput != null) {
                t.row("wrote", statusOutput.toString(), "");
            }
            out.print(t.render());
        }
        out.flush();
    }
}
