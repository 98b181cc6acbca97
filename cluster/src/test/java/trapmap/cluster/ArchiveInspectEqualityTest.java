package trapmap.cluster;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.BitSet;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.stream.Collectors;
import java.util.stream.Stream;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.SparkSession;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.batch.FlaggedRegions;
import trapmap.maps.batch.Footprint;
import trapmap.maps.batch.Figure;
import trapmap.maps.batch.HotSpots;
import trapmap.maps.batch.IronPairRules;
import trapmap.maps.batch.IronPairs;
import trapmap.maps.batch.Recurrence;
import trapmap.maps.batch.RecurrenceMap;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.WaferResult;
import trapmap.maps.demo.HistoryScenario;
import trapmap.maps.demo.InjectionStackDemo;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.NumberText;
import trapmap.maps.region.Region;
import trapmap.shared.progress.ProgressListener;

/**
 * The Spark job in local mode ({@code local[2]}) gives, for every map, the row {@code inspect}'s batch gives: the
 * same verdict, grade, profile, defect, failed and graded-down rules, every figure (to 1e-9 relative), the worst
 * region, the flagged regions and the footprint; error rows for the files {@code inspect} cannot read, with the same
 * reason. On the demonstration set with the example rules (their FeB/Fe_i pair judged together: every column of
 * {@code results.csv}, iron columns included), on the injection-stack demonstration (the stack figures of the first
 * level; a missing level's error row) and on a generated history of 189 small maps (with a few damaged files), the
 * last also run twice into the same output (no duplicated rows).
 */
class ArchiveInspectEqualityTest {
    private static final Path DEMO = Path.of("..", "demo-data").toAbsolutePath().normalize();
    private static SparkSession spark;

    @TempDir
    Path dir;

    @BeforeAll
    static void startSpark() {
        spark = LocalSpark.start();
    }

    @AfterAll
    static void stopSpark() {
        spark.stop();
    }

    /** The batch of {@code inspect} over the map files of {@code folder} as inspect takes them: its results by file. */
    private static Map<String, WaferResult> inspect(Path folder, Rules rules, Path out) throws Exception {
        return inspect(folder, rules, null, out);
    }

    /** As above, with the iron pairs of {@code iron} (null: none) as {@code inspect} evaluates them. */
    private static Map<String, WaferResult> inspect(Path folder, Rules rules, IronPairRules iron, Path out)
            throws Exception {
        List<Path> files;
        try (Stream<Path> s = Files.list(folder)) {
            files = s.filter(p -> p.getFileName().toString().toLowerCase(Locale.ROOT).matches(".*\\.(tif|tiff|csv)$"))
                    .filter(p -> !BatchInspection.isOutputName(p.getFileName().toString()))
                    .sorted().toList();
        }
        return inspect(files, rules, iron, out);
    }

    /** The batch over {@code files} in this order (as inspect takes several input folders, one after the other). */
    private static Map<String, WaferResult> inspect(List<Path> files, Rules rules, IronPairRules iron, Path out)
            throws Exception {
        Map<String, WaferResult> told = new HashMap<>();
        new BatchInspection(rules).withIron(iron).tellingWafers((r, row) -> {
            told.put(r.file(), r);
            ROWS.put(r.file(), row);
        }).finishingWith((done, recurrence) -> RECURRENCE.put(done, recurrence))
                .run(files, out, new BatchInspection.Options(2, false, false, ProgressListener.NONE));
        assertThat(told).hasSize(files.size());
        return told;
    }

    /** Inspect's recurrence by output folder. */
    private static final Map<Path, RecurrenceMap> RECURRENCE = new java.util.concurrent.ConcurrentHashMap<>();

    /** Inspect's results rows (as {@code results.csv} holds them) by file. */
    private static final Map<String, Map<String, String>> ROWS = new java.util.concurrent.ConcurrentHashMap<>();

    /** A local path of the job's {@code file} column ({@code file:/...}). */
    private static String local(String uri) {
        return uri.replace("file:", "");
    }

    private static void sameRows(Map<String, WaferResult> expected, Rules rules, String output) {
        List<Row> results = spark.read().parquet(output + "/" + ArchiveJob.RESULTS).collectAsList();
        assertThat(results).hasSize(expected.size());
        Map<String, List<Row>> regions = spark.read().parquet(output + "/" + ArchiveJob.REGIONS).collectAsList()
                .stream().collect(Collectors.groupingBy(r -> local(r.getAs("file"))));
        Map<String, Row> footprints = spark.read().parquet(output + "/" + ArchiveJob.FOOTPRINTS).collectAsList()
                .stream().collect(Collectors.toMap(r -> local(r.getAs("file")), r -> r));
        List<String> figures = rules.figures().stream().map(f -> f.name()).toList();
        int judged = 0;
        for (Row row : results) {
            String file = local(row.getAs("file"));
            WaferResult r = expected.get(file);
            assertThat(r).as(file).isNotNull();
            assertThat((String) row.getAs("wafer_id")).as(file).isEqualTo(r.waferId());
            Map<String, String> csv = ROWS.get(file);
            assertThat((String) row.getAs("status")).as(file).isEqualTo(r.status().key()).isEqualTo(csv.get("status"));
            assertThat((String) row.getAs("grade")).as(file).isEqualTo(r.grade()).isEqualTo(csv.get("grade"));
            assertThat(String.join(";", row.<String>getList(row.fieldIndex("failed_rules")))).as(file)
                    .isEqualTo(csv.get("failed_rules"));
            assertThat((String) row.getAs("profile")).as(file).isEqualTo(r.profile());
            assertThat((String) row.getAs("defect")).as(file).isEqualTo(r.defectId());
            assertThat(local(row.getAs("error"))).as(file).isEqualTo(r.error());
            assertThat(row.getList(row.fieldIndex("failed_rules"))).as(file).isEqualTo(r.failed());
            assertThat(row.getList(row.fieldIndex("graded_down_by"))).as(file).isEqualTo(r.gradedDownBy());
            for (String f : figures) {
                Double want = r.figures().get(f);
                Object got = row.getAs(f);
                if (want == null || want.isNaN()) {
                    assertThat(got).as(file + " " + f).isNull();
                } else {
                    assertThat((Double) got).as(file + " " + f).isCloseTo(want, within(1e-9 * Math.abs(want)));
                }
            }
            Region worst = r.worstRegion();
            if (worst == null) {
                assertThat((Object) row.getAs("worst_region_area_mm2")).as(file).isNull();
            } else {
                judged++;
                assertThat((Double) row.getAs("worst_region_area_mm2")).as(file).isEqualTo(worst.areaMm2());
                assertThat((String) row.getAs("worst_region_rule")).as(file).isEqualTo(r.worstRegionRule());
                assertThat((Double) row.getAs("worst_region_max_y_mm")).as(file).isEqualTo(worst.bounds().maxYMm());
            }
            List<Row> got = regions.getOrDefault(file, List.of());
            assertThat(got).as(file + " regions").hasSize(r.regions().size());
            got = new ArrayList<>(got);
            got.sort((a, b) -> Integer.compare(a.getAs("region"), b.getAs("region")));
            for (int i = 0; i < got.size(); i++) {
                FlaggedRegions.FlaggedRegion fr = r.regions().get(i);
                Row g = got.get(i);
                assertThat((Integer) g.getAs("region")).isEqualTo(fr.region().id());
                assertThat((Double) g.getAs("area_mm2")).isEqualTo(fr.region().areaMm2());
                assertThat((Double) g.getAs("centroid_x_mm")).isEqualTo(fr.region().centroidXMm());
                if (Double.isNaN(fr.peakDensityCm3())) { // a lifetime flag's region without densities
                    assertThat((Object) g.getAs("peak_density_cm3")).isNull();
                } else {
                    assertThat((Double) g.getAs("peak_density_cm3")).isCloseTo(fr.peakDensityCm3(),
                            within(1e-9 * Math.abs(fr.peakDensityCm3())));
                }
            }
            Footprint fp = r.footprint();
            Row f = footprints.get(file);
            if (fp == null) {
                assertThat(f).as(file).isNull();
            } else {
                assertThat(f).as(file).isNotNull();
                assertThat((String) f.getAs("family")).isEqualTo(fp.family());
                assertThat(Arrays.asList((Integer) f.getAs("min_i"), (Integer) f.getAs("min_j"),
                        (Integer) f.getAs("width"), (Integer) f.getAs("height")))
                        .isEqualTo(List.of(fp.minI(), fp.minJ(), fp.width(), fp.height()));
                assertThat(BitSet.valueOf((byte[]) f.getAs("covered"))).isEqualTo(fp.covered());
                assertThat(BitSet.valueOf((byte[]) f.getAs("flagged"))).isEqualTo(fp.flagged());
            }
        }
        assertThat(judged).isPositive();
    }

    /**
     * Every column of {@code inspect}'s {@code results.csv} rows (iron columns included) equals the job's: text as
     * it is (paths without {@code file:}), lists joined with {@code ;}, numbers as the batch writes them; returns the
     * job's rows by local file.
     */
    private static Map<String, Row> sameCsvColumns(String output, int expectedRows) {
        Map<String, Row> rows = spark.read().parquet(output + "/" + ArchiveJob.RESULTS).collectAsList().stream()
                .collect(Collectors.toMap(r -> local(r.getAs("file")), r -> r));
        assertThat(rows).hasSize(expectedRows);
        int compared = 0;
        for (Map.Entry<String, Row> e : rows.entrySet()) {
            Map<String, String> csv = ROWS.get(e.getKey());
            assertThat(csv).as(e.getKey()).isNotNull();
            Row row = e.getValue();
            for (Map.Entry<String, String> c : csv.entrySet()) {
                String column = c.getKey();
                String want = c.getValue();
                String what = e.getKey() + " " + column;
                Object got = row.getAs(column);
                if (got == null) {
                    assertThat(want).as(what).isEmpty();
                } else if (got instanceof String text) {
                    assertThat(local(text)).as(what).isEqualTo(want);
                } else if (got instanceof Boolean b) {
                    assertThat(b.toString()).as(what).isEqualTo(want);
                } else if (got instanceof Double d) {
                    assertThat(want).as(what).isIn(written(column, d));
                } else {
                    assertThat(String.join(";", row.<String>getList(row.fieldIndex(column)))).as(what)
                            .isEqualTo(want);
                }
                compared++;
            }
        }
        assertThat(compared).isPositive();
        return rows;
    }

    /** The texts the batch writes a number of {@code column} as (figures by their kind, positions in mm, ...). */
    private static List<String> written(String column, double v) {
        if (column.startsWith("worst_region_")) {
            return List.of(column.equals("worst_region_area_mm2") ? NumberText.mm2(v)
                    : column.equals("worst_region_peak") ? NumberText.sample(v) : NumberText.mm(v));
        }
        if (column.startsWith("iron_")) {
            return List.of(NumberText.of(v), NumberText.sample(v)); // limited figures in full, the others as samples
        }
        return List.of(Figure.parse(column).text(v));
    }

    /** The job's recurrence maps and hot spots equal inspect's, family by family; the table holds every cell. */
    private static void sameRecurrence(RecurrenceMap inspect, ArchiveRecurrence.Outcome job, String output) {
        Map<String, Recurrence> want = inspect.families();
        assertThat(job.families().keySet()).containsExactlyElementsOf(want.keySet());
        long cells = 0;
        for (Map.Entry<String, Recurrence> e : want.entrySet()) {
            Recurrence w = e.getValue();
            Recurrence g = job.families().get(e.getKey());
            assertThat(g.wafers()).as(e.getKey()).isEqualTo(w.wafers());
            assertThat(g.fraction().grid()).as(e.getKey()).isEqualTo(w.fraction().grid());
            assertThat(g.fraction().raster().samples()).as(e.getKey())
                    .containsExactly(w.fraction().raster().samples());
            assertThat(g.wafersPerCell()).as(e.getKey()).containsExactly(w.wafersPerCell());
            HotSpots.Result hw = HotSpots.find(w, HotSpots.Criteria.DEFAULT);
            assertThat(job.hotSpots().get(e.getKey()).regions().regions()).as(e.getKey())
                    .isEqualTo(hw.regions().regions());
            cells += Arrays.stream(w.wafersPerCell()).filter(n -> n > 0).count();
        }
        assertThat(spark.read().parquet(output + "/" + ArchiveJob.RECURRENCE).count()).isEqualTo(cells);
    }

    @Test
    void demonstrationSetGivesInspectsRowsIronPairsIncluded() throws Exception {
        Path rulesFile = DEMO.resolve("rules-example.json");
        Rules rules = Rules.read(rulesFile);
        IronPairRules iron = IronPairRules.read(rulesFile).orElseThrow();
        Map<String, WaferResult> expected = inspect(DEMO, rules, iron, dir.resolve("inspect"));
        assertThat(expected).hasSize(17);
        String output = dir.resolve("archive").toString();
        ArchiveJob.Outcome o = ArchiveJob.run(spark, new ArchiveJob.Request(List.of(DEMO.toString()),
                DEMO.resolve("rules-example.json").toString(), output, PartitionKey.DAY, false));
        assertThat(o.total()).isEqualTo(17);
        assertThat(o.pass() + o.fail()).isEqualTo(expected.values().stream()
                .filter(r -> r.status() != WaferResult.Status.ERROR).count());
        sameRows(expected, rules, output);
        Map<String, Row> rows = sameCsvColumns(output, 17);
        sameRecurrence(RECURRENCE.get(dir.resolve("inspect")), o.recurrence(), output);
        // the pair: its figures unrounded, to 1e-9, against the batch's iron step on the same files
        Path feb = DEMO.resolve("LOT-A03-W02-feb-state.tif");
        Path fei = DEMO.resolve("LOT-A03-W02-fe-i-state.tif");
        IronPairs.Evaluation want = IronPairs.evaluate(iron, rules, feb.getFileName().toString(), feb.toString(),
                n -> fei.toString(), f -> MapFiles.readSingle(Path.of(f)));
        Row febRow = rows.get(feb.toString());
        assertThat(want.values()).containsKeys("iron_median_cm3", "iron_p95_cm3", "iron_crossover_cm3");
        for (Map.Entry<String, Double> v : want.values().entrySet()) {
            assertThat((Double) febRow.getAs(v.getKey())).as(v.getKey())
                    .isCloseTo(v.getValue(), within(1e-9 * Math.abs(v.getValue())));
        }
        assertThat(local(febRow.getAs(IronPairs.PARTNER))).isEqualTo(fei.toString());
        assertThat((String) rows.get(fei.toString()).getAs(IronPairs.STATUS)).isEqualTo("paired");
        assertThat((Object) rows.get(DEMO.resolve("LOT-A01-W01.tif").toString()).getAs(IronPairs.STATUS)).isNull();
    }

    @Test
    void aFebStateMapWithoutItsPartnerFailsAsInInspect() throws Exception {
        Path alone = dir.resolve("alone");
        Files.createDirectories(alone);
        for (String f : List.of("LOT-A03-W02-feb-state", "LOT-A01-W01")) {
            Files.copy(DEMO.resolve(f + ".tif"), alone.resolve(f + ".tif"));
            Files.copy(DEMO.resolve(f + ".json"), alone.resolve(f + ".json"));
        }
        Path rulesFile = DEMO.resolve("rules-example.json");
        Rules rules = Rules.read(rulesFile);
        Map<String, WaferResult> expected = inspect(alone, rules, IronPairRules.read(rulesFile).orElseThrow(),
                dir.resolve("inspect"));
        String output = dir.resolve("archive").toString();
        ArchiveJob.run(spark, new ArchiveJob.Request(List.of(alone.toString()), rulesFile.toString(), output,
                PartitionKey.DAY, false));
        Map<String, Row> rows = sameCsvColumns(output, 2);
        Row feb = rows.get(alone.resolve("LOT-A03-W02-feb-state.tif").toString());
        assertThat((String) feb.getAs("status")).isEqualTo("fail");
        assertThat(feb.getList(feb.fieldIndex("failed_rules"))).contains("iron");
        assertThat((String) feb.getAs(IronPairs.NOTE)).contains("no Fe_i-state partner LOT-A03-W02-fe-i-state.tif");
        assertThat(expected).hasSize(2);
    }

    @Test
    void aPartnerInAnotherInputFolderIsTheFirstOfItsName() throws Exception {
        List<Path> files = new ArrayList<>();
        for (String folder : List.of("a", "b", "c")) {
            Path f = Files.createDirectories(dir.resolve(folder));
            String wafer = folder.equals("a") ? "LOT-A03-W02-feb-state" : "LOT-A03-W02-fe-i-state";
            Files.copy(DEMO.resolve(wafer + ".tif"), f.resolve(wafer + ".tif"));
            Files.copy(DEMO.resolve(wafer + ".json"), f.resolve(wafer + ".json"));
            files.add(f.resolve(wafer + ".tif"));
        }
        Path rulesFile = DEMO.resolve("rules-example.json");
        inspect(files, Rules.read(rulesFile), IronPairRules.read(rulesFile).orElseThrow(), dir.resolve("inspect"));
        String output = dir.resolve("archive").toString();
        ArchiveJob.run(spark, new ArchiveJob.Request(List.of(dir.resolve("a").toString(), dir.resolve("b").toString(),
                dir.resolve("c").toString()), rulesFile.toString(), output, PartitionKey.DAY, false));
        Map<String, Row> rows = sameCsvColumns(output, 3);
        assertThat(local(rows.get(files.get(0).toString()).getAs(IronPairs.PARTNER))).isEqualTo(files.get(1).toString());
        assertThat((String) rows.get(files.get(0).toString()).getAs(IronPairs.STATUS)).isIn("pass", "fail");
        assertThat(local(rows.get(files.get(2).toString()).getAs(IronPairs.PARTNER))).isEqualTo(files.get(0).toString());
    }

    @Test
    void injectionStackGivesInspectsStackFigures() throws Exception {
        Path stack = DEMO.resolve(InjectionStackDemo.FOLDER);
        Path rulesFile = stack.resolve(InjectionStackDemo.RULES);
        Rules rules = Rules.read(rulesFile);
        Map<String, WaferResult> expected = inspect(stack, rules, dir.resolve("inspect"));
        String output = dir.resolve("archive").toString();
        ArchiveJob.Outcome o = ArchiveJob.run(spark, new ArchiveJob.Request(List.of(stack.toString()),
                rulesFile.toString(), output, PartitionKey.LOT, false));
        assertThat(o.total()).isEqualTo(3);
        sameRows(expected, rules, output);
        Map<String, Row> rows = sameCsvColumns(output, 3);
        WaferResult first = expected.get(stack.resolve(InjectionStackDemo.fileName(0)).toString());
        assertThat(first.profile()).isEqualTo("injection-stack");
        for (String f : List.of("best_defect_area_fraction", "no_single_defect_area_fraction")) {
            double want = first.figures().get(f);
            assertThat(want).as(f).isPositive();
            assertThat((Double) rows.get(first.file()).getAs(f)).as(f).isCloseTo(want, within(1e-9 * want));
        }
    }

    @Test
    void aMissingStackLevelIsInspectsErrorRow() throws Exception {
        Path stack = DEMO.resolve(InjectionStackDemo.FOLDER);
        Path two = dir.resolve("two-levels");
        Files.createDirectories(two);
        for (int l = 0; l < 2; l++) {
            String name = InjectionStackDemo.fileName(l);
            Files.copy(stack.resolve(name), two.resolve(name));
            String side = name.replaceAll("\\.tif$", ".json");
            Files.copy(stack.resolve(side), two.resolve(side));
        }
        Path rulesFile = stack.resolve(InjectionStackDemo.RULES);
        Rules rules = Rules.read(rulesFile);
        Map<String, WaferResult> expected = inspect(two, rules, dir.resolve("inspect"));
        WaferResult first = expected.get(two.resolve(InjectionStackDemo.fileName(0)).toString());
        assertThat(first.status()).isEqualTo(WaferResult.Status.ERROR);
        assertThat(first.error()).contains("stack level 3 of 3");
        String output = dir.resolve("archive").toString();
        ArchiveJob.run(spark, new ArchiveJob.Request(List.of(two.toString()), rulesFile.toString(), output,
                PartitionKey.LOT, false));
        sameCsvColumns(output, 2);
    }

    @Test
    void generatedHistoryWithDamagedFilesGivesInspectsRowsAndARerunNoDuplicates() throws Exception {
        Path maps = dir.resolve("history");
        HistoryScenario.write(maps);
        byte[] tif = Files.readAllBytes(maps.resolve("L0001-S02.tif"));
        Files.write(maps.resolve("damaged-empty.tif"), new byte[0]);
        Files.write(maps.resolve("damaged-cut.tif"), Arrays.copyOf(tif, tif.length / 2));
        Files.write(maps.resolve("damaged-sidecar.tif"), tif);
        Files.writeString(maps.resolve("damaged-sidecar.json"), "{\"conditions\": {\"thickness_um\": -5}}");
        Files.writeString(maps.resolve(BatchInspection.CSV_NAME), "an earlier batch's table, never a map\n");
        Path rulesFile = maps.resolve(HistoryScenario.RULES);
        Rules rules = Rules.read(rulesFile);
        Map<String, WaferResult> expected = inspect(maps, rules, dir.resolve("inspect"));
        assertThat(expected).hasSize(189 + 3);
        assertThat(expected.values().stream().filter(r -> r.status() == WaferResult.Status.ERROR)).hasSize(3);

        String output = dir.resolve("archive").toString();
        ArchiveJob.Request request = new ArchiveJob.Request(List.of(maps.toString()), rulesFile.toString(), output,
                PartitionKey.LOT, false);
        ArchiveJob.run(spark, request);
        ArchiveJob.Outcome again = ArchiveJob.run(spark, request);
        assertThat(again.total()).isEqualTo(192);
        assertThat(again.error()).isEqualTo(3);
        sameRows(expected, rules, output);
        sameRecurrence(RECURRENCE.get(dir.resolve("inspect")), again.recurrence(), output);
        HotSpots.Result slot7 = again.recurrence().hotSpots().values().iterator().next();
        assertThat(slot7.regions().regions()).isNotEmpty(); // the bad boat slot's spot recurs in 63 of 189 wafers
        try (Stream<Path> s = Files.list(Path.of(output, ArchiveJob.RESULTS))) {
            assertThat(s.map(p -> p.getFileName().toString()).filter(n -> n.startsWith("lot="))).hasSize(63 + 1);
        }
    }
}
