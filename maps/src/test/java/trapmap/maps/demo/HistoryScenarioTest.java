package trapmap.maps.demo;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.FlaggedRegions;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.WaferInspection;
import trapmap.maps.batch.WaferResult;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.Sidecar;
import trapmap.maps.model.Quantity;
import trapmap.maps.model.WaferMap;
import trapmap.maps.process.ConversionSettings;
import trapmap.maps.process.MapConversion;
import trapmap.maps.trend.Baseline;
import trapmap.maps.trend.RunRule;
import trapmap.maps.trend.TrendSettings;
import trapmap.physics.defect.DefectLibrary;

class HistoryScenarioTest {
    private static final ObjectMapper JSON = new ObjectMapper();

    @TempDir
    static Path dir;
    static List<Path> written;
    static HistoryTruth truth;
    /** Every wafer judged by the history's own rules file, by file name. */
    static Map<String, WaferResult> results = new HashMap<>();

    @BeforeAll
    static void generateAndInspect() throws Exception {
        written = HistoryScenario.write(dir);
        truth = HistoryScenario.readTruth(dir.resolve(DemoScenario.TRUTH));
        WaferInspection inspection = new WaferInspection(Rules.read(dir.resolve(HistoryScenario.RULES)));
        for (HistoryTruth.Wafer w : truth.wafers()) {
            results.put(w.file(), inspection.inspect(dir.resolve(w.file())));
        }
    }

    @Test
    void theRulesFollowTheMedianPerTubeAgainstAWeekBeforeTheChange() throws Exception {
        TrendSettings t = Rules.read(dir.resolve(HistoryScenario.RULES)).trend().orElseThrow();
        assertThat(t.figure()).isEqualTo("trap_density_p50_cm3");
        assertThat(t.by()).isEqualTo("furnace_tube");
        assertThat(t.baseline()).isEqualTo(Baseline.before(Instant.parse("2026-10-12T00:00:00Z")));
        assertThat(t.baseline().until()).isBefore(HistoryScenario.CHANGE_AT).isAfter(HistoryScenario.START);
        assertThat(t.alarmRules()).containsExactly(RunRule.BEYOND_3_SIGMA);
        // every wafer measured in the first week is in the baseline: each tube has lots of its own there
        assertThat(truth.wafers().stream().filter(w -> w.measuredAt().isBefore(t.baseline().until()))
                .map(HistoryTruth.Wafer::furnaceTube).distinct()).containsExactlyInAnyOrder("T1", "T2");
    }

    @Test
    void twoRunsAreByteIdenticalAndTheHistoryStaysUnderFiveMegabytes(@TempDir Path other) throws IOException {
        List<Path> second = HistoryScenario.write(other);
        assertThat(second).hasSameSizeAs(written);
        long total = 0;
        for (Path p : written) {
            Path rel = dir.relativize(p);
            assertThat(Files.readAllBytes(other.resolve(rel))).as(rel.toString()).isEqualTo(Files.readAllBytes(p));
            total += Files.size(p);
        }
        assertThat(total).isLessThan(5_000_000L);
        int wafers = HistoryScenario.DAYS * HistoryScenario.LOTS_PER_DAY * HistoryScenario.SLOTS.size();
        assertThat(truth.wafers()).hasSize(wafers);
        assertThat(written).hasSize(2 * wafers + 3);
        try (Stream<Path> s = Files.list(dir)) {
            assertThat(s.count()).isEqualTo(written.size());
        }
    }

    @Test
    void everySidecarCarriesTheAgreedFactsAsTheTruthRecordsThem() throws IOException {
        Instant previous = Instant.MIN;
        for (HistoryTruth.Wafer w : truth.wafers()) {
            String stem = w.file().substring(0, w.file().lastIndexOf('.'));
            JsonNode extra = JSON.readTree(Files.readString(dir.resolve(stem + ".json"))).get("conditions")
                    .get("extra");
            assertThat(extra.get("lot").isTextual()).isTrue();
            assertThat(extra.get("lot").asText()).isEqualTo(w.lot()).matches("L\\d{4}");
            assertThat(extra.get("measured_at").asText()).endsWith("Z");
            assertThat(Instant.parse(extra.get("measured_at").asText())).isEqualTo(w.measuredAt());
            assertThat(extra.get("furnace_tube").asText()).isEqualTo(w.furnaceTube()).isIn("T1", "T2");
            assertThat(extra.get("boat_slot").isInt()).as("boat_slot is a number").isTrue();
            assertThat(extra.get("boat_slot").asInt()).isEqualTo(w.boatSlot());

            Sidecar side = Sidecar.read(dir.resolve(stem + ".json"));
            assertThat(side.warnings()).isEmpty();
            assertThat(side.waferId()).isEqualTo(w.waferId()).startsWith(w.lot() + "-S");
            assertThat(side.conditions().extra()).containsEntry("lot", w.lot())
                    .containsEntry("boat_slot", Integer.toString(w.boatSlot()))
                    .containsEntry("furnace_tube", w.furnaceTube())
                    .containsEntry("measured_at", w.measuredAt().toString());
            WaferMap map = MapFiles.readSingle(dir.resolve(w.file()));
            assertThat(map.conditions().extra()).isEqualTo(side.conditions().extra());
            assertThat(map.grid().width()).isEqualTo(64);
            assertThat(map.provenance().source()).contains("--history").contains(Long.toString(HistoryScenario.SEED));

            assertThat(w.measuredAt()).isAfter(w.processedAt()).isAfterOrEqualTo(previous);
            previous = w.measuredAt();
        }
        assertThat(truth.wafers().get(0).measuredAt()).isAfter(truth.start());
        assertThat(truth.wafers().get(truth.wafers().size() - 1).measuredAt())
                .isBefore(truth.start().plus(Duration.ofDays(truth.days() + 1)));
    }

    @Test
    void truthRecordsTheDriftLawPerWafer() {
        assertThat(truth.driftTube()).isEqualTo("T2");
        assertThat(truth.steadyTube()).isEqualTo("T1");
        assertThat(truth.changeAt()).isEqualTo(Instant.parse("2026-10-15T00:00:00Z"));
        int drifted = 0;
        for (HistoryTruth.Wafer w : truth.wafers()) {
            double expected = 1;
            if (w.furnaceTube().equals(truth.driftTube()) && w.processedAt().isAfter(truth.changeAt())) {
                // days after the change, by hand: seconds / 86 400
                expected = 1 + truth.driftPerDay() * (w.processedAt().getEpochSecond()
                        - truth.changeAt().getEpochSecond()) / 86_400.0;
                drifted++;
            }
            assertThat(w.driftFactor()).as(w.file()).isCloseTo(expected, within(1e-8));
        }
        // about half the lots of the eleven days after the change
        assertThat(drifted).isBetween(45, 55);
    }

    /**
     * ln(centre iron / (baseline · drift)) = LOT_SIGMA·z_lot + WAFER_SIGMA·z_wafer with standard normal z: the spread
     * within the lots estimates WAFER_SIGMA², the spread of the lot means LOT_SIGMA² + WAFER_SIGMA²/3; each scaled
     * sum of squares must lie inside the central 99.9 % of its chi-squared distribution (Apache Commons Math), and
     * the mean of the lot means within 3.3 standard errors of 0.
     */
    @Test
    void plantedIronSpreadsByTheLotAndWaferSigmas() {
        Map<String, List<Double>> byLot = new java.util.TreeMap<>();
        for (HistoryTruth.Wafer w : truth.wafers()) {
            byLot.computeIfAbsent(w.lot(), k -> new ArrayList<>())
                    .add(Math.log(w.centreFeCm3() / (truth.baselineFeCm3() * w.driftFactor())));
        }
        int perLot = HistoryScenario.SLOTS.size();
        double withinSquares = 0;
        int withinDf = 0;
        double[] lotMeans = new double[byLot.size()];
        int k = 0;
        for (List<Double> v : byLot.values()) {
            assertThat(v).hasSize(perLot);
            double[] x = v.stream().mapToDouble(Double::doubleValue).toArray();
            lotMeans[k++] = new org.apache.commons.math3.stat.descriptive.moment.Mean().evaluate(x);
            withinSquares += new org.apache.commons.math3.stat.descriptive.moment.Variance().evaluate(x)
                    * (x.length - 1);
            withinDf += x.length - 1;
        }
        assertThat(byLot).hasSize(HistoryScenario.DAYS * HistoryScenario.LOTS_PER_DAY);
        double wafer2 = HistoryScenario.WAFER_SIGMA * HistoryScenario.WAFER_SIGMA;
        double lotMean2 = HistoryScenario.LOT_SIGMA * HistoryScenario.LOT_SIGMA + wafer2 / perLot;
        assertCentralChiSquared("within lots", withinSquares / wafer2, withinDf);
        double betweenSquares = new org.apache.commons.math3.stat.descriptive.moment.Variance().evaluate(lotMeans)
                * (lotMeans.length - 1);
        assertCentralChiSquared("between lots", betweenSquares / lotMean2, lotMeans.length - 1);
        assertThat(new org.apache.commons.math3.stat.descriptive.moment.Mean().evaluate(lotMeans))
                .isCloseTo(0, within(3.3 * Math.sqrt(lotMean2 / lotMeans.length)));
    }

    private static void assertCentralChiSquared(String what, double scaled, int df) {
        var chi2 = new org.apache.commons.math3.distribution.ChiSquaredDistribution(df);
        assertThat(scaled).as("%s: scaled sum of squares, %d degrees of freedom", what, df)
                .isBetween(chi2.inverseCumulativeProbability(0.0005), chi2.inverseCumulativeProbability(0.9995));
    }

    @Test
    void convertedIronOfEachWaferMatchesItsPlantedLevel() {
        for (HistoryTruth.Wafer w : truth.wafers()) {
            WaferResult r = results.get(w.file());
            assertThat(r.error()).as(w.file()).isNullOrEmpty();
            double median = r.figures().get("trap_density_p50_cm3");
            // The background rises by RADIAL_RISE·r²/R²: the median pixel sits near r² = R²/2 (uniform disc),
            // so the median is about 1.07 × the centre level; the spot of slot 7 moves it by well under 1 %.
            assertThat(median / w.centreFeCm3()).as(w.file()).isBetween(1.0, 1.15);
        }
    }

    @Test
    void convertedIronDriftsInTheDriftingTubeAfterTheChangeDateOnly() {
        double steadyBefore = meanMedian(truth.steadyTube(), false, 0);
        double steadyAfter = meanMedian(truth.steadyTube(), true, 0);
        double driftBefore = meanMedian(truth.driftTube(), false, 0);
        double driftAfter = meanMedian(truth.driftTube(), true, 0);
        double driftLastDays = meanMedian(truth.driftTube(), true, 8);
        assertThat(steadyAfter / steadyBefore).isBetween(0.9, 1.1);
        assertThat(driftBefore / steadyBefore).isBetween(0.9, 1.1);
        // mean drift factor over the eleven days after the change ≈ 1 + 0.15 · 5.5 ≈ 1.8
        assertThat(driftAfter / driftBefore).isBetween(1.5, 2.1);
        // the last three days: ≈ 1 + 0.15 · 9.5 ≈ 2.4
        assertThat(driftLastDays / driftBefore).isBetween(2.1, 2.8);

        // Judged by the history's rules: the steady tube's wafers outside the bad slot all pass, and the drifting
        // tube's late wafers fail on the median iron.
        for (HistoryTruth.Wafer w : truth.wafers()) {
            WaferResult r = results.get(w.file());
            if (w.boatSlot() != truth.badSlot() && w.furnaceTube().equals(truth.steadyTube())) {
                assertThat(r.status()).as(w.file()).isEqualTo(WaferResult.Status.PASS);
            }
            if (w.furnaceTube().equals(truth.driftTube()) && w.driftFactor() > 2.2) {
                assertThat(r.status()).as(w.file()).isEqualTo(WaferResult.Status.FAIL);
                assertThat(String.join(";", r.failed())).contains("trap_density_p50_cm3");
            }
        }
    }

    @Test
    void theBadSlotCarriesItsSpotAtTheSamePlaceAndNoOtherSlotDoes() throws IOException {
        int spots = 0;
        for (HistoryTruth.Wafer w : truth.wafers()) {
            WaferResult r = results.get(w.file());
            List<FlaggedRegions.FlaggedRegion> near = new ArrayList<>();
            for (FlaggedRegions.FlaggedRegion fr : r.regions()) {
                if (Math.hypot(fr.region().centroidXMm() - truth.spotXMm(),
                        fr.region().centroidYMm() - truth.spotYMm()) < 10) {
                    near.add(fr);
                }
            }
            if (w.boatSlot() != truth.badSlot()) {
                assertThat(w.defects()).isEmpty();
                assertThat(near).as(w.file()).isEmpty();
                continue;
            }
            spots++;
            assertThat(w.defects()).hasSize(1);
            PlantedDefect d = w.defects().get(0);
            assertThat(d.centreXMm()).isEqualTo(truth.spotXMm());
            assertThat(d.centreYMm()).isEqualTo(truth.spotYMm());
            assertThat(d.densityPerCm3()).isCloseTo(truth.spotDensityCm3(), within(0.05 * truth.spotDensityCm3()));
            assertThat(near).as(w.file()).hasSize(1);
            assertThat(Math.hypot(near.get(0).region().centroidXMm() - d.centreXMm(),
                    near.get(0).region().centroidYMm() - d.centreYMm())).as(w.file())
                    .isLessThan(PlantedDefect.POSITION_TOLERANCE_MM);
            assertThat(r.status()).isEqualTo(WaferResult.Status.FAIL);
            assertThat(String.join(";", r.failed())).contains("largest_interior_region_mm2");
        }
        assertThat(spots).isEqualTo(HistoryScenario.DAYS * HistoryScenario.LOTS_PER_DAY);

        // the converted density at the spot's probe pixel, one wafer of each tube
        for (String tube : List.of(truth.steadyTube(), truth.driftTube())) {
            HistoryTruth.Wafer w = truth.wafers().stream().filter(x -> x.boatSlot() == truth.badSlot()
                    && x.furnaceTube().equals(tube)).findFirst().orElseThrow();
            WaferMap density = MapConversion.convert(MapFiles.readSingle(dir.resolve(w.file())),
                    DefectLibrary.byId(truth.defect()), ConversionSettings.DEFAULTS, 1).get(Quantity.TRAP_DENSITY);
            PlantedDefect d = w.defects().get(0);
            int x = (int) Math.round(density.grid().xPx(d.probeXMm()));
            int y = (int) Math.round(density.grid().yPx(d.probeYMm()));
            assertThat((double) density.raster().get(x, y)).as(w.file()).isBetween(
                    d.densityPerCm3() / PlantedDefect.DENSITY_FACTOR, d.densityPerCm3() * PlantedDefect.DENSITY_FACTOR);
        }
    }

    /** Mean converted median iron of a tube's wafers before or after the change (after: from {@code fromDay}). */
    private static double meanMedian(String tube, boolean after, int fromDay) {
        Instant from = truth.changeAt().plus(Duration.ofDays(fromDay));
        double sum = 0;
        int n = 0;
        for (HistoryTruth.Wafer w : truth.wafers()) {
            boolean isAfter = w.processedAt().isAfter(from);
            if (!w.furnaceTube().equals(tube) || after != isAfter
                    || (!after && w.processedAt().isAfter(truth.changeAt()))) {
                continue;
            }
            sum += results.get(w.file()).figures().get("trap_density_p50_cm3");
            n++;
        }
        assertThat(n).as(tube + (after ? " after" : " before")).isGreaterThan(5);
        return sum / n;
    }
}
