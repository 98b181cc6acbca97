package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.atomic.AtomicInteger;
import javax.imageio.ImageIO;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.geometry.OutlineDetection;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.NumberText;
import trapmap.maps.model.MeasurementConditions;
import trapmap.maps.model.WaferMap;
import trapmap.maps.raster.Mask;
import trapmap.maps.stats.MapStatistics;
import trapmap.maps.stats.StatisticsRequest;
import trapmap.shared.progress.ProgressListener;

class BatchInspectionTest {
    @TempDir
    Path dir;

    private static final String SPOT_RULES = """
            {"edge_exclusion_mm": 2,
             "flag": {"quantity": "lifetime", "threshold": 10, "min_area_mm2": 1},
             "limits": {"flagged_area_fraction": {"max": 0.001}, "p5_lifetime_us": {"min": 5}},
             "grades": [{"grade": "A", "when": {"median_lifetime_us": {"min": 60}}},
                        {"grade": "B", "when": {"median_lifetime_us": {"min": 30}}},
                        {"grade": "C"}]}
            """;

    private static Rules rules(String json) throws RulesException {
        return Rules.parse(json, "rules.json");
    }

    private static BatchInspection.Options options(int threads, boolean resume) {
        return new BatchInspection.Options(threads, resume, false, ProgressListener.NONE);
    }

    /** Runs {@code b} over {@code files} and interrupts it after {@code rows} rows, as a stopped program would be. */
    static void interruptedAfter(BatchInspection b, List<Path> files, Path out, int rows) {
        BatchInspection.Options o = new BatchInspection.Options(1, false, false, (done, total, m) -> {
            if (done == rows) {
                Thread.currentThread().interrupt();
            }
        });
        try {
            org.assertj.core.api.Assertions.assertThatThrownBy(() -> b.run(files, out, o))
                    .isInstanceOf(InterruptedException.class);
        } finally {
            Thread.interrupted();
        }
    }

    private static List<CSVRecord> csv(Path file) throws Exception {
        try (Reader r = Files.newBufferedReader(file);
             CSVParser p = CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).build().parse(r)) {
            return new ArrayList<>(p.getRecords());
        }
    }

    private Path maps() throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        SyntheticWafers.clean(in, "w1", 80);
        SyntheticWafers.spot(in, "w2", 80, 20, -10, 5, 4);
        SyntheticWafers.clean(in, "w3", 40);
        SyntheticWafers.clean(in, "w4", 20);
        return in;
    }

    private static List<Path> list(Path in) throws Exception {
        try (var s = Files.list(in)) {
            return s.filter(p -> !p.toString().endsWith(".json")).sorted().toList();
        }
    }

    @Test
    void plantedSpotFailsWithItsRegionAtThePlantedPositionAndCleanWafersPass() throws Exception {
        Path in = maps();
        BatchInspection.Summary s = new BatchInspection(rules(SPOT_RULES)).run(list(in), dir.resolve("out"),
                options(2, false));
        List<CSVRecord> rows = csv(s.csv());
        assertThat(rows).extracting(r -> r.get("wafer_id")).containsExactly("w1", "w2", "w3", "w4");
        assertThat(rows).extracting(r -> r.get("status")).containsExactly("pass", "fail", "pass", "pass");
        CSVRecord spot = rows.get(1);
        assertThat(spot.get("failed_rules")).isEqualTo("flagged_area_fraction");
        assertThat(Math.hypot(Double.parseDouble(spot.get("worst_region_x_mm")) - 20,
                Double.parseDouble(spot.get("worst_region_y_mm")) + 10)).isLessThan(2);
        assertThat(Double.parseDouble(spot.get("worst_region_area_mm2"))).isCloseTo(Math.PI * 25, within(5.0));
        assertThat(Double.parseDouble(spot.get("worst_region_peak"))).isEqualTo(4);
        assertThat(rows.get(0).get("worst_region_x_mm")).isEmpty();
        assertThat(Double.parseDouble(rows.get(0).get("flagged_area_fraction"))).isZero();
        assertThat(s.pass()).isEqualTo(3);
        assertThat(s.fail()).isEqualTo(1);
        assertThat(s.yield()).isEqualTo(0.75);
        assertThat(Files.exists(dir.resolve("out").resolve(BatchInspection.PARTIAL_NAME))).isFalse();
    }

    @Test
    void theEndOfTheRowsIsToldOnceBeforeTheTablesWithTheRowsAndRecurrenceTheFinisherGets() throws Exception {
        Path in = maps();
        Path out = dir.resolve("out");
        List<Map<String, String>> told = new ArrayList<>();
        List<Object[]> ended = new ArrayList<>();
        BatchInspection b = new BatchInspection(rules(SPOT_RULES));
        b.tellingRows(new BatchInspection.RowListener() {
            @Override
            public void row(Map<String, String> row) {
                told.add(row);
            }

            @Override
            public void rowsEnded(List<Map<String, String>> rows, boolean asTold, RecurrenceMap recurrence) {
                // told before the tables are put in place and results.json and the recurrence maps are written
                ended.add(new Object[] {rows, asTold, recurrence, Files.exists(out.resolve(BatchInspection.CSV_NAME)),
                    Files.exists(out.resolve(BatchInspection.JSON_NAME)),
                    Files.exists(out.resolve(BatchInspection.RECURRENCE_NAME))});
            }
        }).finishingWith((d, recurrence) -> {
            assertThat(ended).hasSize(1);
            assertThat(ended.get(0)[0]).isSameAs(b.rows());
            assertThat(ended.get(0)[2]).isSameAs(recurrence);
        }).run(list(in), out, options(2, false));

        assertThat(ended).hasSize(1);
        assertThat(ended.get(0)[1]).isEqualTo(true);
        @SuppressWarnings("unchecked")
        List<Map<String, String>> rows = (List<Map<String, String>>) ended.get(0)[0];
        assertThat(rows).containsExactlyElementsOf(told).hasSize(4);
        assertThat(java.util.Arrays.copyOfRange(ended.get(0), 3, 6)).as("results.csv, results.json, recurrence.csv")
                .containsExactly(false, false, false); // no table in place yet
        assertThat(csv(out.resolve(BatchInspection.CSV_NAME))).extracting(r -> r.get("wafer_id"))
                .containsExactly("w1", "w2", "w3", "w4");
    }

    @Test
    void passingWafersTakeTheFirstMatchingGradeAndFailedOnesNone() throws Exception {
        Path in = maps();
        BatchInspection.Summary s = new BatchInspection(rules(SPOT_RULES)).run(list(in), dir.resolve("out"),
                options(1, false));
        List<CSVRecord> rows = csv(s.csv());
        assertThat(rows).extracting(r -> r.get("status")).containsExactly("pass", "fail", "pass", "pass");
        assertThat(rows).extracting(r -> r.get("grade")).containsExactly("A", "", "B", "C");
        assertThat(rows).extracting(r -> r.get("graded_down_by")).containsExactly("", "", "median_lifetime_us",
                "median_lifetime_us");
        assertThat(rows).extracting(r -> r.get("profile")).containsOnly(Rules.DEFAULT_PROFILE);
    }

    /** Columns whose values come from the float samples of a map (written at float precision). */
    private static final List<String> FLOAT_COLUMNS = List.of("median_lifetime_us", "p5_lifetime_us", "peak",
            "worst_region_peak", "peak_density_cm3", "median_density_cm3");

    private static void assertShortestOrRounded(String column, String cell) {
        if (cell.isEmpty() || cell.equals("true") || cell.equals("false") || !cell.matches("-?[0-9].*")) {
            return;
        }
        if (column.endsWith("_mm") || column.endsWith("_mm2")) {
            assertThat(cell).as(column).matches("-?\\d+(\\.\\d{0,2}[1-9])?");
            return;
        }
        double v = Double.parseDouble(cell);
        assertThat(cell).as(column + " is the shortest text of its double").isEqualTo(NumberText.of(v));
        if (FLOAT_COLUMNS.contains(column)) {
            assertThat(cell).as(column + " is the shortest text of its float")
                    .isEqualTo(NumberText.of(Float.parseFloat(cell)));
        }
    }

    @Test
    void everyNumberWrittenIsTheShortestTextOfItsValueOrRoundedToItsResolution() throws Exception {
        Path in = maps();
        String rules = SPOT_RULES.replace("\"limits\": {", "\"limits\": {\"largest_region_mm2\": {\"max\": 1000},"
                + " \"harmonic_mean_lifetime_us\": {\"min\": 1}, \"edge_to_centre_ratio\": {\"min\": 0.01},");
        BatchInspection.Summary s = new BatchInspection(rules(rules)).run(list(in), dir.resolve("out"),
                options(1, false));
        List<CSVRecord> results = csv(s.csv());
        List<CSVRecord> regions = csv(dir.resolve("out").resolve(BatchInspection.REGIONS_NAME));
        assertThat(regions).isNotEmpty();
        int numbers = 0;
        for (CSVRecord r : results) {
            for (Map.Entry<String, String> e : r.toMap().entrySet()) {
                assertShortestOrRounded(e.getKey(), e.getValue());
                numbers += e.getValue().matches("-?[0-9].*") ? 1 : 0;
            }
        }
        for (CSVRecord r : regions) {
            for (Map.Entry<String, String> e : r.toMap().entrySet()) {
                assertShortestOrRounded(e.getKey(), e.getValue());
            }
        }
        assertThat(numbers).isGreaterThan(4 * 6);
        assertThat(results.get(0).get("largest_region_mm2")).isEqualTo("0");
        // results.json: the same numbers, each token the shortest text of its double
        String json = Files.readString(s.json());
        java.util.regex.Matcher m = java.util.regex.Pattern.compile(": (-?[0-9][0-9.eE+-]*)").matcher(json);
        int tokens = 0;
        while (m.find()) {
            String token = m.group(1);
            assertThat(NumberText.of(Double.parseDouble(token))).as(token)
                    .isEqualTo(token.replaceFirst("\\.0(?=E|$)", ""));
            tokens++;
        }
        assertThat(tokens).isGreaterThan(numbers);
        var tree = new com.fasterxml.jackson.databind.ObjectMapper().readTree(json);
        assertThat(tree.get("summary").get("yield_fraction").asDouble()).isEqualTo(s.yield());
        assertThat(tree.get("summary").has("yield")).isFalse();
        for (int i = 0; i < results.size(); i++) {
            for (Map.Entry<String, String> e : results.get(i).toMap().entrySet()) {
                if (e.getValue().matches("-?[0-9].*")) {
                    assertThat(tree.get("wafers").get(i).get(e.getKey()).asDouble()).as(e.getKey())
                            .isEqualTo(Double.parseDouble(e.getValue()));
                }
            }
        }
    }

    @Test
    void aFailedWaferTakesTheFailGradeNeverAPassingOne() throws Exception {
        Path in = maps();
        String rules = SPOT_RULES.replace("\"grades\"", "\"fail_grade\": \"R\", \"grades\"");
        BatchInspection.Summary s = new BatchInspection(rules(rules)).run(list(in), dir.resolve("out"),
                options(1, false));
        assertThat(csv(s.csv())).extracting(r -> r.get("status") + "/" + r.get("grade"))
                .containsExactly("pass/A", "fail/R", "pass/B", "pass/C");
    }

    @Test
    void corruptTruncatedAndEmptyFilesBecomeErrorRowsAndTheBatchGoesOn() throws Exception {
        Path in = maps();
        byte[] good = Files.readAllBytes(in.resolve("w1.tif"));
        Files.write(in.resolve("a-truncated.tif"), java.util.Arrays.copyOf(good, 300));
        Files.write(in.resolve("b-empty.tif"), new byte[0]);
        Files.writeString(in.resolve("c-garbage.csv"), "x_mm,y_mm,value\n1,2\nnot,a,number\n");
        BatchInspection.Summary s = new BatchInspection(rules(SPOT_RULES)).run(list(in), dir.resolve("out"),
                options(2, false));
        List<CSVRecord> rows = csv(s.csv());
        assertThat(rows).hasSize(7);
        for (CSVRecord r : rows.subList(0, 3)) {
            assertThat(r.get("status")).isEqualTo("error");
            assertThat(r.get("error")).isNotBlank().doesNotContain("\n").contains(r.get("file"));
            assertThat(r.get("grade")).isEmpty();
        }
        assertThat(rows.subList(3, 7)).extracting(r -> r.get("status")).containsExactly("pass", "fail", "pass",
                "pass");
        assertThat(s.error()).isEqualTo(3);
        var json = new com.fasterxml.jackson.databind.ObjectMapper().readTree(s.json().toFile());
        assertThat(json.get("summary").get("error").asInt()).isEqualTo(3);
        assertThat(json.get("wafers")).hasSize(7);
        assertThat(json.get("wafers").get(4).get("worst_region_peak").asDouble()).isEqualTo(4);
    }

    @Test
    void figuresEqualMapStatisticsOverTheSameArea() throws Exception {
        Path in = maps();
        BatchInspection.Summary s = new BatchInspection(rules(SPOT_RULES)).run(list(in), dir.resolve("out"),
                options(2, false));
        List<CSVRecord> rows = csv(s.csv());
        for (CSVRecord r : rows) {
            WaferMap m = MapFiles.readSingle(Path.of(r.get("file")));
            Mask mask = Mask.valid(m.raster()).and(OutlineDetection.fit(m).shape().mask(m.grid(), 2));
            MapStatistics ref = MapStatistics.of(m, mask, StatisticsRequest.of(new double[] {5}));
            assertThat(Double.parseDouble(r.get("harmonic_mean_lifetime_us"))).isEqualTo(ref.harmonicMean());
            assertThat(Double.parseDouble(r.get("median_lifetime_us"))).isEqualTo(ref.median());
            assertThat(Double.parseDouble(r.get("p5_lifetime_us"))).isEqualTo(ref.percentile(5));
        }
    }

    @Test
    void resumeReadsOnlyFilesNotYetListedAndKeepsTheEarlierRows() throws Exception {
        Path in = maps();
        AtomicInteger reads = new AtomicInteger();
        WaferInspection.MapReader counting = f -> {
            reads.incrementAndGet();
            return MapFiles.readSingle(f);
        };
        Path out = dir.resolve("out");
        interruptedAfter(new BatchInspection(rules(SPOT_RULES), counting), list(in), out, 3);
        assertThat(reads.get()).isGreaterThanOrEqualTo(3);
        reads.set(0);
        BatchInspection.Summary s = new BatchInspection(rules(SPOT_RULES), counting).run(list(in), out,
                options(2, true));
        assertThat(reads.get()).isEqualTo(1);
        assertThat(s.skipped()).isEqualTo(3);
        assertThat(csv(s.csv())).extracting(r -> r.get("wafer_id")).containsExactly("w1", "w2", "w3", "w4");
        // the region of w2 (read in the first run) is kept in regions.csv
        assertThat(csv(out.resolve(BatchInspection.REGIONS_NAME))).extracting(r -> r.get("wafer_id"))
                .containsExactly("w2");
        reads.set(0);
        new BatchInspection(rules(SPOT_RULES), counting).run(list(in), out, options(2, true));
        assertThat(reads.get()).isZero();
        assertThat(csv(out.resolve(BatchInspection.REGIONS_NAME))).hasSize(1);
    }

    @Test
    void regionsTableListsEachFlaggedRegionWithItsPosition() throws Exception {
        Path in = maps();
        Path out = dir.resolve("out");
        new BatchInspection(rules(SPOT_RULES)).run(list(in), out, options(2, false));
        List<CSVRecord> regions = csv(out.resolve(BatchInspection.REGIONS_NAME));
        assertThat(regions).hasSize(1);
        CSVRecord r = regions.get(0);
        assertThat(r.toMap().keySet()).containsExactlyElementsOf(BatchInspection.REGION_COLUMNS);
        assertThat(r.get("wafer_id")).isEqualTo("w2");
        assertThat(Math.hypot(Double.parseDouble(r.get("x_mm")) - 20, Double.parseDouble(r.get("y_mm")) + 10))
                .isLessThan(0.5);
        assertThat(Double.parseDouble(r.get("peak"))).isEqualTo(4);
        assertThat(r.get("peak_density_cm3")).isEmpty(); // a lifetime flag without a defect: no densities
    }

    @Test
    void filesThatAreNotMapsOrHaveABrokenSidecarBecomeErrorRows() throws Exception {
        Path in = maps();
        Files.writeString(in.resolve("d-text.tif"), "this is not a TIFF\n");
        Files.write(in.resolve("e-empty.csv"), new byte[0]);
        Files.writeString(in.resolve("f-cut.csv"), "x_mm,y_mm,value\n0,0,10\n0.5,0,1");
        byte[] good = Files.readAllBytes(in.resolve("w1.tif"));
        byte[] flipped = good.clone();
        for (int i = 8; i < Math.min(flipped.length, 4096); i++) {
            flipped[i] ^= (byte) 0x5A; // the first IFD and the start of the pixels scrambled
        }
        Files.write(in.resolve("g-scrambled.tif"), flipped);
        Files.write(in.resolve("h-sidecar.tif"), good);
        Files.writeString(in.resolve("h-sidecar.json"), "{\"format\": \"trapmap-map/1\", \"pixel_pitch_mm\": ");
        BatchInspection.Summary s = new BatchInspection(rules(SPOT_RULES)).run(list(in), dir.resolve("out"),
                options(2, false));
        List<CSVRecord> rows = csv(s.csv());
        assertThat(rows).hasSize(9);
        for (CSVRecord r : rows.subList(0, 5)) {
            assertThat(r.get("status")).as(r.get("file")).isEqualTo("error");
            assertThat(r.get("error")).as(r.get("file")).isNotBlank().doesNotContain("\n").contains(r.get("file")
                    .replaceAll(".*[/\\\\]", "").replace(".tif", "").replace(".csv", ""));
            assertThat(r.get("grade")).isEmpty();
        }
        assertThat(rows.subList(5, 9)).extracting(r -> r.get("status")).containsExactly("pass", "fail", "pass",
                "pass");
    }

    @Test
    void resumeAlsoKeepsTheRowsOfAnInterruptedRun() throws Exception {
        Path in = maps();
        Path out = dir.resolve("out");
        interruptedAfter(new BatchInspection(rules(SPOT_RULES)), list(in), out, 2);
        assertThat(Files.exists(out.resolve(BatchInspection.CSV_NAME))).isFalse();
        assertThat(csv(out.resolve(BatchInspection.PARTIAL_NAME))).hasSize(2);
        AtomicInteger reads = new AtomicInteger();
        new BatchInspection(rules(SPOT_RULES), f -> {
            reads.incrementAndGet();
            return MapFiles.readSingle(f);
        }).run(list(in), out, options(1, true));
        assertThat(reads.get()).isEqualTo(2);
        assertThat(csv(out.resolve(BatchInspection.CSV_NAME))).hasSize(4);
    }

    @Test
    void recurrenceIsTheFractionOfWafersFlaggedAtEachPosition() throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        SyntheticWafers.spot(in, "r1", 80, 20, -10, 5, 4);
        SyntheticWafers.spot(in, "r2", 80, 20, -10, 5, 4);
        SyntheticWafers.clean(in, "r3", 80);
        SyntheticWafers.spot(in, "r4", 80, -25, 15, 4, 4);
        BatchInspection.Summary s = new BatchInspection(rules(SPOT_RULES)).run(list(in), dir.resolve("out"),
                options(2, false));
        assertThat(s.recurrence()).hasSize(2);
        Path tif = s.recurrence().stream().filter(p -> p.toString().endsWith(".tif")).findFirst().orElseThrow();
        WaferMap r = MapFiles.readSingle(tif);
        assertThat(r.quantity()).isEqualTo(trapmap.maps.model.Quantity.FRACTION);
        assertThat(value(r, 20, -10)).isEqualTo(0.5f);
        assertThat(value(r, -25, 15)).isEqualTo(0.25f);
        assertThat(value(r, 0, 0)).isZero();
        assertThat(value(r, -30, -30)).isZero();
        assertThat(Files.size(s.recurrence().get(1))).isPositive();
    }

    @Test
    void tablesAndRecurrenceAreByteForByteTheSameWithOneWorkerAndWithFour() throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        for (int k = 0; k < 9; k++) {
            if (k % 3 == 1) {
                SyntheticWafers.clean(in, "m" + k, 60);
            } else {
                SyntheticWafers.spot(in, "m" + k, 60, 5 * k - 20, 10 - 3 * k, 4, 4);
            }
        }
        Files.writeString(in.resolve("m9.csv"), "not a map\n"); // an error row among them
        List<Path> files = new ArrayList<>(list(in));
        BatchInspection one = new BatchInspection(rules(SPOT_RULES));
        one.run(files, dir.resolve("one"), options(1, false));
        BatchInspection four = new BatchInspection(rules(SPOT_RULES));
        four.run(files, dir.resolve("four"), options(4, false));
        try (var s = Files.list(dir.resolve("one"))) {
            for (Path p : s.filter(Files::isRegularFile).toList()) {
                String name = p.getFileName().toString();
                if (!name.equals(RunManifest.FILE_NAME) && !name.equals(RunLock.FILE_NAME)) {
                    assertThat(Files.readAllBytes(dir.resolve("four").resolve(name))).as(name)
                            .isEqualTo(Files.readAllBytes(p));
                }
            }
        }
        assertThat(csv(dir.resolve("four").resolve(BatchInspection.CSV_NAME))).hasSize(10);
        BatchInspection.Phases p = four.lastPhases();
        assertThat(p.inspectionNanos()).isPositive();
        assertThat(p.writerBusyNanos()).isPositive().isLessThanOrEqualTo(p.inspectionNanos());
        assertThat(p.prepareNanos()).isPositive();
        assertThat(p.tablesNanos()).isPositive();
    }

    @Test
    void theWarmUpRunsBesideTheWorkersAndWritesNothingIntoTheFolder() throws Exception {
        Path in = maps();
        java.util.concurrent.atomic.AtomicReference<String> ranOn = new java.util.concurrent.atomic.AtomicReference<>();
        new BatchInspection(rules(SPOT_RULES)).warmingUp(() -> {
            ranOn.set(Thread.currentThread().getName());
            throw new IOException("a failing warm-up is only a lost head start");
        }).run(list(in), dir.resolve("out"), options(2, false));
        assertThat(ranOn.get()).isEqualTo("inspect-warm-up");
        try (var s = Files.list(dir.resolve("out"))) {
            assertThat(s.map(p -> p.getFileName().toString())).allMatch(n -> BatchInspection.isOutputName(n)
                    || n.equals(RunManifest.FILE_NAME) || n.equals(RunLock.FILE_NAME));
        }
    }

    private static float value(WaferMap m, double xMm, double yMm) {
        return m.raster().get((int) Math.round(m.grid().xPx(xMm)), (int) Math.round(m.grid().yPx(yMm)));
    }

    @Test
    void trapDensityFiguresUseTheRulesConditionsAndMissingConditionsGiveAnErrorRow() throws Exception {
        Path in = maps();
        String json = """
                {"conditions": {"doping": "p:1e16", "injection_cm3": 1e14}, "defect": "fe-i",
                 "flag": {"quantity": "trap-density", "threshold": 1e12, "min_area_mm2": 1},
                 "limits": {"trap_density_p95_cm3": {"max": 1e12}, "flagged_area_fraction": {"max": 0.001}}}
                """;
        BatchInspection.Summary s = new BatchInspection(rules(json)).run(list(in), dir.resolve("out"),
                options(2, false));
        List<CSVRecord> rows = csv(s.csv());
        double clean = Double.parseDouble(rows.get(0).get("trap_density_p95_cm3"));
        double low = Double.parseDouble(rows.get(3).get("trap_density_p95_cm3"));
        assertThat(clean).isPositive().isLessThan(low);
        WaferMap w1 = MapFiles.readSingle(in.resolve("w1.tif"));
        WaferMap density = trapmap.maps.process.MapConversion.convert(w1.withConditions(
                        MeasurementConditions.UNKNOWN.withDoping(trapmap.physics.material.Doping.pType(1e16))
                                .withInjection(1e14)), trapmap.physics.defect.DefectLibrary.byId("fe-i"),
                trapmap.maps.process.ConversionSettings.DEFAULTS).get(trapmap.maps.model.Quantity.TRAP_DENSITY);
        Mask mask = Mask.valid(w1.raster()).and(OutlineDetection.fit(w1).shape().mask(w1.grid(), 0))
                .and(Mask.valid(density.raster()));
        // a quantile of the float trap-density map is written at float precision
        assertThat(Float.parseFloat(rows.get(0).get("trap_density_p95_cm3"))).isEqualTo((float) MapStatistics.of(
                density, mask, StatisticsRequest.of(new double[] {95})).percentile(95));
        assertThat(rows.get(1).get("status")).isEqualTo("fail");
        assertThat(Math.hypot(Double.parseDouble(rows.get(1).get("worst_region_x_mm")) - 20,
                Double.parseDouble(rows.get(1).get("worst_region_y_mm")) + 10)).isLessThan(2);

        String noDoping = json.replace("\"doping\": \"p:1e16\", ", "");
        BatchInspection.Summary e = new BatchInspection(rules(noDoping)).run(list(in), dir.resolve("out2"),
                options(2, false));
        assertThat(csv(e.csv())).allSatisfy(r -> {
            assertThat(r.get("status")).isEqualTo("error");
            assertThat(r.get("error")).containsIgnoringCase("doping");
        });
    }

    @Test
    void thumbnailsOutlineTheFlaggedRegion() throws Exception {
        Path in = maps();
        Path out = dir.resolve("out");
        new BatchInspection(rules(SPOT_RULES)).run(list(in), out,
                new BatchInspection.Options(2, false, true, ProgressListener.NONE));
        BufferedImage spot = ImageIO.read(out.resolve("thumbnails").resolve("w2.tif.png").toFile());
        BufferedImage clean = ImageIO.read(out.resolve("thumbnails").resolve("w1.tif.png").toFile());
        assertThat(spot.getWidth()).isEqualTo(Thumbnails.THUMBNAIL_PX);
        assertThat(count(spot, Thumbnails.OUTLINE_ARGB)).isPositive();
        assertThat(count(clean, Thumbnails.OUTLINE_ARGB)).isZero();
        // the spot: radius 5 mm around (20, -10) mm, 0.5 mm pixels, centre (100, 100) of 200 px, drawn 256 px wide
        double k = 200.0 / Thumbnails.THUMBNAIL_PX;
        int cx = (int) ((100 + 40 + 0.5) / k);
        int cy = (int) ((100 + 20 + 0.5) / k);
        double radius = 10 / k;
        int first = cx;
        while (spot.getRGB(first, cy) != Thumbnails.OUTLINE_ARGB) {
            first++;
        }
        int last = first;
        while (spot.getRGB(last + 1, cy) == Thumbnails.OUTLINE_ARGB) {
            last++;
        }
        // drawn just outside the spot, OUTLINE_PX wide, the spot's own pixels left in their colours
        assertThat(first - cx).isBetween((int) radius - 1, (int) radius + 2);
        assertThat(last - first + 1).isBetween(Thumbnails.OUTLINE_PX, Thumbnails.OUTLINE_PX + 1);
        assertThat(spot.getRGB(cx, cy)).isNotEqualTo(Thumbnails.OUTLINE_ARGB);
        assertThat(spot.getRGB(first - 2, cy)).isNotEqualTo(Thumbnails.OUTLINE_ARGB);
    }

    private static int count(BufferedImage img, int argb) {
        int n = 0;
        for (int y = 0; y < img.getHeight(); y++) {
            for (int x = 0; x < img.getWidth(); x++) {
                n += img.getRGB(x, y) == argb ? 1 : 0;
            }
        }
        return n;
    }

    @Test
    void edgeToCentreRatioComparesTheEdgeBandWithTheCentre() throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        WaferMap m = SyntheticWafers.map("ring", 100, 0, 0, 0, 100);
        float[] s = m.raster().samples();
        for (int i = 0; i < s.length; i++) {
            double x = m.grid().xMm(i % SyntheticWafers.N);
            double y = m.grid().yMm(i / SyntheticWafers.N);
            if (!Float.isNaN(s[i]) && Math.hypot(x, y) > 40) {
                s[i] = 50;
            }
        }
        SyntheticWafers.write(in, "ring", m);
        Rules r = rules("{\"edge_band_mm\": 10, \"flag\": {\"quantity\": \"lifetime\", \"threshold\": 1},"
                + " \"limits\": {\"edge_to_centre_ratio\": {\"min\": 0.8}}}");
        BatchInspection.Summary sum = new BatchInspection(r).run(list(in), dir.resolve("out"), options(1, false));
        CSVRecord row = csv(sum.csv()).get(0);
        assertThat(Double.parseDouble(row.get("edge_to_centre_ratio"))).isCloseTo(0.5, within(0.02));
        assertThat(row.get("status")).isEqualTo("fail");
    }

    @Test
    void progressCountsEveryWafer() throws Exception {
        Path in = maps();
        List<Long> seen = new java.util.concurrent.CopyOnWriteArrayList<>();
        new BatchInspection(rules(SPOT_RULES)).run(list(in), dir.resolve("out"),
                new BatchInspection.Options(3, false, false, (done, total, msg) -> {
                    assertThat(total).isEqualTo(4);
                    seen.add(done);
                }));
        assertThat(seen).containsExactly(1L, 2L, 3L, 4L);
    }

    @Test
    void columnsNameEachFigureOfTheRules() throws Exception {
        assertThat(BatchInspection.columns(rules(SPOT_RULES))).containsExactly("file", "wafer_id", "status", "grade",
                "profile", "defect", "harmonic_mean_lifetime_us", "median_lifetime_us", "flagged_area_fraction",
                "p5_lifetime_us", "largest_region_mm2", "invalid_area_fraction", "failed_rules", "graded_down_by",
                "worst_region_area_mm2", "worst_region_x_mm", "worst_region_y_mm", "worst_region_peak", "worst_region_rule",
                "worst_region_centroid_inside", "worst_region_peak_x_mm", "worst_region_peak_y_mm",
                "worst_region_min_x_mm", "worst_region_min_y_mm", "worst_region_max_x_mm", "worst_region_max_y_mm",
                "error");
        assertThat(Map.of()).isEmpty();
    }

    @Test
    void interruptingTheCallerCancelsAndLeavesThePartialTableForResume() throws Exception {
        Path in = maps();
        Path out = dir.resolve("out");
        java.util.concurrent.CountDownLatch reading = new java.util.concurrent.CountDownLatch(1);
        java.util.concurrent.CountDownLatch never = new java.util.concurrent.CountDownLatch(1);
        BatchInspection b = new BatchInspection(rules(SPOT_RULES), f -> {
            if (f.getFileName().toString().equals("w2.tif")) {
                reading.countDown();
                try {
                    never.await();
                } catch (InterruptedException e) {
                    throw new java.io.InterruptedIOException("cancelled");
                }
            }
            return MapFiles.readSingle(f);
        });
        java.util.concurrent.atomic.AtomicReference<Throwable> thrown = new java.util.concurrent.atomic.AtomicReference<>();
        Thread t = new Thread(() -> {
            try {
                b.run(list(in), out, options(1, false));
            } catch (Throwable e) {
                thrown.set(e);
            }
        });
        t.start();
        reading.await();
        t.interrupt();
        t.join(10_000);
        assertThat(t.isAlive()).isFalse();
        assertThat(thrown.get()).isInstanceOf(InterruptedException.class);
        assertThat(Files.exists(out.resolve(BatchInspection.CSV_NAME))).isFalse();
        assertThat(csv(out.resolve(BatchInspection.PARTIAL_NAME))).extracting(r -> r.get("wafer_id"))
                .containsExactly("w1");
    }

    @Test
    void aResumedBatchKeepsTheKeptWafersInTheRecurrenceMap() throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        SyntheticWafers.spot(in, "r1", 80, 20, -10, 5, 4);
        SyntheticWafers.spot(in, "r2", 80, 20, -10, 5, 4);
        SyntheticWafers.clean(in, "r3", 80);
        SyntheticWafers.clean(in, "r4", 80);
        Path out = dir.resolve("out");
        interruptedAfter(new BatchInspection(rules(SPOT_RULES)), list(in), out, 3);
        AtomicInteger reads = new AtomicInteger();
        BatchInspection.Summary s = new BatchInspection(rules(SPOT_RULES), f -> {
            reads.incrementAndGet();
            return MapFiles.readSingle(f);
        }).run(list(in), out, options(2, true));
        assertThat(reads.get()).isEqualTo(1);
        Path tif = s.recurrence().stream().filter(p -> p.toString().endsWith(".tif")).findFirst().orElseThrow();
        assertThat(value(MapFiles.readSingle(tif), 20, -10)).isEqualTo(0.5f);
        assertThat(Files.exists(out.resolve(BatchInspection.FOOTPRINTS_NAME + ".partial"))).isFalse();
    }
}
