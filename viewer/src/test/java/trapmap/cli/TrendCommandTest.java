package trapmap.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;
import org.apache.pdfbox.Loader;
import org.apache.pdfbox.pdmodel.PDDocument;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.WaferResult;
import trapmap.store.ResultsStore;
import trapmap.store.RunInfo;
import trapmap.store.WaferRecord;

/**
 * {@code trapmap trend} on a SQLite store written here: 30 wafers in 6 lots of 5, one an hour from
 * 2026-11-02T00:00Z, in two tubes. The first 20 alternate 1.0e11 / 1.2e11 cm⁻³ (individuals: centre 1.1e11,
 * MR̄ = 2e10, σ̂ = 2e10/1.128 = 1.773e10, UCL = 1.632e11; hand-computed, Montgomery §6.4), the last 10 (lots L5, L6)
 * lie at 2.0e11, beyond the UCL; one more wafer has no measured time and one no value.
 */
class TrendCommandTest {
    static final String FIGURE = "trap_density_p50_cm3";
    static final Instant T0 = Instant.parse("2026-11-02T00:00:00Z");

    @TempDir
    static Path dir;
    static Path store;

    @BeforeAll
    static void writeStore() {
        store = dir.resolve("results.sqlite");
        try (ResultsStore s = ResultsStore.open(store.toString())) {
            String run = s.startRun(new RunInfo(T0, "rules.json", "r".repeat(64), "{}", "s".repeat(64), "test"));
            for (int i = 0; i < 30; i++) {
                double v = i < 20 ? (i % 2 == 0 ? 1.0e11 : 1.2e11) : 2.0e11;
                boolean pass = v < 1.5e11;
                String lot = "L" + (i / 5 + 1);
                write(s, run, "W" + i, lot, T0.plus(Duration.ofHours(i)), v, pass, i % 2 == 0 ? "T1" : "T2");
            }
            write(s, run, "W-untimed", "L6", null, 1.1e11, true, "T1");
            write(s, run, "W-novalue", "L6", T0.plus(Duration.ofHours(40)), Double.NaN, false, "T1");
        }
    }

    private static void write(ResultsStore s, String run, String id, String lot, Instant at, double v, boolean pass,
            String tube) {
        List<String> failed = pass ? List.of() : Double.isNaN(v) ? List.of("invalid_area_fraction")
                : List.of(FIGURE);
        Map<String, Double> figures = Double.isNaN(v) ? Map.of() : Map.of(FIGURE, v);
        WaferResult r = new WaferResult(dir.resolve(id + ".tif").toString(), id,
                pass ? WaferResult.Status.PASS : WaferResult.Status.FAIL, pass ? "A" : "C", "p-type", "fe-i",
                figures, failed, List.of(), List.of(), null, null);
        Map<String, String> facts = at == null ? Map.of("lot", lot, "furnace_tube", tube)
                : Map.of("lot", lot, "furnace_tube", tube, "measured_at", at.toString());
        s.write(run, new WaferRecord(r, WaferRecord.sha256(id), facts, lot, at, List.of()));
    }

    @Test
    void csvTablesHoldTheChartsTheSignalsTheYieldAndThePareto() throws Exception {
        Path csv = dir.resolve("trend.csv");
        Cli.Run run = Cli.run("trend", "--store", store.toString(), "--figure", FIGURE, "-o", csv.toString());
        assertThat(run.code()).as(run.err()).isEqualTo(Exit.TREND_SIGNALS);
        List<CSVRecord> rows = read(csv);
        List<CSVRecord> x = rows.stream().filter(r -> r.get("chart").equals("individuals")).toList();
        assertThat(x).hasSize(30); // the untimed and the value-less wafer are left out
        assertThat(Double.parseDouble(x.get(0).get("centre"))).isEqualTo(1.1e11, org.assertj.core.data.Offset
                .offset(1e3));
        assertThat(Double.parseDouble(x.get(0).get("upper_limit"))).isCloseTo(1.632e11,
                org.assertj.core.data.Percentage.withPercentage(0.1));
        assertThat(x.get(19).get("baseline")).isEqualTo("true");
        assertThat(x.get(20).get("baseline")).isEqualTo("false");
        assertThat(x.get(20).get("signals")).contains("1 point beyond 3 sigma");
        assertThat(x.subList(0, 20)).allMatch(r -> r.get("signals").isEmpty());
        // by lot: 6 subgroups of 5 on the X-bar and R charts; L1-L4 form the baseline, L5 and L6 lie beyond 3σ
        List<CSVRecord> xbar = rows.stream().filter(r -> r.get("chart").equals("subgroup_mean")).toList();
        assertThat(xbar).extracting(r -> r.get("baseline")).containsExactly("true", "true", "true", "true", "false",
                "false");
        assertThat(xbar).extracting(r -> r.get("signals").contains("1 point beyond 3 sigma"))
                .containsExactly(false, false, false, false, true, true);
        List<CSVRecord> yields = read(dir.resolve("trend-yield.csv"));
        assertThat(yields).extracting(r -> r.get("group")).containsExactly("L1", "L2", "L3", "L4", "L5", "L6");
        assertThat(yields.get(5).get("wafers")).isEqualTo("7");
        assertThat(yields.get(5).get("passed")).isEqualTo("1");
        List<CSVRecord> pareto = read(dir.resolve("trend-pareto.csv"));
        assertThat(pareto).extracting(r -> r.get("rule")).containsExactly(FIGURE, "invalid_area_fraction");
        assertThat(pareto).extracting(r -> r.get("failures")).containsExactly("10", "1");
        assertThat(run.out()).contains("without a measured time").contains("signal(s) after the baseline");
    }

    @Test
    void aLotOrAFactHoldingACommaIsGivenInDoubleQuotesAsInTheHistoryWindow() {
        Path commas = dir.resolve("commas.sqlite");
        try (ResultsStore s = ResultsStore.open(commas.toString())) {
            String run = s.startRun(new RunInfo(T0, "rules.json", "r".repeat(64), "{}", "s".repeat(64), "test"));
            for (int i = 0; i < 12; i++) {
                String lot = i < 4 ? "A,1" : i < 8 ? "A" : "1";
                write(s, run, "C" + i, lot, T0.plus(Duration.ofHours(i)), i % 2 == 0 ? 1.0e11 : 1.2e11, true,
                        i % 3 == 0 ? "T1,new" : "T2");
            }
        }
        Path csv = dir.resolve("commas.csv");
        // the lot A,1 quoted: its four wafers, none of lots A and 1
        JsonNode quoted = trendJson(commas, csv, "--lot", "\"A,1\"");
        assertThat(quoted.get("wafers").asInt()).isEqualTo(4);
        assertThat(quoted.get("source").asText()).contains("lot A,1");
        // unquoted, the commas separate lots, as the window's field reads them: lots A and 1
        assertThat(trendJson(commas, csv, "--lot", "A,1").get("wafers").asInt()).isEqualTo(8);
        // a fact value holding a comma: C0, C3, C6, C9
        assertThat(trendJson(commas, csv, "--where", "\"furnace_tube=T1,new\"").get("wafers").asInt()).isEqualTo(4);
        Cli.Run bad = Cli.run("trend", "--store", commas.toString(), "--figure", FIGURE, "--lot", "\"A,1", "-o",
                csv.toString());
        assertThat(bad.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(bad.err()).contains("--lot has a quote that does not close its item");
    }

    private static JsonNode trendJson(Path store, Path csv, String... query) {
        List<String> args = new java.util.ArrayList<>(List.of("trend", "--store", store.toString(), "--figure",
                FIGURE, "--baseline", "2", "-o", csv.toString(), "--json"));
        args.addAll(List.of(query));
        Cli.Run run = Cli.run(args.toArray(String[]::new));
        assertThat(run.code()).as(run.err()).isIn(Exit.OK, Exit.TREND_SIGNALS);
        return Cli.parse(run.out());
    }

    @Test
    void theQueryTakesAPeriodLotsAndFactsAsRecurrenceDoes() {
        // T2 wafers (the odd ones) of lots L1-L4 measured before 2026-11-02T16:00Z: W1, W3, ..., W15 = 8 wafers
        Path csv = dir.resolve("query.csv");
        Cli.Run run = Cli.run("trend", "--store", store.toString(), "--figure", FIGURE, "--where", "furnace_tube=T2",
                "--lot", "L1", "--lot", "L2", "--lot", "L3", "--lot", "L4", "--until", "2026-11-02T16:00:00Z",
                "--baseline", "4", "-o", csv.toString(), "--json");
        assertThat(run.code()).as(run.err()).isEqualTo(Exit.OK);
        JsonNode j = Cli.parse(run.out());
        assertThat(j.get("wafers").asInt()).isEqualTo(8);
        assertThat(j.get("source").asText()).contains("furnace_tube=T2").contains("lot L1, L2, L3, L4")
                .contains("until 2026-11-02T16:00:00Z");
        JsonNode x = j.get("charts").get(0).get("points");
        assertThat(x).hasSize(8).allMatch(p -> p.get("value").asDouble() == 1.2e11);

        Cli.Run none = Cli.run("trend", "--store", store.toString(), "--figure", FIGURE, "--where",
                "furnace_tube=T9", "-o", csv.toString());
        assertThat(none.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(none.err()).contains("--store").contains("holds no wafer for furnace_tube=T9");
        Cli.Run bad = Cli.run("trend", "--store", store.toString(), "--figure", FIGURE, "--where", "T2",
                "-o", csv.toString());
        assertThat(bad.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(bad.err()).contains("--where must be NAME=VALUE");
    }

    @Test
    void jsonByAnAttributeWithABaselineDate() {
        Path csv = dir.resolve("tube.csv");
        Cli.Run run = Cli.run("trend", "--store", store.toString(), "--figure", FIGURE, "--by", "furnace_tube",
                "--baseline-until", "2026-11-02T20:00:00Z", "-o", csv.toString(), "--json");
        assertThat(run.code()).as(run.err()).isEqualTo(Exit.TREND_SIGNALS);
        JsonNode j = Cli.parse(run.out());
        assertThat(j.get("wafers").asInt()).isEqualTo(32);
        assertThat(j.get("without_measured_time").asInt()).isEqualTo(1);
        assertThat(j.get("without_value").asInt()).isEqualTo(1);
        JsonNode charts = j.get("charts");
        assertThat(charts.get(0).get("chart").asText()).isEqualTo("individuals");
        assertThat(charts.get(0).get("signals").get(0).get("after_baseline").asBoolean()).isTrue();
        // by a sidecar fact: no X-bar/R chart, but an individuals and mR chart per tube with the tube's own
        // baseline (T1: the even wafers, all 1.0e11; T2: the odd ones, all 1.2e11)
        assertThat(charts).extracting(c -> c.get("chart").asText()).containsExactly("individuals", "moving_range",
                "group_individuals", "group_moving_range", "group_individuals", "group_moving_range");
        assertThat(charts.get(2).get("group").asText()).isEqualTo("T1");
        assertThat(charts.get(2).get("points")).hasSize(15).allMatch(p -> p.get("group").asText().equals("T1"));
        assertThat(charts.get(2).get("points").get(0).get("centre").asDouble()).isEqualTo(1.0e11);
        assertThat(charts.get(4).get("group").asText()).isEqualTo("T2");
        assertThat(charts.get(4).get("points")).hasSize(15);
        assertThat(charts.get(4).get("points").get(0).get("centre").asDouble()).isEqualTo(1.2e11);
        assertThat(j.get("yield")).extracting(n -> n.get("group").asText()).containsExactly("T1", "T2");
    }

    @Test
    void pdfAndPngAreDrawn() throws Exception {
        Path pdf = dir.resolve("trend.pdf");
        Cli.Run run = Cli.run("trend", "--store", store.toString(), "--figure", FIGURE, "--since", "2026-11-02",
                "-o", pdf.toString());
        assertThat(run.code()).as(run.err()).isIn(Exit.TREND_SIGNALS, Exit.REPORT_MISSING);
        if (run.code() == Exit.TREND_SIGNALS) {
            try (PDDocument d = Loader.loadPDF(pdf.toFile())) {
                assertThat(d.getNumberOfPages()).isEqualTo(4); // 4 control charts, yield, Pareto, signals
            }
            Path png = dir.resolve("trend.png");
            assertThat(Cli.run("trend", "--store", store.toString(), "--figure", FIGURE, "-o", png.toString())
                    .code()).isEqualTo(Exit.TREND_SIGNALS);
            assertThat(javax.imageio.ImageIO.read(png.toFile()).getHeight()).isEqualTo(6 * 380);
        }
    }

    @Test
    void noSignalWhenTheBaselineCoversTheShiftFreeWafersOnly() {
        Cli.Run run = Cli.run("trend", "--store", store.toString(), "--figure", FIGURE, "--by", "none",
                "--since", "2026-11-02T00:00:00Z", "--baseline", "30", "-o", dir.resolve("all.csv").toString());
        // the whole history is the baseline: signals, if any, lie inside it and do not count
        assertThat(run.code()).as(run.err()).isEqualTo(Exit.OK);
    }

    @Test
    void badInputNamesTheOption() {
        Cli.Run since = Cli.run("trend", "--store", store.toString(), "--figure", FIGURE, "--since", "yesterday",
                "-o", dir.resolve("x.csv").toString());
        assertThat(since.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(since.err()).contains("--since").contains("2026-11-02");
        Cli.Run ext = Cli.run("trend", "--store", store.toString(), "--figure", FIGURE, "-o",
                dir.resolve("x.txt").toString());
        assertThat(ext.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(ext.err()).contains("-o").contains(".pdf, .png or .csv");
        Cli.Run missing = Cli.run("trend", "--store", dir.resolve("no/such/store.sqlite").toString(), "--figure",
                FIGURE, "-o", dir.resolve("x.csv").toString());
        assertThat(missing.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(missing.err()).contains("--store");
        Cli.Run small = Cli.run("trend", "--store", store.toString(), "--figure", FIGURE, "--baseline-until",
                "2026-11-02T01:00:00Z", "-o", dir.resolve("x.csv").toString());
        assertThat(small.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(small.err()).contains("--baseline-until").contains("at least 2");
        Cli.Run none = Cli.run("trend", "--store", store.toString(), "--figure", FIGURE, "--profile", "n-type",
                "-o", dir.resolve("x.csv").toString());
        assertThat(none.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(none.err()).contains("holds no wafer");
    }

    private static List<CSVRecord> read(Path csv) throws Exception {
        try (Reader r = Files.newBufferedReader(csv)) {
            return new ArrayList<>(CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).get().parse(r)
                    .getRecords());
        }
    }

    @Test
    void anOutputThatCannotBeWrittenSaysWhyWithoutAnInternalError() throws Exception {
        Path blocked = dir.resolve("not-a-folder");
        java.nio.file.Files.writeString(blocked, "x");
        for (String name : new String[] {"trend.csv", "trend.png"}) {
            Path out = blocked.resolve(name);
            Cli.Run run = Cli.run("trend", "--store", store.toString(), "--figure", FIGURE, "-o", out.toString());
            assertThat(run.code()).as(name).isEqualTo(Exit.INTERNAL_ERROR);
            assertThat(run.errLines()).as(name).containsExactly("trapmap trend: " + out + ": cannot write: " + blocked
                    + " exists and is not a folder");
        }
    }

    @Test
    void aFigureTheStoreDoesNotHoldIsNamedWithTheFiguresItHolds() {
        Path csv = dir.resolve("typo.csv");
        Cli.Run run = Cli.run("trend", "--store", store.toString(), "--figure", "trap_density_p5O_cm3", "-o",
                csv.toString());
        assertThat(run.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(run.errLines()).hasSize(1);
        assertThat(run.err()).startsWith("trapmap trend: --figure trap_density_p5O_cm3 is not a figure of the store;"
                + " it holds ").contains(FIGURE).doesNotContain("baseline");
        assertThat(csv).doesNotExist();
    }

    @Test
    void aBaselineOfFewerThanTwoWafersNamesTheOption() {
        for (String n : new String[] {"0", "1", "-3"}) {
            Cli.Run run = Cli.run("trend", "--store", store.toString(), "--figure", FIGURE, "--baseline", n, "-o",
                    dir.resolve("b.csv").toString());
            assertThat(run.code()).as(n).isEqualTo(Exit.INVALID_INPUT);
            assertThat(run.errLines()).as(n).containsExactly("trapmap trend: --baseline must be at least 2 wafers,"
                    + " the fewest that give a spread (got " + n + ")");
        }
    }

    @Test
    void aGroupingByAFactNoWaferHasIsRefusedNamingTheFacts() {
        Path csv = dir.resolve("by-typo.csv");
        Cli.Run run = Cli.run("trend", "--store", store.toString(), "--figure", FIGURE, "--by", "furnace_tub", "-o",
                csv.toString());
        assertThat(run.code()).isEqualTo(Exit.INVALID_INPUT);
        assertThat(run.errLines()).containsExactly("trapmap trend: --by furnace_tub is neither lot, day, week, none nor"
                + " a sidecar fact of the stored wafers (their facts: furnace_tube)");
        assertThat(csv).doesNotExist();
    }
}
