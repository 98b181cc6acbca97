package trapmap.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.Map;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.recombination.SurfaceModel;

/** {@code trapmap calc}: one effective lifetime (or a CSV table of cases) to the equivalent density of one defect. */
@Command(name = "calc", version = TrapmapCommand.VERSION,
        header = "Effective lifetime to the equivalent SRH trap density of one defect (or a CSV table of cases).",
        mixinStandardHelpOptions = true, sortOptions = false, usageHelpAutoWidth = true,
        subcommands = {IronCommand.class, BoCommand.class, PlCommand.class},
        description = {
            "Converts an effective minority-carrier lifetime into the equivalent SRH density of one defect:",
            "  1/τ_SRH = 1/τ_eff − 1/τ_intr(Δn) − 1/τ_surf,  N_t = K(Δn)/τ_SRH (exact SRH inverse).",
            "Give exactly one of --injection or --generation (steady state: Δn = G·τ_eff).",
            "With --cases/--out, converts every row of a CSV table instead (see below).",
            ""},
        footer = {"",
            "Cases files: a header row, then one case per row. Columns are named like the flags without dashes,"
                    + " with - as _: lifetime_us, doping, injection, generation, defect, temperature, thickness_um,"
                    + " srv, surface_model, vth, reference_injection. Blank cells take the value of the flag given on"
                    + " the command line; other columns are copied. The output has the input columns, every JSON"
                    + " field (renamed result_<name> if an input column already has that name) and an error column;"
                    + " a bad row gets status ERROR and its message, the others go on.",
            "",
            "JSON: infinite or undefined values are null: tau_surface_us with ideal surfaces, tau_srh_us when status"
                    + " is BELOW_LIMIT (then trap_density_cm3 is the detection limit, an upper bound).",
            "",
            Help.MODELS,
            "",
            Help.EXIT_CODES_CALC})
final class CalcCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Option(names = "--lifetime-us", paramLabel = "<µs>", converter = Quantity.Lifetime.class, order = 1,
            description = "Effective lifetime τ_eff in µs, at least 0.001 (1 ns: shorter lifetimes are beyond lifetime"
                    + " tools and the SRH model). No default; required.")
    Double lifetimeUs;

    @Option(names = "--doping", paramLabel = "<type:value>", converter = DopingValue.Converter.class, order = 2,
            description = Help.DOPING)
    DopingValue doping;

    @Option(names = "--injection", paramLabel = "<cm^-3>", converter = Quantity.Density.class, order = 3,
            description = "Excess carrier density Δn in cm^-3, 1e6-1e19. No default; this or --generation is"
                    + " required.")
    Double injection;

    @Option(names = "--generation", paramLabel = "<cm^-3 s^-1>", converter = Quantity.Generation.class, order = 4,
            description = "Steady-state generation rate G in cm^-3 s^-1, 1e10-1e24, instead of --injection"
                    + " (Δn = G·τ_eff). No default.")
    Double generation;

    @Option(names = "--defect", paramLabel = "<id>", order = 5,
            description = "Defect id: a built-in one (list with 'trapmap defects') or one from --defect-file."
                    + " No default; required.")
    String defect;

    @Option(names = "--defect-file", paramLabel = "<file.json>", order = 6, description = Help.DEFECT_FILE)
    Path defectFile;

    @Option(names = "--temperature", paramLabel = "<K>", converter = Quantity.Temperature.class, order = 7,
            description = Help.TEMPERATURE)
    Double temperature;

    @Option(names = "--thickness-um", paramLabel = "<µm>", converter = Quantity.Thickness.class, order = 8,
            description = "Wafer thickness W in µm, 1-5000. Alone it adds no surface term. Default: none (ideal"
                    + " surfaces).")
    Double thicknessUm;

    @Option(names = "--srv", paramLabel = "<cm/s>", converter = Quantity.Srv.class, order = 9,
            description = "Surface recombination velocity S in cm/s on both surfaces, 0-1e7; needs --thickness-um."
                    + " Default: none (ideal surfaces).")
    Double srv;

    @Option(names = "--surface-model", paramLabel = "sproul|exact", converter = Choices.Surface.class, order = 10,
            description = "Surface lifetime: sproul = W/(2S) + (W/π)²/D (Sproul 1994), exact = fundamental decay"
                    + " mode. Default: sproul.")
    SurfaceModel surfaceModel;

    @Option(names = "--vth", paramLabel = "fixed|green", converter = Choices.Vth.class, order = 11,
            description = Help.VTH)
    ThermalVelocityModel vth;

    @Option(names = "--reference-injection", paramLabel = "<cm^-3>", converter = Quantity.Density.class, order = 12,
            description = "Also report the lifetime the wafer would have at this Δn in cm^-3, 1e6-1e19 (same trap"
                    + " density, intrinsic and surface terms). Default: none.")
    Double referenceInjection;

    @Option(names = "--physics", paramLabel = "<physics.json>", order = 12,
            description = PhysicsOption.DESCRIPTION + " --vth and --surface-model (and the cases' columns) override"
                    + " its fields.")
    java.nio.file.Path physics;

    @Option(names = "--json", order = 13, description = Help.JSON)
    boolean json;

    @Option(names = "--cases", paramLabel = "<in.csv>", order = 14,
            description = "CSV table of cases to convert (columns below); needs --out. Default: none.")
    Path cases;

    @Option(names = {"-o", "--out", "--output"}, paramLabel = "<out.csv>", order = 15,
            description = "CSV file to write the converted cases to (folders created when missing); replaced"
                    + " atomically. Default: none.")
    Path out;

    @Override
    public Integer call() {
        PrintWriter stdout = spec.commandLine().getOut();
        CalcRequest request = new CalcRequest(lifetimeUs, doping, injection, generation, defect, temperature,
                thicknessUm, srv, surfaceModel, vth, referenceInjection);
        if (cases != null || out != null) {
            return runCases(request, stdout);
        }
        DefectCatalog catalog = DefectCatalog.load(defectFile);
        Map<String, Object> result = Calculation.run(request, catalog, PhysicsOption.load(physics));
        if (json) {
            stdout.println(Output.json(Calculation.forJson(result)));
        } else {
            stdout.print(Calculation.table(result));
        }
        stdout.flush();
        return Exit.OK;
    }

    private int runCases(CalcRequest defaults, PrintWriter stdout) {
        if (cases == null) {
            throw new InputException("--out needs --cases (a CSV file of cases)");
        }
        if (out == null) {
            throw new InputException("--cases needs --out (the CSV file to write the results to)");
        }
        if (json) {
            throw new InputException("--json cannot be combined with --cases: the results go to the --out CSV file");
        }
        DefectCatalog catalog = DefectCatalog.load(defectFile);
        CasesFile.Summary s = CasesFile.run(cases, out, defaults, catalog, PhysicsOption.load(physics));
        stdout.println("wrote " + s.rows() + " cases to " + out + " (" + (s.rows() - s.errors()) + " converted, "
                + s.errors() + " with errors)");
        stdout.flush();
        if (s.errors() > 0) {
            PrintWriter err = spec.commandLine().getErr();
            err.println(spec.qualifiedName() + ": " + s.errors() + " of " + s.rows()
                    + " cases failed; see the error column of " + out);
            err.flush();
            return Exit.SOME_CASES_FAILED;
        }
        return Exit.OK;
    }
}
