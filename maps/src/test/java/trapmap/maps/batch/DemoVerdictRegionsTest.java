package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.demo.DemoScenario;
import trapmap.maps.demo.PlantedDefect;
import trapmap.maps.region.Region;

/**
 * The example rules over the committed demonstration set (demo-data/): each wafer format gets its own family and
 * recurrence map, the worst region is the one behind the failing rule, and ring-shaped regions are marked. The planted
 * positions come from {@code truth.json}.
 */
class DemoVerdictRegionsTest {
    private static final Path DEMO = Path.of("..", "demo-data");

    @TempDir
    static Path out;
    private static Map<String, CSVRecord> results;
    private static List<CSVRecord> regions;
    private static Map<String, List<PlantedDefect>> truth;
    private static Map<String, com.fasterxml.jackson.databind.JsonNode> json;

    @BeforeAll
    static void inspectTheDemoSet() throws Exception {
        Rules rules = Rules.read(DEMO.resolve("rules-example.json"));
        truth = DemoScenario.readTruth(DEMO.resolve(DemoScenario.TRUTH));
        List<Path> files;
        try (Stream<Path> s = Files.list(DEMO)) {
            files = s.filter(p -> p.toString().endsWith(".tif")).sorted().toList();
        }
        new BatchInspection(rules).run(files, out, new BatchInspection.Options(2, false, false, null));
        results = new LinkedHashMap<>();
        for (CSVRecord r : read(out.resolve(BatchInspection.CSV_NAME))) {
            results.put(Path.of(r.get("file")).getFileName().toString(), r);
        }
        regions = read(out.resolve(BatchInspection.REGIONS_NAME));
        json = new LinkedHashMap<>();
        for (com.fasterxml.jackson.databind.JsonNode w : new com.fasterxml.jackson.databind.ObjectMapper()
                .readTree(out.resolve(BatchInspection.JSON_NAME).toFile()).get("wafers")) {
            json.putIfAbsent(w.get("wafer_id").asText(), w);
        }
    }

    private static List<CSVRecord> read(Path file) throws Exception {
        try (Reader r = Files.newBufferedReader(file, StandardCharsets.UTF_8);
             CSVParser p = CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).build().parse(r)) {
            return p.getRecords();
        }
    }

    @Test
    void verdictsAndGradesStayAsTheExampleRulesWereTuned() {
        assertThat(results).hasSize(17);
        long pass = results.values().stream().filter(r -> r.get("status").equals("pass")).count();
        assertThat(pass).isEqualTo(4);
        assertThat(results.get("LOT-A01-W01.tif").get("grade")).isEqualTo("A");
        assertThat(results.get("LOT-A01-W08.tif").get("grade")).isEqualTo("A");
        assertThat(results.get("LOT-A01-W03.tif").get("grade")).isEqualTo("B");
        assertThat(results.get("LOT-A01-W06.tif").get("grade")).isEqualTo("B");
        // the monitor is still judged as one: its family is now round-200, which the rules' list names
        CSVRecord mon = results.get("MON-200-W01.tif");
        assertThat(mon.get("profile")).isEqualTo("ic-monitor");
        assertThat(mon.get("failed_rules")).isEqualTo("largest_region_mm2");
        assertThat(mon.get("worst_region_rule")).isEqualTo("largest_region_mm2");
    }

    @Test
    void everyFormatHasItsOwnRecurrenceMapWithItsWaferCount() throws Exception {
        Map<String, String> counts = new LinkedHashMap<>();
        for (CSVRecord r : read(out.resolve(BatchInspection.RECURRENCE_NAME))) {
            counts.put(r.get("family"), r.get("wafers"));
            assertThat(out.resolve(r.get("file"))).exists();
        }
        // 8 + 2 + 1 M2 wafers (LOT-A01, the FeB pair, the PL wafer); the gettering pair is cut square
        assertThat(counts).containsExactlyInAnyOrderEntriesOf(Map.of("m2", "11", "square-156.75", "2", "m10", "2",
                "g12", "1", "round-200", "1"));
        assertThat(out.resolve("recurrence-fitted.tif")).doesNotExist();
        assertThat(out.resolve("recurrence-m10.tif")).exists();
        assertThat(out.resolve("recurrence-g12.png")).exists();
    }

    @Test
    void theWorstRegionOfW02IsTheInteriorMarkThatFailedIt() {
        CSVRecord w02 = results.get("LOT-A01-W02.tif");
        assertThat(w02.get("failed_rules")).isEqualTo("largest_interior_region_mm2");
        assertThat(w02.get("worst_region_rule")).isEqualTo("largest_interior_region_mm2");
        double area = Double.parseDouble(w02.get("worst_region_area_mm2"));
        assertThat(area).isEqualTo(Double.parseDouble(w02.get("largest_interior_region_mm2")));
        assertThat(area).isLessThan(Double.parseDouble(w02.get("largest_region_mm2"))); // not the edge zone
        PlantedDefect mark = truth.get("LOT-A01-W02.tif").stream().filter(d -> d.kind().equals("handling-mark"))
                .findFirst().orElseThrow();
        double x = Double.parseDouble(w02.get("worst_region_x_mm"));
        double y = Double.parseDouble(w02.get("worst_region_y_mm"));
        assertThat(Math.hypot(x - mark.centreXMm(), y - mark.centreYMm()))
                .isLessThan(PlantedDefect.POSITION_TOLERANCE_MM);
        assertThat(w02.get("worst_region_centroid_inside")).isEqualTo("true");
        assertThat(json.get("LOT-A01-W02").get("worst_region_centroid_inside").isBoolean()).isTrue();
        assertThat(json.get("LOT-A01-W02").get("worst_region_rule").asText())
                .isEqualTo("largest_interior_region_mm2");
        assertThat(json.get("LOT-A01-W02").get("worst_region_min_x_mm").isNumber()).isTrue();
        double minX = Double.parseDouble(w02.get("worst_region_min_x_mm"));
        double maxX = Double.parseDouble(w02.get("worst_region_max_x_mm"));
        double minY = Double.parseDouble(w02.get("worst_region_min_y_mm"));
        double maxY = Double.parseDouble(w02.get("worst_region_max_y_mm"));
        assertThat(mark.centreXMm()).isBetween(minX, maxX);
        assertThat(mark.centreYMm()).isBetween(minY, maxY);
        assertThat(maxX - minX).isCloseTo(2 * mark.radiusMm(), within(2.5));
        assertThat(Double.parseDouble(w02.get("worst_region_peak_x_mm"))).isBetween(minX, maxX);
        assertThat(Double.parseDouble(w02.get("worst_region_peak_y_mm"))).isBetween(minY, maxY);
    }

    @Test
    void aPassingWafersWorstRegionIsItsLargestWithoutARule() {
        CSVRecord w01 = results.get("LOT-A01-W01.tif");
        assertThat(w01.get("status")).isEqualTo("pass");
        assertThat(w01.get("worst_region_rule")).isEmpty();
        assertThat(Double.parseDouble(w01.get("worst_region_area_mm2")))
                .isEqualTo(Double.parseDouble(w01.get("largest_region_mm2")));
    }

    @Test
    void ringRegionsAreMarkedAndPlacedOnTheRing() {
        List<String> rings = new ArrayList<>();
        for (Map.Entry<String, List<PlantedDefect>> e : truth.entrySet()) {
            for (PlantedDefect d : e.getValue()) {
                if (!d.kind().equals("ring")) {
                    continue;
                }
                rings.add(e.getKey());
                CSVRecord ring = regions.stream().filter(r -> r.get("file").endsWith(e.getKey()))
                        .max((a, b) -> Double.compare(Double.parseDouble(a.get("area_mm2")),
                                Double.parseDouble(b.get("area_mm2")))).orElseThrow();
                assertThat(ring.get("centroid_inside")).as(e.getKey()).isEqualTo("false");
                double cx = Double.parseDouble(ring.get("centroid_x_mm"));
                double cy = Double.parseDouble(ring.get("centroid_y_mm"));
                assertThat(Math.hypot(cx - d.centreXMm(), cy - d.centreYMm())).as(e.getKey())
                        .isLessThan(PlantedDefect.POSITION_TOLERANCE_MM);
                double r = Math.hypot(Double.parseDouble(ring.get("x_mm")) - d.centreXMm(),
                        Double.parseDouble(ring.get("y_mm")) - d.centreYMm());
                assertThat(r).as(e.getKey()).isBetween(d.radiusMm() - 3 * d.widthMm(), d.radiusMm() + 3 * d.widthMm());
                double extent = Double.parseDouble(ring.get("max_x_mm")) - Double.parseDouble(ring.get("min_x_mm"));
                assertThat(extent).as(e.getKey()).isGreaterThan(2 * d.radiusMm() - 3 * d.widthMm());
                CSVRecord row = results.get(e.getKey());
                assertThat(row.get("worst_region_centroid_inside")).as(e.getKey()).isEqualTo("false");
                assertThat(row.get("worst_region_x_mm")).isEqualTo(ring.get("x_mm"));
            }
        }
        assertThat(rings).containsExactlyInAnyOrder("LOT-N01-W01.tif", "LOT-N01-W02.tif", "LOT-N01-W03.tif");
    }

    @Test
    void theRuleBehindTheWorstRegionFollowsTheFailedLimits() {
        Region small = region(1, 10, 50);
        Region big = region(2, 900, 0);
        FlaggedRegions.FlaggedRegion interior = new FlaggedRegions.FlaggedRegion(small, Double.NaN, Double.NaN);
        FlaggedRegions.FlaggedRegion largest = new FlaggedRegions.FlaggedRegion(big, Double.NaN, Double.NaN);
        Figure li = Figure.parse("largest_interior_region_mm2");
        Figure lr = Figure.parse("largest_region_mm2");
        Figure p95 = Figure.parse("trap_density_p95_cm3");
        Figure ff = Figure.parse("flagged_area_fraction");
        assertThat(WaferResult.Worst.behind(List.of(p95, li), largest, interior))
                .isEqualTo(new WaferResult.Worst(interior, "largest_interior_region_mm2"));
        assertThat(WaferResult.Worst.behind(List.of(lr, li), largest, interior))
                .isEqualTo(new WaferResult.Worst(largest, "largest_region_mm2"));
        assertThat(WaferResult.Worst.behind(List.of(ff), largest, interior))
                .isEqualTo(new WaferResult.Worst(largest, "flagged_area_fraction"));
        assertThat(WaferResult.Worst.behind(List.of(p95), largest, interior))
                .isEqualTo(new WaferResult.Worst(largest, ""));
        assertThat(WaferResult.Worst.behind(List.of(), largest, interior)).isEqualTo(new WaferResult.Worst(largest,
                ""));
        // failed on the interior figure without an interior region (no outline): the next rule, else the largest
        assertThat(WaferResult.Worst.behind(List.of(li), largest, null)).isEqualTo(new WaferResult.Worst(largest, ""));
        assertThat(WaferResult.Worst.behind(List.of(li), null, null)).isNull();
    }

    private static Region region(int id, double area, double edge) {
        return new Region(id, (int) area, area, 0, 0, new Region.BoundsMm(-1, -1, 1, 1), 1, 0, 0, 1, edge, true, 0,
                0);
    }
}
