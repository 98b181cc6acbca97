package trapmap.maps.watch;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** When a map arriving in a watched folder counts as complete ({@link Arrivals}), on a clock of the test's. */
class ArrivalsTest {
    private static final long S = 1_000_000_000L;
    private static final Path W1 = Path.of("/in/W1.tif").toAbsolutePath();
    private static final Path W2 = Path.of("/in/W2.tif").toAbsolutePath();

    private static Map<Path, Arrivals.Look> looks(Object... pathAndLook) {
        Map<Path, Arrivals.Look> m = new LinkedHashMap<>();
        for (int i = 0; i < pathAndLook.length; i += 2) {
            m.put((Path) pathAndLook[i], (Arrivals.Look) pathAndLook[i + 1]);
        }
        return m;
    }

    private static Arrivals.Look look(long size, long time, long sidecarSize, boolean done) {
        return new Arrivals.Look(size, time, sidecarSize, sidecarSize < 0 ? -1 : 7, done);
    }

    @Test
    void aMapGrowingInPiecesWaitsUntilItsSizeStaysTheSameForTheSettleTime() {
        Arrivals a = new Arrivals(2 * S, true);
        assertThat(a.update(looks(W1, look(100, 1, 50, false)), 0)).isEmpty();
        assertThat(a.update(looks(W1, look(200, 2, 50, false)), 1 * S)).isEmpty(); // grew: settle starts again
        assertThat(a.update(looks(W1, look(200, 2, 50, false)), 2 * S)).isEmpty(); // 1 s unchanged
        assertThat(a.update(looks(W1, look(300, 3, 50, false)), 3 * S - 1)).isEmpty(); // grew again
        assertThat(a.update(looks(W1, look(300, 3, 50, false)), 5 * S - 2)).isEmpty(); // 2 s less 1 ns
        assertThat(a.update(looks(W1, look(300, 3, 50, false)), 5 * S - 1)).containsExactly(W1);
        assertThat(a.update(looks(W1, look(300, 3, 50, false)), 9 * S)).as("offered once").isEmpty();
    }

    @Test
    void aTouchWithoutGrowthAlsoRestartsTheSettleTime() {
        Arrivals a = new Arrivals(2 * S, true);
        a.update(looks(W1, look(100, 1, 50, false)), 0);
        assertThat(a.update(looks(W1, look(100, 5, 50, false)), 3 * S)).isEmpty();
        assertThat(a.update(looks(W1, look(100, 5, 50, false)), 5 * S)).containsExactly(W1);
    }

    @Test
    void aMapWaitsForItsSidecarAndTheSidecarMustSettleToo() {
        Arrivals a = new Arrivals(2 * S, true);
        assertThat(a.update(looks(W1, look(100, 1, -1, false)), 0)).isEmpty();
        assertThat(a.update(looks(W1, look(100, 1, -1, false)), 10 * S)).as("no sidecar yet").isEmpty();
        assertThat(a.update(looks(W1, look(100, 1, 20, false)), 11 * S)).as("sidecar just came").isEmpty();
        assertThat(a.update(looks(W1, look(100, 1, 40, false)), 12 * S)).as("sidecar still growing").isEmpty();
        assertThat(a.update(looks(W1, look(100, 1, 40, false)), 14 * S)).containsExactly(W1);
    }

    @Test
    void withoutRequiredSidecarsAMapCompletesBySettlingAlone() {
        Arrivals a = new Arrivals(2 * S, false);
        a.update(looks(W1, look(100, 1, -1, false)), 0);
        assertThat(a.update(looks(W1, look(100, 1, -1, false)), 2 * S)).containsExactly(W1);
    }

    @Test
    void aDoneMarkerCompletesAtOnceAndAnEmptyFileNeverSettles() {
        Arrivals a = new Arrivals(2 * S, true);
        assertThat(a.update(looks(W1, look(0, 1, -1, false), W2, look(10, 1, -1, true)), 0)).containsExactly(W2);
        assertThat(a.update(looks(W1, look(0, 1, 5, false)), 100 * S)).as("empty map").isEmpty();
        assertThat(a.waiting()).isEqualTo(1);
    }

    @Test
    void completeMapsComeByNameAndTakenMapsNeverAndRemovedMapsAreForgotten() {
        Arrivals a = new Arrivals(0, true);
        a.take(Path.of("/in/W0.tif"));
        Path w0 = Path.of("/in/W0.tif").toAbsolutePath();
        assertThat(a.update(looks(W2, look(1, 1, 1, false), W1, look(1, 1, 1, false), w0, look(1, 1, 1, true)), 0))
                .containsExactly(W1, W2);
        Arrivals b = new Arrivals(2 * S, true);
        b.update(looks(W1, look(1, 1, 1, false)), 0);
        b.update(looks(), 1 * S); // removed
        assertThat(b.waiting()).isZero();
        assertThat(b.update(looks(W1, look(1, 1, 1, false)), 2 * S)).as("back: settles anew").isEmpty();
    }

    @Test
    void theFolderScanLeavesOutHiddenFilesOutputsTheOutputFolderAndFoldersAndFindsMarkers(@TempDir Path dir)
            throws IOException {
        Path out = Files.createDirectories(dir.resolve("report.csv")); // an output folder named like a map
        Files.write(dir.resolve("W1.tif"), new byte[10]);
        Files.write(dir.resolve("W1.json"), new byte[3]);
        Files.write(dir.resolve("W2.csv"), new byte[10]); // no sidecar
        Files.write(dir.resolve("W3.tif"), new byte[10]);
        Files.write(dir.resolve("W3.tif.done"), new byte[0]); // complete without sidecar
        Files.write(dir.resolve("W4.TIFF"), new byte[10]);
        Files.write(dir.resolve("W4.done"), new byte[0]);
        Files.write(dir.resolve(".W5.tif.part"), new byte[10]);
        Files.write(dir.resolve(".W6.tif"), new byte[10]);
        Files.write(dir.resolve("results.csv"), new byte[10]);
        Files.write(dir.resolve("recurrence-m2.tif"), new byte[10]);
        Files.createDirectories(dir.resolve("W7.tif"));
        Arrivals a = new Arrivals(0, true);
        List<Path> first = a.scan(dir, out, 0);
        assertThat(first).extracting(p -> p.getFileName().toString()).containsExactly("W1.tif", "W3.tif", "W4.TIFF");
        assertThat(a.scan(dir, out, 1)).isEmpty();
        Files.write(dir.resolve("W2.json"), new byte[3]);
        assertThat(a.scan(dir, out, 2)).extracting(p -> p.getFileName().toString()).containsExactly("W2.csv");
    }
}
