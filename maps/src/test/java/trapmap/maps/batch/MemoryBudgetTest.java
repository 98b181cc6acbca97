package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicInteger;
import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.MapMemory;
import trapmap.shared.progress.ProgressListener;

class MemoryBudgetTest {
    @TempDir
    Path dir;

    private static final String RULES = """
            {"edge_exclusion_mm": 2,
             "flag": {"quantity": "lifetime", "threshold": 10, "min_area_mm2": 1},
             "limits": {"p5_lifetime_us": {"min": 5}}}
            """;
    /** Working memory of one synthetic wafer in the budget: 201² pixels × 36 bytes = 1.45 MB → 2 MiB. */
    private static final long WAFER_MIB = 2;

    private static List<CSVRecord> csv(Path file) throws Exception {
        try (Reader r = Files.newBufferedReader(file);
             CSVParser p = CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).build().parse(r)) {
            return new ArrayList<>(p.getRecords());
        }
    }

    private List<Path> wafers(int n) throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        List<Path> files = new ArrayList<>();
        for (int i = 1; i <= n; i++) {
            files.add(SyntheticWafers.clean(in, "w" + i, 80));
        }
        return files;
    }

    private static BatchInspection.Options options(int threads) {
        return new BatchInspection.Options(threads, false, false, ProgressListener.NONE);
    }

    @Test
    void theBudgetIsSeventyPercentOfTheHeapLessTheReserveAndTheAdviceHoldsTheMap() {
        assertThat(MemoryBudget.ofHeap(1L << 30).totalMib()).isEqualTo(652); // 0.7 × 1024 − 64 = 652.8
        assertThat(MemoryBudget.ofHeap(64L << 20).totalMib()).isZero();
        MapMemory.Size big = new MapMemory.Size(8192, 8192, 8192L * 8192);
        assertThat(MemoryBudget.needMib(big)).isEqualTo(2304); // 64 Mi pixels × 36 bytes
        assertThat(MemoryBudget.heapFor(2304)).isEqualTo("-Xmx4g"); // (2304 + 64) / 0.7 = 3383 MiB
        assertThat(MemoryBudget.ofHeap(4L << 30).totalMib()).isGreaterThanOrEqualTo(2304);
        assertThat(MemoryBudget.ofHeap(3L << 30).totalMib()).isLessThan(2304);
    }

    @Test
    void theSizeComesFromTheTiffHeader() throws Exception {
        Path f = wafers(1).get(0);
        MapMemory.Size s = MapMemory.estimate(f);
        assertThat(s.width()).isEqualTo(SyntheticWafers.N);
        assertThat(s.height()).isEqualTo(SyntheticWafers.N);
        assertThat(s.pixels()).isEqualTo((long) SyntheticWafers.N * SyntheticWafers.N);
        assertThat(MemoryBudget.needMib(s)).isEqualTo(WAFER_MIB);
        assertThat(MapMemory.estimate(dir.resolve("missing.tif"))).isNull();
    }

    @Test
    void aMapThatCannotFitEvenAloneIsAnErrorRowNamingItsSizeAndTheBatchGoesOn() throws Exception {
        List<Path> files = wafers(2);
        BatchInspection.Summary s = new BatchInspection(Rules.parse(RULES, "rules.json"))
                .withMemoryBudget((WAFER_MIB - 1) << 20).run(files, dir.resolve("out"), options(2));
        List<CSVRecord> rows = csv(s.csv());
        assertThat(rows).hasSize(2);
        for (int i = 0; i < 2; i++) {
            assertThat(rows.get(i).get("status")).isEqualTo("error");
            assertThat(rows.get(i).get("error")).startsWith(files.get(i).toString() + ": 201×201 pixels need about"
                    + " 2 MB of memory, more than the batch can give one map (1 MB").contains("run with JAVA_OPTS=-Xmx");
        }
        assertThat(s.error()).isEqualTo(2);
    }

    @Test
    void workersTakeTurnsWhenTheBudgetHoldsOneMapAtATime() throws Exception {
        List<Path> files = wafers(4);
        AtomicInteger active = new AtomicInteger();
        AtomicInteger most = new AtomicInteger();
        WaferInspection.MapReader slow = f -> {
            most.accumulateAndGet(active.incrementAndGet(), Math::max);
            try {
                Thread.sleep(100);
                return MapFiles.readSingle(f);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                throw new java.io.InterruptedIOException();
            } finally {
                active.decrementAndGet();
            }
        };
        BatchInspection.Summary s = new BatchInspection(Rules.parse(RULES, "rules.json"), slow)
                .withMemoryBudget((2 * WAFER_MIB - 1) << 20).run(files, dir.resolve("out"), options(3));
        assertThat(most.get()).isEqualTo(1);
        assertThat(csv(s.csv())).extracting(r -> r.get("status")).containsExactly("pass", "pass", "pass", "pass");
    }

    @Test
    void anOutOfMemoryErrorInOneWorkerIsThatWafersErrorRow() throws Exception {
        List<Path> files = wafers(3);
        WaferInspection.MapReader failing = f -> {
            if (f.getFileName().toString().equals("w2.tif")) {
                throw new OutOfMemoryError("Java heap space");
            }
            return MapFiles.readSingle(f);
        };
        BatchInspection.Summary s = new BatchInspection(Rules.parse(RULES, "rules.json"), failing)
                .run(files, dir.resolve("out"), options(2));
        List<CSVRecord> rows = csv(s.csv());
        assertThat(rows).extracting(r -> r.get("status")).containsExactly("pass", "error", "pass");
        assertThat(rows.get(1).get("error")).startsWith(files.get(1) + ": out of memory while processing "
                + files.get(1) + " (201×201 pixels need about").contains("run with JAVA_OPTS=-Xmx");
    }
}
