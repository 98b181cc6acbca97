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
import trapmap.physics.pl.PlCalibration;
import trapmap.shared.units.Units;

/** {@code trapmap calc pl}: photoluminescence counts to Δn and lifetime, calibrated on a reference. */
@Command(name = "pl", version = TrapmapCommand.VERSION,
        header = "PL counts to injection and lifetime, calibrated on a reference of known lifetime.",
        mixinStandardHelpOptions = true, sortOptions = false, usageHelpAutoWidth = true,
        description = {
            "Photoluminescence counts to excess carrier density and effective lifetime, with the signal model",
            "  I = A·Δn·(Δn + N_dop),  τ_eff = Δn/G",
            "and A calibrated on a reference of known lifetime measured at the same generation rate G:",
            "  Δn_ref = G·τ_ref,  A = I_ref/(Δn_ref (Δn_ref + N_dop)).",
            ""},
        footer = {"", "JSON: calibration_constant is A in counts·cm^6.", "", Help.EXIT_CODES})
final class PlCommand implements Callable<Integer> {
    static final String MODEL = "I = A·Δn·(Δn + N_dop), steady state τ_eff = Δn/G";
    static final String CAUTION = "assumes the sample and the reference share optics, doping, thickness, surface and"
            + " generation rate; follow site procedures";

    @Spec
    CommandSpec spec;

    @Option(names = "--counts", required = true, paramLabel = "<counts>", converter = Quantity.Counts.class, order = 1,
            description = "PL signal of the sample in counts (> 0). No default; required.")
    Double counts;

    @Option(names = "--reference-counts", required = true, paramLabel = "<counts>", converter = Quantity.Counts.class, order = 2,
            description = "PL signal of the reference in counts (> 0). No default; required.")
    Double referenceCounts;

    @Option(names = "--reference-lifetime-us", required = true, paramLabel = "<µs>", converter = Quantity.Lifetime.class, order = 3,
            description = "Known effective lifetime of the reference in µs. No default; required.")
    Double referenceLifetimeUs;

    @Option(names = "--generation", required = true, paramLabel = "<cm^-3 s^-1>", converter = Quantity.Generation.class, order = 4,
            description = "Generation rate G in cm^-3 s^-1 of both measurements. No default; required.")
    Double generation;

    @Option(names = "--doping", required = true, paramLabel = "<type:value>", converter = DopingValue.Converter.class, order = 5,
            description = Help.DOPING)
    DopingValue doping;

    @Option(names = "--json", order = 6, description = Help.JSON)
    boolean json;

    @Override
    public Integer call() {
        double n = doping.doping().densityPerCm3();
        PlCalibration cal = PlCalibration.fromReference(referenceCounts, referenceLifetimeUs, generation, n);
        double dn = cal.injectionPerCm3(counts);
        double tau = cal.lifetimeUs(counts, generation);

        Map<String, Object> m = new LinkedHashMap<>();
        m.put("status", "OK");
        m.put("calibration_constant", cal.constant());
        m.put("injection_cm3", Output.num(dn));
        m.put("lifetime_us", Output.num(tau));
        m.put("reference_injection_cm3", generation * referenceLifetimeUs * Units.S_PER_US);
        m.put("counts", counts);
        m.put("reference_counts", referenceCounts);
        m.put("reference_lifetime_us", referenceLifetimeUs);
        m.put("generation_cm3_s", generation);
        m.put("doping_type", doping.typeLetter());
        m.put("doping_cm3", n);
        if (doping.fromResistivity()) {
            m.put("resistivity_ohm_cm", doping.resistivityOhmCm());
        }
        m.put("model", MODEL);
        m.put("warnings", List.of());
        m.put("caution", CAUTION);

        PrintWriter out = spec.commandLine().getOut();
        if (json) {
            out.println(Output.json(m));
        } else {
            Output.Table t = new Output.Table();
            t.row("status", "OK", "");
            t.number(m, "injection_cm3", "injection Δn", "cm^-3", null);
            t.number(m, "lifetime_us", "effective lifetime τ_eff", "µs", null);
            t.number(m, "calibration_constant", "calibration constant A", "counts·cm^6", null);
            t.number(m, "reference_injection_cm3", "reference injection Δn_ref", "cm^-3", null);
            t.number(m, "generation_cm3_s", "generation G", "cm^-3 s^-1", null);
            t.row("doping", doping.describe(), "");
            t.row("model", MODEL, "");
            t.note("caution: " + CAUTION);
            out.print(t.render());
        }
        out.flush();
        return Exit.OK;
    }
}
