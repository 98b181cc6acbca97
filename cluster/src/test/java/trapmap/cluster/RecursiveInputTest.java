package trapmap.cluster;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;
import org.apache.spark.sql.SparkSession;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.batch.BatchInspection;
import trapmap.maps.demo.HistoryScenario;

/**
 * Inputs as an archive lays them out: with {@code --recursive} the maps of every folder below the input (sidecars
 * beside them, a batch's own outputs left out, as {@code inspect} leaves them out); without it only the input
 * folder's own maps, and a folder without any is refused in one line.
 */
class RecursiveInputTest {
    @TempDir
    Path dir;

    @Test
    void recursiveInputsReadTheMapsOfEveryFolderBelow() throws Exception {
        Path all = dir.resolve("history");
        HistoryScenario.write(all);
        Path archive = dir.resolve("archive");
        for (String lot : List.of("L0001", "L0002", "L0003", "L0004")) {
            Path day = Files.createDirectories(archive.resolve(lot.compareTo("L0003") < 0 ? "day1" : "day2").resolve(lot));
            try (Stream<Path> s = Files.list(all)) {
                for (Path p : s.filter(p -> p.getFileName().toString().startsWith(lot + "-")).toList()) {
                    Files.copy(p, day.resolve(p.getFileName()));
                }
            }
        }
        Path report = Files.createDirectories(archive.resolve("day1").resolve("report"));
        Files.writeString(report.resolve(BatchInspection.CSV_NAME), "not a map\n");
        Files.copy(all.resolve("L0001-S02.tif"), report.resolve(BatchInspection.RECURRENCE_PREFIX + "round-156.tif"));
        String rules = all.resolve(HistoryScenario.RULES).toString();
        SparkSession spark = LocalSpark.start();
        try {
            ArchiveJob.Outcome o = ArchiveJob.run(spark, new ArchiveJob.Request(List.of(archive.toString()), rules,
                    dir.resolve("out").toString(), PartitionKey.DAY, true));
            assertThat(o.total()).isEqualTo(12);
            assertThat(o.error()).isZero();
            assertThat(spark.read().parquet(dir.resolve("out").resolve(ArchiveJob.RESULTS).toString())
                    .select("lot").distinct().count()).isEqualTo(4);
            assertThatThrownBy(() -> ArchiveJob.run(spark, new ArchiveJob.Request(List.of(archive.toString()), rules,
                    dir.resolve("out2").toString(), PartitionKey.DAY, false))).isInstanceOf(IOException.class)
                    .hasMessage("no map files (.tif, .tiff, .csv) in " + archive
                            + "; use --recursive for the folders below it");
        } finally {
            spark.stop();
        }
    }
}
