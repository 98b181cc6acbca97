package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.shared.progress.ProgressListener;

/**
 * On a machine of one or two processors the first wafer of a batch runs alone and the other workers start after it
 * ({@link BatchInspection#firstWaferAlone}); the tables are the same as when every worker starts at once and as with
 * one worker.
 */
class FirstWaferAloneTest {
    @TempDir
    Path dir;

    private static final String RULES = """
            {"edge_exclusion_mm": 2,
             "flag": {"quantity": "lifetime", "threshold": 10, "min_area_mm2": 1},
             "limits": {"p5_lifetime_us": {"min": 5}}}
            """;

    private List<Path> wafers(int n) throws Exception {
        Path in = Files.createDirectories(dir.resolve("in"));
        List<Path> files = new ArrayList<>();
        for (int i = 1; i <= n; i++) {
            files.add(i % 3 == 0 ? SyntheticWafers.clean(in, "w" + i, 80)
                    : SyntheticWafers.spot(in, "w" + i, 80, -10 + 3 * i, 5, 15, 2));
        }
        return files;
    }

    private static BatchInspection.Options options(int threads) {
        return new BatchInspection.Options(threads, false, true, ProgressListener.NONE);
    }

    private static void pause() throws java.io.InterruptedIOException {
        try {
            Thread.sleep(150);
        } catch (InterruptedException e) {
            throw new java.io.InterruptedIOException("interrupted");
        }
    }

    private static void await(CountDownLatch latch) throws java.io.InterruptedIOException {
        try {
            if (!latch.await(30, TimeUnit.SECONDS)) {
                throw new IllegalStateException("the first wafer was never read");
            }
        } catch (InterruptedException e) {
            throw new java.io.InterruptedIOException("interrupted");
        }
    }

    @Test
    void onlyMachinesOfUpToTwoProcessorsHoldTheOtherWorkersBack() {
        assertThat(BatchInspection.firstWaferAlone(2, 2)).isTrue();
        assertThat(BatchInspection.firstWaferAlone(3, 2)).isTrue();
        assertThat(BatchInspection.firstWaferAlone(2, 1)).isTrue();
        assertThat(BatchInspection.firstWaferAlone(1, 2)).isFalse(); // one worker: nobody to hold back
        assertThat(BatchInspection.firstWaferAlone(2, 4)).isFalse();
        assertThat(BatchInspection.firstWaferAlone(16, 16)).isFalse();
    }

    @Test
    void theOtherWorkersStartAfterTheFirstWafer() throws Exception {
        List<Path> files = wafers(6);
        Path first = files.get(0);
        CountDownLatch firstRead = new CountDownLatch(1);
        Set<Path> startedBeforeFirstEnded = ConcurrentHashMap.newKeySet();
        boolean[] firstEnded = {false};
        Object lock = new Object();
        BatchInspection.Summary s = new BatchInspection(Rules.parse(RULES, "rules.json"), f -> {
            if (f.equals(first)) {
                firstRead.countDown();
                pause(); // time for a worker that does not wait to start on its own wafer
                var map = MapFiles.readSingle(f);
                synchronized (lock) {
                    firstEnded[0] = true; // the read ends before the wafer's inspection does
                }
                return map;
            }
            await(firstRead);
            synchronized (lock) {
                if (!firstEnded[0]) {
                    startedBeforeFirstEnded.add(f);
                }
            }
            return MapFiles.readSingle(f);
        }).withFirstWaferAlone(true).run(files, dir.resolve("alone"), options(3));
        assertThat(s.total()).isEqualTo(6);
        assertThat(startedBeforeFirstEnded).isEmpty();
    }

    @Test
    void theTablesAreTheSameWhicheverWayTheWorkersStart() throws Exception {
        List<Path> files = wafers(7);
        Rules rules = Rules.parse(RULES, "rules.json");
        BatchInspection.Summary one = new BatchInspection(rules).run(files, dir.resolve("one"), options(1));
        BatchInspection.Summary alone = new BatchInspection(rules).withFirstWaferAlone(true)
                .run(files, dir.resolve("alone"), options(3));
        BatchInspection.Summary together = new BatchInspection(rules).withFirstWaferAlone(false)
                .run(files, dir.resolve("together"), options(3));
        for (String table : List.of(BatchInspection.CSV_NAME, BatchInspection.REGIONS_NAME,
                BatchInspection.FOOTPRINTS_NAME)) {
            String expected = Files.readString(dir.resolve("one").resolve(table));
            assertThat(Files.readString(dir.resolve("alone").resolve(table))).as(table).isEqualTo(expected);
            assertThat(Files.readString(dir.resolve("together").resolve(table))).as(table).isEqualTo(expected);
        }
        assertThat(alone.fail()).isEqualTo(one.fail()).isEqualTo(together.fail()).isPositive();
    }
}
