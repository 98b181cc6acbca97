package trapmap.maps.demo;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.math.BigDecimal;
import java.math.MathContext;
import java.math.RoundingMode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import trapmap.maps.io.InputFiles;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.Sidecar;

/**
 * The files of the production history of {@link HistoryScenario}: per wafer a TIFF with embedded metadata and a JSON
 * sidecar (its {@code boat_slot} fact written as a number), then {@code truth.json}, the rules file and
 * {@code README.md}; and reading {@code truth.json} back.
 */
final class HistorySetFiles {
    private static final ObjectMapper JSON = new ObjectMapper();

    private HistorySetFiles() {
    }

    static List<Path> write(Path dir, List<HistoryScenario.Wafer> wafers) throws IOException {
        Files.createDirectories(dir);
        List<Path> written = new ArrayList<>();
        for (HistoryScenario.Wafer w : wafers) {
            DemoFile f = w.file();
            Path tif = dir.resolve(f.file());
            MapFiles.write(f.map(), tif);
            written.add(tif);
            Path json = dir.resolve(f.stem() + ".json");
            ObjectNode side = (ObjectNode) JSON.readTree(Sidecar.toJson(f.map()));
            ((ObjectNode) side.get("conditions").get("extra")).put("boat_slot", w.boatSlot());
            DemoSetFiles.writeText(json, DemoSetFiles.pretty(side));
            written.add(json);
        }
        Path truth = dir.resolve(DemoScenario.TRUTH);
        DemoSetFiles.writeText(truth, truthJson(wafers));
        written.add(truth);
        Path rules = dir.resolve(HistoryScenario.RULES);
        DemoSetFiles.writeText(rules, rules());
        written.add(rules);
        Path readme = dir.resolve(DemoScenario.README);
        DemoSetFiles.writeText(readme, readme(wafers));
        written.add(readme);
        return written;
    }

    static String truthJson(List<HistoryScenario.Wafer> wafers) throws IOException {
        ObjectNode root = JSON.createObjectNode();
        root.put("description", "faults planted in the trapmap demonstration production history (invented data)");
        root.put("seed", HistoryScenario.SEED);
        root.put("start", HistoryScenario.START.toString());
        root.put("days", HistoryScenario.DAYS);
        root.put("lots_per_day", HistoryScenario.LOTS_PER_DAY);
        ArrayNode slots = root.putArray("boat_slots_measured");
        HistoryScenario.SLOTS.forEach(slots::add);
        root.put("defect", HistoryScenario.DEFECT);
        root.put("baseline_fe_i_cm3", HistoryScenario.BASELINE_FE_CM3);
        ObjectNode drift = root.putObject("drift");
        drift.put("furnace_tube", HistoryScenario.DRIFT_TUBE);
        drift.put("steady_tube", HistoryScenario.STEADY_TUBE);
        drift.put("change_at", HistoryScenario.CHANGE_AT.toString());
        drift.put("increase_per_day", HistoryScenario.DRIFT_PER_DAY);
        drift.put("law", "Fe_i = level before x (1 + increase_per_day x days from change_at to the lot's furnace"
                + " time), for lots of furnace_tube processed after change_at");
        ObjectNode spot = root.putObject("bad_slot");
        spot.put("boat_slot", HistoryScenario.BAD_SLOT);
        spot.put("kind", "spot");
        spot.put("centre_x_mm", HistoryScenario.SPOT_X_MM);
        spot.put("centre_y_mm", HistoryScenario.SPOT_Y_MM);
        spot.put("radius_mm", HistoryScenario.SPOT_RADIUS_MM);
        spot.put("density_cm3", HistoryScenario.SPOT_DENSITY_CM3);
        ArrayNode list = root.putArray("wafers");
        for (HistoryScenario.Wafer w : wafers) {
            ObjectNode o = list.addObject();
            o.put("file", w.file().file());
            o.put("wafer_id", w.file().map().waferId());
            o.put("lot", w.lot());
            o.put("furnace_tube", w.furnaceTube());
            o.put("boat_slot", w.boatSlot());
            o.put("processed_at", w.processedAt().toString());
            o.put("measured_at", w.measuredAt().toString());
            o.put("drift_factor", digits(w.driftFactor(), 9));
            o.put("centre_fe_i_cm3", digits(w.centreFeCm3(), 9));
            ArrayNode ds = o.putArray("defects");
            for (PlantedDefect d : w.file().defects()) {
                ObjectNode n = ds.addObject();
                n.put("kind", d.kind());
                n.put("defect", d.defect());
                n.put("centre_x_mm", d.centreXMm());
                n.put("centre_y_mm", d.centreYMm());
                n.put("radius_mm", d.radiusMm());
                n.put("probe_x_mm", digits(d.probeXMm(), 9));
                n.put("probe_y_mm", digits(d.probeYMm(), 9));
                n.put("density_cm3", digits(d.densityPerCm3(), 6));
                n.put("background_cm3", digits(d.backgroundPerCm3(), 6));
                n.put("lifetime_us", digits(d.lifetimeUs(), 6));
            }
        }
        return DemoSetFiles.pretty(root);
    }

    private static double digits(double v, int n) {
        return v == 0 || !Double.isFinite(v) ? v
                : new BigDecimal(v).round(new MathContext(n, RoundingMode.HALF_EVEN)).doubleValue();
    }

    static HistoryTruth readTruth(Path file) throws IOException {
        JsonNode root = JSON.readTree(InputFiles.readUtf8(file, InputFiles.JSON_MAX_BYTES));
        JsonNode drift = root.get("drift");
        JsonNode spot = root.get("bad_slot");
        List<HistoryTruth.Wafer> wafers = new ArrayList<>();
        for (JsonNode w : root.get("wafers")) {
            List<PlantedDefect> ds = new ArrayList<>();
            for (JsonNode d : w.get("defects")) {
                ds.add(new PlantedDefect(d.get("kind").asText(), d.get("defect").asText(),
                        d.get("centre_x_mm").asDouble(), d.get("centre_y_mm").asDouble(),
                        d.get("radius_mm").asDouble(), Double.NaN, null, d.get("probe_x_mm").asDouble(),
                        d.get("probe_y_mm").asDouble(), d.get("density_cm3").asDouble(),
                        d.get("background_cm3").asDouble(), d.get("lifetime_us").asDouble()));
            }
            wafers.add(new HistoryTruth.Wafer(w.get("file").asText(), w.get("wafer_id").asText(),
                    w.get("lot").asText(), w.get("furnace_tube").asText(), w.get("boat_slot").asInt(),
                    Instant.parse(w.get("processed_at").asText()), Instant.parse(w.get("measured_at").asText()),
                    w.get("drift_factor").asDouble(), w.get("centre_fe_i_cm3").asDouble(), ds));
        }
        return new HistoryTruth(Instant.parse(root.get("start").asText()), root.get("days").asInt(),
                root.get("defect").asText(), root.get("baseline_fe_i_cm3").asDouble(),
                drift.get("furnace_tube").asText(), drift.get("steady_tube").asText(),
                Instant.parse(drift.get("change_at").asText()), drift.get("increase_per_day").asDouble(),
                spot.get("boat_slot").asInt(), spot.get("centre_x_mm").asDouble(), spot.get("centre_y_mm").asDouble(),
                spot.get("radius_mm").asDouble(), spot.get("density_cm3").asDouble(), wafers);
    }

    /**
     * Rules for the history: interstitial iron, a median limit that the drifting tube crosses about a week after
     * the change, a limit on interior regions that the bad slot's spot fails, and a trend block that follows the
     * median per furnace tube against the first week ({@link HistoryScenario#TREND_BASELINE_UNTIL}), so that a batch
     * stored with {@code --store} gets its trend page and a watch its alarm on a point beyond 3σ.
     */
    static String rules() {
        String day = HistoryScenario.TREND_BASELINE_UNTIL.toString().substring(0, 10);
        return """
                {
                  "defect": "fe-i",
                  "edge_exclusion_mm": 3,
                  "wafer": "auto",
                  "flag": {"quantity": "trap-density", "threshold": 3e11, "min_area_mm2": 20},
                  "limits": {
                    "trap_density_p50_cm3": {"max": 6e10},
                    "largest_interior_region_mm2": {"max": 25}
                  },
                  "grades": [
                    {"grade": "A", "when": {"trap_density_p50_cm3": {"max": 4e10}}},
                    {"grade": "B"}
                  ],
                  "fail_grade": "R",
                  "trend": {
                    "figure": "trap_density_p50_cm3",
                    "by": "furnace_tube",
                    "baseline_until": "DAY",
                    "alarm_rules": ["beyond_3_sigma"]
                  }
                }
                """.replace("DAY", day);
    }

    /** A round number in plain scientific form: 3e10. */
    private static String sci(double v) {
        return String.format(Locale.ROOT, "%.0e", v).replace("e+", "e");
    }

    /** The measured slots as words: "2, 7 and 14". */
    private static String slots() {
        List<Integer> s = HistoryScenario.SLOTS;
        StringBuilder sb = new StringBuilder();
        for (int i = 0; i < s.size(); i++) {
            sb.append(i == 0 ? "" : i == s.size() - 1 ? " and " : ", ").append(s.get(i));
        }
        return sb.toString();
    }

    private static String readme(List<HistoryScenario.Wafer> wafers) {
        HistoryScenario.Wafer first = wafers.get(0);
        HistoryScenario.Wafer last = wafers.get(wafers.size() - 1);
        StringBuilder sb = new StringBuilder();
        sb.append("# Demonstration production history\n\n");
        sb.append(String.format(Locale.ROOT, "An invented furnace-monitor history generated by `trapmap demo"
                + " --history DIR` (seed %d): %d wafers of\n%d lots, measured from %s to %s.\nEvery lot, tube and"
                + " wafer name is made up and **nothing here is measured data**. Every run writes\nthe same bytes.%n%n",
                HistoryScenario.SEED, wafers.size(), wafers.size() / HistoryScenario.SLOTS.size(),
                first.measuredAt(), last.measuredAt()));
        sb.append(String.format(Locale.ROOT, "Each day %d lots go through one of two furnace tubes (%s and %s,"
                + " alternately); the monitor wafers of\nboat slots %s of every lot are measured as 64 × 64 px"
                + " lifetime maps (round %.0f mm, %.1f mm pixels, p-type\n1.5 Ω·cm, 180 µm, Δn = 1e14 cm⁻³),"
                + " drawn from a planted interstitial-iron map (Fe_i) as the main demonstration\nset is.%n%n",
                HistoryScenario.LOTS_PER_DAY, HistoryScenario.STEADY_TUBE, HistoryScenario.DRIFT_TUBE,
                slots(), HistoryScenario.DIAMETER_MM, HistoryScenario.PITCH_MM));
        sb.append("## Planted faults\n\n");
        sb.append(String.format(Locale.ROOT, "- From %s the iron of tube %s rises by %.0f %% of its level per day"
                + " (baseline %s cm⁻³ at the\n  wafer centre); tube %s stays.%n", HistoryScenario.CHANGE_AT,
                HistoryScenario.DRIFT_TUBE, 100 * HistoryScenario.DRIFT_PER_DAY, sci(HistoryScenario.BASELINE_FE_CM3),
                HistoryScenario.STEADY_TUBE));
        sb.append(String.format(Locale.ROOT, "- The wafer in boat slot %d of every lot has a contamination spot at"
                + " (%.0f, %.0f) mm, radius %.0f mm,\n  %s cm⁻³.%n%n", HistoryScenario.BAD_SLOT,
                HistoryScenario.SPOT_X_MM, HistoryScenario.SPOT_Y_MM, HistoryScenario.SPOT_RADIUS_MM,
                sci(HistoryScenario.SPOT_DENSITY_CM3)));
        sb.append("## Files\n\n");
        sb.append("- `Lnnnn-Snn.tif` (lot and boat slot) and its sidecar `Lnnnn-Snn.json`: one wafer; the sidecar's\n"
                + "  `conditions.extra` holds `lot`, `measured_at` (ISO-8601 UTC), `furnace_tube` and `boat_slot` (a"
                + " number).\n");
        sb.append("- `truth.json`: `drift` (`furnace_tube`, `steady_tube`, `change_at`, `increase_per_day`),"
                + " `bad_slot` (`boat_slot`,\n  the spot's centre, radius and density) and per wafer its lot,"
                + " tube, slot, furnace and measuring times,\n  `drift_factor`, `centre_fe_i_cm3` (planted Fe_i at"
                + " the centre, cm⁻³) and the spot with its probe pixel.\n");
        sb.append("- `" + HistoryScenario.RULES + "`: rules that judge the wafers: Fe_i median at most 6e10 cm⁻³"
                + " and no interior\n  region above 3e11 cm⁻³ larger than 25 mm², and follow that median per furnace tube"
                + " (its `trend` block:\n  baseline the first week, alarm on a point beyond 3 sigma); for example\n\n");
        sb.append("      ./trapmap inspect DIR --rules DIR/" + HistoryScenario.RULES + " --out report\n");
        sb.append("\n  and with `--store results.db` the summary ends with the trend of that median per tube.\n");
        return sb.toString();
    }
}
