package trapmap.cluster;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.stream.Stream;
import org.apache.spark.TaskContext;
import org.apache.spark.sql.Row;
import org.apache.spark.sql.SparkSession;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.demo.HistoryScenario;

/**
 * A task that fails and is run again by Spark leaves no duplicated rows: the first attempt of each task judging one
 * of three chosen maps fails there (after other maps of its partition were judged), Spark retries it
 * ({@code local[2,3]}: up to three attempts), and every table holds each map exactly once, as a run without failures
 * does.
 */
class TaskRetryTest {
    @TempDir
    Path dir;

    @Test
    void retriedTasksWriteEachMapOnce() throws Exception {
        Path all = dir.resolve("history");
        HistoryScenario.write(all);
        Path rules = all.resolve(HistoryScenario.RULES);
        Path maps = Files.createDirectories(dir.resolve("maps"));
        try (Stream<Path> s = Files.list(all)) { // the first 20 lots: 60 wafers
            for (Path p : s.filter(p -> p.getFileName().toString().matches("L00(0[1-9]|1\\d|20)-S\\d+\\.(tif|json)"))
                    .toList()) {
                Files.copy(p, maps.resolve(p.getFileName()));
            }
        }
        Set<String> failing = Set.of("L0005-S07.tif", "L0012-S02.tif", "L0019-S14.tif");
        AtomicInteger failed = new AtomicInteger();
        Set<String> seen = ConcurrentHashMap.newKeySet();
        SparkSession spark = LocalSpark.start("local[2,3]");
        try {
            ArchiveJob.beforeEachMap = name -> {
                String file = name.substring(name.lastIndexOf('/') + 1);
                seen.add(file);
                if (failing.contains(file) && TaskContext.get().attemptNumber() == 0) {
                    failed.incrementAndGet();
                    throw new IllegalStateException("a task attempt lost while judging " + file);
                }
            };
            String output = dir.resolve("archive").toString();
            ArchiveJob.Outcome o = ArchiveJob.run(spark, new ArchiveJob.Request(List.of(maps.toString()),
                    rules.toString(), output, PartitionKey.LOT, false));
            assertThat(failed.get()).isPositive(); // one per task holding a chosen map (a task stops at its first)
            assertThat(seen).hasSize(60);
            assertThat(o.total()).isEqualTo(60);
            List<Row> results = spark.read().parquet(output + "/" + ArchiveJob.RESULTS).select("file").collectAsList();
            assertThat(results).hasSize(60);
            assertThat(results.stream().map(r -> r.getString(0)).distinct().count()).isEqualTo(60);
            long withFootprint = spark.read().parquet(output + "/" + ArchiveJob.FOOTPRINTS).count();
            assertThat(withFootprint).isEqualTo(60);
            assertThat(spark.read().parquet(output + "/" + ArchiveJob.FOOTPRINTS).select("file").distinct().count())
                    .isEqualTo(60);
            long regions = spark.read().parquet(output + "/" + ArchiveJob.REGIONS).count();
            assertThat(spark.read().parquet(output + "/" + ArchiveJob.REGIONS).select("file", "region").distinct()
                    .count()).isEqualTo(regions);
            assertThat(o.recurrence().families().values().iterator().next().wafers()).isEqualTo(60);
        } finally {
            ArchiveJob.beforeEachMap = null;
            spark.stop();
        }
    }
}
