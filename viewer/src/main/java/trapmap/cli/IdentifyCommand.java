package trapmap.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
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
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.NumberText;
import trapmap.maps.io.ReadOptions;
import trapmap.maps.spectroscopy.DefectIdentification;
import trapmap.maps.spectroscopy.IdentificationFiles;
import trapmap.maps.spectroscopy.IdentificationResult;
import trapmap.maps.spectroscopy.InjectionStack;
import trapmap.maps.spectroscopy.RegionIdentification;
import trapmap.maps.spectroscopy.StackLevel;
import trapmap.physics.defect.Defect;
import trapmap.physics.spectroscopy.LifetimeCurve;

/** {@code trapmap identify}: the defect hint of a wafer from lifetime maps at several injection levels. */
@Command(name = "identify", version = TrapmapCommand.VERSION, mixinStandardHelpOptions = true, sortOptions = false,
        usageHelpAutoWidth = true,
        header = "Suggests the defect behind each pixel and region from lifetime maps at several injection levels.",
        description = {
            "MAP1 MAP2 [MAP3 ...] are lifetime (or PL) maps of one wafer at different injection levels, each sidecar"
                    + " giving its injection_cm3 (or generation_cm3_s), or one multi-page file whose sidecar 'pages'"
                    + " objects give them ({\"label\": \"1e13\", \"injection_cm3\": 1e13}). The condition flags"
                    + " apply to every level; there is no --injection or --generation (each level has its own).",
            "",
            "Every level is registered onto the first (unless --no-registration): upright, turned at most 2°,"
                    + " and kept as measured unless a shift (or shift and turn) scores clearly better; τ_SRH is"
                    + " taken per pixel with intrinsic and surface recombination removed, and the library defects are ranked by the χ² of"
                    + " their one-parameter fit N_t (injection-dependent lifetime spectroscopy; Rein, Lifetime"
                    + " Spectroscopy, Springer 2005): per pixel (or --block k), and per region (connected areas where"
                    + " SRH dominates the first level and τ_SRH is below half its median), with the defect parameter"
                    + " solution surface (DPSS) per region. No single defect: best p < 0.01.",
            "",
            "Writes OUT (best-defect index, see the legend CSV) and beside it OUT-runner-up, -chi2, -chi2-ratio,"
                    + " -status (" + IdentificationFiles.STATUS_CODES + "), -nt (N_t of the best, cm^-3), -regions"
                    + " (.tif), -legend.csv, -regions.csv and with --json OUT.json. A hint, not a proof: the ranking"
                    + " only knows the defects of the library.",
            ""},
        footer = {"", Help.EXIT_CODES_OUTPUT})
final class IdentifyCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Parameters(index = "0..*", arity = "1..*", paramLabel = "MAP",
            description = "Lifetime or PL maps of one wafer at two or more injection levels, or one multi-page file.")
    List<Path> maps;

    @Option(names = {"-o", "--output", "--out"}, paramLabel = "<file.tif>", required = true,
            description = "Best-defect index map (.tif); the other files are written beside it.")
    Path output;

    @Option(names = "--defects", paramLabel = "<id,id>", split = ",",
            description = "Candidate defects (ids, see 'trapmap defects'). Default: every built-in defect and those"
                    + " of --defect-file.")
    List<String> defects;

    @Option(names = "--defect-file", paramLabel = "<file.json>", description = Help.DEFECT_FILE)
    Path defectFile;

    @Option(names = "--block", paramLabel = "<k>", defaultValue = "1",
            description = "Rank k x k pixel blocks as one curve (their mean τ_SRH), in [1, 1024] px. Default: 1.")
    int block;

    @Option(names = "--noise", paramLabel = "<relative>", defaultValue = "0.03",
            description = "Relative standard uncertainty of one pixel's τ_SRH at each level (0.03 = 3 %%). Default:"
                    + " 0.03.")
    double noise;

    @Option(names = "--region-below-us", paramLabel = "<µs>",
            description = "Regions are where the first level's τ_SRH is below this, in µs (and SRH dominates)."
                    + " Default: half the median τ_SRH of the first level.")
    Double regionBelowUs;

    @Option(names = "--min-region-px", paramLabel = "<px>", defaultValue = "16",
            description = "Smallest region kept, in pixels. Default: 16.")
    int minRegionPx;

    @Option(names = "--no-registration", description = "Take the maps as already aligned (same grid).")
    boolean noRegistration;

    @Option(names = "--any-wafer-id", description = "Take the maps as one wafer even when their wafer ids differ"
            + " (e.g. files named after their level, without a sidecar wafer_id).")
    boolean anyWaferId;

    @Option(names = "--json", description = "Print the summary as one JSON object and write it to OUT.json.")
    boolean json;

    @Mixin
    MapConditionOptions conditions;

    @Override
    public Integer call() throws IOException {
        String name = output.getFileName().toString().toLowerCase(Locale.ROOT);
        if (!name.endsWith(".tif") && !name.endsWith(".tiff")) {
            throw new InputException("--output must be a .tif file (the best-defect index map), not " + output);
        }
        MapInput.refuseOverwriting(output, IdentificationFiles.files(output, json), maps);
        if (!(noise >= DefectIdentification.MIN_RELATIVE_NOISE && noise <= 1)) {
            throw new InputException("--noise must be a relative uncertainty in ["
                    + NumberText.of(DefectIdentification.MIN_RELATIVE_NOISE) + ", 1] (0.03 = 3 %), not " + noise);
        }
        if (block < 1 || block > DefectIdentification.MAX_BLOCK_PX) {
            throw new InputException("--block must be in [1, " + DefectIdentification.MAX_BLOCK_PX + "] px, not "
                    + block);
        }
        if (minRegionPx < 1) {
            throw new InputException("--min-region-px must be at least 1 px, not " + minRegionPx);
        }
        if (regionBelowUs != null && !(regionBelowUs > 0 && Double.isFinite(regionBelowUs))) {
            throw new InputException("--region-below-us must be a positive lifetime in µs, not " + regionBelowUs);
        }
        if (conditions.injection != null || conditions.generation != null) {
            throw new InputException((conditions.injection != null ? "--injection" : "--generation") + " would give"
                    + " every level the same value; identify reads each level's injection_cm3 (cm^-3) or"
                    + " generation_cm3_s (cm^-3 s^-1) from its sidecar or its page object of 'pages'");
        }
        List<Defect> candidates = candidates();
        InjectionStack.Loaded loaded = InjectionStack.read(maps, ReadOptions.DEFAULTS, conditions.overrides());
        InjectionStack stack = InjectionStack.of(loaded, new InjectionStack.Options(!noRegistration,
                InjectionStack.REGISTRATION, !anyWaferId));
        DefectIdentification.Options o = new DefectIdentification.Options(block, noise,
                regionBelowUs == null ? Double.NaN : regionBelowUs, minRegionPx,
                Runtime.getRuntime().availableProcessors());
        IdentificationResult r = DefectIdentification.identify(stack, conditions.settings(), candidates, o);
        List<Path> written;
        try {
            written = IdentificationFiles.write(r, output, json);
        } catch (IOException e) {
            throw MapInput.cannotWrite(output, e);
        }
        print(r, written);
        return Exit.OK;
    }

    private List<Defect> candidates() {
        DefectCatalog catalog = DefectCatalog.load(defectFile);
        List<Defect> out = new ArrayList<>();
        if (defects == null || defects.isEmpty()) {
            out.addAll(catalog.builtIn());
            out.addAll(catalog.user());
        } else {
            for (String id : defects) {
                Defect d = catalog.find("--defects", id);
                if (!out.contains(d)) {
                    out.add(d);
                }
            }
        }
        if (out.stream().noneMatch(Defect::hasAbsoluteCrossSections)) {
            throw new InputException("--defects: none of " + out.stream().map(Defect::id).toList() + " has"
                    + " absolute capture cross-sections (cm^2), so none can be ranked");
        }
        return out;
    }

    private void print(IdentificationResult r, List<Path> written) {
        PrintWriter out = spec.commandLine().getOut();
        if (json) {
            Map<String, Object> s = IdentificationFiles.summary(r);
            s.put("files", written.stream().map(Path::toString).toList());
            out.println(IdentificationFiles.json(s));
            out.flush();
            return;
        }
        Output.Table t = new Output.Table();
        t.row("wafer", r.stack().waferId(), "");
        for (StackLevel l : r.stack().levels()) {
            double[] shift = l.shiftMm();
            t.row("level " + l.label(), l.source() + (l.registration() == null ? "" : String.format(Locale.ROOT,
                    ", shift %.3f, %.3f mm, turn %.2f deg%s", shift[0], shift[1], l.rotationDeg(),
                    l.resampled() ? ", resampled" : ", within half a pixel: kept as read")), "");
        }
        int[] c = r.statusCounts();
        for (trapmap.physics.spectroscopy.RankingStatus s : trapmap.physics.spectroscopy.RankingStatus.values()) {
            t.row("pixels " + IdentificationFiles.key(s), Integer.toString(c[s.ordinal()]), "px");
        }
        for (IdentificationResult.LegendEntry e : r.legend()) {
            if (e.pixelCount() > 0) {
                t.row("best " + e.index() + " " + e.defectId(), Integer.toString(e.pixelCount()), "px");
            }
        }
        t.row("regions", r.regionRule(), "");
        for (RegionIdentification g : r.regions()) {
            String v;
            if (g.ranking() == null) {
                v = g.note();
            } else if (g.ranking().hint() == null) {
                v = IdentificationFiles.key(g.ranking().status());
            } else {
                v = String.format(Locale.ROOT, "%s: %s, N_t %.3g cm^-3, chi2 ratio %.3g",
                        IdentificationFiles.key(g.ranking().status()), g.ranking().hint().best().id(),
                        g.ranking().hint().best().ntPerCm3(), g.ranking().hint().chiSquaredRatio());
            }
            t.row("region " + g.id() + " (" + g.region().pixelCount() + " px)", v, "");
        }
        for (Path p : written) {
            t.row("wrote", p.toString(), "");
        }
        t.note(trapmap.maps.spectroscopy.DefectIdentification.HINT + " (relative uncertainty "
                + Format.number(r.options().relativeNoise()) + " per pixel, default "
                + Format.number(LifetimeCurve.DEFAULT_RELATIVE_UNCERTAINTY) + ")");
        t.note("caution: " + Calculation.CAUTION);
        out.print(t.render());
        out.flush();
    }
}
