package trapmap.maps.io;

import com.code_intelligence.jazzer.junit.FuzzTest;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Timeout;
import trapmap.maps.fuzz.FuzzContract;

/**
 * Fuzz target of the CSV map reader ({@link MapFiles#read} of a {@code .csv}: point lists, grids, {@code # key=value}
 * headers; no sidecar): a map or a {@link MapFormatException} with one line naming the file. Seeds and fixed
 * findings: {@code src/test/resources/trapmap/maps/io/CsvReaderJazzerTestInputs/readCsv/}.
 */
class CsvReaderJazzerTest {
    @FuzzTest(maxDuration = "2m")
    @Timeout(10)
    void readCsv(byte[] data) throws IOException {
        Files.deleteIfExists(FuzzContract.file("f.json"));
        Path file = FuzzContract.write("f.csv", data);
        MapReaderContract.read(file, file);
    }
}
