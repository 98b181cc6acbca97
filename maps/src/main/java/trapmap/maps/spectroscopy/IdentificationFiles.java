package trapmap.maps.spectroscopy;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.SerializationFeature;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import trapmap.maps.compare.RegistrationReport;
import trapmap.maps.io.AtomicFiles;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.NumberText;
import trapmap.maps.io.TableFiles;
import trapmap.physics.spectroscopy.CandidateFit;
import trapmap.physics.spectroscopy.DefectOnCurve;
import trapmap.physics.spectroscopy.DpssResult;
import trapmap.physics.spectroscopy.Ranking;
import trapmap.physics.spectroscopy.RankingStatus;

/**
 * The files of an identification, all written atomically beside the best-defect index map {@code STEM.tif}:
 * {@code STEM-runner-up.tif}, {@code STEM-chi2.tif}, {@code STEM-chi2-ratio.tif}, {@code STEM-status.tif},
 * {@code STEM-nt.tif} (N_t of the best defect, cm^-3), {@code STEM-regions.tif} (region ids), the legend
 * {@code STEM-legend.csv}, the region table {@code STEM-regions.csv} and, when asked, the summary
 * {@code STEM-summary.json} (not {@code STEM.json}, the sidecar name of the index map). The same summary object ({@link #summary}) is what a command prints.
 */
public final class IdentificationFiles {
    /** Header of the legend CSV. */
    public static final List<String> LEGEND_HEADER = List.of("index", "defect", "name", "pixels");
    /** Header of the region table CSV: one row per region and candidate, ranked by χ². */
    public static final List<String> REGION_HEADER = List.of("region", "pixels", "pixels_used", "area_mm2",
            "centroid_x_mm", "centroid_y_mm", "status", "rank", "defect", "nt_cm3", "nt_se_cm3", "nt_lower95_cm3",
            "nt_upper95_cm3", "chi2", "dof", "p_value", "dpss_on_curve", "dpss_k_min", "dpss_k_max",
            "dpss_ambiguous_half", "reason");
    /** The status codes of {@code STEM-status.tif}. */
    public static final String STATUS_CODES = "0 ok, 1 below-limit (some levels not usable), 2 too-few-levels,"
            + " 3 no-single-defect (best p < 0.01); no data: NaN";

    private IdentificationFiles() {
    }

    /** The file {@code STEM + suffix} beside {@code indexTif} ({@code STEM} its name without extension). */
    public static Path beside(Path indexTif, String suffix) {
        String name = indexTif.getFileName().toString();
        int dot = name.lastIndexOf('.');
        String stem = dot > 0 ? name.substring(0, dot) : name;
        return indexTif.resolveSibling(stem + suffix);
    }

    /**
     * The files {@link #write} writes, in its order: the index map, the six other maps, the two tables and, with
     * {@code json}, the summary.
     */
    public static List<Path> files(Path indexTif, boolean json) {
        List<Path> out = new ArrayList<>(List.of(indexTif));
        for (String suffix : List.of("-runner-up.tif", "-chi2.tif", "-chi2-ratio.tif", "-status.tif", "-nt.tif",
                "-regions.tif", "-legend.csv", "-regions.csv")) {
            out.add(beside(indexTif, suffix));
        }
        if (json) {
            // not STEM.json: that name is the sidecar a reader of STEM.tif looks for
            out.add(beside(indexTif, "-summary.json"));
        }
        return List.copyOf(out);
    }

    /**
     * Writes every file ({@link #files}).
     *
     * @return the files written, the index map first
     */
    public static List<Path> write(IdentificationResult r, Path indexTif, boolean json) throws IOException {
        List<Path> f = files(indexTif, json);
        List<Path> out = new ArrayList<>();
        out.add(map(r.bestIndexMap(), f.get(0)));
        out.add(map(r.runnerUpIndexMap(), f.get(1)));
        out.add(map(r.chiSquaredMap(), f.get(2)));
        out.add(map(r.chiSquaredRatioMap(), f.get(3)));
        out.add(map(r.statusMap(), f.get(4)));
        out.add(map(r.bestDensityMap(), f.get(5)));
        out.add(map(r.regionMap(), f.get(6)));
        TableFiles.writeCsv(f.get(7), LEGEND_HEADER, legendRows(r));
        out.add(f.get(7));
        TableFiles.writeCsv(f.get(8), REGION_HEADER, regionRows(r));
        out.add(f.get(8));
        if (json) {
            Path j = f.get(9);
            Map<String, Object> s = summary(r);
            List<String> files = new ArrayList<>();
            out.forEach(p -> files.add(p.toString()));
            files.add(j.toString());
            s.put("files", files);
            AtomicFiles.write(j, (json(s) + "\n").getBytes(StandardCharsets.UTF_8));
            out.add(j);
        }
        return out;
    }

    private static Path map(trapmap.maps.model.WaferMap m, Path p) throws IOException {
        MapFiles.write(m, p);
        return p;
    }

    /** The summary as indented JSON (NaN and infinities as null). */
    public static String json(Map<String, Object> summary) {
        try {
            return NumberText.jsonMapper().enable(SerializationFeature.INDENT_OUTPUT).writeValueAsString(summary);
        } catch (JsonProcessingException e) {
            throw new IllegalStateException("cannot render the identification summary as JSON", e);
        }
    }

    /** The legend rows: index, defect id, name, pixels. */
    public static List<List<Object>> legendRows(IdentificationResult r) {
        List<List<Object>> rows = new ArrayList<>();
        for (IdentificationResult.LegendEntry e : r.legend()) {
            rows.add(List.of(e.index(), e.defectId(), e.name(), e.pixelCount()));
        }
        return rows;
    }

    /** The region table rows ({@link #REGION_HEADER}). */
    public static List<List<Object>> regionRows(IdentificationResult r) {
        List<List<Object>> rows = new ArrayList<>();
        for (RegionIdentification g : r.regions()) {
            Ranking k = g.ranking();
            DpssResult d = g.dpss();
            String onCurve = d == null ? "" : String.join(";", d.onCurve().stream().map(o -> o.defect().id())
                    .toList());
            double[] kr = d == null ? new double[] {Double.NaN, Double.NaN} : d.bandRatioRange();
            String status = k == null ? "" : key(k.status());
            String reason = k == null ? g.note() : k.reason();
            if (k == null) {
                rows.add(row(g, status, "", "", Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, "",
                        Double.NaN, onCurve, kr, d, reason));
                continue;
            }
            int rank = 0;
            for (CandidateFit f : k.candidates()) {
                if (!f.fitted()) {
                    continue;
                }
                rank++;
                rows.add(row(g, status, Integer.toString(rank), f.id(), f.ntPerCm3(), f.standardErrorPerCm3(),
                        f.lowerPerCm3(), f.upperPerCm3(), f.chiSquared(), Integer.toString(f.degreesOfFreedom()),
                        f.pValue(), onCurve, kr, d, reason));
            }
            if (rank == 0) {
                rows.add(row(g, status, "", "", Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, "",
                        Double.NaN, onCurve, kr, d, reason));
            }
        }
        return rows;
    }

    private static List<Object> row(RegionIdentification g, String status, String rank, String id, double nt,
                                    double se, double lo, double hi, double chi2, String dof, double p,
                                    String onCurve, double[] kr, DpssResult d, String reason) {
        List<Object> row = new ArrayList<>();
        row.add(g.id());
        row.add(g.region().pixelCount());
        row.add(g.pixelsUsed());
        row.add(num(NumberText.roundMm2(g.region().areaMm2())));
        row.add(num(NumberText.roundMm(g.region().centroidXMm())));
        row.add(num(NumberText.roundMm(g.region().centroidYMm())));
        row.add(status);
        row.add(rank);
        row.add(id);
        row.add(num(nt));
        row.add(num(se));
        row.add(num(lo));
        row.add(num(hi));
        row.add(num(chi2));
        row.add(dof);
        row.add(num(p));
        row.add(onCurve);
        row.add(num(kr[0]));
        row.add(num(kr[1]));
        row.add(d == null ? "" : Boolean.toString(d.ambiguousHalf()));
        row.add(reason);
        return row;
    }

    private static String num(double v) {
        return Double.isFinite(v) ? String.format(Locale.ROOT, "%.6g", v) : "";
    }

    private static Double finite(double v) {
        return Double.isFinite(v) ? v : null;
    }

    /** Lower-case key of a status, e.g. {@code no-single-defect}. */
    public static String key(RankingStatus s) {
        return s.name().toLowerCase(Locale.ROOT).replace('_', '-');
    }

    /**
     * The summary: wafer, levels (label, source, Δn or G, registration shift), candidates, settings, status
     * counts, legend, shares, regions (best, runner-up, χ² ratio, status, reason, DPSS on-curve defects).
     */
    public static Map<String, Object> summary(IdentificationResult r) {
        Map<String, Object> m = new LinkedHashMap<>();
        InjectionStack stack = r.stack();
        m.put("wafer_id", stack.waferId());
        List<Object> levels = new ArrayList<>();
        for (StackLevel l : stack.levels()) {
            Map<String, Object> lv = new LinkedHashMap<>();
            lv.put("label", l.label());
            lv.put("source", l.source());
            lv.put("injection_cm3", l.map().conditions().injectionPerCm3());
            lv.put("generation_cm3_s", l.map().conditions().generationPerCm3PerS());
            RegistrationReport rr = l.registration();
            if (rr != null) {
                Map<String, Object> reg = new LinkedHashMap<>();
                reg.put("kept", rr.kept().key());
                reg.put("flip_x", rr.registration().flipX());
                reg.put("rotation_deg", finite(rr.registration().rotationDeg()));
                reg.put("shift_x_mm", finite(rr.registration().shiftXMm()));
                reg.put("shift_y_mm", finite(rr.registration().shiftYMm()));
                reg.put("score", finite(rr.registration().score()));
                reg.put("search_score", finite(rr.searchScore()));
                reg.put("identity_score", finite(rr.identityScore()));
                reg.put("resampled", l.resampled());
                reg.put("warnings", rr.warnings());
                lv.put("registration", reg);
            }
            levels.add(lv);
        }
        m.put("levels", levels);
        m.put("doping", r.lifetimes().doping().toString());
        m.put("candidates", r.candidates().stream().map(d -> d.id()).toList());
        m.put("block_px", r.options().blockPx());
        m.put("relative_noise", r.options().relativeNoise());
        m.put("region_threshold_us", finite(r.regionThresholdUs()));
        m.put("min_region_px", r.options().minRegionPixels());
        m.put("status_codes", STATUS_CODES);
        Map<String, Object> counts = new LinkedHashMap<>();
        int[] c = r.statusCounts();
        for (RankingStatus s : RankingStatus.values()) {
            counts.put(key(s), c[s.ordinal()]);
        }
        m.put("status_pixels", counts);
        m.put("share_no_single_defect", r.shareNoSingleDefect());
        List<Object> legend = new ArrayList<>();
        for (IdentificationResult.LegendEntry e : r.legend()) {
            Map<String, Object> le = new LinkedHashMap<>();
            le.put("index", e.index());
            le.put("defect", e.defectId());
            le.put("name", e.name());
            le.put("pixels", e.pixelCount());
            le.put("share", r.shareIdentifiedAs(e.defectId()));
            legend.add(le);
        }
        m.put("legend", legend);
        List<Object> regions = new ArrayList<>();
        for (RegionIdentification g : r.regions()) {
            Map<String, Object> rg = new LinkedHashMap<>();
            rg.put("region", g.id());
            rg.put("pixels", g.region().pixelCount());
            rg.put("pixels_used", g.pixelsUsed());
            rg.put("area_mm2", NumberText.roundMm2(g.region().areaMm2()));
            rg.put("centroid_x_mm", NumberText.roundMm(g.region().centroidXMm()));
            rg.put("centroid_y_mm", NumberText.roundMm(g.region().centroidYMm()));
            Ranking k = g.ranking();
            if (k != null) {
                rg.put("status", key(k.status()));
                if (k.hint() != null) {
                    rg.put("best", k.hint().best().id());
                    rg.put("best_nt_cm3", finite(k.hint().best().ntPerCm3()));
                    rg.put("best_nt_lower95_cm3", finite(k.hint().best().lowerPerCm3()));
                    rg.put("best_nt_upper95_cm3", finite(k.hint().best().upperPerCm3()));
                    rg.put("best_chi2", finite(k.hint().best().chiSquared()));
                    rg.put("best_p", finite(k.hint().best().pValue()));
                    rg.put("runner_up", k.hint().runnerUp() == null ? null : k.hint().runnerUp().id());
                    rg.put("chi2_ratio", finite(k.hint().chiSquaredRatio()));
                }
                rg.put("reason", k.reason());
            }
            DpssResult d = g.dpss();
            if (d != null) {
                rg.put("dpss_on_curve", d.onCurve().stream().map(DefectOnCurve::defect).map(x -> x.id()).toList());
                rg.put("dpss_k_min", finite(d.bandRatioRange()[0]));
                rg.put("dpss_k_max", finite(d.bandRatioRange()[1]));
                rg.put("dpss_ambiguous_half", d.ambiguousHalf());
                rg.put("dpss_reason", d.reason());
            } else if (!g.note().isEmpty()) {
                rg.put("note", g.note());
            }
            regions.add(rg);
        }
        m.put("regions", regions);
        m.put("caution", trapmap.maps.model.Caution.TEXT);
        return m;
    }
}
