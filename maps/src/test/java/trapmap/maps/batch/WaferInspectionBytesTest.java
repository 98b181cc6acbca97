package trapmap.maps.batch;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import trapmap.maps.io.MapFiles;
import trapmap.maps.io.ReadOptions;

/**
 * {@link WaferInspection#inspect(String, WaferInspection.MapSupplier, InspectionBuffers)} with a map read from its
 * bytes judges as {@link WaferInspection#inspect(Path)} judges the file: equal results for every demonstration map
 * (the results are records: verdict, grade, profile, defect, every figure, failed rules, regions, footprint), and
 * the same error result for a file that cannot be read.
 */
class WaferInspectionBytesTest {
    private static final Path DEMO = Path.of("..", "demo-data");

    @TempDir
    Path dir;

    private static WaferResult fromBytes(WaferInspection in, Path file) {
        Path sidecar = MapFiles.sidecarOf(file);
        return in.inspect(file.toString(), () -> MapFiles.readSingle(file.toString(), Files.readAllBytes(file),
                sidecar.toString(), Files.isRegularFile(sidecar) ? Files.readAllBytes(sidecar) : null,
                ReadOptions.DEFAULTS), new InspectionBuffers());
    }

    @Test
    void demonstrationMapsFromTheirBytesGiveTheFilesResults() throws Exception {
        WaferInspection in = new WaferInspection(Rules.read(DEMO.resolve("rules-example.json")));
        List<Path> maps;
        try (Stream<Path> s = Files.list(DEMO)) {
            maps = s.filter(p -> p.toString().endsWith(".tif")).sorted().toList();
        }
        assertThat(maps).hasSize(17);
        int judged = 0;
        for (Path m : maps) {
            WaferResult expected = in.inspect(m);
            WaferResult r = fromBytes(in, m);
            assertThat(r).as(m.toString()).isEqualTo(expected);
            judged += r.status() == WaferResult.Status.ERROR ? 0 : 1;
        }
        assertThat(judged).isEqualTo(17);
    }

    @Test
    void anUnreadableMapIsTheSameErrorFromItsBytes() throws Exception {
        WaferInspection in = new WaferInspection(Rules.read(DEMO.resolve("rules-example.json")));
        byte[] tif = Files.readAllBytes(DEMO.resolve("LOT-A01-W01.tif"));
        Path cut = Files.write(dir.resolve("cut.tif"), java.util.Arrays.copyOf(tif, 500));
        WaferResult expected = in.inspect(cut);
        assertThat(expected.status()).isEqualTo(WaferResult.Status.ERROR);
        assertThat(fromBytes(in, cut)).isEqualTo(expected);
    }
}
