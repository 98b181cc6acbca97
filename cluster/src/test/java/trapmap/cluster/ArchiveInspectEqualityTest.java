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
import trapmap.maps.batch.HotSpots;
import trapmap.maps.batch.Recurrence;
import trapmap.maps.batch.RecurrenceMap;
import trapmap.maps.batch.Rules;
import trapmap.maps.batch.WaferResult;
import trapmap.maps.demo.HistoryScenario;
import trapmap.maps.region.Region;
import trapmap.shared.progress.ProgressListener;

/**
 * The Spark job in local mode ({@code local[2]}) gives, for every map, the row {@code inspect}'s batch gives: the
 * same verdict, grade, profile, defect, failed and graded-down rules, every figure (to 1e-9 relative), the worst
 * region, the flagged regions and the footprint; error rows for the files {@code inspect} cannot read, with the same
 * reason. On the demonstration set with the example rules and on a generated history of 189 small maps (with a few
 * damaged files), the second also run twice into the same output (no duplicated rows).
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
        List<Path> files;
        try (Stream<Path> s = Files.list(folder)) {
            files = s.filter(p -> p.getFileName().toString().toLowerCase(Locale.ROOT).matches(".*\\.(tif|tiff|csv)$"))
                    .filter(p -> !BatchInspection.isOutputName(p.getFileName().toString()))
                    .sorted().toList();
        }
        Map<String, WaferResult> told = new HashMap<>();
        new BatchInspection(rules).tellingWafers((r, row) -> {
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
                assertThat((Double) g.getAs("peak_density_cm3")).isCloseTo(fr.peakDensityCm3(),
                        within(1e-9 * Math.abs(fr.peakDensityCm3())));
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
    void demonstrationSetGivesInspectsRows() throws Exception {
        Rules rules = Rules.read(DEMO.resolve("rules-example.json"));
        Map<String, WaferResult> expected = inspect(DEMO, rules, dir.resolve("inspect"));
        assertThat(expected).hasSize(17);
        String output = dir.resolve("archive").toString();
        ArchiveJob.Outcome o = ArchiveJob.run(spark, new ArchiveJob.Request(List.of(DEMO.toString()),
                DEMO.resolve("rules-example.json").toString(), output, PartitionKey.DAY, false));
        assertThat(o.total()).isEqualTo(17);
        assertThat(o.pass() + o.fail()).isEqualTo(expected.values().stream()
                .filter(r -> r.status() != WaferResult.Status.ERROR).count());
        sameRows(expected, rules, output);
        sameRecurrence(RECURRENCE.get(dir.resolve("inspect")), o.recurrence(), output);
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
