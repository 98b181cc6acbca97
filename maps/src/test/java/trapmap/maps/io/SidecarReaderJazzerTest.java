package trapmap.maps.io;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.io.IOException;
import java.nio.file.Path;
import org.junit.jupiter.api.Timeout;
import trapmap.maps.fuzz.FuzzContract;

/**
 * Fuzz target of the sidecar reader: the fuzzed bytes are the {@code .json} beside a small valid float TIFF (2 × 2 pixels), read
 * through {@link MapFiles#read} so that the sidecar's fields are also applied to the map (scale, pitch, conditions,
 * pages). A map or a {@link MapFormatException} with one line naming the sidecar or the map. Seeds and fixed
 * findings: {@code src/test/resources/trapmap/maps/io/SidecarReaderJazzerTestInputs/readSidecar/}.
 */
class SidecarReaderJazzerTest {
    private static final byte[] TIFF = SidecarTest.plainTiff();

    @FuzzTest(maxDuration = "2m")
    @Timeout(10)
    void readSidecar(byte[] data) throws IOException {
        Path tif = FuzzContract.write("s.tif", TIFF);
        Path json = FuzzContract.write("s.json", data);
        MapReaderContract.read(tif, json, tif);
    }
}
