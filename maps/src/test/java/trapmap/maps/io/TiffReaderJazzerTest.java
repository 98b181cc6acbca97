package trapmap.maps.io;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Timeout;
import trapmap.maps.fuzz.FuzzContract;

/**
 * Fuzz target of the TIFF map reader ({@link MapFiles#read} of a {@code .tif}, no sidecar): a map or a
 * {@link MapFormatException} with one line naming the file; anything else is a finding. Seeds and fixed findings:
 * {@code src/test/resources/trapmap/maps/io/TiffReaderJazzerTestInputs/readTiff/}. How to fuzz: DEVELOPERS.md.
 */
class TiffReaderJazzerTest {
    @FuzzTest(maxDuration = "2m")
    @Timeout(10)
    void readTiff(byte[] data) throws IOException {
        Files.deleteIfExists(FuzzContract.file("f.json"));
        Path file = FuzzContract.write("f.tif", data);
        MapReaderContract.read(file, file);
    }
}
