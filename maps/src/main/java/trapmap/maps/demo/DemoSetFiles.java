package trapmap.maps.demo;

import com.fasterxml.jackson.core.util.DefaultIndenter;
import com.fasterxml.jackson.core.util.DefaultPrettyPrinter;
import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import trapmap.maps.io.AtomicFiles;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.Sidecar;

/**
 * The files of the demonstration set: per map a TIFF with embedded metadata and a JSON sidecar, then
 * {@code truth.json} (the planted defects) and {@code README.md}; and reading {@code truth.json} back.
 */
final class DemoSetFiles {
    private static final ObjectMapper JSON = new ObjectMapper();

    private DemoSetFiles() {
    }

    /**
     * Writes the maps {@code files} of the set into {@code dir} (created when missing): per map a TIFF with embedded metadata and a JSON
     * sidecar, then {@code truth.json} and {@code README.md}. Every file is written atomically; files of the same
     * names are replaced. Two runs give byte-identical files.
     *
     * @return the files written, in order
     */
    static List<Path> write(Path dir, List<DemoFile> files) throws IOException {
        Files.createDirectories(dir);
        List<Path> written = new ArrayList<>();
        for (DemoFile f : files) {
            Path tif = dir.resolve(f.file());
            MapFiles.write(f.map(), tif);
            written.add(tif);
            Path json = dir.resolve(f.stem() + ".json");
            writeText(json, pretty(JSON.readTree(Sidecar.toJson(f.map()))));
            written.add(json);
        }
        Path truth = dir.resolve(DemoScenario.TRUTH);
        writeText(truth, truthJson(files));
        written.add(truth);
        Path readme = dir.resolve(DemoScenario.README);
        writeText(readme, readme(files));
        written.add(readme);
        return written;
    }

    static String truthJson(List<DemoFile> files) throws IOException {
        ObjectNode root = JSON.createObjectNode();
        root.put("description", "defects planted in the trapmap demonstration set (invented data)");
        root.put("tolerance", PlantedDefect.TOLERANCE);
        root.put("seed", DemoScenario.SEED);
        ArrayNode list = root.putArray("files");
        for (DemoFile f : files) {
            ObjectNode o = list.addObject();
            o.put("file", f.file());
            o.put("wafer_id", f.map().waferId());
            o.put("quantity", f.map().quantity().key());
            ArrayNode ds = o.putArray("defects");
            for (PlantedDefect d : f.defects()) {
                ObjectNode n = ds.addObject();
                n.put("kind", d.kind());
                n.put("defect", d.defect());
                n.put("centre_x_mm", d.centreXMm());
                n.put("centre_y_mm", d.centreYMm());
                if (!Double.isNaN(d.radiusMm())) {
                    n.put("radius_mm", d.radiusMm());
                }
                if (d.kind().equals("ring")) {
                    n.put("width_mm", d.widthMm());
                }
                if (d.side() != null) {
                    n.put("side", d.side());
                    n.put("decay_length_mm", d.widthMm());
                }
                n.put("probe_x_mm", digits(d.probeXMm(), 9));
                n.put("probe_y_mm", digits(d.probeYMm(), 9));
                n.put("density_cm3", digits(d.densityPerCm3(), 6));
                n.put("background_cm3", digits(d.backgroundPerCm3(), 6));
                n.put("lifetime_us", digits(d.lifetimeUs(), 6));
                n.put("tolerance", PlantedDefect.TOLERANCE);
            }
        }
        return pretty(root);
    }

    /** {@code v} rounded to {@code n} significant digits, so that the truth file reads plainly. */
    static double digits(double v, int n) {
        return v == 0 || !Double.isFinite(v) ? v
                : new BigDecimal(v).round(new MathContext(n, RoundingMode.HALF_EVEN)).doubleValue();
    }

    /** Reads the planted defects of every file back from a {@code truth.json}. */
    static Map<String, List<PlantedDefect>> readTruth(Path file) throws IOException {
        JsonNode root = JSON.readTree(trapmap.maps.io.InputFiles.readUtf8(file,
                trapmap.maps.io.InputFiles.JSON_MAX_BYTES));
        Map<String, List<PlantedDefect>> out = new TreeMap<>();
        for (JsonNode f : root.get("files")) {
            List<PlantedDefect> ds = new ArrayList<>();
            for (JsonNode d : f.get("defects")) {
                String kind = d.get("kind").asText();
                double width = d.has("width_mm") ? d.get("width_mm").asDouble()
                        : d.has("decay_length_mm") ? d.get("decay_length_mm").asDouble() : Double.NaN;
                ds.add(new PlantedDefect(kind, d.get("defect").asText(), d.get("centre_x_mm").asDouble(),
                        d.get("centre_y_mm").asDouble(), d.has("radius_mm") ? d.get("radius_mm").asDouble()
                        : Double.NaN, width, d.has("side") ? d.get("side").asText() : null,
                        d.get("probe_x_mm").asDouble(), d.get("probe_y_mm").asDouble(),
                        d.get("density_cm3").asDouble(), d.get("background_cm3").asDouble(),
                        d.get("lifetime_us").asDouble()));
            }
            out.put(f.get("file").asText(), ds);
        }
        return out;
    }

    /** {@code node} as the demonstration files write JSON: two-space indents, one key or element a line. */
    static String pretty(JsonNode node) throws IOException {
        DefaultPrettyPrinter p = new DefaultPrettyPrinter();
        DefaultIndenter indent = new DefaultIndenter("  ", "\n");
        p.indentObjectsWith(indent);
        p.indentArraysWith(indent);
        return JSON.writer(p).writeValueAsString(node) + "\n";
    }

    static void writeText(Path target, String text) throws IOException {
        AtomicFiles.write(target, text.getBytes(StandardCharsets.UTF_8));
    }

    private static String readme(List<DemoFile> files) {
        StringBuilder sb = new StringBuilder();
        sb.append("# Demonstration data\n\n");
        sb.append("An invented supplier batch generated by `trapmap demo --out DIR` (seed ").append(DemoScenario.SEED)
                .append("). Every lot, wafer and\nsupplier name is made up and **nothing here is measured data**."
                        + " Regenerate with `./trapmap demo --out demo-data --force`;\nthe output is"
                        + " byte-identical on every run.\n\n");
        sb.append("## How the maps were made\n\n");
        sb.append("Each map starts from a planted trap-density map (grains, edge zones, marks, rings, spots)."
                + " The effective lifetime\nof every pixel follows from it with the same physics `trapmap convert`"
                + " inverts: at the map's injection level Δn,\n\n"
                + "    1/τ_eff = N_t/K(Δn) + 1/τ_intr(Δn) + 1/τ_surf\n\n"
                + "(SRH of the named defect, Richter 2012 intrinsic recombination, Sproul surface term with the"
                + " sidecar's thickness\nand SRV). The PL image solves Δn = G·τ_eff(Δn) at its generation rate and"
                + " stores I = A·Δn·(Δn + N_dop). A\n1.5 % multiplicative noise is added. Converting a map with the"
                + " conditions of its sidecar gives back the planted\ndensity, for example\n\n"
                + "    ./trapmap convert demo-data/LOT-A01-W02.tif --defect fe-i -o w02-fe.tif\n"
                + "    ./trapmap stats w02-fe.tif --threshold 1e12\n"
                + "    ./trapmap compare demo-data/LOT-A02-W05-before-gettering.tif"
                + " demo-data/LOT-A02-W05-after-gettering.tif --defect fe-i --quantity reduction -o g.tif\n\n");
        sb.append("Each `NAME.tif` (32-bit float, metadata embedded) has a `NAME.json` sidecar with the same"
                + " conditions\n(schema: [maps/SIDECAR.md](../maps/SIDECAR.md)).\n\n");
        sb.append("## Files\n\n| file | wafer | defect used | content |\n|---|---|---|---|\n");
        for (DemoFile f : files) {
            String defect = f.defects().isEmpty() ? "" : f.defects().get(0).defect();
            sb.append("| `").append(f.file()).append("` | ").append(f.map().waferId()).append(" | ").append(defect)
                    .append(" | ").append(f.description()).append(" |\n");
        }
        sb.append("\n## truth.json\n\n");
        sb.append("```\n{ \"tolerance\": \"").append(PlantedDefect.TOLERANCE).append("\", \"seed\": ..., \"files\": [\n"
                + "  { \"file\": \"LOT-A01-W02.tif\", \"wafer_id\": \"LOT-A01-W02\", \"quantity\": \"effective-lifetime\",\n"
                + "    \"defects\": [ { \"kind\": \"handling-mark\", \"defect\": \"fe-i\", \"centre_x_mm\": 20.0,"
                + " \"centre_y_mm\": 70.0,\n"
                + "                   \"radius_mm\": 3.0, \"probe_x_mm\": .., \"probe_y_mm\": .., \"density_cm3\": ..,\n"
                + "                   \"background_cm3\": .., \"lifetime_us\": .., \"tolerance\": \"...\" } ] } ] }\n```\n\n");
        sb.append("| field | meaning |\n|---|---|\n"
                + "| `kind` | `edge-zone` (iron from the crucible wall), `handling-mark`, `ring`, `boat-contact`,"
                + " `cluster` (dislocated, not gettered), `spot` |\n"
                + "| `defect` | library id the lifetimes were computed with (`fe-i`, `fe-b` for the paired state,"
                + " `midgap`) |\n"
                + "| `centre_x_mm`, `centre_y_mm` | centre of the feature in wafer coordinates (mm from the wafer"
                + " centre, x right, y up); for an edge zone the middle of its side, for a ring the ring centre |\n"
                + "| `radius_mm` | radius of a spot, mark or cluster (flat top), or of the ring's centre line |\n"
                + "| `width_mm` | ring: Gaussian σ of the ring across its radius |\n"
                + "| `side`, `decay_length_mm` | edge zone: side it starts from, and λ of N = N_edge·exp(−d/λ) |\n"
                + "| `probe_x_mm`, `probe_y_mm` | the pixel centre where `density_cm3` holds (spot centre, 2 mm"
                + " inside an edge, on the ring) |\n"
                + "| `density_cm3` | planted trap density at the probe, cm⁻³ |\n"
                + "| `background_cm3` | the density the probe would have without this defect, cm⁻³ |\n"
                + "| `lifetime_us` | noiseless effective lifetime at the probe, µs |\n"
                + "| `tolerance` | what a conversion must reach: density within a factor 1.5, positions within 2 mm |\n\n");
        sb.append("The FeB pair (`LOT-A03-W02-feb-state.tif`, `LOT-A03-W02-fe-i-state.tif`) shares one iron map: "
                + "`trapmap calc iron`\nwith the two lifetimes of a pixel at Δn = 1e13 cm⁻³ gives the planted [Fe]."
                + " The PL image converts to lifetime with\nits own `pl_calibration_counts_cm6`,"
                + " `generation_cm3_s` and `doping`.\n");
        sb.append(InjectionStackDemo.readme());
        return sb.toString();
    }
}
