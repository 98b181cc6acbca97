package trapmap.cli;

import java.io.PrintWriter;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import trapmap.physics.conversion.Injection;
import trapmap.physics.conversion.PixelStatus;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.iron.IronImaging;
import trapmap.physics.iron.IronResult;
import trapmap.physics.material.Silicon;
import trapmap.physics.material.ThermalVelocityModel;

/** {@code trapmap calc iron}: interstitial iron from lifetimes before and after dissociating the FeB pairs. */
@Command(name = "iron", version = TrapmapCommand.VERSION,
        header = "Interstitial iron from lifetimes before and after FeB-pair dissociation (p-type).",
        mixinStandardHelpOptions = true, sortOptions = false, usageHelpAutoWidth = true,
        description = {
            "Interstitial iron from the lifetimes before and after dissociating the iron-boron pairs (p-type only):",
            "  [Fe_i] = C(Δn)·(1/τ_after − 1/τ_before),  C = 1/(χ_Fei − χ_FeB)",
            "after Macdonald, Geerligs & Azzizi, JAP 95, 1021 (2004), with the built-in fe-i and fe-b parameter sets.",
            ""},
        footer = {"", "JSON: fe_i_cm3 is the detection limit (an upper bound) when status is BELOW_LIMIT, and null"
                + " when status is INVALID (Δn at the crossover, where the method has no signal) or INCONSISTENT"
                + " (the lifetime moved the way dissociation cannot move it at this Δn: a fall above the crossover,"
                + " a rise below it; reason says which); crossover_cm3 is"
                + " null when there is no crossover in 1e8-1e19 cm^-3.", "", Help.EXIT_CODES})
final class IronCommand implements Callable<Integer> {
    static final String METHOD = "Macdonald, Geerligs & Azzizi, JAP 95, 1021 (2004)";
    static final String CAUTION = "assumes complete FeB dissociation, all other recombination unchanged and the same"
            + " injection in both measurements; verify with an independent method before scrapping material; follow"
            + " site procedures";

    @Spec
    CommandSpec spec;

    @Option(names = "--before-us", required = true, paramLabel = "<µs>", converter = Quantity.Lifetime.class, order = 1,
            description = "Effective lifetime before dissociation (iron paired as FeB) in µs. No default; required.")
    Double beforeUs;

    @Option(names = "--after-us", required = true, paramLabel = "<µs>", converter = Quantity.Lifetime.class, order = 2,
            description = "Effective lifetime after dissociation (interstitial Fe_i) in µs. No default; required.")
    Double afterUs;

    @Option(names = "--doping", required = true, paramLabel = "<type:value>", converter = DopingValue.Converter.class, order = 3,
            description = Help.DOPING + " Must be p-type.")
    DopingValue doping;

    @Option(names = "--injection", required = true, paramLabel = "<cm^-3>", converter = Quantity.Density.class, order = 4,
            description = "Excess carrier density Δn in cm^-3 of both measurements, 1e6-1e19. No default; required.")
    Double injection;

    @Option(names = "--temperature", paramLabel = "<K>", converter = Quantity.Temperature.class, order = 5,
            description = Help.TEMPERATURE)
    Double temperature;

    @Option(names = "--vth", paramLabel = "fixed|green", converter = Choices.Vth.class, order = 6,
            description = Help.VTH)
    ThermalVelocityModel vth;

    @Option(names = "--json", order = 7, description = Help.JSON)
    boolean json;

    @Override
    public Integer call() {
        double t = temperature == null ? Calculation.DEFAULT_TEMPERATURE_K : temperature;
        ThermalVelocityModel model = vth == null ? ThermalVelocityModel.FIXED : vth;
        Silicon silicon = Silicon.at(t, model);
        Injection.fixed(injection); // range check of Δn
        IronImaging iron = new IronImaging(doping.doping(), silicon);
        IronResult r = iron.evaluate(beforeUs, afterUs, injection);
        Defect feI = DefectLibrary.byId("fe-i");
        Defect feB = DefectLibrary.byId("fe-b");

        List<String> warnings = Output.warningMessages(r.warnings());
        List<String> codes = Output.warningCodes(r.warnings());

        Map<String, Object> m = new LinkedHashMap<>();
        m.put("status", r.status().name());
        m.put("fe_i_cm3", Output.num(r.ironPerCm3()));
        m.put("fe_i_is_upper_bound", r.status() == PixelStatus.BELOW_LIMIT);
        m.put("reason", r.reason().isEmpty() ? null : r.reason());
        m.put("prefactor_us_cm3", Output.num(r.prefactorUsCm3()));
        m.put("crossover_cm3", Output.num(r.crossoverPerCm3()));
        m.put("tau_before_us", beforeUs);
        m.put("tau_after_us", afterUs);
        m.put("injection_cm3", injection);
        m.put("doping_type", doping.typeLetter());
        m.put("doping_cm3", doping.doping().densityPerCm3());
        if (doping.fromResistivity()) {
            m.put("resistivity_ohm_cm", doping.resistivityOhmCm());
        }
        m.put("temperature_k", t);
        m.put("vth_model", Choices.vthName(model));
        m.put("fe_i_level", feI.level().toString());
        m.put("fe_i_source", feI.source());
        m.put("fe_b_level", feB.level().toString());
        m.put("fe_b_source", feB.source());
        m.put("method", METHOD);
        m.put("warnings", warnings);
        m.put("warning_codes", codes);
        m.put("caution", CAUTION);

        PrintWriter out = spec.commandLine().getOut();
        if (json) {
            out.println(Output.json(m));
        } else {
            out.print(table(m, r));
        }
        out.flush();
        return Exit.OK;
    }

    private static String table(Map<String, Object> m, IronResult r) {
        Output.Table t = new Output.Table();
        boolean bound = r.status() == PixelStatus.BELOW_LIMIT;
        t.row("status", bound ? "BELOW_LIMIT (no iron detectable)" : r.status().name(), "");
        if (r.status() == PixelStatus.INCONSISTENT) {
            t.row("interstitial iron [Fe_i]", "undefined (inconsistent pair)", "");
            t.note("reason: " + r.reason());
        } else if (m.get("fe_i_cm3") == null) {
            t.row("interstitial iron [Fe_i]", "undefined (injection at the crossover)", "");
        } else {
            String fe = Format.number(r.ironPerCm3());
            t.row(bound ? "interstitial iron [Fe_i] (upper bound)" : "interstitial iron [Fe_i]",
                    bound ? "<= " + fe : fe, "cm^-3");
        }
        t.number(m, "prefactor_us_cm3", "prefactor C", "µs·cm^-3", null);
        t.number(m, "crossover_cm3", "crossover Δn", "cm^-3", "none in 1e8-1e19 cm^-3");
        t.number(m, "tau_before_us", "lifetime before (FeB)", "µs", null);
        t.number(m, "tau_after_us", "lifetime after (Fe_i)", "µs", null);
        t.number(m, "injection_cm3", "injection Δn", "cm^-3", null);
        t.row("doping", m.get("doping_type") + "-type " + Format.number(((Number) m.get("doping_cm3")).doubleValue()),
                "cm^-3");
        t.number(m, "resistivity_ohm_cm", "  from resistivity (ASTM F723)", "Ω·cm", null);
        t.number(m, "temperature_k", "temperature", "K", null);
        t.row("thermal velocity", (String) m.get("vth_model"), "");
        t.row("Fe_i", m.get("fe_i_level") + "; " + m.get("fe_i_source"), "");
        t.row("FeB", m.get("fe_b_level") + "; " + m.get("fe_b_source"), "");
        t.row("method", METHOD, "");
        @SuppressWarnings("unchecked")
        List<String> warnings = (List<String>) m.get("warnings");
        warnings.forEach(w -> t.note("warning: " + w));
        t.note("caution: " + CAUTION);
        return t.render();
    }
}
