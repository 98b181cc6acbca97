package trapmap.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.Callable;
import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import trapmap.physics.defect.Defect;
import trapmap.physics.defect.DefectLibrary;
import trapmap.physics.defect.EnergyReference;
import trapmap.physics.defect.ParameterSpread;
import trapmap.physics.defect.Range;
import trapmap.shared.error.InvalidValueException;

/** {@code trapmap defects}: the built-in defect library and the user's defects, with parameters and sources. */
@Command(name = "defects", version = TrapmapCommand.VERSION,
        header = "Lists the built-in and user-defined defects with their parameters and sources.",
        mixinStandardHelpOptions = true, sortOptions = false, usageHelpAutoWidth = true,
        description = {
            "Lists the defects 'trapmap calc --defect' accepts: level, capture cross-sections σ_n and σ_p (cm²), k ="
                    + " σ_n/σ_p, the thermal-velocity convention the cross-sections belong to, the published spread"
                    + " used for the density bounds, the conductivity type it suits (a conversion on the other type"
                    + " warns), and the source.",
            ""},
        footer = {"", "JSON: {\"defects\": [...]}; numbers that are not published (bo-lid) are null.", "",
            Help.EXIT_CODES})
final class DefectsCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Option(names = "--defect-file", paramLabel = "<file.json>", order = 1, description = Help.DEFECT_FILE)
    Path defectFile;

    @Option(names = "--json", order = 2, description = "Print one JSON object instead of text. Default: text.")
    boolean json;

    @Override
    public Integer call() {
        DefectCatalog catalog = DefectCatalog.load(defectFile);
        List<Defect> all = new ArrayList<>(catalog.builtIn());
        all.addAll(catalog.user());
        PrintWriter out = spec.commandLine().getOut();
        if (json) {
            List<Map<String, Object>> list = new ArrayList<>();
            for (Defect d : all) {
                list.add(describe(d, catalog.origin(d)));
            }
            out.println(Output.json(Map.of("defects", list)));
        } else {
            StringBuilder sb = new StringBuilder();
            for (Defect d : all) {
                sb.append(text(d, catalog.origin(d))).append(System.lineSeparator());
            }
            out.print(sb);
        }
        out.flush();
        return Exit.OK;
    }

    /** Why no absolute density can be computed for {@code d}, or null when it can. */
    static String limitation(Defect d) {
        if (d.hasAbsoluteCrossSections()) {
            return null;
        }
        try {
            d.requireAbsoluteCrossSections();
            return null;
        } catch (InvalidValueException e) {
            return Flags.oneLine(e.getMessage()) + "; compute that with 'trapmap calc bo'";
        }
    }

    private static Map<String, Object> describe(Defect d, String origin) {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("id", d.id());
        m.put("name", d.name());
        m.put("origin", origin);
        m.put("level", d.level().toString());
        m.put("level_reference", reference(d.level().reference()));
        m.put("energy_ev", d.level().energyEv());
        m.put("degeneracy", d.level().degeneracy());
        m.put("sigma_n_cm2", Output.num(d.electronCrossSectionCm2()));
        m.put("sigma_p_cm2", Output.num(d.holeCrossSectionCm2()));
        m.put("capture_ratio_k", Output.num(d.captureRatio()));
        m.put("vth_convention", Choices.vthName(d.velocityConvention()));
        m.put("vth_convention_description", d.velocityConvention().description());
        ParameterSpread s = d.spread();
        if (s == null) {
            m.put("spread", null);
        } else {
            Map<String, Object> sp = new LinkedHashMap<>();
            sp.put("energy_ev_min", s.energyEv().min());
            sp.put("energy_ev_max", s.energyEv().max());
            sp.put("sigma_n_cm2_min", s.electronCrossSectionCm2().min());
            sp.put("sigma_n_cm2_max", s.electronCrossSectionCm2().max());
            sp.put("sigma_p_cm2_min", s.holeCrossSectionCm2().min());
            sp.put("sigma_p_cm2_max", s.holeCrossSectionCm2().max());
            sp.put("note", s.note());
            m.put("spread", sp);
        }
        DefectLibrary.Suitability suits = DefectLibrary.suitability(d);
        m.put("suits_types", suits.types().stream().map(t -> t.name().toLowerCase(java.util.Locale.ROOT)).sorted()
                .toList());
        m.put("suits_reason", suits.reason());
        m.put("source", d.source());
        m.put("density_supported", d.hasAbsoluteCrossSections());
        m.put("limitation", limitation(d));
        return m;
    }

    private static String text(Defect d, String origin) {
        Output.Table t = new Output.Table();
        t.row("  level", d.level().toString(), "");
        if (d.hasAbsoluteCrossSections()) {
            t.row("  σ_n, σ_p", Format.number(d.electronCrossSectionCm2()) + " cm², "
                    + Format.number(d.holeCrossSectionCm2()) + " cm²", "");
        } else {
            t.row("  σ_n, σ_p", "no published absolute values", "");
        }
        t.row("  k = σ_n/σ_p", Format.number(d.captureRatio()), "");
        t.row("  v_th convention", Choices.vthName(d.velocityConvention()) + ": "
                + d.velocityConvention().description(), "");
        ParameterSpread s = d.spread();
        if (s != null) {
            EnergyReference ref = d.level().reference();
            t.row("  spread of level", range(s.energyEv(), ref), "");
            t.row("  spread of σ_n", Format.number(s.electronCrossSectionCm2().min()) + " to "
                    + Format.number(s.electronCrossSectionCm2().max()), "cm²");
            t.row("  spread of σ_p", Format.number(s.holeCrossSectionCm2().min()) + " to "
                    + Format.number(s.holeCrossSectionCm2().max()), "cm²");
            t.row("  spread note", s.note(), "");
        } else {
            t.row("  spread", "none", "");
        }
        DefectLibrary.Suitability suits = DefectLibrary.suitability(d);
        t.row("  suits", suits.label() + " (" + suits.reason() + ")", "");
        t.row("  source", d.source(), "");
        t.row("  origin", origin, "");
        String limit = limitation(d);
        if (limit != null) {
            t.row("  note", limit, "");
        }
        return d.id() + "  " + d.name() + System.lineSeparator() + t.render();
    }

    private static String range(Range r, EnergyReference ref) {
        if (r.min() == r.max()) {
            return ref.format(r.min());
        }
        return ref.format(r.min()) + " to " + ref.format(r.max());
    }

    private static String reference(EnergyReference r) {
        switch (r) {
            case CONDUCTION_BAND:
                return "Ec";
            case VALENCE_BAND:
                return "Ev";
            default:
                return "Ei";
        }
    }
}
