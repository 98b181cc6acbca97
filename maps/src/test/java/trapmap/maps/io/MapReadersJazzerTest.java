package trapmap.maps.io;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;

/**
 * Coverage-guided fuzzing of the map readers with Jazzer. Under {@code mvn test} the inputs stored in
 * {@code src/test/resources/trapmap/maps/io/MapReadersJazzerTestInputs/readAnyMapFile/} run as a regression test;
 * {@code JAZZER_FUZZ=1 mvn -pl maps -am test -Dtest=MapReadersJazzerTest} fuzzes for new inputs. An input starting
 * with a TIFF byte order mark is read as a TIFF file, one starting with '{' as the sidecar of a small valid TIFF, any
 * other as a CSV file. The only acceptable outcomes are maps or a {@link MapFormatException}.
 */
class MapReadersJazzerTest {
    private static final ReadOptions OPTIONS = ReadOptions.DEFAULTS.withMaxPixels(1 << 20);
    private static final Path DIR;

    static {
        try {
            DIR = Files.createTempDirectory("trapmap-fuzz");
            DIR.toFile().deleteOnExit();
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    @FuzzTest(maxDuration = "2m")
    void readAnyMapFile(byte[] data) throws IOException {
        Path target;
        if (data.length >= 2 && (data[0] == 'I' && data[1] == 'I' || data[0] == 'M' && data[1] == 'M')) {
            target = DIR.resolve("f.tif");
            Files.deleteIfExists(DIR.resolve("f.json"));
            Files.write(target, data);
        } else if (data.length >= 1 && data[0] == '{') {
            target = DIR.resolve("f.tif");
            Files.write(target, SidecarTest.plainTiff());
            Files.write(DIR.resolve("f.json"), data);
        } else {
            target = DIR.resolve("f.csv");
            Files.deleteIfExists(DIR.resolve("f.json"));
            Files.write(target, data);
        }
        try {
            MapFiles.read(target, OPTIONS);
        } catch (MapFormatException expected) {
            if (expected.problem().startsWith("unexpected failure while reading")) { // the reader's safety net
                throw new AssertionError(expected.getMessage(), expected);
            }
        }
    }
}
