package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.demo.HistoryScenario;

/**
 * {@code trend --by furnace_tube} on the invented production history ({@link HistoryScenario}: tube T2 drifts up
 * 15 %/day from {@link HistoryScenario#CHANGE_AT}, T1 is steady), inspected into a SQLite store: each tube has its own
 * individuals chart and baseline, the drift shows on T2's chart within a few T2 lots of the change and T1's chart
 * shows no point beyond 3σ after its baseline. Measured on this history: the first T2 lot processed after the
 * change with a point beyond 3σ is its 3rd (drift factor 1.29); T1 has 0 points beyond 3σ after the baseline.
 */
class TrendByTubeHistoryTest {
    static final String FIGURE = "trap_density_p50_cm3";
    /** The first T2 lot after the change with a point beyond 3σ must be at most this one (measured: the 3rd). */
    static final int MAX_T2_LOTS_TO_DETECT = 4;

    @TempDir
    Path dir;

    @Test
    void eachTubeHasItsOwnChartAndOnlyTheDriftingTubeSignals() throws Exception {
        Path hist = dir.resolve("history");
        HistoryScenario.write(hist);
        Path db = dir.resolve("results.sqlite");
        Cli.Run inspect = Cli.run("inspect", hist.toString(), "--rules",
                hist.resolve(HistoryScenario.RULES).toString(), "--out", dir.resolve("results").toString(),
                "--store", db.toString(), "--no-pdf", "--no-thumbnails");
        assertThat(inspect.code()).as(inspect.err()).isIn(Exit.OK, 1);
        Path csv = dir.resolve("trend.csv");
        Cli.Run trend = Cli.run("trend", "--store", db.toString(), "--figure", FIGURE, "--by", "furnace_tube",
                "--baseline-until", "2026-10-12", "-o", csv.toString());
        assertThat(trend.code()).as(trend.err()).isEqualTo(Exit.TREND_SIGNALS);
        List<CSVRecord> rows = read(csv);

        // --by lot|day|week keep the X-bar/R chart; a sidecar fact gives per-tube individuals charts instead.
        assertThat(rows).noneMatch(r -> r.get("chart").startsWith("subgroup"));
        Map<Instant, HistoryScenario.Wafer> wafers = new HashMap<>();
        for (HistoryScenario.Wafer w : HistoryScenario.build()) {
            wafers.put(w.measuredAt(), w);
        }
        for (String tube : List.of(HistoryScenario.STEADY_TUBE, HistoryScenario.DRIFT_TUBE)) {
            List<CSVRecord> x = chart(rows, tube);
            assertThat(x).isNotEmpty().allSatisfy(r -> assertThat(wafers.get(Instant.parse(r.get("time")))
                    .furnaceTube()).isEqualTo(tube));
            assertThat(x).allMatch(r -> r.get("centre").equals(x.get(0).get("centre")));
        }
        assertThat(chart(rows, "T1").get(0).get("centre")).isNotEqualTo(chart(rows, "T2").get(0).get("centre"));

        List<CSVRecord> t1 = chart(rows, HistoryScenario.STEADY_TUBE);
        long t1Beyond = t1.stream().filter(r -> r.get("baseline").equals("false"))
                .filter(r -> r.get("signals").contains("beyond 3 sigma")).count();
        assertThat(t1Beyond).as("T1 points beyond 3 sigma after the baseline").isZero();

        List<String> t2LotsAfter = new ArrayList<>(new LinkedHashSet<>(wafers.values().stream()
                .filter(w -> w.furnaceTube().equals(HistoryScenario.DRIFT_TUBE))
                .filter(w -> w.processedAt().isAfter(HistoryScenario.CHANGE_AT))
                .sorted(java.util.Comparator.comparing(HistoryScenario.Wafer::processedAt))
                .map(HistoryScenario.Wafer::lot).toList()));
        String firstBeyond = chart(rows, HistoryScenario.DRIFT_TUBE).stream()
                .filter(r -> r.get("signals").contains("beyond 3 sigma"))
                .map(r -> wafers.get(Instant.parse(r.get("time"))))
                .filter(w -> w.processedAt().isAfter(HistoryScenario.CHANGE_AT))
                .map(HistoryScenario.Wafer::lot).findFirst().orElseThrow();
        int lotsToDetect = t2LotsAfter.indexOf(firstBeyond) + 1;
        assertThat(lotsToDetect).as("T2 lots after the change until a point beyond 3 sigma")
                .isBetween(1, MAX_T2_LOTS_TO_DETECT);
    }

    /** The per-group individuals chart of {@code tube}. */
    private static List<CSVRecord> chart(List<CSVRecord> rows, String tube) {
        return rows.stream().filter(r -> r.get("chart").equals("group_individuals"))
                .filter(r -> r.get("group").equals(tube)).toList();
    }

    private static List<CSVRecord> read(Path csv) throws Exception {
        try (Reader r = Files.newBufferedReader(csv)) {
            return new ArrayList<>(CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).get().parse(r)
                    .getRecords());
        }
    }
}
