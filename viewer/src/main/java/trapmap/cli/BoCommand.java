package trapmap.cli;

import java.io.PrintWriter;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import trapmap.physics.defect.BoronOxygen;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;

/** {@code trapmap calc bo}: the normalised boron-oxygen defect density from a degraded/annealed pair. */
@Command(name = "bo", version = TrapmapCommand.VERSION,
        header = "Normalised boron-oxygen defect density N_t* from a degraded/annealed lifetime pair.",
        mixinStandardHelpOptions = true, sortOptions = false, usageHelpAutoWidth = true,
        description = {
            "Normalised density of the boron-oxygen light-induced-degradation centre:",
            "  N_t* = 1/τ_degraded − 1/τ_annealed  (1/µs; Bothe & Schmidt, JAP 99, 013701 (2006)).",
            "No absolute capture cross-section is published for this centre, so no absolute density is given.",
            ""},
        footer = {"", Help.EXIT_CODES})
final class BoCommand implements Callable<Integer> {
    static final String METHOD = "Bothe & Schmidt, JAP 99, 013701 (2006)";
    static final String CAUTION = "N_t* is proportional to the boron-oxygen defect density, not an absolute density;"
            + " compare only pairs measured at the same injection and temperature; follow site procedures";
    static final String NO_DEGRADATION = "the degraded lifetime is not below the annealed one: no light-induced"
            + " degradation detected";

    @Spec
    CommandSpec spec;

    @Option(names = "--degraded-us", required = true, paramLabel = "<µs>", converter = Quantity.Lifetime.class, order = 1,
            description = "Effective lifetime after light-induced degradation in µs. No default; required.")
    Double degradedUs;

    @Option(names = "--annealed-us", required = true, paramLabel = "<µs>", converter = Quantity.Lifetime.class, order = 2,
            description = "Effective lifetime after annealing (or regeneration) in µs, measured at the same injection."
                    + " No default; required.")
    Double annealedUs;

    @Option(names = "--json", order = 3, description = Help.JSON)
    boolean json;

    @Override
    public Integer call() {
        double nt = BoronOxygen.normalisedDensityPerUs(degradedUs, annealedUs);
        Defect bo = DefectLibrary.byId("bo-lid");
        List<String> warnings = new ArrayList<>();
        if (!(nt > 0)) {
            warnings.add(NO_DEGRADATION);
        }
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("status", "OK");
        m.put("normalised_density_per_us", nt);
        m.put("tau_degraded_us", degradedUs);
        m.put("tau_annealed_us", annealedUs);
        m.put("defect", bo.id());
        m.put("defect_level", bo.level().toString());
        m.put("defect_source", bo.source());
        m.put("method", METHOD);
        m.put("warnings", warnings);
        m.put("caution", CAUTION);

        PrintWriter out = spec.commandLine().getOut();
        if (json) {
            out.println(Output.json(m));
        } else {
            Output.Table t = new Output.Table()
                    .row("status", "OK", "")
                    .row("normalised density N_t*", Format.number(nt), "1/µs")
                    .row("degraded lifetime", Format.number(degradedUs), "µs")
                    .row("annealed lifetime", Format.number(annealedUs), "µs")
                    .row("defect", bo.id() + " — " + bo.name() + ", " + bo.level(), "")
                    .row("defect source", bo.source(), "")
                    .row("method", METHOD, "");
            warnings.forEach(w -> t.note("warning: " + w));
            t.note("caution: " + CAUTION);
            out.print(t.render());
        }
        out.flush();
        return Exit.OK;
    }
}
